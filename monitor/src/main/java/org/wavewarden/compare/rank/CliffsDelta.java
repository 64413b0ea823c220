package org.wavewarden.compare.rank;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * Cliff's delta, P(current &gt; baseline) - P(current &lt; baseline), with a confidence interval.
 *
 * <p>The estimate is the mean of the dominance matrix d_ij = sign(current_i - baseline_j) (Cliff 1993,
 * Psychological Bulletin 114). Its variance is Cliff's consistent estimator built from the row and column means of
 * that matrix (Cliff 1993; Cliff 1996, Ordinal Methods for Behavioral Data Analysis, Chapter 5),
 * <pre>
 *   s^2 = [ nb^2 sum_i (d_i. - d)^2 + nc^2 sum_j (d_.j - d)^2 - sum_ij (d_ij - d)^2 ] / [ nc nb (nc - 1)(nb - 1) ]
 * </pre>
 * floored at (1 - d^2) / (nb nc - 1) as Cliff proposes, so a sample that happens to show no spread still gets an
 * interval. The interval is the asymmetric one of Feng &amp; Cliff (2004, Journal of Modern Applied Statistical
 * Methods 3), which stays inside [-1, 1]:
 * <pre>
 *   (d - d^3 -/+ z s sqrt((1 - d^2)^2 + z^2 s^2)) / (1 - d^2 + z^2 s^2)
 * </pre>
 * Every row mean depends only on the current value and every column mean only on the baseline value, so one merge
 * over the two sorted tables gives all terms: O(k1 + k2).
 *
 * <p>Degenerate cases: with a single observation in either wave the variance is undefined and the interval is the
 * whole range [-1, 1]; with complete separation (|d| = 1) every entry of the matrix is equal, the estimated variance
 * is zero and the interval collapses to the estimate.
 */
public final class CliffsDelta {

    public static final String NAME = "Cliff's delta";

    private CliffsDelta() {
    }

    public static EffectSize estimate(NumericDistribution baseline, NumericDistribution current, double confidence) {
        Checks.observations(baseline, 1, "baseline");
        Checks.observations(current, 1, "current");
        Checks.confidence(confidence);
        double nb = baseline.n();
        double nc = current.n();
        int kb = baseline.size();
        int kc = current.size();

        double[] rowMean = new double[kc];
        double[] colMean = new double[kb];
        long cumB = 0;
        int i = 0;
        for (int j = 0; j < kc; j++) {
            double v = current.value(j);
            while (i < kb && baseline.value(i) < v) {
                cumB += baseline.count(i++);
            }
            long equal = i < kb && baseline.value(i) == v ? baseline.count(i) : 0;
            long below = cumB;
            long above = (long) nb - cumB - equal;
            rowMean[j] = (below - above) / nb;
        }
        long cumC = 0;
        int j = 0;
        long tiedPairs = 0;
        for (int b = 0; b < kb; b++) {
            double v = baseline.value(b);
            while (j < kc && current.value(j) < v) {
                cumC += current.count(j++);
            }
            long equal = j < kc && current.value(j) == v ? current.count(j) : 0;
            tiedPairs += equal * baseline.count(b);
            long above = (long) nc - cumC - equal;
            colMean[b] = (above - cumC) / nc;
        }
        double d = 0;
        for (int r = 0; r < kc; r++) {
            d += current.count(r) * rowMean[r];
        }
        d /= nc;

        if (nb < 2 || nc < 2) {
            return new EffectSize(NAME, d, -1.0, 1.0, confidence);
        }
        double rowSs = 0;
        for (int r = 0; r < kc; r++) {
            double e = rowMean[r] - d;
            rowSs += current.count(r) * e * e;
        }
        double colSs = 0;
        for (int b = 0; b < kb; b++) {
            double e = colMean[b] - d;
            colSs += baseline.count(b) * e * e;
        }
        double pairs = nb * nc;
        // entries are -1, 0, +1: sum (d_ij - d)^2 = (#untied pairs) - pairs * d^2
        double cellSs = (pairs - tiedPairs) - pairs * d * d;
        double var = (nb * nb * rowSs + nc * nc * colSs - cellSs) / (nc * nb * (nc - 1) * (nb - 1));
        var = Math.max(var, (1 - d * d) / (pairs - 1));

        return Tables.fengCliff(NAME, d, var, confidence);
    }
}
