package org.wavewarden.compare.normality;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

class ShapiroWilkTestTest {

    private static void assertMatches(double w, double p, TestResult r) {
        assertEquals("Shapiro-Wilk", r.test());
        assertEquals(w, r.statistic(), 1e-9, "W");
        assertEquals(p, r.pValue(), 1e-7 * Math.max(p, 1e-3), "p");
    }

    private static TestResult sw(double... x) {
        return ShapiroWilkTest.test(NumericDistribution.ofSample(x));
    }

    @Test
    void matchesHollanderWolfePermeabilityData() {
        // CHECK-SOURCES: R 4.2.2 shapiro.test (Royston 1995, AS R94) on x of Hollander & Wolfe (1973), p. 69:
        // W = 0.91129, p = 0.2900
        TestResult r = sw(0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46);
        assertEquals(0.91129, r.statistic(), 5e-6);
        assertEquals(0.2900, r.pValue(), 5e-5);
        // R 4.2.2 (Debian r-base-core): sprintf("%.17g", shapiro.test(x)[c("statistic", "p.value")])
        assertMatches(0.9112893891477436, 0.28996573480239274, r);
    }

    @Test
    void matchesRForThreeObservationsWithTheExactDistribution() {
        // R 4.2.2: shapiro.test(c(1, 2, 4)), shapiro.test(c(2.5, 3.1, 3.0)), shapiro.test(c(1, 1, 2))
        assertMatches(0.96428571428571419, 0.6368868450289632, sw(1, 2, 4));
        assertMatches(0.87096774193548421, 0.29827585215423202, sw(2.5, 3.1, 3.0));
        assertMatches(0.75, 0.0, sw(1, 1, 2));
    }

    @Test
    void matchesRForSmallSamplesOnBothSidesOfTheN11Switch() {
        // R 4.2.2: shapiro.test(c(1,2,2,3,7)); shapiro.test(c(3,1,4,1,5,9,2,6))
        assertMatches(0.81300432609388606, 0.10299465794178411, sw(1, 2, 2, 3, 7));
        assertMatches(0.92772417967794207, 0.49559691253683003, sw(3, 1, 4, 1, 5, 9, 2, 6));
        // R 4.2.2: x20 <- c(2.1,3.4,1.9,5.6,4.4,3.3,2.8,3.9,4.1,2.2,3.0,3.6,4.8,2.9,3.1,3.7,6.5,2.6,3.3,4.0)
        assertMatches(0.9428079089390311, 0.27079307565114208, sw(2.1, 3.4, 1.9, 5.6, 4.4, 3.3, 2.8, 3.9, 4.1, 2.2,
                3.0, 3.6, 4.8, 2.9, 3.1, 3.7, 6.5, 2.6, 3.3, 4.0));
        // R 4.2.2: both sleep groups pooled, n = 20
        assertMatches(0.94607276250996897, 0.31137541672322422, sw(0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0,
                2.0, 1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4));
    }

    @Test
    void matchesRWithHeavyTies() {
        // R 4.2.2: shapiro.test(rep(c(1,2,3,4,5), c(10,25,40,20,5)))
        assertMatches(0.9100054772757582, 4.3116103896400357e-06, ShapiroWilkTest.test(new NumericDistribution(
                new double[] {1, 2, 3, 4, 5}, new long[] {10, 25, 40, 20, 5})));
        // R 4.2.2: shapiro.test(rep(1:12, c(1,3,8,20,40,70,80,60,30,12,4,1)))
        assertMatches(0.97053907907169645, 3.0352487851814743e-06, ShapiroWilkTest.test(new NumericDistribution(
                new double[] {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12},
                new long[] {1, 3, 8, 20, 40, 70, 80, 60, 30, 12, 4, 1})));
    }

    @Test
    void matchesRAtTheLargestAllowedSample() {
        // R 4.2.2: i <- 1:5000; big <- ((i*7919) %% 1009) + ((i*104729) %% 1013) + ((i*15485863) %% 1019)
        double[] big = new double[5000];
        double[] expBig = new double[5000];
        for (long i = 1; i <= 5000; i++) {
            big[(int) i - 1] = (i * 7919) % 1009 + (i * 104729) % 1013 + (i * 15485863) % 1019;
            expBig[(int) i - 1] = Math.exp(big[(int) i - 1] / 1000);
        }
        // R 4.2.2: shapiro.test(big); shapiro.test(exp(big / 1000))
        assertMatches(0.99739412273980832, 1.4606178958591757e-07, sw(big));
        TestResult skewed = sw(expBig);
        assertEquals(0.90962393977242395, skewed.statistic(), 1e-9);
        assertEquals(1.5985105246172887e-47, skewed.pValue(), 1e-6 * 1.5985105246172887e-47);
    }

    @Test
    void wIsInvariantUnderShiftScaleAndReflection() {
        Random rng = new Random(31L);
        for (int rep = 0; rep < 30; rep++) {
            int n = 3 + rng.nextInt(300);
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = Math.round(rng.nextGaussian() * 20) / 4.0 + (rep % 3 == 0 ? Math.exp(rng.nextGaussian()) : 0);
            }
            TestResult r = sw(x);
            double scale = Math.exp(2 * rng.nextGaussian());
            double shift = 50 * rng.nextGaussian();
            double[] y = new double[n];
            double[] z = new double[n];
            for (int i = 0; i < n; i++) {
                y[i] = scale * x[i] + shift;
                z[i] = -x[i];
            }
            assertEquals(r.statistic(), sw(y).statistic(), 1e-10);
            assertEquals(r.pValue(), sw(y).pValue(), 1e-8);
            assertEquals(r.statistic(), sw(z).statistic(), 1e-12);
        }
    }

    @Test
    void rejectsAboutFivePercentOfNormalSamplesAtLevelFivePercent() {
        // calibration: under normality the p-value is close to uniform, so at level 0.05 about 5% of samples reject
        Random rng = new Random(2024L);
        int rejected = 0;
        int skewedRejected = 0;
        int reps = 400;
        for (int rep = 0; rep < reps; rep++) {
            double[] x = new double[40];
            double[] e = new double[40];
            for (int i = 0; i < x.length; i++) {
                x[i] = rng.nextGaussian();
                e[i] = Math.exp(rng.nextGaussian());
            }
            rejected += sw(x).pValue() < 0.05 ? 1 : 0;
            skewedRejected += sw(e).pValue() < 0.05 ? 1 : 0;
        }
        assertTrue(rejected >= 8 && rejected <= 36, "rejected " + rejected + " of " + reps); // binomial(400, 0.05): 20 +- 3.5 sd
        assertTrue(skewedRejected > 0.9 * reps, "lognormal rejected only " + skewedRejected);
    }

    @Test
    void coefficientsAreAntisymmetricWithUnitSumOfSquares() {
        for (int n : new int[] {3, 4, 5, 6, 7, 11, 12, 50, 5000}) {
            double[] a = ShapiroWilkTest.coefficients(n);
            double ss = 0;
            for (int i = 0; i < n; i++) {
                assertEquals(-a[n - 1 - i], a[i], 0.0);
                ss += a[i] * a[i];
            }
            assertEquals(1.0, ss, 1e-12, "n = " + n);
        }
    }

    @Test
    void rejectsConstantAndOutOfRangeSamples() {
        IllegalArgumentException constant = assertThrows(IllegalArgumentException.class, () -> sw(4, 4, 4, 4));
        assertTrue(constant.getMessage().startsWith("sample is constant"), constant.getMessage());
        IllegalArgumentException tooFew = assertThrows(IllegalArgumentException.class, () -> sw(1, 2));
        assertTrue(tooFew.getMessage().contains("has 2"));
        assertThrows(IllegalArgumentException.class, () -> ShapiroWilkTest.test(new NumericDistribution(
                new double[] {1, 2}, new long[] {2500, 2501})));
    }
}
