package org.wavewarden.compare;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.random.RandomGenerator;

/**
 * Student's t distribution the statistics use, through commons-math3's {@link TDistribution} (regularised incomplete
 * beta, Abramowitz and Stegun 26.7.1, with an absolute accuracy of 1e-12 for quantiles): the two-sided p-value and
 * the interval multiplier. Every t test, design-based t and t interval of the project takes them from here.
 */
public final class StudentT {

    private StudentT() {
    }

    private static TDistribution on(double df) {
        // The generator is only used for sampling, which never happens here; null avoids seeding one per call.
        return new TDistribution((RandomGenerator) null, df, 1e-12);
    }

    /** {@code P(|T| >= |t|)} on df degrees of freedom, from the smaller tail so that a small p keeps its digits. */
    public static double twoSidedP(double t, double df) {
        return Math.min(1.0, 2 * on(df).cumulativeProbability(-Math.abs(t)));
    }

    /** The t with {@code P(|T| <= t) = confidence} on df degrees of freedom: the standard error's multiplier. */
    public static double twoSidedQuantile(double df, double confidence) {
        return on(df).inverseCumulativeProbability(0.5 + Checks.confidence(confidence) / 2);
    }
}
