package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * The paired t test: a one-sample t test on the within-pair differences {@code current[i] - baseline[i]}, df = n - 1.
 *
 * <p>Source: Student (1908), "The probable error of a mean", Biometrika 6, 1-25 (his sleep data are paired). Used
 * for panel waves where the same respondents answer twice; the pairing needs the rows, so this test alone takes
 * arrays instead of frequency tables (the differences are then tabulated).
 */
public final class PairedTTest {

    public static final String NAME = "paired t";

    private PairedTTest() {
    }

    /**
     * @param baseline   the earlier answers, index i the same unit as in {@code current}
     * @param current    the later answers, same length as {@code baseline}, at least 2 pairs
     * @param confidence level of the interval, in (0, 1)
     * @throws IllegalArgumentException on different lengths, fewer than 2 pairs, non-finite values or constant
     *                                  differences
     */
    public static MeanDifference test(double[] baseline, double[] current, double confidence) {
        if (baseline == null || current == null) {
            throw new IllegalArgumentException((baseline == null ? "baseline" : "current") + " must not be null");
        }
        if (baseline.length != current.length) {
            throw new IllegalArgumentException("baseline has " + baseline.length + " values but current has "
                    + current.length + "; pairs need equal lengths");
        }
        if (baseline.length < 2) {
            throw new IllegalArgumentException("baseline and current need at least 2 pairs, have " + baseline.length);
        }
        Checks.confidence(confidence);
        double[] diff = new double[baseline.length];
        double sumB = 0;
        double sumC = 0;
        for (int i = 0; i < diff.length; i++) {
            if (!Double.isFinite(baseline[i])) {
                throw new IllegalArgumentException("baseline[" + i + "] is not finite: " + baseline[i]);
            }
            if (!Double.isFinite(current[i])) {
                throw new IllegalArgumentException("current[" + i + "] is not finite: " + current[i]);
            }
            diff[i] = current[i] - baseline[i];
            sumB += baseline[i];
            sumC += current[i];
        }
        return OneSampleTTest.of(NAME, NumericDistribution.ofSample(diff), 0.0, confidence,
                sumB / diff.length, sumC / diff.length, TestResult.DF_PAIRED);
    }

    /**
     * The same test from the moments of the differences, for pairs streamed past once and never held: t = mean /
     * (sd / sqrt(n)) on n - 1 degrees of freedom.
     *
     * @param pairs          number of pairs, at least 2
     * @param meanDifference mean of {@code current - baseline}
     * @param sdDifference   sample standard deviation (divisor n - 1) of the differences, positive
     * @param meanBaseline   mean of the baseline answers of the pairs, for the report
     * @param meanCurrent    mean of the current answers of the pairs
     * @param confidence     level of the interval, in (0, 1)
     * @throws IllegalArgumentException on fewer than 2 pairs, non-finite moments or differences without spread
     */
    public static MeanDifference ofDifferences(long pairs, double meanDifference, double sdDifference,
                                               double meanBaseline, double meanCurrent, double confidence) {
        if (pairs < 2) {
            throw new IllegalArgumentException("pairs must be at least 2, was " + pairs);
        }
        if (!Double.isFinite(meanDifference) || !Double.isFinite(sdDifference)) {
            throw new IllegalArgumentException("meanDifference and sdDifference must be finite, were "
                    + meanDifference + " and " + sdDifference);
        }
        Checks.confidence(confidence);
        return TStatistics.result(NAME, meanDifference, sdDifference / Math.sqrt(pairs), pairs - 1.0,
                TestResult.DF_PAIRED, meanBaseline,
                meanCurrent, confidence);
    }
}
