package org.wavewarden.compare.rank;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * References: R 4.2.2 (Debian r-base-core). The estimate against {@code wilcox.test}'s V by Kerby's formula
 * {@code 4 V / (n (n + 1)) - 1}; the interval against a direct O(n^2) evaluation of the documented method on the
 * raw differences:
 * <pre>
 * rbci <- function(d, conf = 0.95) {
 *   d <- d[d != 0]; n <- length(d)
 *   S <- outer(d, d, function(a, b) sign(a + b))
 *   r <- sum(S[upper.tri(S, diag = TRUE)]) / (n * (n + 1) / 2)
 *   h <- (rowSums(S) - diag(S)) / (n - 1); v <- 4 * var(h) / n; z <- qnorm(0.5 + conf / 2)
 *   lo <- (r - r^3 - z * sqrt(v) * sqrt((1 - r^2)^2 + z^2 * v)) / (1 - r^2 + z^2 * v)
 *   hi <- (r - r^3 + z * sqrt(v) * sqrt((1 - r^2)^2 + z^2 * v)) / (1 - r^2 + z^2 * v)
 *   c(r = r, lo = max(-1, lo), hi = min(1, hi))
 * }
 * </pre>
 */
class RankBiserialTest {

    /** {@code cc - b} of the 15 invented pairs in the R call below: ties, two zeros, both signs. */
    static final double[] DIFFERENCES = {2, -2, 3, 4, 0, 4, -1, 5, 3, -1, 5, 0, 4, 3, 2};

    @Test
    void matchesKerbysFormulaOnWilcoxonsVAndTheIntervalInR() {
        // b <- c(12,15,9,20,14,11,17,13,16,10,18,12,21,8,15); cc <- c(14,13,12,24,14,15,16,18,19,9,23,12,25,11,17)
        // wilcox.test(cc, b, paired = TRUE, exact = FALSE)$statistic = 84 over 13 non-zero differences:
        // 4 * 84 / (13 * 14) - 1 = 0.84615384615384626; rbci(cc - b): 0.55709408393940885 to 0.95233546884206333
        NumericDistribution d = NumericDistribution.ofSample(DIFFERENCES);
        EffectSize e = RankBiserial.estimate(d, 0.95);
        assertEquals(0.84615384615384626, e.estimate(), 1e-14);
        assertEquals(0.55709408393940885, e.ciLow(), 1e-12);
        assertEquals(0.95233546884206333, e.ciHigh(), 1e-12);
        assertEquals(4 * WilcoxonSignedRankTest.oneSample(d, 0).v() / (13 * 14) - 1, e.estimate(), 1e-14);
        // rbci(cc - b, 0.9): 0.61605378126575594 to 0.94320100527563255
        EffectSize e90 = RankBiserial.estimate(d, 0.9);
        assertEquals(0.61605378126575594, e90.ciLow(), 1e-12);
        assertEquals(0.94320100527563255, e90.ciHigh(), 1e-12);
    }

    @Test
    void frequencyTableEqualsTheDirectComputationAndNegatingFlips() {
        Random rng = new Random(41L);
        for (int rep = 0; rep < 100; rep++) {
            int n = 2 + rng.nextInt(80);
            double[] d = new double[n];
            for (int i = 0; i < n; i++) {
                d[i] = rng.nextInt(9) - 3; // ties, zeros and |d| ties of opposite sign
            }
            if (java.util.Arrays.stream(d).allMatch(x -> x == 0)) {
                continue;
            }
            double[] direct = direct(d);
            EffectSize e = RankBiserial.estimate(NumericDistribution.ofSample(d), 0.95);
            assertEquals(direct[0], e.estimate(), 1e-12);
            if (Math.abs(direct[0]) < 1 && !Double.isNaN(direct[1])) {
                assertEquals(direct[1], e.ciLow(), 1e-9);
                assertEquals(direct[2], e.ciHigh(), 1e-9);
            }
            double[] neg = new double[n];
            for (int i = 0; i < n; i++) {
                neg[i] = -d[i];
            }
            EffectSize f = RankBiserial.estimate(NumericDistribution.ofSample(neg), 0.95);
            assertEquals(-e.estimate(), f.estimate(), 1e-12);
            assertEquals(-e.ciHigh(), f.ciLow(), 1e-9);
        }
    }

    /** The method of the class comment, pair by pair, on raw differences. */
    static double[] direct(double[] all) {
        double[] d = java.util.Arrays.stream(all).filter(x -> x != 0).toArray();
        int n = d.length;
        double sum = 0;
        double[] h = new double[n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double s = Math.signum(d[i] + d[j]);
                if (j >= i) {
                    sum += s;
                }
                if (j != i) {
                    h[i] += s / (n - 1);
                }
            }
        }
        double r = sum / (n * (n + 1) / 2.0);
        if (n < 2) {
            return new double[] {r, Double.NaN, Double.NaN};
        }
        double mean = java.util.Arrays.stream(h).average().orElse(0);
        double ss = 0;
        for (double x : h) {
            ss += (x - mean) * (x - mean);
        }
        double v = 4 * ss / (n - 1) / n;
        double z = 1.959963984540054;
        double a = (1 - r * r);
        double lo = (r - r * r * r - z * Math.sqrt(v) * Math.sqrt(a * a + z * z * v)) / (a + z * z * v);
        double hi = (r - r * r * r + z * Math.sqrt(v) * Math.sqrt(a * a + z * z * v)) / (a + z * z * v);
        return new double[] {r, Math.max(-1, lo), Math.min(1, hi)};
    }

    @Test
    void everyChangeOneWayCollapsesTheIntervalAndNoChangeIsRefused() {
        EffectSize down = RankBiserial.estimate(NumericDistribution.ofSample(-1.2, -2.4, 0, -1.3), 0.95);
        assertEquals(-1, down.estimate(), 1e-15);
        assertEquals(-1, down.ciLow(), 1e-15);
        assertEquals(-1, down.ciHigh(), 1e-15);
        EffectSize one = RankBiserial.estimate(NumericDistribution.ofSample(0, 0, 3), 0.95);
        assertEquals(1, one.estimate(), 1e-15);
        assertEquals(-1, one.ciLow(), 0.0);
        assertThrows(IllegalArgumentException.class,
                () -> RankBiserial.estimate(NumericDistribution.ofSample(0, 0), 0.95));
    }
}
