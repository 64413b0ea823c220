package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.wavewarden.compare.location.Samples.*;

import java.util.Random;
import org.apache.commons.math3.stat.inference.TTest;
import org.junit.jupiter.api.Test;

class PairedTTestTest {

    @Test
    void pairedTMatchesStudentSleepData() {
        // CHECK-SOURCES: Student (1908), Biometrika 6; R 4.2.2 t.test(paired = TRUE): t = -4.0621, df = 9,
        // p = 0.002833 (group 1 minus group 2: baseline = group 2)
        MeanDifference m = PairedTTest.test(SLEEP_2, SLEEP_1, 0.95);
        assertEquals(-4.0621, m.test().statistic(), 5e-5);
        assertEquals(9, m.test().df(), 0.0);
        assertEquals("pairs - 1", m.test().dfConvention());
        assertEquals(0.002833, m.test().pValue(), 5e-7);
        // R 4.2.2 (Debian r-base-core): t.test(g1, g2, paired = TRUE), full precision
        assertEquals(-4.0621276833820366, m.test().statistic(), 1e-10);
        assertEquals(0.0028328901973842702, m.test().pValue(), 1e-12);
        assertEquals(-2.4598857632769824, m.ciLow(), 1e-10);
        assertEquals(-0.70011423672301754, m.ciHigh(), 1e-10);
        assertEquals(-1.58, m.difference(), 1e-12);
        assertEquals(2.33, m.meanBaseline(), 1e-12);
        assertEquals(0.75, m.meanCurrent(), 1e-12);
    }

    @Test
    void pairedTMatchesRWithTiedDifferences() {
        // R 4.2.2 (Debian r-base-core): pb <- c(3,4,4,5,2,3,6,4,5,3,4,4); pc <- c(4,4,5,5,3,3,7,5,5,4,5,4);
        // t.test(pc, pb, paired = TRUE, conf.level = 0.9)
        double[] pb = {3, 4, 4, 5, 2, 3, 6, 4, 5, 3, 4, 4};
        double[] pc = {4, 4, 5, 5, 3, 3, 7, 5, 5, 4, 5, 4};
        MeanDifference m = PairedTTest.test(pb, pc, 0.9);
        assertEquals(3.9242833740697165, m.test().statistic(), 1e-10);
        assertEquals(11, m.test().df(), 0.0);
        assertEquals(0.0023752882027352914, m.test().pValue(), 1e-12);
        assertEquals(0.31638026758392107, m.ciLow(), 1e-10);
        assertEquals(0.85028639908274561, m.ciHigh(), 1e-10);
    }

    @Test
    void agreesWithCommonsMathAndSwappingFlipsSigns() {
        // reference: commons-math3 3.6.1 TTest.pairedT / pairedTTest
        Random rng = new Random(5L);
        TTest reference = new TTest();
        for (int rep = 0; rep < 50; rep++) {
            int n = 2 + rng.nextInt(200);
            double[] b = roundedNormal(rng, n, 5, 2);
            double[] c = new double[n];
            for (int i = 0; i < n; i++) {
                c[i] = b[i] + Math.round((0.2 + rng.nextGaussian()) * 10) / 10.0;
            }
            if (java.util.Arrays.equals(b, c)) {
                continue;
            }
            MeanDifference m = PairedTTest.test(b, c, 0.95);
            assertEquals(reference.pairedT(c, b), m.test().statistic(), 1e-8 * Math.max(1, Math.abs(m.test().statistic())));
            assertEquals(reference.pairedTTest(c, b), m.test().pValue(), 1e-9);
            MeanDifference s = PairedTTest.test(c, b, 0.95);
            assertEquals(m.test().pValue(), s.test().pValue(), 1e-12);
            assertEquals(m.ciLow(), -s.ciHigh(), 1e-9);
        }
    }

    @Test
    void fromTheMomentsOfTheDifferencesEqualsTheTestOnThePairs() {
        // What a streamed panel has: n, the mean and SD of the differences, and the two means.
        MeanDifference pairs = PairedTTest.test(SLEEP_2, SLEEP_1, 0.95);
        double[] d = new double[SLEEP_1.length];
        for (int i = 0; i < d.length; i++) {
            d[i] = SLEEP_1[i] - SLEEP_2[i];
        }
        var table = org.wavewarden.profile.NumericDistribution.ofSample(d);
        MeanDifference moments = PairedTTest.ofDifferences(10, table.mean(), table.standardDeviation(), 2.33, 0.75,
                0.95);
        assertEquals(pairs.test().statistic(), moments.test().statistic(), 1e-12);
        assertEquals(pairs.test().df(), moments.test().df(), 0.0);
        assertEquals(pairs.test().dfConvention(), moments.test().dfConvention());
        assertEquals(pairs.test().pValue(), moments.test().pValue(), 1e-15);
        assertEquals(pairs.ciLow(), moments.ciLow(), 1e-12);
        assertEquals(pairs.ciHigh(), moments.ciHigh(), 1e-12);
        assertEquals(2.33, moments.meanBaseline(), 0.0);
        assertThrows(IllegalArgumentException.class, () -> PairedTTest.ofDifferences(1, 0.5, 1, 0, 0, 0.95));
        assertThrows(IllegalArgumentException.class, () -> PairedTTest.ofDifferences(5, 0.5, 0, 0, 0, 0.95));
    }

    @Test
    void rejectsUnequalLengthsAndNonFiniteValues() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> PairedTTest.test(new double[] {1, 2, 3}, new double[] {1, 2}, 0.95));
        assertEquals(true, e.getMessage().startsWith("baseline has 3"));
        IllegalArgumentException nan = assertThrows(IllegalArgumentException.class,
                () -> PairedTTest.test(new double[] {1, 2}, new double[] {1, Double.NaN}, 0.95));
        assertEquals("current[1] is not finite: NaN", nan.getMessage());
    }
}
