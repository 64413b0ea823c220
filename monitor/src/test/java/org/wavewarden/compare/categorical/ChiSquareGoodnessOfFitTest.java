package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.categorical.RandomTables.assertClose;

import java.util.Random;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;

class ChiSquareGoodnessOfFitTest {

    @Test
    void goodnessOfFitMatchesRChisqTestWithP() {
        long[] observed = {30, 52, 18};
        double[] p = {0.25, 0.5, 0.25};
        TestResult t = ChiSquareGoodnessOfFit.test(observed, p);
        // R 4.2.2: chisq.test(c(30, 52, 18), p = c(0.25, 0.5, 0.25))
        assertClose(3.04, t.statistic(), 1e-12, "X2");
        assertEquals(2, t.df());
        assertClose(0.21871188695221475, t.pValue(), 1e-10, "p");
        EffectSize w = ChiSquareGoodnessOfFit.cohensW(observed, p, 0.95);
        assertClose(Math.sqrt(3.04 / 100), w.estimate(), 1e-12, "w");
        // R 4.2.2: uniroot on pchisq(3.04, 2, ncp) - 0.025 (see CramersVTest) = 12.240791887334309; lower limit 0
        assertEquals(0, w.ciLow());
        assertClose(Math.sqrt(12.240791887334309 / 100), w.ciHigh(), 1e-8, "upper");
    }

    @Test
    void goodnessOfFitAgreesWithCommonsMathAndIgnoresCategoryOrder() {
        Random random = new Random(23L);
        ChiSquareTest reference = new ChiSquareTest(); // commons-math3 3.6.1
        for (int rep = 0; rep < 100; rep++) {
            int k = 2 + random.nextInt(6);
            double[] p = new double[k];
            double sum = 0;
            for (int i = 0; i < k; i++) {
                p[i] = 0.05 + random.nextDouble();
                sum += p[i];
            }
            long[] observed = new long[k];
            double[] expected = new double[k];
            long n = 0;
            for (int i = 0; i < k; i++) {
                p[i] /= sum;
                observed[i] = random.nextInt(60);
                n += observed[i];
            }
            if (n == 0) {
                continue;
            }
            for (int i = 0; i < k; i++) {
                expected[i] = p[i] * n;
            }
            TestResult t = ChiSquareGoodnessOfFit.test(observed, p);
            assertClose(reference.chiSquare(expected, observed), t.statistic(), 1e-10, "X2");
            assertEquals(reference.chiSquareTest(expected, observed), t.pValue(), 1e-12 + 1e-9 * t.pValue());
            int[] perm = RandomTables.permutation(random, k);
            long[] o2 = new long[k];
            double[] p2 = new double[k];
            for (int i = 0; i < k; i++) {
                o2[i] = observed[perm[i]];
                p2[i] = p[perm[i]];
            }
            TestResult moved = ChiSquareGoodnessOfFit.test(o2, p2);
            assertClose(t.statistic() + 1, moved.statistic() + 1, 1e-12, "relabelled X2");
            assertEquals(t.pValue(), moved.pValue(), 1e-12);
        }
    }

    @Test
    void proportionsMustMatchTheCategoriesAndSumToOne() {
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> ChiSquareGoodnessOfFit.test(new long[] {1, 2}, new double[] {0.5, 0.4}))
                .getMessage().contains("sum to 1"));
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> ChiSquareGoodnessOfFit.test(new long[] {1, 2}, new double[] {1.0}))
                .getMessage().startsWith("expectedProportions"));
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> ChiSquareGoodnessOfFit.test(new long[] {1, 2}, new double[] {0, 1.0}))
                .getMessage().startsWith("expectedProportions[0]"));
    }
}
