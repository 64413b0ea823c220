package org.wavewarden.compare.design;

import java.util.Arrays;

/**
 * Weighted means and shares with design-based standard errors by Taylor linearisation under a stratified cluster
 * design, PSUs with replacement within strata.
 *
 * <p>The weighted mean {@code ybar = sum w y / sum w} is a ratio of two totals; its linearised score is
 * {@code z_i = w_i (y_i - ybar) / sum w} (Woodruff, R. S. (1971), "A simple method for approximating the variance of
 * a complicated estimate", JASA 66, 411-414), and its variance is estimated from the PSU totals of z by
 * {@code sum_h n_h/(n_h - 1) sum_i (z_hi - zbar_h)^2} (Wolter, K. M. (2007), Introduction to Variance Estimation,
 * 2nd ed., Springer, Chapter 6). This is the default of R's {@code survey} package
 * ({@code svydesign(ids = ~psu, strata = ~stratum, weights = ~w, nest = TRUE)} with {@code svymean}; Lumley, T.
 * (2010), Complex Surveys, Wiley). Strata with a single PSU follow R's {@code survey.lonely.psu = "adjust"} (see
 * the package documentation of the variance). A share is the mean of a 0/1 indicator.
 */
public final class WeightedEstimates {

    private WeightedEstimates() {
    }

    /** Weighted mean of {@code values} with its design-based standard error. */
    public static DesignEstimate mean(double[] values, SurveyDesign design) {
        if (values == null) {
            throw new IllegalArgumentException("values must not be null");
        }
        SurveyDesign.checkValues("values", values.length, design);
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("values[" + i + "] must be finite, was " + values[i]);
            }
        }
        return means(new double[][] {values}, design).estimate(0);
    }

    /** Weighted share of respondents with {@code hit[i] == true}, with its design-based standard error. */
    public static DesignEstimate share(boolean[] hit, SurveyDesign design) {
        if (hit == null) {
            throw new IllegalArgumentException("hit must not be null");
        }
        SurveyDesign.checkValues("hit", hit.length, design);
        double[] y = new double[hit.length];
        for (int i = 0; i < hit.length; i++) {
            y[i] = hit[i] ? 1 : 0;
        }
        return means(new double[][] {y}, design).estimate(0);
    }

    /** Weighted shares of every observed category code, with their design-based covariance. */
    public static CategoryShares shares(int[] categories, SurveyDesign design) {
        if (categories == null) {
            throw new IllegalArgumentException("categories must not be null");
        }
        SurveyDesign.checkValues("categories", categories.length, design);
        int[] codes = Arrays.stream(categories).distinct().sorted().toArray();
        double[][] indicators = new double[codes.length][categories.length];
        for (int i = 0; i < categories.length; i++) {
            indicators[Arrays.binarySearch(codes, categories[i])][i] = 1;
        }
        Means m = means(indicators, design);
        DesignEstimate[] estimates = new DesignEstimate[codes.length];
        for (int j = 0; j < codes.length; j++) {
            estimates[j] = m.estimate(j);
        }
        return new CategoryShares(codes, m.means, estimates, m.covariance);
    }

    /** Means of several variables on one design, their covariance, and the weighted variances s_w^2. */
    record Means(double[] means, double[][] covariance, double[] weightedVariances, long n, double sumOfWeights) {

        DesignEstimate estimate(int c) {
            double v = covariance[c][c];
            double srsReplace = weightedVariances[c] / n;
            double srsWithout = sumOfWeights > n ? weightedVariances[c] * (sumOfWeights - n) / (sumOfWeights * n)
                    : Double.NaN;
            return new DesignEstimate(means[c], Math.sqrt(v), v / srsReplace, v / srsWithout);
        }
    }

    static Means means(double[][] columns, SurveyDesign design) {
        int n = design.size();
        int p = columns.length;
        double total = 0;
        for (int i = 0; i < n; i++) {
            total += design.weight(i);
        }
        double[] means = new double[p];
        double[] variances = new double[p];
        double[][] scores = new double[p][n];
        for (int c = 0; c < p; c++) {
            double[] y = columns[c];
            double s = 0;
            for (int i = 0; i < n; i++) {
                s += design.weight(i) * y[i];
            }
            double mean = s / total;
            double ss = 0;
            for (int i = 0; i < n; i++) {
                double e = y[i] - mean;
                scores[c][i] = design.weight(i) * e / total;
                ss += design.weight(i) * e * e;
            }
            means[c] = mean;
            variances[c] = n / (n - 1.0) * ss / total;
        }
        return new Means(means, DesignVariance.covariance(design, scores), variances, n, total);
    }

    /**
     * The same from PSU sums: for PSU k, {@code weight[k] = sum w}, {@code sums[c][k] = sum w y_c} and
     * {@code squares[c][k] = sum w y_c^2} over the respondents counted in n. The PSU total of the scores
     * {@code w_i (y_i - ybar) / W} is {@code (sums[c][k] - ybar weight[k]) / W}, and {@code sum w (y - ybar)^2 / W =
     * sum w y^2 / W - ybar^2}, so nothing but the sums is needed.
     */
    static Means means(int[] psuStratum, double[] weight, double[][] sums, double[][] squares, long n) {
        int psus = psuStratum.length;
        int p = sums.length;
        double total = 0;
        for (double w : weight) {
            total += w;
        }
        double[] means = new double[p];
        double[] variances = new double[p];
        double[][] totals = new double[psus][p];
        for (int c = 0; c < p; c++) {
            double s = 0;
            double s2 = 0;
            for (int k = 0; k < psus; k++) {
                s += sums[c][k];
                s2 += squares[c][k];
            }
            double mean = s / total;
            for (int k = 0; k < psus; k++) {
                totals[k][c] = (sums[c][k] - mean * weight[k]) / total;
            }
            means[c] = mean;
            // The raw-moment form can fall a rounding error below zero when y hardly varies.
            variances[c] = Math.max(0, n / (n - 1.0) * (s2 / total - mean * mean));
        }
        return new Means(means, DesignVariance.covariance(psuStratum, totals), variances, n, total);
    }
}
