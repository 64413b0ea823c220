package org.wavewarden.compare.categorical;

import org.apache.commons.math3.special.Gamma;

/**
 * The noncentral chi-square distribution function, which commons-math3 lacks.
 *
 * <p>The distribution is a Poisson mixture of central chi-squares: F(x; k, lambda) = sum_j Pois(j; lambda / 2)
 * P(chi2_{k + 2j} <= x). The series is summed outward from the Poisson mode in both directions, as Benton and
 * Krishnamoorthy (2003, Computational Statistics and Data Analysis 43, 249-267) recommend, so that the large terms
 * come first and the loop stops once the neglected tail mass is below about 1e-15; each term uses the regularized
 * incomplete gamma function. The backward sum is bounded by the remaining Poisson mass; the forward sum by the
 * remaining Poisson mass times the (decreasing) central distribution function.
 */
public final class NoncentralChiSquare {

    private static final double EPS = 1e-15;
    private static final int MAX_TERMS = 1_000_000;

    private NoncentralChiSquare() {
    }

    /**
     * P(X <= x) for X noncentral chi-square.
     *
     * @param x   the quantile; values at or below zero give 0
     * @param df  degrees of freedom, positive
     * @param ncp noncentrality, non-negative
     */
    public static double cdf(double x, double df, double ncp) {
        if (!(df > 0) || Double.isInfinite(df)) {
            throw new IllegalArgumentException("df must be positive and finite, was " + df);
        }
        if (!(ncp >= 0) || Double.isInfinite(ncp)) {
            throw new IllegalArgumentException("ncp must be non-negative and finite, was " + ncp);
        }
        if (Double.isNaN(x)) {
            throw new IllegalArgumentException("x must not be NaN");
        }
        if (x <= 0) {
            return 0;
        }
        if (x == Double.POSITIVE_INFINITY) {
            return 1;
        }
        double halfX = x / 2;
        if (ncp == 0) {
            return Gamma.regularizedGammaP(df / 2, halfX);
        }
        double lambda = ncp / 2;
        long mode = (long) Math.floor(lambda);
        double logWeightMode = -lambda + mode * Math.log(lambda) - Gamma.logGamma(mode + 1.0);
        double weightMode = Math.exp(logWeightMode);

        double sum = 0;
        // forward: j = mode, mode + 1, ...
        double w = weightMode;
        double massBehind = 0;
        for (long j = mode; j < mode + MAX_TERMS; j++) {
            if (j > mode) {
                w *= lambda / j;
            }
            double p = Gamma.regularizedGammaP(df / 2 + j, halfX);
            double term = w * p;
            sum += term;
            massBehind += w;
            // remaining Poisson weights from j + 1 on are at most w * lambda / (j + 1 - lambda) once j + 1 > lambda
            if (j + 1 > lambda) {
                double rest = w * lambda / (j + 1 - lambda) * p;
                if (rest <= EPS * Math.max(sum, Double.MIN_NORMAL) || rest < 1e-300) {
                    break;
                }
            }
        }
        // backward: j = mode - 1, ..., 0; here the central cdf grows, so bound by the Poisson mass left below j
        w = weightMode;
        for (long j = mode - 1; j >= 0; j--) {
            w *= (j + 1) / lambda;
            double term = w * Gamma.regularizedGammaP(df / 2 + j, halfX);
            sum += term;
            // weights below the mode fall at least geometrically with ratio j / lambda
            double rest = w * j / (lambda - j);
            if (rest <= EPS * Math.max(sum, Double.MIN_NORMAL) || rest < 1e-300) {
                break;
            }
        }
        return Math.min(1, Math.max(0, sum));
    }
}
