package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.wavewarden.compare.location.Samples.*;

import java.util.Random;
import org.apache.commons.math3.stat.inference.TTest;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class PooledTTestTest {

    private static void assertMatches(double[] r, MeanDifference m, double tol) {
        assertEquals(r[0], m.test().statistic(), tol * Math.abs(r[0]), "t");
        assertEquals(r[1], m.test().df(), 0.0, "df");
        assertEquals(org.wavewarden.compare.TestResult.DF_POOLED, m.test().dfConvention(), "the df's convention is named");
        assertEquals(r[2], m.test().pValue(), tol * r[2], "p");
        assertEquals(r[3], m.ciLow(), tol * Math.abs(r[3]), "ciLow");
        assertEquals(r[4], m.ciHigh(), tol * Math.abs(r[4]), "ciHigh");
    }

    @Test
    void pooledTMatchesStudentSleepData() {
        // CHECK-SOURCES: Student (1908), Biometrika 6; R 4.2.2 t.test(var.equal = TRUE): t = -1.8608, df = 18,
        // p = 0.07919 (group 1 minus group 2: baseline = group 2)
        MeanDifference m = PooledTTest.test(NumericDistribution.ofSample(SLEEP_2), NumericDistribution.ofSample(SLEEP_1),
                0.95);
        assertEquals(-1.8608, m.test().statistic(), 5e-5);
        assertEquals(18, m.test().df(), 0.0);
        assertEquals(0.07919, m.test().pValue(), 5e-6);
        // R 4.2.2 (Debian r-base-core): t.test(g1, g2, var.equal = TRUE), full precision
        assertMatches(new double[] {-1.8608134674868528, 18, 0.079186714215938175, -3.3638740322875984,
                0.20387403228759859}, m, 1e-10);
    }

    @Test
    void pooledTMatchesRWithTiesUnbalancedAndLargeWaves() {
        // R 4.2.2 (Debian r-base-core): t.test(tc, tb, var.equal = TRUE)
        assertMatches(new double[] {2.4939097954101324, 198, 0.013453365687252701, 0.077428685615534565,
                0.66257131438446559}, PooledTTest.test(tiesBaseline(), tiesCurrent(), 0.95), 1e-10);
        // R 4.2.2: t.test(uc, ub, var.equal = TRUE), 30 versus 3000
        assertMatches(new double[] {0.16228785364227202, 3028, 0.87109000764362943, -9.4935055160905009,
                11.206838849423827}, PooledTTest.test(unbalancedBaseline(), unbalancedCurrent(), 0.95), 1e-9);
        // R 4.2.2: t.test(lc, lb, var.equal = TRUE)
        assertMatches(new double[] {5.2534497778253391, 242098, 1.4940224073488137e-07, 0.026528702377101247,
                0.05810358633222102}, PooledTTest.test(largeBaseline(), largeCurrent(), 0.95), 1e-8);
    }

    @Test
    void frequencyTableAgreesWithCommonsMathOnRawDataAndSwappingFlipsSigns() {
        // reference: commons-math3 3.6.1 TTest.homoscedasticT / homoscedasticTTest on the raw observations
        Random rng = new Random(11L);
        TTest reference = new TTest();
        for (int rep = 0; rep < 50; rep++) {
            double[] b = roundedNormal(rng, 2 + rng.nextInt(300), 10, 3);
            double[] c = roundedNormal(rng, 2 + rng.nextInt(300), 10 + rng.nextGaussian(), 3);
            NumericDistribution tb = NumericDistribution.ofSample(b);
            NumericDistribution tc = NumericDistribution.ofSample(c);
            MeanDifference m = PooledTTest.test(tb, tc, 0.95);
            assertEquals(reference.homoscedasticT(c, b), m.test().statistic(),
                    1e-9 * Math.max(1, Math.abs(m.test().statistic())));
            assertEquals(reference.homoscedasticTTest(c, b), m.test().pValue(), 1e-9);
            MeanDifference swapped = PooledTTest.test(tc, tb, 0.95);
            assertEquals(m.test().pValue(), swapped.test().pValue(), 1e-12);
            assertEquals(m.ciLow(), -swapped.ciHigh(), 1e-9);
        }
    }

    @Test
    void singleObservationWaveIsAllowedButNoSpreadIsNot() {
        NumericDistribution one = NumericDistribution.ofSample(4.0);
        NumericDistribution two = NumericDistribution.ofSample(1.0, 2.0);
        assertEquals(1, PooledTTest.test(one, two, 0.95).test().df(), 0.0); // 1 + 2 - 2
        assertThrows(IllegalArgumentException.class, () -> PooledTTest.test(one, one, 0.95));
        assertThrows(IllegalArgumentException.class,
                () -> PooledTTest.test(NumericDistribution.empty(), two, 0.95));
    }
}
