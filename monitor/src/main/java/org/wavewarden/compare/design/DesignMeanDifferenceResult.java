package org.wavewarden.compare.design;

import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;

/**
 * The outcome of {@link DesignMeanDifference}: the two wave estimates, the standard error of their difference, the
 * design-based t test and the difference (current minus baseline) with its confidence interval.
 *
 * @param baseline      weighted mean or share of the baseline wave
 * @param current       weighted mean or share of the current wave
 * @param standardError {@code sqrt(SE_baseline^2 + SE_current^2)}
 * @param test          t = difference / standardError, df = sum of the waves' #PSU - #strata, two-sided p
 * @param difference    {@code current - baseline} with its t interval
 * @param svyttest      the same t on R survey's {@code svyttest} df (one fewer, see
 *                      {@link DesignMeanDifference#SVYTTEST_NOTE}), or null when that leaves no df
 */
public record DesignMeanDifferenceResult(DesignEstimate baseline, DesignEstimate current, double standardError,
                                         TestResult test, EffectSize difference, TestResult svyttest) {

    public DesignMeanDifferenceResult {
        if (baseline == null || current == null || test == null || difference == null) {
            throw new IllegalArgumentException("baseline, current, test and difference must not be null");
        }
    }
}
