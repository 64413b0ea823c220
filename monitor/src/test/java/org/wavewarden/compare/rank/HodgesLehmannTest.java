package org.wavewarden.compare.rank;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.ReferenceWaves.*;

import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * R's limits come from uniroot with its default tol.root = 1e-4 on a step function whose jumps sit at pairwise
 * differences, so R lands within about 1e-4 of the exact jump that is computed here: that is the tolerance used.
 */
class HodgesLehmannTest {

    private static final double R_ROOT_TOL = 1e-4;

    private static void assertInterval(double est, double lo, double hi, EffectSize e, double tol) {
        assertEquals(est, e.estimate(), tol, "estimate");
        assertEquals(lo, e.ciLow(), tol, "ciLow");
        assertEquals(hi, e.ciHigh(), tol, "ciHigh");
    }

    @Test
    void shiftMatchesROnHollanderWolfePermeabilityData() {
        EffectSize e = HodgesLehmann.estimate(of(HW_Y), of(HW_X), 0.95);
        // R 4.2.2: wilcox.test(x, y, conf.int = TRUE)$estimate = 0.305 (median of the 50 differences);
        // wilcox.test(x, y, conf.int = TRUE, exact = FALSE, correct = TRUE)$conf.int = -0.150014837, 0.759942765
        assertInterval(0.305, -0.150014837199084, 0.759942765322294, e, R_ROOT_TOL);
        assertEquals("Hodges-Lehmann shift", e.name());
        assertEquals(0.95, e.confidence());
    }

    @Test
    void shiftMatchesRWithHeavyTiesOnFivePointScale() {
        // R 4.2.2: wilcox.test(lc, lb, conf.int = TRUE, exact = FALSE): estimate 1.04e-05, CI 4.03e-05, 0.99998
        assertInterval(0, 0, 1, HodgesLehmann.estimate(likertBaseline(), likertCurrent(), 0.95), R_ROOT_TOL);
    }

    @Test
    void shiftMatchesRForUnbalancedAndSmallTiedWaves() {
        // R 4.2.2: wilcox.test(uc, ub, conf.int = TRUE, exact = FALSE): estimate 1.0000569, CI -8.0000331, 10.0000705
        assertInterval(1, -8, 10, HodgesLehmann.estimate(of(modular(4000, 37, 101, 1, 0)),
                of(modular(40, 53, 97, 1, 5)), 0.95), R_ROOT_TOL);
        // R 4.2.2: wilcox.test(c(2,3,4,4,5,5,6), c(1,2,2,3,3,3,4,5), conf.int = TRUE, exact = FALSE):
        // estimate 1.0000847, CI -4.59e-05, 2.9999954
        assertInterval(1, 0, 3, HodgesLehmann.estimate(of(1, 2, 2, 3, 3, 3, 4, 5), of(2, 3, 4, 4, 5, 5, 6), 0.95),
                R_ROOT_TOL);
        // R 4.2.2: sb, sc as in the rank-sum test; median(outer(sc, sb, "-")) = 4.5; normal CI -7.5000032, 16.500034
        assertInterval(4.5, -7.5, 16.5, HodgesLehmann.estimate(of(modular(49, 17, 101, 1, 0)),
                of(modular(49, 23, 103, 1, 0.5)), 0.95), R_ROOT_TOL);
    }

    @Test
    void shiftMatchesRForLargeWavesWithoutFormingPairs() {
        EffectSize e = HodgesLehmann.estimate(of(modular(30000, 7919, 30011, 100, 0)),
                of(modular(20000, 104729, 30029, 100, 3)), 0.95);
        // R 4.2.2: wilcox.test(gc, gb, conf.int = TRUE, exact = FALSE): estimate 3.12008565, CI 1.56993372, 4.67999556
        assertInterval(3.12008565290580, 1.56993372386333, 4.67999555671971, e, R_ROOT_TOL);

        EffectSize ages = HodgesLehmann.estimate(of(ages(30000, 7919, 30011, 73)),
                of(ages(32000, 104729, 30029, 71)), 0.95);
        // R 4.2.2: wilcox.test(ac, ab, conf.int = TRUE, exact = FALSE): estimate -1.0000177, CI -1.0000668, -0.9999551
        assertInterval(-1, -1, -1, ages, R_ROOT_TOL);
    }

    @Test
    void frequencyTableResultEqualsBruteForceOnRawData() {
        Random rnd = new Random(21);
        for (int rep = 0; rep < 40; rep++) {
            double[] b = gridSample(rnd, 5 + rnd.nextInt(40), 2 + rnd.nextInt(30), 0);
            double[] c = gridSample(rnd, 5 + rnd.nextInt(40), 2 + rnd.nextInt(30), rnd.nextInt(8) / 8.0);
            double confidence = rep % 2 == 0 ? 0.95 : 0.8;
            EffectSize e = HodgesLehmann.estimate(of(b), of(c), confidence);
            double[] brute = bruteForce(b, c, confidence);
            assertEquals(brute[0], e.estimate(), 1e-12, "estimate, rep " + rep);
            assertEquals(brute[1], e.ciLow(), 1e-12, "ciLow, rep " + rep);
            assertEquals(brute[2], e.ciHigh(), 1e-12, "ciHigh, rep " + rep);
        }
    }

    @Test
    void selectionFindsEveryOrderStatisticOfThePairwiseDifferences() {
        Random rnd = new Random(8);
        double[] b = new double[300];
        double[] c = new double[200];
        for (int i = 0; i < b.length; i++) {
            b[i] = Math.floor(rnd.nextGaussian() * 1000) / 7.0;
        }
        for (int i = 0; i < c.length; i++) {
            c[i] = Math.floor(rnd.nextGaussian() * 1000 + 300) / 7.0;
        }
        double[] all = new double[b.length * c.length];
        int k = 0;
        for (double x : c) {
            for (double y : b) {
                all[k++] = x - y;
            }
        }
        Arrays.sort(all);
        PairwiseDifferences diffs = new PairwiseDifferences(of(b), of(c));
        for (int rank = 1; rank <= all.length; rank += 997) {
            assertEquals(all[rank - 1], diffs.kthSmallest(rank), "rank " + rank);
        }
        assertEquals(all[0], diffs.kthSmallest(1));
        assertEquals(all[all.length - 1], diffs.kthSmallest(all.length));
    }

    @Test
    void swappingWavesFlipsShiftAndMirrorsInterval() {
        Random rnd = new Random(4);
        for (int rep = 0; rep < 30; rep++) {
            NumericDistribution b = of(gridSample(rnd, 10 + rnd.nextInt(90), 3 + rnd.nextInt(40), 0));
            NumericDistribution c = of(gridSample(rnd, 10 + rnd.nextInt(90), 3 + rnd.nextInt(40), 0.5));
            EffectSize forward = HodgesLehmann.estimate(b, c, 0.95);
            EffectSize backward = HodgesLehmann.estimate(c, b, 0.95);
            assertEquals(-forward.estimate(), backward.estimate(), 1e-12);
            assertEquals(-forward.ciHigh(), backward.ciLow(), 1e-12);
            assertEquals(-forward.ciLow(), backward.ciHigh(), 1e-12);
        }
    }

    @Test
    void addingAConstantToBothWavesLeavesTheShiftAndMovingOneMovesIt() {
        Random rnd = new Random(6);
        for (int rep = 0; rep < 20; rep++) {
            double[] b = gridSample(rnd, 20 + rnd.nextInt(50), 16, 0);
            double[] c = gridSample(rnd, 20 + rnd.nextInt(50), 16, 0.25);
            EffectSize e = HodgesLehmann.estimate(of(b), of(c), 0.9);
            assertEquals(e, HodgesLehmann.estimate(of(shifted(b, 1024)), of(shifted(c, 1024)), 0.9));
            EffectSize moved = HodgesLehmann.estimate(of(b), of(shifted(c, 2)), 0.9);
            assertEquals(e.estimate() + 2, moved.estimate(), 1e-12);
            assertEquals(e.ciLow() + 2, moved.ciLow(), 1e-12);
            assertEquals(e.ciHigh() + 2, moved.ciHigh(), 1e-12);
        }
    }

    @Test
    void badConfidenceIsRejectedByName() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> HodgesLehmann.estimate(of(1, 2), of(3, 4), 1.0));
        assertTrue(e.getMessage().contains("confidence"));
    }

    /**
     * Plain reference: every pairwise difference listed and sorted; the interval limits found as R defines them,
     * by evaluating the corrected standardised statistic of (current - d, baseline), ranked afresh, at a point
     * between each two consecutive distinct differences and taking the difference where it crosses the quantile.
     */
    private static double[] bruteForce(double[] b, double[] c, double confidence) {
        int n = b.length * c.length;
        double[] all = new double[n];
        int k = 0;
        for (double x : c) {
            for (double y : b) {
                all[k++] = x - y;
            }
        }
        Arrays.sort(all);
        double median = n % 2 == 1 ? all[n / 2] : (all[n / 2 - 1] + all[n / 2]) / 2;
        double[] distinct = Arrays.stream(all).distinct().toArray();
        double zq = new NormalDistribution(0, 1).inverseCumulativeProbability(0.5 + confidence / 2);
        return new double[] {median, crossing(b, c, distinct, zq), crossing(b, c, distinct, -zq)};
    }

    private static double crossing(double[] b, double[] c, double[] distinct, double zq) {
        // f falls as d rises; the root is the first distinct difference after which f is no longer above zq
        for (int t = 0; t < distinct.length; t++) {
            double after = t + 1 < distinct.length ? (distinct[t] + distinct[t + 1]) / 2 : distinct[t] + 1;
            if (standardised(b, c, after) - zq <= 0) {
                return distinct[t];
            }
        }
        return distinct[distinct.length - 1];
    }

    private static double standardised(double[] b, double[] c, double d) {
        int nb = b.length;
        int nc = c.length;
        double[] pooled = new double[nb + nc];
        for (int i = 0; i < nc; i++) {
            pooled[i] = c[i] - d;
        }
        System.arraycopy(b, 0, pooled, nc, nb);
        double rankSum = 0;
        for (int i = 0; i < nc; i++) {
            double less = 0;
            double equal = 0;
            for (double v : pooled) {
                less += v < pooled[i] ? 1 : 0;
                equal += v == pooled[i] ? 1 : 0;
            }
            rankSum += less + (equal + 1) / 2;
        }
        double[] sorted = pooled.clone();
        Arrays.sort(sorted);
        double ties = 0;
        for (int i = 0; i < sorted.length; ) {
            int j = i;
            while (j < sorted.length && sorted[j] == sorted[i]) {
                j++;
            }
            double t = j - i;
            ties += t * t * t - t;
            i = j;
        }
        double nn = nb + nc;
        double dz = rankSum - nc * (nc + 1) / 2.0 - nb * (double) nc / 2;
        double sigma = Math.sqrt(nb * (double) nc / 12 * ((nn + 1) - ties / (nn * (nn - 1))));
        return (dz - 0.5 * Math.signum(dz)) / sigma;
    }
}
