package org.wavewarden.compare;

/**
 * A signed effect size (current wave relative to the baseline) with its confidence interval.
 *
 * @param name       the measure, e.g. "Hedges' g", "Cliff's delta", "Cramér's V", "risk difference"
 * @param estimate   the point estimate; positive means the current wave is larger / higher
 * @param ciLow      lower confidence limit
 * @param ciHigh     upper confidence limit
 * @param confidence the confidence level of the interval, e.g. 0.95
 */
public record EffectSize(String name, double estimate, double ciLow, double ciHigh, double confidence) {

    public EffectSize {
        Checks.confidence(confidence);
        if (ciLow > ciHigh) {
            throw new IllegalArgumentException("ciLow " + ciLow + " exceeds ciHigh " + ciHigh + " for " + name);
        }
    }

    /**
     * The same effect with its interval collapsed onto the estimate: a complete enumeration observed every unit, so
     * the effect has no sampling error to draw or state.
     */
    public EffectSize exact() {
        return new EffectSize(name, estimate, estimate, estimate, confidence);
    }

    /** The interval lies strictly inside (-threshold, threshold). */
    public boolean intervalWithin(double threshold) {
        return ciLow > -threshold && ciHigh < threshold;
    }
}
