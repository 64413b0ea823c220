package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.location.Samples.*;

import java.util.Random;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * R references come from this function, R 4.2.2 (Debian r-base-core), base R only:
 * <pre>
 * hg <- function(b, c, conf = 0.95, normal = FALSE) {
 *   n1 <- as.numeric(length(b)); n2 <- as.numeric(length(c)); df <- n1 + n2 - 2
 *   sp <- sqrt(((n1 - 1) * var(b) + (n2 - 1) * var(c)) / df)
 *   d <- (mean(c) - mean(b)) / sp
 *   J <- exp(lgamma(df / 2) - lgamma((df - 1) / 2)) / sqrt(df / 2); g <- J * d
 *   if (normal) { se <- sqrt((n1 + n2) / (n1 * n2) + g^2 / (2 * (n1 + n2))); z <- qnorm(0.5 + conf / 2)
 *                 lo <- g - z * se; hi <- g + z * se }
 *   else { sc <- sqrt(1 / n1 + 1 / n2); t <- d / sc; a <- (1 - conf) / 2
 *          lo <- uniroot(function(x) pt(t, df, x) - (1 - a), c(t - 50, t + 50), tol = 1e-14)$root * sc * J
 *          hi <- uniroot(function(x) pt(t, df, x) - a, c(t - 50, t + 50), tol = 1e-14)$root * sc * J }
 *   sprintf("%.17g", c(g, lo, hi, J)) }
 * </pre>
 */
class HedgesGTest {

    private static final double R_J10 = 0.92274560805308692;

    private static void assertMatches(double[] r, EffectSize e, double tol) {
        assertEquals(r[0], e.estimate(), tol * Math.abs(r[0]), "g");
        assertEquals(r[1], e.ciLow(), tol * Math.abs(r[1]), "ciLow");
        assertEquals(r[2], e.ciHigh(), tol * Math.abs(r[2]), "ciHigh");
    }

    @Test
    void hedgesGMatchesRNoncentralInversionOnSleepData() {
        // R 4.2.2: hg(g2, g1), baseline = sleep group 2, current = group 1
        EffectSize e = HedgesG.estimate(NumericDistribution.ofSample(SLEEP_2), NumericDistribution.ofSample(SLEEP_1),
                0.95);
        assertEquals("Hedges' g", e.name());
        assertMatches(new double[] {-0.79693523919112186, -1.6651717906748549, 0.091407732805160402}, e, 1e-9);
        assertEquals(0.95764642702371949, HedgesG.correction(18), 1e-14);
    }

    @Test
    void hedgesGMatchesRWithTiesUnbalancedAndLargeEffects() {
        // R 4.2.2: hg(tb, tc, 0.9)
        assertMatches(new double[] {0.35135417951980308, 0.11736929101887146, 0.58446018365177788},
                HedgesG.estimate(tiesBaseline(), tiesCurrent(), 0.9), 1e-9);
        // R 4.2.2: hg(ub, uc), 3000 versus 30
        assertMatches(new double[] {0.029769975873628021, -0.32976775265924269, 0.3893027888480961},
                HedgesG.estimate(unbalancedBaseline(), unbalancedCurrent(), 0.95), 1e-8);
        // R 4.2.2: hg(c(1,2,3,4,5,6), c(8,9,10,11,12,13,14)), a very large effect on few observations
        assertMatches(new double[] {3.4293837664657709, 1.6640405461597338, 5.1435723141254917},
                HedgesG.estimate(NumericDistribution.ofSample(1, 2, 3, 4, 5, 6),
                        NumericDistribution.ofSample(8, 9, 10, 11, 12, 13, 14), 0.95), 1e-9);
    }

    @Test
    void hedgesGMatchesRWhereTheNoncentralityPassesTheSeriesLimit() {
        // R 4.2.2: bb <- rep(1:3, c(50,100,50)); cc <- rep(4:6, c(50,100,50)); hg(bb, cc)
        // the observed t is about 42, so pt (and NoncentralT) use the normal approximation near the limits
        NumericDistribution b = table(new double[] {1, 2, 3}, new long[] {50, 100, 50});
        NumericDistribution c = table(new double[] {4, 5, 6}, new long[] {50, 100, 50});
        assertMatches(new double[] {4.2240400313656359, 3.8687155330703575, 4.5740579467069358},
                HedgesG.estimate(b, c, 0.95), 1e-8);
    }

    @Test
    void largeWavesUseTheHedgesOlkinNormalInterval() {
        assertTrue(largeBaseline().n() + largeCurrent().n() > HedgesG.NORMAL_APPROXIMATION_ABOVE);
        // R 4.2.2: hg(lb, lc, normal = TRUE)
        EffectSize e = HedgesG.estimate(largeBaseline(), largeCurrent(), 0.95);
        assertMatches(new double[] {0.021354053337574549, 0.0133870031772126, 0.029321103497936499}, e, 1e-9);
        // R 4.2.2: hg(lb, lc) by noncentral inversion; at this size the two agree to about 1e-8
        assertEquals(0.013387005806477222, e.ciLow(), 1e-8);
        assertEquals(0.029321056765754413, e.ciHigh(), 1e-7);
        // R 4.2.2: hg(tb, tc, 0.9, normal = TRUE), the normal formula on a small case
        double[] normal = HedgesG.normalInterval(0.35135417951980308, 100, 100, 0.9);
        assertEquals(0.116948834436781, normal[0], 1e-12);
        assertEquals(0.5857595246028251, normal[1], 1e-12);
    }

    @Test
    void exactCorrectionIsCloseToTheUsualApproximation() {
        // R 4.2.2 (Debian r-base-core): gamma(5) / (sqrt(5) * gamma(4.5)), the gamma form of Hedges (1981) for df = 10
        assertEquals(R_J10, HedgesG.correction(10), 1e-14);
        for (double df : new double[] {2, 5, 20, 100, 1e4, 1e6}) {
            double approx = 1 - 3 / (4 * df - 1);
            // the two differ by about 1 / (32 df^2)
            assertEquals(approx, HedgesG.correction(df), 0.04 / (df * df));
            assertTrue(Math.abs(approx - HedgesG.correction(df)) > 0.02 / (df * df) || df >= 1e5);
        }
        // R 4.2.2: exp(lgamma(m/2) - lgamma((m-1)/2)) / sqrt(m/2) for m = 50, 199, 200, 400, where lgamma keeps its digits
        assertEquals(0.98491194229556311, HedgesG.correction(50), 1e-14);
        assertEquals(0.99624452247916850, HedgesG.correction(200), 1e-12);
        assertEquals(0.99812363171484453, HedgesG.correction(400), 1e-12);
        // R 4.2.2, same formula, m = 242098: R's log-gamma difference is itself off by about 1e-10 here
        assertEquals(0.9999969019595043, HedgesG.correction(242098), 3e-10);
    }

    @Test
    void correctionObeysTheGammaRecursionOnBothSidesOfTheSeriesSwitch() {
        // Gamma(x + 1) = x Gamma(x) gives J(m + 2) = J(m) sqrt(m / (m + 2)) m / (m - 1), exactly
        for (double m : new double[] {3, 10, 150, 500, 996, 997, 998, 999, 5e4, 1e6, 1e9}) {
            double expected = HedgesG.correction(m) * Math.sqrt(m / (m + 2)) * m / (m - 1);
            assertEquals(expected, HedgesG.correction(m + 2), 2e-14, "m = " + m);
        }
    }

    @Test
    void swappingWavesMirrorsGAndItsInterval() {
        Random rng = new Random(123L);
        for (int rep = 0; rep < 40; rep++) {
            NumericDistribution b = NumericDistribution.ofSample(roundedNormal(rng, 2 + rng.nextInt(100), 0, 1));
            NumericDistribution c = NumericDistribution.ofSample(roundedNormal(rng, 2 + rng.nextInt(100),
                    2 * rng.nextGaussian(), 1));
            EffectSize bc = HedgesG.estimate(b, c, 0.95);
            EffectSize cb = HedgesG.estimate(c, b, 0.95);
            assertEquals(bc.estimate(), -cb.estimate(), 1e-12);
            assertEquals(bc.ciLow(), -cb.ciHigh(), 1e-9);
            assertEquals(bc.ciHigh(), -cb.ciLow(), 1e-9);
            assertTrue(bc.ciLow() < bc.estimate() && bc.estimate() < bc.ciHigh());
        }
    }

    @Test
    void gIsInvariantUnderShiftAndPositiveScale() {
        Random rng = new Random(77L);
        for (int rep = 0; rep < 20; rep++) {
            double[] b = roundedNormal(rng, 3 + rng.nextInt(80), 0, 1);
            double[] c = roundedNormal(rng, 3 + rng.nextInt(80), 0.5, 1.3);
            double shift = 100 * rng.nextGaussian();
            double scale = Math.exp(3 * rng.nextGaussian());
            EffectSize plain = HedgesG.estimate(NumericDistribution.ofSample(b), NumericDistribution.ofSample(c), 0.9);
            EffectSize moved = HedgesG.estimate(NumericDistribution.ofSample(affine(b, scale, shift)),
                    NumericDistribution.ofSample(affine(c, scale, shift)), 0.9);
            assertEquals(plain.estimate(), moved.estimate(), 1e-9);
            assertEquals(plain.ciLow(), moved.ciLow(), 1e-8);
            assertEquals(plain.ciHigh(), moved.ciHigh(), 1e-8);
        }
    }

    @Test
    void frequencyTableAgreesWithRawDataStatistics() {
        // reference: commons-math3 3.6.1 DescriptiveStatistics (mean, variance) on the raw observations
        Random rng = new Random(2L);
        for (int rep = 0; rep < 30; rep++) {
            double[] b = roundedNormal(rng, 2 + rng.nextInt(300), 3, 1);
            double[] c = roundedNormal(rng, 2 + rng.nextInt(300), 3 + 0.5 * rng.nextGaussian(), 1);
            DescriptiveStatistics sb = new DescriptiveStatistics(b);
            DescriptiveStatistics sc = new DescriptiveStatistics(c);
            double df = b.length + c.length - 2;
            double sp = Math.sqrt(((b.length - 1) * sb.getVariance() + (c.length - 1) * sc.getVariance()) / df);
            double expectedD = (sc.getMean() - sb.getMean()) / sp;
            double g = HedgesG.estimate(NumericDistribution.ofSample(b), NumericDistribution.ofSample(c), 0.95)
                    .estimate();
            assertEquals(expectedD, g / HedgesG.correction(df), 1e-10);
        }
    }

    @Test
    void rejectsWavesWithoutSpread() {
        NumericDistribution flat = NumericDistribution.ofSample(2, 2, 2);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> HedgesG.estimate(flat, flat, 0.95));
        assertTrue(e.getMessage().contains("pooled standard deviation"));
        assertThrows(IllegalArgumentException.class,
                () -> HedgesG.estimate(NumericDistribution.ofSample(1), NumericDistribution.ofSample(2), 0.95));
    }

    private static double[] affine(double[] x, double scale, double shift) {
        double[] out = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            out[i] = scale * x[i] + shift;
        }
        return out;
    }
}
