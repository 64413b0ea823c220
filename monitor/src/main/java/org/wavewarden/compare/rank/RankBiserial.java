package org.wavewarden.compare.rank;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * The matched-pairs rank-biserial correlation, the effect size that goes with the Wilcoxon signed-rank test:
 * {@code r = (T+ - T-) / (T+ + T-)}, T+ and T- the sums of the ranks of |d| over the positive and the negative
 * differences, zeros dropped and ties given mid-ranks (Kerby, D. S. (2014), "The simple difference formula: an
 * approach to teaching nonparametric correlation", Comprehensive Psychology 3, 11.IT.3.1). With V = T+ as R's
 * {@code wilcox.test} reports it and n non-zero differences, {@code r = 4 V / (n (n + 1)) - 1}: -1 when every
 * respondent who changed moved down, +1 when every one moved up.
 *
 * <p>By Tukey's identity, {@code T+ - T- = sum over i <= j of sign(d_i + d_j)}, so r is (up to its n diagonal
 * terms) a U-statistic with kernel sign(d_i + d_j), the share of Walsh averages above zero minus the share below.
 * Its variance is taken from Hoeffding's (1948, Annals of Mathematical Statistics 19) first-order term
 * {@code 4 zeta_1 / n}, with {@code zeta_1} estimated as the sample variance of
 * {@code h_i = (1 / (n - 1)) sum_{j != i} sign(d_i + d_j)}, the way Cliff (1993) estimates the variance of his
 * delta from its row means. The interval is the asymmetric one of Feng and Cliff (2004) for a dominance statistic
 * on [-1, 1], {@code (r - r^3 -/+ z s sqrt((1 - r^2)^2 + z^2 s^2)) / (1 - r^2 + z^2 s^2)}, the same form as
 * {@link CliffsDelta}'s, so the limits stay inside [-1, 1]. Every h_i depends only on d_i, so one pass over the
 * sorted table of differences gives all terms.
 *
 * <p>Degenerate cases, as for {@link CliffsDelta}: with a single non-zero difference the interval is [-1, 1]; when
 * every respondent who changed moved the same way (|r| = 1) every kernel term is equal, the estimated variance is
 * zero and the interval collapses to the estimate.
 */
public final class RankBiserial {

    public static final String NAME = "matched-pairs rank-biserial r";

    private RankBiserial() {
    }

    /**
     * @param differences the paired differences {@code current - baseline} as a frequency table, with at least one
     *                    non-zero difference
     * @param confidence  level of the interval, in (0, 1)
     */
    public static EffectSize estimate(NumericDistribution differences, double confidence) {
        Checks.observations(differences, 1, "differences");
        Checks.confidence(confidence);
        int k = differences.size();
        double[] x = new double[k];
        long[] c = new long[k];
        int m = 0;
        for (int i = 0; i < k; i++) {
            if (differences.value(i) != 0) {
                x[m] = differences.value(i);
                c[m++] = differences.count(i);
            }
        }
        long[] below = new long[m + 1]; // below[i]: non-zero differences at indices < i
        for (int i = 0; i < m; i++) {
            below[i + 1] = below[i] + c[i];
        }
        double n = below[m];
        if (n == 0) {
            throw new IllegalArgumentException("differences has no non-zero difference: every pair is unchanged");
        }
        // s[i] = #{d > -x_i} - #{d < -x_i}: the sum over all j of sign(x_i + d_j)
        double[] s = new double[m];
        double ordered = 0;
        double diagonal = 0;
        for (int i = 0; i < m; i++) {
            double target = -x[i];
            int lo = lowerBound(x, m, target);
            int hi = lo < m && x[lo] == target ? lo + 1 : lo;
            s[i] = (n - below[hi]) - below[lo];
            ordered += c[i] * s[i];
            diagonal += c[i] * Math.signum(x[i]);
        }
        double r = (ordered + diagonal) / (n * (n + 1));
        if (n < 2) {
            return new EffectSize(NAME, r, -1.0, 1.0, confidence);
        }
        double theta = 0;
        for (int i = 0; i < m; i++) {
            theta += c[i] * (s[i] - Math.signum(x[i])) / (n - 1);
        }
        theta /= n;
        double ss = 0;
        for (int i = 0; i < m; i++) {
            double e = (s[i] - Math.signum(x[i])) / (n - 1) - theta;
            ss += c[i] * e * e;
        }
        double var = 4 * (ss / (n - 1)) / n;

        return Tables.fengCliff(NAME, r, var, confidence);
    }

    /** First index in x[0..m) whose value is at least target (x ascending). */
    private static int lowerBound(double[] x, int m, double target) {
        int lo = 0;
        int hi = m;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (x[mid] < target) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }
}
