package org.wavewarden.config;

import java.util.List;

/**
 * The effect measures a threshold on the {@code effect} scale can be judged on, each with the largest value it can
 * take. A threshold above that bound can never be reached, so every wave would look stable; the loader refuses it.
 */
public enum EffectScale {
    /** Standardised mean difference (Hedges 1981); unbounded. */
    HEDGES_G("Hedges' g", Double.POSITIVE_INFINITY),
    /** Paired standardised difference (Cohen 1988); unbounded. */
    COHENS_DZ("Cohen's d_z", Double.POSITIVE_INFINITY),
    /** P(X > Y) - P(X < Y) (Cliff 1993), in [-1, 1]. */
    CLIFFS_DELTA("Cliff's delta", 1),
    /** Matched-pairs rank-biserial correlation (Kerby 2014), in [-1, 1]. */
    RANK_BISERIAL("rank-biserial r", 1),
    /** Cramér's V (Cramér 1946), in [0, 1]. */
    CRAMERS_V("Cramér's V", 1),
    /** Kolmogorov-Smirnov distance, in [0, 1]. */
    KS_DISTANCE("KS distance", 1),
    /** Difference of arcsine-transformed proportions (Cohen 1988), in [-pi, pi]. */
    COHENS_H("Cohen's h", Math.PI);

    private final String label;
    private final double max;

    EffectScale(String label, double max) {
        this.label = label;
        this.max = max;
    }

    public String label() {
        return label;
    }

    /** The largest absolute value the measure can take. */
    public double max() {
        return max;
    }

    /**
     * The scales one variable's effect threshold may be applied to. A continuous variable is judged on Hedges' g
     * or, when the shape of its data calls for rank methods, on Cliff's delta, so one threshold must fit both.
     */
    public static List<EffectScale> of(VariableKind kind) {
        return switch (kind) {
            case CONTINUOUS -> List.of(HEDGES_G, CLIFFS_DELTA, COHENS_DZ, RANK_BISERIAL);
            case ORDINAL -> List.of(CLIFFS_DELTA, RANK_BISERIAL);
            case CATEGORICAL -> List.of(CRAMERS_V);
            case BINARY -> List.of(COHENS_H);
            case TEXT, DATE -> List.of();
        };
    }

    /** The scale of the kind with the smallest bound: a threshold must not exceed it. */
    public static EffectScale tightest(VariableKind kind) {
        return of(kind).stream().min(java.util.Comparator.comparingDouble(EffectScale::max)).orElse(null);
    }
}
