package org.wavewarden.compare.domain;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.special.Gamma;

import java.util.ArrayList;
import java.util.List;

/**
 * The Wald chi-square that several domains' changes are equal (see {@link Breakdowns} for the rule on degenerate
 * variances).
 *
 * @param statistic {@code W = (C d)' (C V C')^+ (C d)}
 * @param df        the rank of {@code C V C'}
 * @param pValue    {@code P(chi^2_df >= W)}; 1 without a testable contrast
 */
record Wald(double statistic, int df, double pValue) {

    /**
     * Relative size below which an eigenvalue of {@code C V C'} counts as zero: rounding in sums of squares of
     * scores leaves about 1e-16 of the largest; 1e-10 keeps well clear of that (common practice, no source).
     */
    static final double RANK_TOLERANCE = 1e-10;

    static final Wald NONE = new Wald(0, 0, 1);

    /**
     * @param change the domains' changes
     * @param v      their covariance
     */
    static Wald ofChanges(double[] change, double[][] v) {
        double largest = 0;
        for (int i = 0; i < change.length; i++) {
            largest = Math.max(largest, v[i][i]);
        }
        List<Integer> testable = new ArrayList<>();
        for (int i = 0; i < change.length; i++) {
            if (v[i][i] > RANK_TOLERANCE * largest) {
                testable.add(i);
            }
        }
        int m = testable.size();
        if (m < 2) {
            return NONE;
        }
        return independent(v, testable) ? cochran(change, v, testable) : contrasts(change, v, testable);
    }

    /**
     * Whether the testable domains' estimates are uncorrelated (every covariance between them exactly zero, as
     * without a design, where each respondent is its own PSU and the domains share none) and their variances within
     * a factor 1e6 of each other (common practice, no source), so that no contrast is near the rank tolerance and W
     * has full rank m - 1.
     */
    static boolean independent(double[][] v, List<Integer> testable) {
        double low = Double.POSITIVE_INFINITY;
        double high = 0;
        for (int i : testable) {
            for (int j : testable) {
                if (i != j && v[i][j] != 0) {
                    return false;
                }
            }
            low = Math.min(low, v[i][i]);
            high = Math.max(high, v[i][i]);
        }
        return low >= 1e-6 * high;
    }

    /**
     * W for uncorrelated estimates in closed form: {@code sum w_i (d_i - d_w)^2}, w_i the inverse variances and d_w
     * the weighted mean, on m - 1 degrees of freedom (Cochran's Q, Biometrics 10, 1954, cited from memory; with a
     * diagonal V it equals the contrast form below, which needs an eigendecomposition of order m: about 0.1 s for 300
     * interviewers, per finding).
     */
    static Wald cochran(double[] change, double[][] v, List<Integer> testable) {
        double sw = 0;
        double swd = 0;
        for (int i : testable) {
            sw += 1 / v[i][i];
            swd += change[i] / v[i][i];
        }
        double mean = swd / sw;
        double w = 0;
        for (int i : testable) {
            double dev = change[i] - mean;
            w += dev * dev / v[i][i];
        }
        int df = testable.size() - 1;
        return new Wald(w, df, Gamma.regularizedGammaQ(df / 2.0, w / 2));
    }

    /** W from the contrasts of each domain against the last, the pseudo-inverse by eigendecomposition. */
    static Wald contrasts(double[] change, double[][] v, List<Integer> testable) {
        int m = testable.size();
        // Contrasts of each testable domain against the last: any full set of contrasts gives the same W.
        int last = testable.get(m - 1);
        double[] cd = new double[m - 1];
        double[][] cvc = new double[m - 1][m - 1];
        for (int a = 0; a < m - 1; a++) {
            int i = testable.get(a);
            cd[a] = change[i] - change[last];
            for (int b = 0; b < m - 1; b++) {
                int j = testable.get(b);
                cvc[a][b] = v[i][j] - v[i][last] - v[last][j] + v[last][last];
            }
        }
        EigenDecomposition eigen = new EigenDecomposition(new Array2DRowRealMatrix(cvc, false));
        double[] values = eigen.getRealEigenvalues();
        double top = 0;
        for (double e : values) {
            top = Math.max(top, e);
        }
        RealMatrix vectors = eigen.getV();
        double w = 0;
        int rank = 0;
        for (int e = 0; e < values.length; e++) {
            if (!(values[e] > RANK_TOLERANCE * top)) {
                continue;
            }
            rank++;
            double proj = 0;
            for (int a = 0; a < m - 1; a++) {
                proj += vectors.getEntry(a, e) * cd[a];
            }
            w += proj * proj / values[e];
        }
        if (rank == 0) {
            return NONE;
        }
        return new Wald(w, rank, Gamma.regularizedGammaQ(rank / 2.0, w / 2));
    }
}
