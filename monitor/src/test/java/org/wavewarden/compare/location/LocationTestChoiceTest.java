package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.location.LocationTestChoice.LocationTest.MANN_WHITNEY;
import static org.wavewarden.compare.location.LocationTestChoice.LocationTest.WELCH_T;
import static org.wavewarden.compare.location.Samples.*;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.location.LocationTestChoice.Choice;
import org.wavewarden.profile.NumericDistribution;

class LocationTestChoiceTest {

    private static final double[] ELEVEN = {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
    /** 5000 observations on 0..10, mildly skewed; R 4.2.2: shapiro.test p = 1.2e-31, g1 = 0.180, g2 = 0.267. */
    private static final long[] BELL_5000 = {50, 150, 400, 800, 1000, 1200, 800, 350, 150, 50, 50};
    /** the same with one more observation at 5 (n = 5001); R 4.2.2 hand formula: g1 = 0.179, g2 = 0.267 */
    private static final long[] BELL_5001 = {50, 150, 400, 800, 1000, 1201, 800, 350, 150, 50, 50};

    @Test
    void fewDistinctValuesOrObservationsChooseMannWhitney() {
        NumericDistribution fourValues = table(new double[] {1, 2, 3, 4}, new long[] {30, 40, 20, 10});
        NumericDistribution many = NumericDistribution.ofSample(SLEEP_1);
        Choice c = LocationTestChoice.choose(fourValues, many);
        assertEquals(MANN_WHITNEY, c.test());
        assertTrue(c.reason().startsWith("too few distinct values for a normal model"), c.reason());
        assertEquals(MANN_WHITNEY, LocationTestChoice.choose(many, NumericDistribution.ofSample(1, 2)).test());
        // five distinct values is enough to go on to the normality check
        NumericDistribution five = NumericDistribution.ofSample(1, 2, 3, 4, 5);
        assertTrue(!LocationTestChoice.choose(five, many).reason().startsWith("too few"));
    }

    @Test
    void smallNormalLookingWavesChooseWelch() {
        // R 4.2.2: shapiro.test(sleep group 1)$p.value = 0.408, group 2 = 0.351, both above 0.01
        Choice c = LocationTestChoice.choose(NumericDistribution.ofSample(SLEEP_2), NumericDistribution.ofSample(SLEEP_1));
        assertEquals(WELCH_T, c.test());
        assertTrue(c.reason().contains("Shapiro-Wilk p = 0.351 (baseline), 0.408 (current)"), c.reason());
    }

    @Test
    void aWaveRejectedByShapiroWilkChoosesMannWhitney() {
        // R 4.2.2: shapiro.test(rep(1:5, c(10,25,40,20,5)))$p.value = 4.3e-06 < 0.01
        Choice c = LocationTestChoice.choose(tiesBaseline(), NumericDistribution.ofSample(SLEEP_1));
        assertEquals(MANN_WHITNEY, c.test());
        assertTrue(c.reason().startsWith("the baseline wave departs"), c.reason());
        assertTrue(LocationTestChoice.choose(NumericDistribution.ofSample(SLEEP_1), tiesBaseline()).reason()
                .startsWith("the current wave departs"));
    }

    @Test
    void aboveFiveThousandTheShapeDecidesInsteadOfShapiroWilk() {
        NumericDistribution n5000 = table(ELEVEN, BELL_5000);
        NumericDistribution n5001 = table(ELEVEN, BELL_5001);
        // at n = 5000 Shapiro-Wilk rejects this near-normal shape outright (p = 1.2e-31 in R 4.2.2) ...
        assertEquals(MANN_WHITNEY, LocationTestChoice.choose(n5000, n5000).test());
        // ... one observation more and the shape rule applies to both waves: |g1| <= 1, |g2| <= 2
        Choice c = LocationTestChoice.choose(n5000, n5001);
        assertEquals(WELCH_T, c.test());
        assertTrue(c.reason().contains("skewness 0.18 and excess kurtosis 0.27 (baseline)"), c.reason());
        assertEquals(WELCH_T, LocationTestChoice.choose(largeBaseline(), largeCurrent()).test());
    }

    @Test
    void largeSkewedWaveChoosesMannWhitney() {
        // counts round(6000 * 0.5^k), k = 1..12: n = 5999, R 4.2.2 hand formula g1 = 2.01, g2 = 5.31
        long[] counts = new long[12];
        double[] values = new double[12];
        for (int k = 1; k <= 12; k++) {
            values[k - 1] = k;
            counts[k - 1] = Math.round(6000 * Math.pow(0.5, k));
        }
        NumericDistribution skewed = table(values, counts);
        Choice c = LocationTestChoice.choose(largeBaseline(), skewed);
        assertEquals(MANN_WHITNEY, c.test());
        assertTrue(c.reason().startsWith("the current wave is too skewed"), c.reason());
    }

    @Test
    void choiceDoesNotDependOnWhichWaveIsTheBaseline() {
        Random rng = new Random(55L);
        for (int rep = 0; rep < 40; rep++) {
            NumericDistribution a = NumericDistribution.ofSample(randomWave(rng));
            NumericDistribution b = NumericDistribution.ofSample(randomWave(rng));
            assertEquals(LocationTestChoice.choose(a, b).test(), LocationTestChoice.choose(b, a).test());
        }
    }

    @Test
    void shiftAndScaleDoNotChangeTheChoice() {
        Random rng = new Random(56L);
        for (int rep = 0; rep < 40; rep++) {
            double[] a = randomWave(rng);
            double[] b = randomWave(rng);
            double scale = Math.exp(rng.nextGaussian());
            double shift = 10 * rng.nextGaussian();
            Choice plain = LocationTestChoice.choose(NumericDistribution.ofSample(a), NumericDistribution.ofSample(b));
            Choice moved = LocationTestChoice.choose(NumericDistribution.ofSample(affine(a, scale, shift)),
                    NumericDistribution.ofSample(affine(b, scale, shift)));
            assertEquals(plain.test(), moved.test());
        }
    }

    @Test
    void rejectsMissingWaves() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> LocationTestChoice.choose(null, NumericDistribution.ofSample(1, 2, 3)));
        assertEquals("baseline must not be null", e.getMessage());
    }

    /** Normal, lognormal or coarse waves of varying size, so every branch of the rule is visited. */
    private static double[] randomWave(Random rng) {
        int n = 3 + rng.nextInt(rng.nextBoolean() ? 60 : 7000);
        int kind = rng.nextInt(3);
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            double z = rng.nextGaussian();
            x[i] = switch (kind) {
                case 0 -> Math.round(z * 100) / 10.0;
                case 1 -> Math.round(Math.exp(z) * 10) / 10.0;
                default -> Math.round(z);
            };
        }
        return x;
    }

    private static double[] affine(double[] x, double scale, double shift) {
        double[] out = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            out[i] = scale * x[i] + shift;
        }
        return out;
    }

    @Test
    void valuesWhoseSquaresPassTheLargestDoubleAreComparedByRanks() {
        double[] b = new double[500];
        double[] c = new double[500];
        for (int i = 0; i < 500; i++) {
            b[i] = 40 + i % 20;
            c[i] = 41 + i % 20;
        }
        b[0] = 1e308;
        b[1] = -1e308;
        Choice choice = LocationTestChoice.choose(NumericDistribution.ofSample(b), NumericDistribution.ofSample(c));
        assertEquals(MANN_WHITNEY, choice.test());
        assertTrue(choice.reason().contains("beyond what sums of squares can hold"), choice.reason());
        // Values a little smaller still have finite sums of squares and follow the usual rule.
        b[0] = 1e150;
        b[1] = -1e150;
        assertTrue(!LocationTestChoice.choose(NumericDistribution.ofSample(b), NumericDistribution.ofSample(c))
                .reason().contains("sums of squares"));
    }
}
