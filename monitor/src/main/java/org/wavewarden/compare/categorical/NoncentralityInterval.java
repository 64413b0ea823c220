package org.wavewarden.compare.categorical;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.wavewarden.compare.Checks;

/**
 * A confidence interval for the noncentrality parameter of a chi-square statistic, found by inverting the
 * noncentral chi-square distribution function (the "pivoting the CDF" method; Smithson 2003, Confidence Intervals,
 * Sage; as MBESS's {@code conf.limits.nc.chisq}): the lower limit is the noncentrality at which the observed X2 is
 * the upper (1 + confidence) / 2 quantile, the upper limit the one at which it is the lower (1 - confidence) / 2
 * quantile; a limit is 0 when even the central distribution puts the observed X2 beyond that quantile.
 */
final class NoncentralityInterval {

    private NoncentralityInterval() {
    }

    /** Returns {lower, upper} for the noncentrality of {@code x2} on {@code df} degrees of freedom. */
    static double[] of(double x2, double df, double confidence) {
        Checks.confidence(confidence);
        if (df <= 0 || !(x2 > 0)) {
            return new double[] {0, 0};
        }
        double alpha = 1 - confidence;
        return new double[] {limit(x2, df, 1 - alpha / 2), limit(x2, df, alpha / 2)};
    }

    /** The noncentrality at which P(X2 <= x2) equals {@code target}; 0 if that is already exceeded at 0. */
    private static double limit(double x2, double df, double target) {
        DoubleUnaryOperator f = ncp -> NoncentralChiSquare.cdf(x2, df, ncp) - target;
        if (f.applyAsDouble(0) <= 0) {
            return 0;
        }
        // the cdf falls as the noncentrality grows; widen until the target is bracketed
        double lo = 0;
        double hi = Math.max(1, x2);
        while (f.applyAsDouble(hi) > 0) {
            lo = hi;
            hi *= 2;
        }
        return new BrentSolver(1e-12, 1e-10, 1e-15).solve(500, f::applyAsDouble, lo, hi);
    }
}
