package org.wavewarden.compare.location;

import org.wavewarden.compare.StudentT;
import org.wavewarden.compare.TestResult;

/** Shared arithmetic of the t tests: argument checks and the result, with Student t from {@link StudentT}. */
final class TStatistics {

    private TStatistics() {
    }

    static double twoSidedP(double t, double df) {
        return StudentT.twoSidedP(t, df);
    }

    static double criticalValue(double df, double confidence) {
        return StudentT.twoSidedQuantile(df, confidence);
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
