package org.wavewarden.compare.design;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.wavewarden.compare.TestResult;

/**
 * One wave's weighted shares against given population shares (benchmark margins), design-based: Pearson's
 * statistic on the estimated totals, {@code X2 = sum_j (T_j - p_j N)^2 / (p_j N)} with {@code N = sum_j T_j}, and
 * its null distribution the weighted sum {@code sum_j lambda_j chi2_1} of the eigenvalues of the design covariance
 * of {@code (T_j - p_j N) / sqrt(p_j N)} (delta method), referred by Satterthwaite's approximation to
 * {@code scale * chi2_df} with {@code scale = sum lambda^2 / sum lambda} and {@code df = (sum lambda)^2 / sum lambda^2}
 * (Rao and Scott 1981, JASA 76, 221-230; Satterthwaite 1946). This is R's {@code svygofchisq} in survey 4.1.1, whose
 * p-value comes from {@code pchisqsum(..., method = "satterthwaite")}. The statistic depends on the scale of the
 * weights, the eigenvalues scale with it, and the p-value does not.
 */
public final class DesignGoodnessOfFit {

    public static final String NAME = "design-based chi-square for given shares (Satterthwaite)";

    private DesignGoodnessOfFit() {
    }

    /**
     * @param test   X2 with the Satterthwaite df and p-value
     * @param shares the weighted shares {@code T_j / N}
     * @param lambda the eigenvalues, largest first
     * @param scale  {@code sum lambda^2 / sum lambda}
     */
    public record Result(TestResult test, double[] shares, double[] lambda, double scale) {

        /** The statistic on the chi-square scale of the approximation, {@code X2 / scale}. */
        public double scaledStatistic() {
            return test.statistic() / scale;
        }
    }

    /**
     * Under the weights-only design: the tally's values are the positions of the categories of {@code p}
     * (0 .. k-1), every position listed (with count 0 where the wave has none).
     */
    public static Result test(WeightedTally tally, double[] p) {
        int k = p.length;
        double[] totals = new double[k];
        double[] q = new double[k];
        for (int i = 0; i < tally.size(); i++) {
            int j = position(tally.value(i), k);
            totals[j] += tally.weight(i);
            q[j] += tally.squaredWeight(i);
        }
        long n = tally.n();
        if (n < 2) {
            throw new IllegalArgumentException("need at least 2 respondents, had " + n);
        }
        // Each respondent its own PSU: V = n/(n-1) (sum_i z_i z_i' - n zbar zbar'), z_i[j] = w_i 1[i in j].
        double[][] v = new double[k][k];
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) {
                v[a][b] = n / (n - 1.0) * ((a == b ? q[a] : 0) - totals[a] * totals[b] / n);
            }
        }
        return test(totals, v, p);
    }

    /** Under a stratified cluster design: values are the category positions as above. */
    public static Result test(PsuTally tally, double[] p) {
        int k = p.length;
        int psus = tally.psuCount();
        double[][] psuTotals = new double[psus][k];
        double[] totals = new double[k];
        for (int i = 0; i < tally.size(); i++) {
            int j = position(tally.value(i), k);
            for (int h = 0; h < psus; h++) {
                double w = tally.weight(i, h);
                psuTotals[h][j] += w;
                totals[j] += w;
            }
        }
        return test(totals, DesignVariance.covariance(tally.psuStratum(), psuTotals), p);
    }

    /** From the estimated totals of the k categories and their covariance. */
    static Result test(double[] totals, double[][] covariance, double[] p) {
        int k = p.length;
        double sum = 0;
        for (double x : p) {
            if (!(x > 0 && x < 1)) {
                throw new IllegalArgumentException("every given share must lie in (0, 1), got " + x);
            }
            sum += x;
        }
        if (Math.abs(sum - 1) > 1e-9) {
            throw new IllegalArgumentException("the given shares must sum to 1, summed to " + sum);
        }
        double n = 0;
        for (double t : totals) {
            n += t;
        }
        if (!(n > 0)) {
            throw new IllegalArgumentException("the wave carries no weight");
        }
        double x2 = 0;
        double[] shares = new double[k];
        double[][] jac = new double[k][k];
        for (int j = 0; j < k; j++) {
            double e = p[j] * n;
            double d = totals[j] - e;
            x2 += d * d / e;
            shares[j] = totals[j] / n;
            // X_j = (T_j - p_j N) / sqrt(p_j N), N = sum_m T_m
            for (int m = 0; m < k; m++) {
                jac[j][m] = ((j == m ? 1 : 0) - p[j]) / Math.sqrt(e) - d * 0.5 * p[j] / (e * Math.sqrt(e));
            }
        }
        double[][] vx = new double[k][k];
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) {
                double s = 0;
                for (int c = 0; c < k; c++) {
                    for (int d = 0; d < k; d++) {
                        s += jac[a][c] * covariance[c][d] * jac[b][d];
                    }
                }
                vx[a][b] = s;
            }
        }
        for (int a = 0; a < k; a++) {
            for (int b = a + 1; b < k; b++) {
                double m = (vx[a][b] + vx[b][a]) / 2;
                vx[a][b] = m;
                vx[b][a] = m;
            }
        }
        double[] lambda = new EigenDecomposition(new Array2DRowRealMatrix(vx)).getRealEigenvalues();
        java.util.Arrays.sort(lambda);
        double[] desc = new double[k];
        double s1 = 0;
        double s2 = 0;
        for (int j = 0; j < k; j++) {
            desc[j] = lambda[k - 1 - j];
            s1 += desc[j];
            s2 += desc[j] * desc[j];
        }
        if (!(s1 > 0)) {
            throw new IllegalArgumentException("the shares do not vary within the wave: no design variance");
        }
        double scale = s2 / s1;
        double df = s1 * s1 / s2;
        double pValue = org.wavewarden.compare.categorical.ChiSquareHomogeneity.upperTail(x2 / scale, df);
        return new Result(new TestResult(NAME, x2, df, pValue, "Satterthwaite: (sum of eigenvalues)^2 / sum of"
                + " squared eigenvalues, X2 referred to scale times chi-square on it (R survey svygofchisq)"), shares,
                desc, scale);
    }

    private static int position(double value, int k) {
        int j = (int) value;
        if (j != value || j < 0 || j >= k) {
            throw new IllegalArgumentException("values must be category positions 0.." + (k - 1) + ", got " + value);
        }
        return j;
    }
}
