package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;

/**
 * Cohen's d_z, the standardised mean of paired differences: {@code mean(current - baseline) / sd(current -
 * baseline)} (Cohen, J. (1988), Statistical Power Analysis for the Behavioral Sciences, 2nd ed., chapter 2, the
 * effect size of the t test for paired observations; conventions 0.2 / 0.5 / 0.8). Not bias-corrected, as Cohen
 * defines it.
 *
 * <p>Interval: the paired t statistic {@code t = d_z sqrt(n)} follows a noncentral t on n - 1 degrees of freedom
 * with noncentrality {@code delta_z sqrt(n)}; the limits for that noncentrality are found by inverting
 * {@link NoncentralT#cdf} (Steiger and Fouladi 1997, as for {@link HedgesG}) and divided by {@code sqrt(n)}. Above
 * {@value #NORMAL_APPROXIMATION_ABOVE} pairs, or when the inversion fails to bracket a root, the large-sample normal
 * interval {@code d_z +- z sqrt(1/n + d_z^2 / (2n))} is used instead: the large-sample variance of a standardised
 * mean, as Hedges and Olkin (1985, Statistical Methods for Meta-Analysis, Chapter 5) derive it for two samples.
 */
public final class CohensDz {

    public static final String NAME = "Cohen's d_z";
    /** Above this number of pairs the normal interval replaces the noncentral t inversion. */
    public static final long NORMAL_APPROXIMATION_ABOVE = 100_000;

    private CohensDz() {
    }

    /**
     * @param pairs          number of pairs, at least 2
     * @param meanDifference mean of the differences {@code current - baseline}
     * @param sdDifference   their sample standard deviation (divisor n - 1), positive
     * @param confidence     level of the interval, in (0, 1)
     * @throws IllegalArgumentException on fewer than 2 pairs, a non-positive standard deviation or a confidence
     *                                  outside (0, 1)
     */
    public static EffectSize estimate(long pairs, double meanDifference, double sdDifference, double confidence) {
        if (pairs < 2) {
            throw new IllegalArgumentException("pairs must be at least 2, was " + pairs);
        }
        if (!(sdDifference > 0) || Double.isInfinite(sdDifference)) {
            throw new IllegalArgumentException("sdDifference must be positive and finite, was " + sdDifference
                    + ": a standardised difference is undefined");
        }
        if (!Double.isFinite(meanDifference)) {
            throw new IllegalArgumentException("meanDifference must be finite, was " + meanDifference);
        }
        Checks.confidence(confidence);
        double d = meanDifference / sdDifference;
        double root = Math.sqrt(pairs);
        if (pairs <= NORMAL_APPROXIMATION_ABOVE) {
            double t = d * root;
            double df = pairs - 1.0;
            double tail = (1 - confidence) / 2;
            double low = HedgesG.solveNcp(t, df, 1 - tail);
            double high = HedgesG.solveNcp(t, df, tail);
            if (!Double.isNaN(low) && !Double.isNaN(high) && low <= high) {
                return new EffectSize(NAME, d, low / root, high / root, confidence);
            }
        }
        double z = StandardNormal.twoSidedQuantile(confidence);
        double se = Math.sqrt(1.0 / pairs + d * d / (2.0 * pairs));
        return new EffectSize(NAME, d, d - z * se, d + z * se, confidence);
    }
}
