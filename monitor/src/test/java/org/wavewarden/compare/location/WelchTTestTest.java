package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.wavewarden.compare.location.Samples.*;

import java.util.Random;
import org.apache.commons.math3.stat.inference.TTest;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class WelchTTestTest {

    /** Exposes commons-math3's Welch-Satterthwaite df, protected in its TTest. */
    private static final class WelchDf extends TTest {
        double of(double[] x, double[] y) {
            return df(variance(x), variance(y), x.length, y.length);
        }

        private static double variance(double[] x) {
            return new org.apache.commons.math3.stat.descriptive.moment.Variance().evaluate(x);
        }
    }

    private static void assertMatches(double[] r, MeanDifference m, double tol) {
        assertEquals(r[0], m.test().statistic(), tol * Math.abs(r[0]), "t");
        assertEquals(r[1], m.test().df(), tol * r[1], "df");
        assertEquals(org.wavewarden.compare.TestResult.DF_WELCH, m.test().dfConvention(), "the df's convention is named");
        assertEquals(r[2], m.test().pValue(), tol * r[2], "p");
        assertEquals(r[3], m.ciLow(), tol * Math.abs(r[3]), "ciLow");
        assertEquals(r[4], m.ciHigh(), tol * Math.abs(r[4]), "ciHigh");
    }

    @Test
    void welchTMatchesStudentSleepData() {
        // CHECK-SOURCES: Student (1908), Biometrika 6; R 4.2.2 t.test: t = -1.8608, df = 17.776, p = 0.07939,
        // 95% CI -3.3655 to 0.2055 for group 1 minus group 2, so baseline = group 2, current = group 1.
        MeanDifference m = WelchTTest.test(NumericDistribution.ofSample(SLEEP_2), NumericDistribution.ofSample(SLEEP_1),
                0.95);
        assertEquals(-1.8608, m.test().statistic(), 5e-5);
        assertEquals(17.776, m.test().df(), 5e-4);
        assertEquals(0.07939, m.test().pValue(), 5e-6);
        assertEquals(-3.3655, m.ciLow(), 5e-5);
        assertEquals(0.2055, m.ciHigh(), 5e-5);
        assertEquals(-1.58, m.difference(), 1e-12);
        assertEquals(0.75, m.meanCurrent(), 1e-12);
        assertEquals(2.33, m.meanBaseline(), 1e-12);
        assertEquals("Welch t", m.test().test());
        // R 4.2.2 (Debian r-base-core): t.test(g1, g2) statistic, parameter, p.value, conf.int, full precision
        assertMatches(new double[] {-1.8608134674868531, 17.776473516178498, 0.079394140187358173,
                -3.3654832307117104, 0.20548323071171018}, m, 1e-10);
    }

    @Test
    void welchTMatchesRWithTies() {
        // R 4.2.2 (Debian r-base-core): t.test(tc, tb) with tb, tc as in Samples
        assertMatches(new double[] {2.4939097954101328, 197.35989951395933, 0.013456052946162908,
                0.077422850605023907, 0.66257714939497636}, WelchTTest.test(tiesBaseline(), tiesCurrent(), 0.95), 1e-10);
        // R 4.2.2: t.test(tc, tb, conf.level = 0.9)
        assertMatches(new double[] {2.4939097954101328, 197.35989951395933, 0.013456052946162908,
                0.12481628734960834, 0.61518371265039185}, WelchTTest.test(tiesBaseline(), tiesCurrent(), 0.9), 1e-10);
    }

    @Test
    void welchTMatchesRWithUnbalancedWaves() {
        // R 4.2.2 (Debian r-base-core): t.test(uc, ub), 30 versus 3000 observations
        assertMatches(new double[] {0.31593622253369313, 31.322392989825687, 0.75414661760226942,
                -4.6712040639856562, 6.3845373973189794},
                WelchTTest.test(unbalancedBaseline(), unbalancedCurrent(), 0.95), 1e-9);
    }

    @Test
    void welchTMatchesRWithLargeWaves() {
        // R 4.2.2 (Debian r-base-core): t.test(lc, lb), about 120000 observations each
        assertMatches(new double[] {5.2532887874746965, 242037.33508197096, 1.4953296486902046e-07,
                0.026528218541193489, 0.058104070168128782}, WelchTTest.test(largeBaseline(), largeCurrent(), 0.95),
                1e-8);
    }

    @Test
    void swappingWavesFlipsSignsAndKeepsP() {
        Random rng = new Random(20240611L);
        for (int rep = 0; rep < 50; rep++) {
            NumericDistribution b = NumericDistribution.ofSample(roundedNormal(rng, 2 + rng.nextInt(200), 5, 2));
            NumericDistribution c = NumericDistribution.ofSample(roundedNormal(rng, 2 + rng.nextInt(200),
                    5 + rng.nextGaussian(), 1 + 3 * rng.nextDouble()));
            MeanDifference bc = WelchTTest.test(b, c, 0.95);
            MeanDifference cb = WelchTTest.test(c, b, 0.95);
            assertEquals(bc.difference(), -cb.difference(), 1e-12);
            assertEquals(bc.test().statistic(), -cb.test().statistic(), 1e-9);
            assertEquals(bc.test().pValue(), cb.test().pValue(), 1e-12);
            assertEquals(bc.ciLow(), -cb.ciHigh(), 1e-9);
            assertEquals(bc.ciHigh(), -cb.ciLow(), 1e-9);
        }
    }

    @Test
    void frequencyTableAgreesWithCommonsMathOnRawData() {
        // reference: commons-math3 3.6.1 TTest on the raw observations
        Random rng = new Random(7L);
        TTest reference = new TTest();
        WelchDf welchDf = new WelchDf();
        for (int rep = 0; rep < 50; rep++) {
            double[] b = roundedNormal(rng, 2 + rng.nextInt(300), 10, 3);
            double[] c = roundedNormal(rng, 2 + rng.nextInt(300), 10 + rng.nextGaussian(), 1 + 4 * rng.nextDouble());
            MeanDifference m = WelchTTest.test(NumericDistribution.ofSample(b), NumericDistribution.ofSample(c), 0.95);
            assertEquals(reference.t(c, b), m.test().statistic(), 1e-9 * Math.max(1, Math.abs(m.test().statistic())));
            assertEquals(reference.tTest(c, b), m.test().pValue(), 1e-9);
            assertEquals(welchDf.of(c, b), m.test().df(), 1e-9 * m.test().df());
        }
    }

    @Test
    void shiftingBothWavesChangesOnlyTheMeans() {
        Random rng = new Random(99L);
        for (int rep = 0; rep < 20; rep++) {
            double[] b = roundedNormal(rng, 3 + rng.nextInt(100), 0, 1);
            double[] c = roundedNormal(rng, 3 + rng.nextInt(100), 0.3, 1.5);
            double shift = 1000 * rng.nextGaussian();
            MeanDifference m = WelchTTest.test(NumericDistribution.ofSample(b), NumericDistribution.ofSample(c), 0.95);
            MeanDifference s = WelchTTest.test(NumericDistribution.ofSample(add(b, shift)),
                    NumericDistribution.ofSample(add(c, shift)), 0.95);
            assertEquals(m.test().statistic(), s.test().statistic(), 1e-6);
            assertEquals(m.test().pValue(), s.test().pValue(), 1e-7);
            assertEquals(m.ciLow(), s.ciLow(), 1e-7);
            assertEquals(m.meanBaseline() + shift, s.meanBaseline(), 1e-7);
        }
    }

    @Test
    void rejectsWavesWithoutSpreadOrTooFewObservations() {
        NumericDistribution one = NumericDistribution.ofSample(1.0);
        NumericDistribution two = NumericDistribution.ofSample(1.0, 2.0);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> WelchTTest.test(one, two, 0.95));
        assertEquals(true, e.getMessage().startsWith("baseline"));
        assertThrows(IllegalArgumentException.class, () -> WelchTTest.test(two, two, 1.0));
        NumericDistribution flat = NumericDistribution.ofSample(3.0, 3.0, 3.0);
        assertThrows(IllegalArgumentException.class, () -> WelchTTest.test(flat, flat, 0.95));
    }

    static double[] add(double[] x, double shift) {
        double[] out = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            out[i] = x[i] + shift;
        }
        return out;
    }
}
