package org.wavewarden.compare.rank;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.ReferenceWaves.*;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class WilcoxonSignedRankTestTest {

    private static void assertRelative(double expected, double actual, double rel) {
        assertEquals(expected, actual, Math.abs(expected) * rel, () -> "expected " + expected + " got " + actual);
    }

    @Test
    void pairedTestMatchesSleepData() {
        SignedRankResult r = WilcoxonSignedRankTest.paired(SLEEP_2, SLEEP_1);
        // R 4.2.2: wilcox.test(group1, group2, paired = TRUE, exact = FALSE): V = 0, p = 0.009091 (CHECK-SOURCES);
        // more digits 0.00909069801592506. One zero difference is dropped and -1.3 occurs twice.
        assertEquals(0.0, r.v());
        assertRelative(0.00909069801592506, r.test().pValue(), 1e-9);
        assertEquals(9, r.nonZero());
        assertFalse(r.exact());
    }

    @Test
    void oneSampleExactMatchesR() {
        SignedRankResult r = WilcoxonSignedRankTest.oneSample(of(HW_X), 1.1);
        // R 4.2.2: wilcox.test(x, mu = 1.1): V = 41, p = 0.193359375, exact test
        assertEquals(41.0, r.v());
        assertRelative(0.193359375, r.test().pValue(), 1e-12);
        assertTrue(r.exact());
    }

    @Test
    void oneSampleMatchesRWithTiesAndZeros() {
        SignedRankResult likert = WilcoxonSignedRankTest.oneSample(likertCurrent(), 3);
        // R 4.2.2: wilcox.test(lc, mu = 3): V = 7322.5, p = 0.00124899381612004
        assertEquals(7322.5, likert.v());
        assertRelative(0.00124899381612004, likert.test().pValue(), 1e-9);
        assertEquals(150, likert.nonZero());

        SignedRankResult ages = WilcoxonSignedRankTest.oneSample(of(ages(30000, 7919, 30011, 73)), 50.5);
        // R 4.2.2: wilcox.test(ab, mu = 50.5): V = 266000861, p = 1.83652479922841e-164
        assertEquals(266000861.0, ages.v());
        assertRelative(1.83652479922841e-164, ages.test().pValue(), 1e-6);

        SignedRankResult ties = WilcoxonSignedRankTest.oneSample(of(modular(49, 23, 103, 1, 0.5)), 40);
        // R 4.2.2: wilcox.test(sc, mu = 40): V = 819, p = 0.0404456862427738 (ties in |x - mu|, so normal)
        assertEquals(819.0, ties.v());
        assertRelative(0.0404456862427738, ties.test().pValue(), 1e-9);
        assertFalse(ties.exact());
    }

    @Test
    void exactPValueEqualsEnumerationOfAllSignFlips() {
        Random rnd = new Random(41);
        for (int rep = 0; rep < 10; rep++) {
            int n = 3 + rnd.nextInt(10);
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = (i + 1 + rnd.nextDouble() * 0.5) * (rnd.nextBoolean() ? 1 : -1);
            }
            SignedRankResult r = WilcoxonSignedRankTest.oneSample(of(x), 0);
            assertTrue(r.exact());
            double v = bruteV(x);
            assertEquals(v, r.v());
            double centre = n * (n + 1) / 4.0;
            int extreme = 0;
            for (int mask = 0; mask < (1 << n); mask++) {
                double[] y = new double[n];
                for (int i = 0; i < n; i++) {
                    y[i] = ((mask >> i) & 1) == 1 ? Math.abs(x[i]) : -Math.abs(x[i]);
                }
                double w = bruteV(y);
                if (v > centre ? w >= v : w <= v) {
                    extreme++;
                }
            }
            assertEquals(Math.min(1.0, 2.0 * extreme / (1 << n)), r.test().pValue(), 1e-12);
        }
    }

    @Test
    void frequencyTableStatisticEqualsRanksOnRawData() {
        Random rnd = new Random(42);
        for (int rep = 0; rep < 40; rep++) {
            double[] x = gridSample(rnd, 5 + rnd.nextInt(80), 2 + rnd.nextInt(30), -1);
            double mu = rnd.nextInt(16) / 8.0 - 1;
            SignedRankResult r = WilcoxonSignedRankTest.oneSample(of(x), mu);
            assertEquals(bruteV(shifted(x, -mu)), r.v(), 1e-9);
        }
    }

    @Test
    void reversingThePairsMirrorsVAndKeepsPValue() {
        Random rnd = new Random(43);
        for (int rep = 0; rep < 20; rep++) {
            double[] a = gridSample(rnd, 10 + rnd.nextInt(60), 20, 0);
            double[] b = gridSample(rnd, a.length, 20, 0.25);
            SignedRankResult f = WilcoxonSignedRankTest.paired(a, b);
            SignedRankResult r = WilcoxonSignedRankTest.paired(b, a);
            assertEquals(f.nonZero() * (f.nonZero() + 1) / 2.0 - f.v(), r.v(), 1e-9);
            assertEquals(f.test().pValue(), r.test().pValue(), 1e-12);
            assertEquals(f, WilcoxonSignedRankTest.paired(shifted(a, 1024), shifted(b, 1024)));
        }
    }

    @Test
    void unequalPairsAreRejectedByName() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> WilcoxonSignedRankTest.paired(new double[] {1, 2}, new double[] {1}));
        assertTrue(e.getMessage().contains("baseline"));
        NumericDistribution zeros = table(new double[] {2}, new long[] {5});
        assertEquals(1.0, WilcoxonSignedRankTest.oneSample(zeros, 2).test().pValue());
    }

    /** V by mid-ranks of |x| over the non-zero values, O(n^2). */
    private static double bruteV(double[] x) {
        double v = 0;
        for (double xi : x) {
            if (xi <= 0) {
                continue;
            }
            double less = 0;
            double equal = 0;
            for (double xj : x) {
                if (xj == 0) {
                    continue;
                }
                less += Math.abs(xj) < Math.abs(xi) ? 1 : 0;
                equal += Math.abs(xj) == Math.abs(xi) ? 1 : 0;
            }
            v += less + (equal + 1) / 2;
        }
        return v;
    }
}
