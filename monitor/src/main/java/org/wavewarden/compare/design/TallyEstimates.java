package org.wavewarden.compare.design;

/**
 * Weighted means, shares, variances and the covariance of category shares of one wave from its
 * {@link WeightedTally}, under the weights-only design (one stratum, each respondent its own PSU, with replacement).
 *
 * <p>The estimators and their Taylor-linearised variances are those of {@link WeightedEstimates} (Woodruff, R. S.
 * (1971), JASA 66, 411-414; Wolter, K. M. (2007), Introduction to Variance Estimation, 2nd ed., Springer,
 * Chapter 6): for a mean, {@code V = n/(n-1) [sum_v Q_v (y_v - ybar)^2 / W^2 - S^2 / n]} with
 * {@code S = sum_v W_v (y_v - ybar) / W}, which is zero up to rounding and is subtracted as the row-level formula
 * subtracts the mean PSU total. R's {@code svymean(~y, svydesign(ids = ~1, weights = ~w))} on the rows gives the same
 * numbers (Lumley, T. (2010), Complex Surveys, Wiley).
 */
public final class TallyEstimates {

    private TallyEstimates() {
    }

    /** Weighted mean of the tally's values with its design-based standard error and design effects. */
    public static DesignEstimate mean(WeightedTally t) {
        double sw2 = weightedVariance(t);
        long n = t.n();
        double total = t.totalWeight();
        double mean = weightedMean(t, total);
        double s = 0;
        double zz = 0;
        for (int i = 0; i < t.size(); i++) {
            double e = t.value(i) - mean;
            s += t.weight(i) * e / total;
            zz += t.squaredWeight(i) * e * e / (total * total);
        }
        return estimate(mean, n / (n - 1.0) * (zz - s * s / n), sw2, n, total);
    }

    /**
     * Weighted variance {@code s_w^2 = n/(n-1) sum_v W_v (y_v - ybar)^2 / W}, as R's {@code svyvar} when no weight
     * is zero (svyvar's n counts respondents of nonzero weight; here n counts every respondent of the tally).
     */
    public static double weightedVariance(WeightedTally t) {
        check(t);
        long n = t.n();
        double total = t.totalWeight();
        double mean = weightedMean(t, total);
        double ss = 0;
        for (int i = 0; i < t.size(); i++) {
            double e = t.value(i) - mean;
            ss += t.weight(i) * e * e;
        }
        return n / (n - 1.0) * ss / total;
    }

    /**
     * Weighted shares of every category of a categorical tally (values are category codes, integers) with
     * non-zero weight, with their design-based covariance.
     */
    public static CategoryShares shares(WeightedTally t) {
        check(t);
        int kept = 0;
        for (int i = 0; i < t.size(); i++) {
            if (t.weight(i) > 0) {
                kept++;
            }
        }
        int[] codes = new int[kept];
        int[] index = new int[kept];
        int j = 0;
        for (int i = 0; i < t.size(); i++) {
            if (t.weight(i) > 0) {
                codes[j] = code(t.value(i));
                index[j++] = i;
            }
        }
        long n = t.n();
        double total = t.totalWeight();
        double[] p = new double[kept];
        double[] w = new double[kept];
        double[] q = new double[kept];
        for (int c = 0; c < kept; c++) {
            w[c] = t.weight(index[c]);
            q[c] = t.squaredWeight(index[c]);
            p[c] = w[c] / total;
        }
        double[][] cov = DesignVariance.weightsOnlyShares(n, total, w, q, p);
        DesignEstimate[] estimates = new DesignEstimate[kept];
        for (int c = 0; c < kept; c++) {
            // s_w^2 of the indicator: sum_i w_i (1[c] - p_c)^2 = W_c (1 - p_c)^2 + (W - W_c) p_c^2
            double ss = w[c] * (1 - p[c]) * (1 - p[c]) + (total - w[c]) * p[c] * p[c];
            estimates[c] = estimate(p[c], cov[c][c], n / (n - 1.0) * ss / total, n, total);
        }
        return new CategoryShares(codes, p, estimates, cov);
    }

    private static DesignEstimate estimate(double mean, double v, double weightedVariance, long n, double total) {
        double variance = Math.max(0, v);
        double srsReplace = weightedVariance / n;
        double srsWithout = total > n ? weightedVariance * (total - n) / (total * n) : Double.NaN;
        return new DesignEstimate(mean, Math.sqrt(variance), variance / srsReplace, variance / srsWithout);
    }

    static double weightedMean(WeightedTally t, double total) {
        double s = 0;
        for (int i = 0; i < t.size(); i++) {
            s += t.weight(i) * t.value(i);
        }
        return s / total;
    }

    static int code(double value) {
        if (value != Math.rint(value) || Math.abs(value) > Integer.MAX_VALUE) {
            throw new IllegalArgumentException("category values must be integer codes, was " + value);
        }
        return (int) value;
    }

    static void check(WeightedTally t) {
        if (t == null) {
            throw new IllegalArgumentException("tally must not be null");
        }
        if (t.n() < 2) {
            throw new IllegalArgumentException("tally must hold at least 2 respondents, has " + t.n());
        }
        if (!(t.totalWeight() > 0)) {
            throw new IllegalArgumentException("tally has no weight: every respondent's weight is zero");
        }
    }
}
