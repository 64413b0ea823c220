package org.wavewarden.compare.proportion;

import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;

/**
 * The comparison of one proportion between the baseline and the current wave.
 *
 * @param test                the two-proportion z test (pooled variance, no continuity correction); z is positive
 *                            when the current proportion is larger
 * @param proportionBaseline  successes over n in the baseline wave
 * @param proportionCurrent   successes over n in the current wave
 * @param riskDifference      current minus baseline with Newcombe's (1998) hybrid score interval, the primary
 *                            interval
 * @param waldRiskDifference  current minus baseline with the Wald interval diff +- z sqrt(pB qB / nB + pC qC / nC),
 *                            the interval R's {@code prop.test(correct = FALSE)} reports; poor near 0 and 1, kept for
 *                            comparison
 */
public record TwoProportionResult(TestResult test, double proportionBaseline, double proportionCurrent,
                                  EffectSize riskDifference, EffectSize waldRiskDifference) {

    /** Pearson's X2 for the 2 x 2 table, equal to z squared. */
    public double chiSquare() {
        return test.statistic() * test.statistic();
    }
}
