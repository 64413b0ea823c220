package org.wavewarden.compare;

import org.wavewarden.judge.FindingKind;

/**
 * The outcome of comparing one variable between two waves, before false-discovery-rate control and the verdict.
 *
 * @param variable        source column
 * @param kind            SHIFT, PANEL_SHIFT, SHAPE_CHANGE, MISSING_RATE_CHANGE, REFERENCE or RELATIONSHIP_CHANGE
 * @param test            the primary test
 * @param effect          the effect the verdict is judged on (raw scale when the threshold is in raw units)
 * @param threshold       T on the scale of {@code effect}
 * @param thresholdSource where T came from ("configured 1.5 years", "default for Hedges' g, Cohen 1988")
 * @param nBaseline       valid observations in the baseline wave
 * @param nCurrent        valid observations in the current wave
 * @param change          the change in the variable's own terms
 * @param detail          method-specific detail for the report
 */
public record Comparison(String variable, FindingKind kind, TestResult test, EffectSize effect, double threshold,
                         String thresholdSource, long nBaseline, long nCurrent, Change change, Object detail) {
}
