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
final class DesignVariance {

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
     * The same from the PSU totals themselves. The number of PSUs of a stratum is the number of entries of
     * {@code psuStratum} naming it, so a PSU whose totals are all zero (no respondent of a domain) still counts.
     *
     * @param psuStratum stratum index 0..H-1 of each PSU, every index present
     * @param totals     {@code totals[k][c]}: total of the linearised scores of estimator c in PSU k
     * @return the p x p covariance matrix
     */
    static double[][] covariance(int[] psuStratum, double[][] totals) {
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
