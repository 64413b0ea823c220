package org.wavewarden.compare;

import org.wavewarden.config.Threshold;

/**
 * Default smallest-change-that-matters per effect measure, and the conversion of configured thresholds.
 * Defaults: Hedges' g and Cohen's h 0.2 and Cohen's w (Cramér's V for a 2 x k table) 0.1, the "small" effects of
 * Cohen (1988); Cliff's delta 0.147, the "negligible" bound of Romano et al. (2006).
 */
public final class Thresholds {

    public static final double HEDGES_G = 0.2;
    public static final double CLIFFS_DELTA = 0.147;
    public static final double CRAMERS_V = 0.1;
    public static final double COHENS_H = 0.2;
    /** KS distance that counts as a changed shape: common practice, no source. */
    public static final double KS_DISTANCE = 0.1;
    /**
     * Difference of two waves' Spearman correlations that counts as a changed relationship: common practice, no
     * source.
     */
    public static final double CORRELATION_DIFFERENCE = 0.1;

    private Thresholds() {
    }

    /** A resolved threshold: the value on the verdict's scale and a note of where it came from. */
    public record Resolved(double value, String source, boolean rawScale) {
    }

    public static Resolved resolve(Threshold configured, String effectName, double defaultValue, String unit) {
        if (configured == null) {
            return new Resolved(defaultValue, "default " + defaultValue + " for " + effectName, false);
        }
        if (configured.effect() != null) {
            return new Resolved(configured.effect(), "configured " + configured.effect() + " on " + effectName, false);
        }
        if (configured.raw() != null) {
            return new Resolved(configured.raw(), "configured " + trim(configured.raw())
                    + (unit == null ? "" : " " + unit), true);
        }
        return new Resolved(configured.points() / 100.0, "configured " + trim(configured.points())
                + " percentage points", true);
    }

    static String trim(double v) {
        return v == Math.rint(v) ? String.valueOf((long) v) : String.valueOf(v);
    }
}
