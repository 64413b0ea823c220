package org.wavewarden.config;

import java.util.Map;

/**
 * A fixed value a variable is tested against in every wave, beside the wave-to-wave comparison: a known mean for
 * a continuous or ordinal variable, or known shares (population margins, benchmarks) for a categorical or binary
 * one. Shares may sum to less than 1; the remainder belongs to every answer not listed.
 *
 * @param mean   the reference mean; null when shares are given
 * @param shares category to expected share; empty when a mean is given
 */
public record Reference(Double mean, Map<String, Double> shares) {

    public Reference {
        shares = shares == null ? Map.of() : Map.copyOf(shares);
    }
}
