package org.wavewarden.compare.rank;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.ReferenceWaves.*;

import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class MannWhitneyTestTest {

    private static void assertRelative(double expected, double actual, double rel) {
        assertEquals(expected, actual, Math.abs(expected) * rel, () -> "expected " + expected + " got " + actual);
    }

    @Test
    void rankSumMatchesHollanderWolfePermeabilityExample() {
        RankSumResult r = MannWhitneyTest.test(of(HW_Y), of(HW_X));
        // Hollander & Wolfe (1973), p. 69: W = 35, two-sided p = 0.2544
        assertEquals(35.0, r.u());
        assertEquals(0.2544, r.test().pValue(), 5e-5);
        // R 4.2.2 (Debian r-base-core): wilcox.test(x, y)$p.value, exact
        assertRelative(0.254412254412254, r.test().pValue(), 1e-10);
        assertTrue(r.exact());
        assertEquals("Mann-Whitney U", r.test().test());
    }

    @Test
    void rankSumMatchesRWithHeavyTiesOnFivePointScale() {
        RankSumResult r = MannWhitneyTest.test(likertBaseline(), likertCurrent());
        // R 4.2.2: wilcox.test(lc, lb) -> W = 24462.5, p = 0.00305018509432181 (normal, tie and continuity corrected)
        assertEquals(24462.5, r.u());
        assertRelative(0.00305018509432181, r.test().pValue(), 1e-9);
        assertFalse(r.exact());
    }

    @Test
    void rankSumMatchesRForUnbalancedWaves() {
        RankSumResult r = MannWhitneyTest.test(of(modular(4000, 37, 101, 1, 0)), of(modular(40, 53, 97, 1, 5)));
        // R 4.2.2: ub <- ((1:4000)*37) %% 101; uc <- ((1:40)*53) %% 97 + 5; wilcox.test(uc, ub)
        assertEquals(81841.5, r.u());
        assertRelative(0.801953668338837, r.test().pValue(), 1e-9);
        assertFalse(r.exact());
    }

    @Test
    void rankSumIsExactBelowFiftyWithoutTiesAsR() {
        RankSumResult r = MannWhitneyTest.test(of(modular(49, 17, 101, 1, 0)), of(modular(49, 23, 103, 1, 0.5)));
        // R 4.2.2: sb <- ((1:49)*17) %% 101; sc <- ((1:49)*23) %% 103 + 0.5; wilcox.test(sc, sb), exact test
        assertEquals(1300.0, r.u());
        assertRelative(0.483492332522094, r.test().pValue(), 1e-9);
        assertTrue(r.exact());
    }

    @Test
    void rankSumMatchesRWithTiesInSmallWaves() {
        RankSumResult r = MannWhitneyTest.test(of(1, 2, 2, 3, 3, 3, 4, 5), of(2, 3, 4, 4, 5, 5, 6));
        // R 4.2.2: wilcox.test(c(2,3,4,4,5,5,6), c(1,2,2,3,3,3,4,5)): W = 42.5, p = 0.0983349877585014
        assertEquals(42.5, r.u());
        assertRelative(0.0983349877585014, r.test().pValue(), 1e-9);
        assertFalse(r.exact());
    }

    @Test
    void rankSumMatchesRForLargeWaves() {
        RankSumResult r = MannWhitneyTest.test(of(modular(30000, 7919, 30011, 100, 0)),
                of(modular(20000, 104729, 30029, 100, 3)));
        // R 4.2.2: gb <- (((1:30000)*7919) %% 30011)/100; gc <- (((1:20000)*104729) %% 30029)/100 + 3;
        // wilcox.test(gc, gb): W = 306209615, p = 8.59170250093072e-05
        assertEquals(306209615.0, r.u());
        assertRelative(8.59170250093072e-05, r.test().pValue(), 1e-8);

        RankSumResult ages = MannWhitneyTest.test(of(ages(30000, 7919, 30011, 73)), of(ages(32000, 104729, 30029, 71)));
        // R 4.2.2: ab <- 18 + (((1:30000)*7919) %% 30011) %% 73; ac <- 18 + (((1:32000)*104729) %% 30029) %% 71;
        // wilcox.test(ac, ab): W = 466836572, p = 3.39890875132413e-09
        assertEquals(466836572.0, ages.u());
        assertRelative(3.39890875132413e-09, ages.test().pValue(), 1e-7);
    }

    @Test
    void exactPValueEqualsEnumerationOfAllAssignments() {
        Random rnd = new Random(11);
        for (int rep = 0; rep < 5; rep++) {
            double[] b = new double[5 + rnd.nextInt(3)];
            double[] c = new double[4 + rnd.nextInt(4)];
            double[] pool = new double[b.length + c.length];
            for (int i = 0; i < pool.length; i++) {
                pool[i] = i + rnd.nextDouble() * 0.5; // distinct
            }
            shuffle(pool, rnd);
            System.arraycopy(pool, 0, b, 0, b.length);
            System.arraycopy(pool, b.length, c, 0, c.length);
            RankSumResult r = MannWhitneyTest.test(of(b), of(c));
            assertTrue(r.exact());
            // permutation reference: every way of choosing which pooled observations form the current wave
            double w = bruteU(b, c);
            double centre = b.length * c.length / 2.0;
            int total = 0;
            int asExtreme = 0;
            int n = pool.length;
            for (int mask = 0; mask < (1 << n); mask++) {
                if (Integer.bitCount(mask) != c.length) {
                    continue;
                }
                double[] cc = new double[c.length];
                double[] bb = new double[b.length];
                int ci = 0;
                int bi = 0;
                for (int t = 0; t < n; t++) {
                    if ((mask & (1 << t)) != 0) {
                        cc[ci++] = pool[t];
                    } else {
                        bb[bi++] = pool[t];
                    }
                }
                double u = bruteU(bb, cc);
                total++;
                if (w > centre ? u >= w : u <= w) {
                    asExtreme++;
                }
            }
            assertEquals(Math.min(1.0, 2.0 * asExtreme / total), r.test().pValue(), 1e-12);
        }
    }

    @Test
    void frequencyTableResultEqualsBruteForceOnRawData() {
        Random rnd = new Random(7);
        NormalDistribution normal = new NormalDistribution(0, 1);
        for (int rep = 0; rep < 40; rep++) {
            double[] b = gridSample(rnd, 50 + rnd.nextInt(60), 2 + rnd.nextInt(12), 0);
            double[] c = gridSample(rnd, 50 + rnd.nextInt(60), 2 + rnd.nextInt(12), rnd.nextInt(3) / 8.0);
            RankSumResult r = MannWhitneyTest.test(of(b), of(c));
            // plain O(n1 n2) statistic and R's tie-corrected normal approximation on the raw pooled sample
            double w = bruteU(b, c);
            double[] pooled = new double[b.length + c.length];
            System.arraycopy(b, 0, pooled, 0, b.length);
            System.arraycopy(c, 0, pooled, b.length, c.length);
            Arrays.sort(pooled);
            double ties = 0;
            for (int i = 0; i < pooled.length; ) {
                int k = i;
                while (k < pooled.length && pooled[k] == pooled[i]) {
                    k++;
                }
                double t = k - i;
                ties += t * t * t - t;
                i = k;
            }
            double n = pooled.length;
            double sigma = Math.sqrt(b.length * c.length / 12.0 * ((n + 1) - ties / (n * (n - 1))));
            double dev = w - b.length * c.length / 2.0;
            double z = (dev - 0.5 * Math.signum(dev)) / sigma;
            double p = 2 * Math.min(normal.cumulativeProbability(z), 1 - normal.cumulativeProbability(z));
            assertEquals(w, r.u());
            assertEquals(z, r.z(), 1e-9);
            assertEquals(p, r.test().pValue(), 1e-9);
        }
    }

    @Test
    void swappingWavesMirrorsUAndKeepsPValue() {
        Random rnd = new Random(3);
        for (int rep = 0; rep < 30; rep++) {
            NumericDistribution b = of(gridSample(rnd, 20 + rnd.nextInt(80), 3 + rnd.nextInt(20), 0));
            NumericDistribution c = of(gridSample(rnd, 20 + rnd.nextInt(80), 3 + rnd.nextInt(20), 0.25));
            RankSumResult forward = MannWhitneyTest.test(b, c);
            RankSumResult backward = MannWhitneyTest.test(c, b);
            assertEquals((double) b.n() * c.n() - forward.u(), backward.u());
            assertEquals(-forward.z(), backward.z(), 1e-12);
            assertEquals(forward.test().pValue(), backward.test().pValue(), 1e-12);
        }
    }

    @Test
    void addingAConstantToBothWavesChangesNothing() {
        Random rnd = new Random(5);
        for (int rep = 0; rep < 20; rep++) {
            double[] b = gridSample(rnd, 30 + rnd.nextInt(40), 10, 0);
            double[] c = gridSample(rnd, 30 + rnd.nextInt(40), 10, 0.5);
            RankSumResult r = MannWhitneyTest.test(of(b), of(c));
            RankSumResult s = MannWhitneyTest.test(of(shifted(b, 1024)), of(shifted(c, 1024)));
            assertEquals(r, s);
        }
    }

    @Test
    void allObservationsTiedGivesNoEvidence() {
        RankSumResult r = MannWhitneyTest.test(table(new double[] {3}, new long[] {60}),
                table(new double[] {3}, new long[] {70}));
        assertEquals(1.0, r.test().pValue());
        assertEquals(0.0, r.z());
    }

    @Test
    void emptyWaveIsRejectedByName() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> MannWhitneyTest.test(NumericDistribution.empty(), of(1, 2)));
        assertTrue(e.getMessage().contains("baseline"));
    }

    static double bruteU(double[] b, double[] c) {
        double u = 0;
        for (double x : c) {
            for (double y : b) {
                u += x > y ? 1 : x == y ? 0.5 : 0;
            }
        }
        return u;
    }

    private static void shuffle(double[] a, Random rnd) {
        for (int i = a.length - 1; i > 0; i--) {
            int j = rnd.nextInt(i + 1);
            double t = a[i];
            a[i] = a[j];
            a[j] = t;
        }
    }
}
