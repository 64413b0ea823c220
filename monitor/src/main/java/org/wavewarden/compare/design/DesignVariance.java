package org.wavewarden.compare.design;

/**
 * Covariance of linearised estimators from PSU totals, stratum by stratum, PSUs with replacement:
 * {@code V = sum_h n_h/(n_h - 1) sum_i (z_hi - zbar_h)(z_hi - zbar_h)'} with {@code z_hi} the PSU totals of the
 * linearised scores (Wolter, K. M. (2007), Introduction to Variance Estimation, 2nd ed., Springer, Chapter 6;
 * Lumley, T. (2010), Complex Surveys, Wiley).
 *
 * <p>A stratum with a single PSU has no within-stratum spread to measure. Policy: "adjust" as in R's
 * {@code options(survey.lonely.psu = "adjust")}: its PSU total is centred at the overall mean of PSU totals instead
 * of its own stratum mean, with factor 1. For every estimator here the scores sum to zero, so that centre is 0 and
 * the lonely stratum contributes {@code z z'}. Chosen over "certainty" (contributing nothing) because it is
 * conservative: a monitor should not claim precision the design cannot show.
 */
public final class DesignVariance {

    private DesignVariance() {
    }

    /**
     * @param design the design
     * @param scores {@code scores[c][i]}: linearised score of estimator c for respondent i
     * @return the p x p covariance matrix
     */
    static double[][] covariance(SurveyDesign design, double[][] scores) {
        int p = scores.length;
        int psus = design.psuCount();
        double[][] totals = new double[psus][p];
        for (int c = 0; c < p; c++) {
            double[] z = scores[c];
            for (int i = 0; i < z.length; i++) {
                totals[design.psuOf(i)][c] += z[i];
            }
        }
        int[] psuStratum = new int[psus];
        for (int k = 0; k < psus; k++) {
            psuStratum[k] = design.psuStratum(k);
        }
        return covariance(psuStratum, totals);
    }

    /**
     * The covariance of weighted shares of cells under a weights-only design (each respondent its own PSU, with
     * replacement), from one wave's per-cell sums alone: with {@code T} the weight the shares are of and a cell's
     * linearised score {@code z_i[c] = w_i (1[c = cell of i] - p_c) / T}, it is {@code n/(n - 1) (sum_i z_i z_i' -
     * S S' / n)}, where {@code S[c] = (W_c - W p_c) / T} and {@code sum_i z_i[c] z_i[d] = (1[c = d] Q_c - Q_c p_d -
     * p_c Q_d + Q p_c p_d) / T^2}, W and Q the wave's totals (Woodruff 1971; Wolter 2007, Chapter 6). A cell of
     * another wave, stacked beside this one, has {@code W_c = Q_c = 0} here.
     *
     * @param n     respondents of the wave
     * @param total T, the weight the shares are taken of (the wave's, or that of the stacked waves)
     * @param w     sum of weights per cell in this wave
     * @param q     sum of squared weights per cell in this wave
     * @param p     share of T per cell
     * @return the covariance matrix of the shares, {@code p.length} square
     */
    static double[][] weightsOnlyShares(long n, double total, double[] w, double[] q, double[] p) {
        int m = p.length;
        double wave = 0;
        double waveSquares = 0;
        for (int c = 0; c < m; c++) {
            wave += w[c];
            waveSquares += q[c];
        }
        double[] s = new double[m];
        for (int c = 0; c < m; c++) {
            s[c] = (w[c] - wave * p[c]) / total;
        }
        double t2 = total * total;
        double[][] v = new double[m][m];
        for (int c = 0; c < m; c++) {
            for (int d = 0; d <= c; d++) {
                double zz = ((c == d ? q[c] : 0) - q[c] * p[d] - p[c] * q[d] + waveSquares * p[c] * p[d]) / t2;
                v[c][d] = n / (n - 1.0) * (zz - s[c] * s[d] / n);
                v[d][c] = v[c][d];
            }
        }
        return v;
    }

    /**
     * The same from the PSU totals themselves. The number of PSUs of a stratum is the number of entries of
     * {@code psuStratum} naming it, so a PSU whose totals are all zero (no respondent of a domain) still counts.
     *
     * @param psuStratum stratum index 0..H-1 of each PSU, every index present
     * @param totals     {@code totals[k][c]}: total of the linearised scores of estimator c in PSU k
     * @return the p x p covariance matrix
     */
    public static double[][] covariance(int[] psuStratum, double[][] totals) {
        int psus = psuStratum.length;
        int p = psus == 0 ? 0 : totals[0].length;
        int[] psusInStratum = psusInStratum(psuStratum);
        int strata = psusInStratum.length;
        double[][] centre = new double[strata][p];
        for (int k = 0; k < psus; k++) {
            int h = psuStratum[k];
            for (int c = 0; c < p; c++) {
                centre[h][c] += totals[k][c];
            }
        }
        for (int h = 0; h < strata; h++) {
            int nh = psusInStratum[h];
            for (int c = 0; c < p; c++) {
                centre[h][c] = nh > 1 ? centre[h][c] / nh : 0.0;
            }
        }
        double[][] v = new double[p][p];
        double[] dev = new double[p];
        for (int k = 0; k < psus; k++) {
            int h = psuStratum[k];
            int nh = psusInStratum[h];
            double scale = nh > 1 ? nh / (nh - 1.0) : 1.0;
            for (int c = 0; c < p; c++) {
                dev[c] = totals[k][c] - centre[h][c];
            }
            for (int a = 0; a < p; a++) {
                for (int b = 0; b <= a; b++) {
                    v[a][b] += scale * dev[a] * dev[b];
                }
            }
        }
        for (int a = 0; a < p; a++) {
            for (int b = a + 1; b < p; b++) {
                v[a][b] = v[b][a];
            }
        }
        return v;
    }

    /** PSUs per stratum; strata are 0..max of {@code psuStratum}. */
    static int[] psusInStratum(int[] psuStratum) {
        int strata = 0;
        for (int h : psuStratum) {
            strata = Math.max(strata, h + 1);
        }
        int[] count = new int[strata];
        for (int h : psuStratum) {
            count[h]++;
        }
        return count;
    }
}
