package org.wavewarden.config;

/**
 * The smallest change that matters for one variable. Exactly one of the three scales is set.
 *
 * @param raw    in the variable's own units (years, minutes, euros), for continuous and ordinal variables
 * @param points in percentage points of a share, for binary and categorical variables
 * @param effect on the scale of the primary effect size (Hedges' g, Cliff's delta, Cramér's V, Cohen's h)
 */
public record Threshold(Double raw, Double points, Double effect) {

    public static Threshold onEffectScale(double effect) {
        return new Threshold(null, null, effect);
    }
}
