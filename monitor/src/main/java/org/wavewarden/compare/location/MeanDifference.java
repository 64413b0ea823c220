package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.TestResult;

/**
 * A t test on means together with the confidence interval of the mean difference it implies.
 *
 * <p>For two waves the difference is {@code meanCurrent - meanBaseline}; for a one-sample test the "baseline" is the
 * hypothesised mean; for a paired test the difference is the mean of the within-pair differences
 * {@code current[i] - baseline[i]}.
 *
 * @param test         the t statistic (current minus baseline), its degrees of freedom and two-sided p-value
 * @param meanBaseline the baseline wave's mean (or the hypothesised mean of a one-sample test)
 * @param meanCurrent  the current wave's mean
 * @param difference   the estimated difference, current minus baseline
 * @param ciLow        lower confidence limit of the difference
 * @param ciHigh       upper confidence limit of the difference
 * @param confidence   confidence level of the interval, e.g. 0.95
 */
public record MeanDifference(TestResult test, double meanBaseline, double meanCurrent, double difference,
                             double ciLow, double ciHigh, double confidence) {

    public MeanDifference {
        if (test == null) {
            throw new IllegalArgumentException("test must not be null");
        }
        Checks.confidence(confidence);
        if (ciLow > ciHigh) {
            throw new IllegalArgumentException("ciLow " + ciLow + " exceeds ciHigh " + ciHigh);
        }
    }
}
