package org.wavewarden.compare;

import java.util.Locale;

/**
 * The conventional words for the size of an effect, so a sentence can say "small" as well as give the number.
 * Cohen (1988): d, g and h 0.2 / 0.5 / 0.8, w (and Cramér's V for two waves) 0.1 / 0.3 / 0.5; Romano et al.
 * (2006): Cliff's delta negligible below 0.147, small below 0.33, medium below 0.474; PSI below 0.1 stable, 0.1 to
 * 0.25 moderate, above 0.25 large (common practice in scorecard monitoring, no single source).
 */
public final class Magnitude {

    private Magnitude() {
    }

    /** Hedges' g, Cohen's d or Cohen's h. */
    public static String standardizedDifference(double e) {
        return band(Math.abs(e), 0.2, 0.5, 0.8);
    }

    /** Cohen's w, or Cramér's V of a two-wave table. */
    public static String w(double e) {
        return band(Math.abs(e), 0.1, 0.3, 0.5);
    }

    public static String cliffsDelta(double e) {
        return band(Math.abs(e), 0.147, 0.33, 0.474);
    }

    public static String psi(double psi) {
        return psi < 0.1 ? "stable" : psi <= 0.25 ? "moderate" : "large";
    }

    /** The word for a named effect, or empty when the measure has no convention (raw units, distances). */
    public static String of(String effectName, double estimate) {
        String n = effectName.toLowerCase(Locale.ROOT);
        if (n.startsWith("hedges") || n.startsWith("cohen's h") || n.startsWith("cohen's d")) {
            return standardizedDifference(estimate);
        }
        if (n.startsWith("cram") || n.startsWith("cohen's w")) {
            return w(estimate);
        }
        if (n.startsWith("cliff")) {
            return cliffsDelta(estimate);
        }
        return "";
    }

    private static String band(double a, double small, double medium, double large) {
        return a < small ? "negligible" : a < medium ? "small" : a < large ? "medium" : "large";
    }
}
