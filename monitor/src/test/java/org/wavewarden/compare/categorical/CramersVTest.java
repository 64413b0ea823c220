package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.categorical.RandomTables.assertClose;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;

class CramersVTest {

    private static final long[][] PARTY = {{762, 327, 468}, {484, 239, 477}};
    private static final long[][] T34 = {{12, 5, 9, 30}, {7, 14, 3, 22}, {9, 11, 6, 18}};

    /*
     * The reference intervals come from R 4.2.2 by root-finding on pchisq with ncp, as MBESS's conf.limits.nc.chisq:
     *   ci <- function(x2, df, conf) { a <- (1 - conf) / 2; f <- function(l, t) pchisq(x2, df, l) - t
     *     lo <- if (f(0, 1 - a) <= 0) 0 else uniroot(f, c(0, 10 * x2 + 100), t = 1 - a, tol = 1e-12)$root
     *     hi <- if (f(0, a) <= 0) 0 else uniroot(f, c(0, 10 * x2 + 100), t = a, tol = 1e-12)$root; c(lo, hi) }
     */

    @Test
    void cramersVMatchesAgrestiPartyIdentificationTable() {
        EffectSize v = CramersV.estimate(PARTY, 0.95);
        // CHECK: V = 0.1044, sqrt(X2 / (n (min(r, c) - 1))) from Agresti's (2007) X2 = 30.07
        assertEquals(0.1044, v.estimate(), 0.00005);
        assertEquals("Cramér's V", v.name());
        // R 4.2.2: ci(30.070149095754672, 2, 0.95) = 11.615166353507924, 54.241115858842470; n = 2757
        assertClose(Math.sqrt(11.615166353507924 / 2757), v.ciLow(), 1e-8, "lower");
        assertClose(Math.sqrt(54.241115858842470 / 2757), v.ciHigh(), 1e-8, "upper");
        assertTrue(v.ciLow() < v.estimate() && v.estimate() < v.ciHigh());
    }

    @Test
    void cramersVIntervalStartsAtZeroWhenIndependenceIsPlausible() {
        EffectSize v90 = CramersV.estimate(T34, 0.90);
        // R 4.2.2: sqrt(chisq.test(T34, correct = FALSE)$statistic / (sum(T34) * 2))
        assertClose(0.18163428258612918, v90.estimate(), 1e-12, "V");
        // R 4.2.2: ci(9.633375682288726, 6, 0.90) = 0, 16.273294656374372; n = 146, min(r, c) - 1 = 2
        assertEquals(0, v90.ciLow());
        assertClose(Math.sqrt(16.273294656374372 / 292), v90.ciHigh(), 1e-8, "upper 90%");
        // R 4.2.2: ci(9.633375682288726, 6, 0.95) = 0, 19.180769273650039
        assertClose(Math.sqrt(19.180769273650039 / 292), CramersV.estimate(T34, 0.95).ciHigh(), 1e-8, "upper 95%");
    }

    @Test
    void cramersVIntervalHoldsForLargeWaves() {
        long[][] big = {{60000, 30000, 10000}, {40000, 40000, 20000}};
        EffectSize v = CramersV.estimate(big, 0.95);
        // R 4.2.2: chisq.test(big, correct = FALSE)$statistic = 8761.9047619047615; ci(8761.9047619047615, 2, 0.95)
        //   = 8397.8317043464413, 9131.6608452248129 (uniroot on pchisq with ncp, see above); n = 200000
        assertClose(Math.sqrt(8761.9047619047615 / 200000), v.estimate(), 1e-12, "V");
        assertClose(Math.sqrt(8397.8317043464413 / 200000), v.ciLow(), 1e-8, "lower");
        assertClose(Math.sqrt(9131.6608452248129 / 200000), v.ciHigh(), 1e-8, "upper");
    }

    @Test
    void biasCorrectedVMatchesBergsmaFormulaInR() {
        // R 4.2.2, Bergsma (2013) eq. for the corrected V:
        //   p2 <- max(0, X2 / n - (k - 1) (r - 1) / (n - 1)); rr <- r - (r - 1)^2 / (n - 1);
        //   kk <- k - (k - 1)^2 / (n - 1); sqrt(p2 / min(kk - 1, rr - 1))
        assertClose(0.10091998278440886, CramersV.biasCorrected(PARTY), 1e-12, "party");
        assertClose(0.1116843963825796, CramersV.biasCorrected(T34), 1e-12, "3 x 4");
        assertEquals(0, CramersV.biasCorrected(new long[][] {{10, 10}, {10, 10}}));
    }

    @Test
    void relabellingSwappingWavesAndTransposingLeaveVAndItsIntervalUnchanged() {
        Random random = new Random(31L);
        for (int rep = 0; rep < 60; rep++) {
            int rows = 2 + random.nextInt(2);
            int cols = 2 + random.nextInt(4);
            long[][] t = RandomTables.table(random, rows, cols, 5 + random.nextInt(80));
            EffectSize v = CramersV.estimate(t, 0.95);
            assertTrue(v.estimate() >= 0 && v.estimate() <= 1 && v.ciHigh() <= 1.0 + 1e-9);
            long[][] moved = RandomTables.permuteRows(
                    RandomTables.permuteColumns(t, RandomTables.permutation(random, cols)),
                    RandomTables.permutation(random, rows));
            for (long[][] other : new long[][][] {moved, RandomTables.transpose(t)}) {
                EffectSize w = CramersV.estimate(other, 0.95);
                assertClose(v.estimate(), w.estimate(), 1e-12, "V");
                assertEquals(v.ciLow(), w.ciLow(), 1e-9);
                assertEquals(v.ciHigh(), w.ciHigh(), 1e-9);
                assertClose(CramersV.biasCorrected(t) + 1, CramersV.biasCorrected(other) + 1, 1e-12, "corrected");
            }
            assertTrue(CramersV.biasCorrected(t) <= v.estimate() + 1e-12, "the correction only shrinks V");
        }
    }

    @Test
    void intervalCoversTheNoncentralityAtTheNominalRate() {
        // P(lower <= lambda <= upper) should be 0.95 by construction; check on X2 drawn from a noncentral chi-square
        // (sum of squared shifted normals), 4 binomial SE wide: 4 sqrt(0.95 x 0.05 / 2000) = 0.019
        Random random = new Random(12L);
        int df = 3;
        double[] shift = {1.5, 0.5, 1.0};
        double lambda = 1.5 * 1.5 + 0.5 * 0.5 + 1.0;
        int covered = 0;
        int reps = 2000;
        for (int rep = 0; rep < reps; rep++) {
            double x2 = 0;
            for (int k = 0; k < df; k++) {
                double z = random.nextGaussian() + shift[k];
                x2 += z * z;
            }
            double[] ci = NoncentralityInterval.of(x2, df, 0.95);
            if (ci[0] <= lambda && lambda <= ci[1]) {
                covered++;
            }
        }
        assertEquals(0.95, covered / (double) reps, 0.019);
    }
}
