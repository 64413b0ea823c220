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
        int strata = design.strataCount();
        double[][] totals = new double[psus][p];
        for (int c = 0; c < p; c++) {
            double[] z = scores[c];
            for (int i = 0; i < z.length; i++) {
                totals[design.psuOf(i)][c] += z[i];
            }
        }
        double[][] centre = new double[strata][p];
        for (int k = 0; k < psus; k++) {
            int h = design.psuStratum(k);
            for (int c = 0; c < p; c++) {
                centre[h][c] += totals[k][c];
            }
        }
        for (int h = 0; h < strata; h++) {
            int nh = design.psusInStratum(h);
            for (int c = 0; c < p; c++) {
                centre[h][c] = nh > 1 ? centre[h][c] / nh : 0.0;
            }
        }
        double[][] v = new double[p][p];
        double[] dev = new double[p];
        for (int k = 0; k < psus; k++) {
            int h = design.psuStratum(k);
            int nh = design.psusInStratum(h);
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
}
