package org.wavewarden.config;

import java.util.Locale;

/**
 * A continuous variable's location test fixed in the configuration ({@code locationTest: means | ranks}) instead of
 * chosen from the variable's first waves.
 */
public enum LocationTestPin {
    /** Welch's t on the means, with Hedges' g. */
    MEANS,
    /** Mann-Whitney on the ranks, with Cliff's delta. */
    RANKS;

    public String configName() {
        return name().toLowerCase(Locale.ROOT);
    }
}
