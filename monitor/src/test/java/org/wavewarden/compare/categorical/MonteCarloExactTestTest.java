package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.wavewarden.compare.categorical.RandomTables.assertClose;

import java.util.Random;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.TestResult;

class MonteCarloExactTestTest {

    private static final int B = 20_000;
    private static final int R_B = 200_000;

    /**
     * Four standard errors of the difference between our estimate (B replicates) and R's (200,000 replicates), each
     * a binomial proportion: 4 sqrt(p (1 - p) (1 / B + 1 / R_B)).
     */
    private static double tolerance(double p) {
        return 4 * Math.sqrt(p * (1 - p) * (1.0 / B + 1.0 / R_B));
    }

    @Test
    void simulatedPAgreesWithRWithinMonteCarloError() {
        // R 4.2.2: set.seed(20240611); chisq.test(m, simulate.p.value = TRUE, B = 200000) on each table in turn
        long[][] s1 = {{3, 0, 2, 5}, {1, 4, 6, 0}};
        long[][] s2 = {{2, 7, 1}, {0, 3, 4}, {5, 1, 2}};
        check(s1, 11.979545454545454, 0.0024949875250623748);
        check(s2, 12.237940630797771, 0.013004934975325124);
    }

    private static void check(long[][] t, double rStatistic, double rP) {
        TestResult r = MonteCarloExactTest.test(t, B, 42L);
        assertClose(rStatistic, r.statistic(), 1e-12, "X2");
        assertEquals(rP, r.pValue(), tolerance(rP), "simulated p");
    }

    @Test
    void simulatedPAgreesWithExactConditionalTailOnTwoByTwoTables() {
        // With margins 7,7 / 6,8 the X2 ordering and the probability ordering agree, so the exact conditional
        // P(X2 >= observed) is Fisher's p: R 4.2.2 fisher.test(matrix(c(1,6,5,2), 2, byrow = TRUE))$p.value
        double exact = 0.10256410256410255;
        assertEquals(exact, MonteCarloExactTest.test(new long[][] {{1, 6}, {5, 2}}, B, 3L).pValue(),
                4 * Math.sqrt(exact * (1 - exact) / B));
        // tea tasting: Fisher (1935), p = 0.4857
        double tea = 0.48571428571428582;
        assertEquals(tea, MonteCarloExactTest.test(new long[][] {{3, 1}, {1, 3}}, B, 4L).pValue(),
                4 * Math.sqrt(tea * (1 - tea) / B));
        // R 4.2.2: sum of dhyper over the tables with X2 >= observed for matrix(c(2,9,7,4), 2, byrow = TRUE)
        double s4 = 0.080495356037151689;
        assertEquals(s4, MonteCarloExactTest.test(new long[][] {{2, 9}, {7, 4}}, B, 5L).pValue(),
                4 * Math.sqrt(s4 * (1 - s4) / B));
    }

    @Test
    void sameTableAndSeedGiveTheSamePValue() {
        long[][] t = {{3, 0, 2, 5}, {1, 4, 6, 0}};
        double p = MonteCarloExactTest.test(t, 2000, 99L).pValue();
        assertEquals(p, MonteCarloExactTest.test(t, 2000, 99L).pValue());
        assertNotEquals(p, MonteCarloExactTest.test(t, 2000, 100L).pValue());
    }

    @Test
    void relabellingCategoriesOrSwappingWavesGivesTheSamePValueForTheSameSeed() {
        Random random = new Random(8L);
        for (int rep = 0; rep < 20; rep++) {
            int rows = 2 + random.nextInt(2);
            int cols = 2 + random.nextInt(4);
            long[][] t = RandomTables.table(random, rows, cols, 6);
            TestResult base = MonteCarloExactTest.test(t, 500, rep);
            long[][] moved = RandomTables.permuteRows(
                    RandomTables.permuteColumns(t, RandomTables.permutation(random, cols)),
                    RandomTables.permutation(random, rows));
            TestResult other = MonteCarloExactTest.test(moved, 500, rep);
            assertClose(base.statistic(), other.statistic(), 1e-12, "X2");
            assertEquals(base.pValue(), other.pValue(), "p rep " + rep);
        }
    }

    @Test
    void simulatedTablesKeepTheMarginsAndFollowTheHypergeometricMean() {
        long[] rt = {3, 7, 12};
        long[] ct = {2, 5, 6, 9};
        SplittableRandom random = new SplittableRandom(1L);
        long[][] out = new long[3][4];
        double sum00 = 0;
        int reps = 20_000;
        for (int b = 0; b < reps; b++) {
            MonteCarloExactTest.patefield(rt, ct, 22, random, out);
            for (int i = 0; i < 3; i++) {
                long s = 0;
                for (long v : out[i]) {
                    if (v < 0) {
                        throw new AssertionError("negative cell");
                    }
                    s += v;
                }
                assertEquals(rt[i], s);
            }
            for (int j = 0; j < 4; j++) {
                assertEquals(ct[j], out[0][j] + out[1][j] + out[2][j]);
            }
            sum00 += out[2][3];
        }
        // E[cell] = row total x column total / n = 12 x 9 / 22; variance below 1.5, so 4 SE is about 0.035
        assertEquals(12.0 * 9 / 22, sum00 / reps, 0.035);
    }

    @Test
    void replicatesMustBePositive() {
        assertThrows(IllegalArgumentException.class, () -> MonteCarloExactTest.test(new long[][] {{1, 2}, {3, 4}}, 0, 1L),
                "replicates");
    }
}
