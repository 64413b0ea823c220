package org.wavewarden.config;

/**
 * A pair of numeric variables whose correlation is watched from wave to wave (relationship drift).
 *
 * @param x         the first column, a monitored INTEGER or DECIMAL column
 * @param y         the second column, likewise
 * @param threshold the smallest difference of correlations (current minus baseline Spearman rho) that matters;
 *                  null for the default
 */
public record RelationshipConfig(String x, String y, Double threshold) {

    /** The name findings carry for the pair, e.g. {@code hours_worked ~ income}. */
    public String label() {
        return x + " ~ " + y;
    }
}
