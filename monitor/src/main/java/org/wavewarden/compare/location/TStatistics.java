package org.wavewarden.compare.location;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.random.RandomGenerator;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/** Shared arithmetic of the t tests: argument checks, Student t tail areas and quantiles. */
final class TStatistics {

    private TStatistics() {
    }

    static void checkAtLeastTwo(String name, NumericDistribution d) {
        if (d == null) {
            throw new IllegalArgumentException(name + " must not be null");
        }
        if (d.n() < 2) {
            throw new IllegalArgumentException(name + " needs at least 2 observations, has " + d.n());
        }
    }

    static TDistribution student(double df) {
        // The generator is only used for sampling, which we never do; null avoids seeding one per call.
        return new TDistribution((RandomGenerator) null, df, 1e-12);
    }

    /** Two-sided p-value of t on df degrees of freedom, computed from the smaller tail to avoid 1 - (1 - p). */
    static double twoSidedP(double t, double df) {
        double p = 2 * student(df).cumulativeProbability(-Math.abs(t));
        return Math.min(1.0, p);
    }

    /** Upper (1 + confidence) / 2 quantile, the multiplier of the standard error in a two-sided interval. */
    static double criticalValue(double df, double confidence) {
        return student(df).inverseCumulativeProbability(0.5 + confidence / 2);
    }

    static MeanDifference result(String name, double estimate, double se, double df, String dfConvention,
                                 double meanBaseline, double meanCurrent, double confidence) {
        if (!(se > 0)) {
            throw new IllegalArgumentException("standard error of the difference is " + se
                    + ": the data have no spread, so a t test is undefined");
        }
        double t = estimate / se;
        double half = criticalValue(df, confidence) * se;
        return new MeanDifference(new TestResult(name, t, df, twoSidedP(t, df), dfConvention), meanBaseline, meanCurrent,
                estimate, estimate - half, estimate + half, confidence);
    }
}
