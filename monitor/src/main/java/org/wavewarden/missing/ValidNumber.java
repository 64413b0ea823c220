package org.wavewarden.missing;

import org.wavewarden.config.VariableConfig;

import java.util.Collection;
import java.util.HashMap;
import java.util.Map;
import java.util.Set;

/**
 * The one rule for a valid answer of a continuous or ordinal variable. An answer is valid when it is
 * <ul>
 *   <li>plain decimal text ({@link NumberText#isPlainDecimal}, surrounding white space allowed): Java would also read
 *       {@code NaN}, {@code Infinity}, {@code 0x1p3} and {@code 1.5d}, which no survey answer means as a number;
 *       for an ordinal variable with {@code levels}, one of the levels, whose value is its rank;</li>
 *   <li>finite (a decimal too large for a double is not);</li>
 *   <li>inside the declared range, bounds included;</li>
 *   <li>not left out by the screen: a codebook missing code or a value in a declared missing range (matched
 *       numerically, so {@code 999.0} is the code {@code 999}), or a value the screen excluded as a confident
 *       disguised missing value.</li>
 * </ul>
 * The screen ({@link VariableScreen}), the panel's pairs, the design views and the relationships' pairs all ask this
 * class, so that an answer is valid in one comparison exactly when it is valid in the others.
 */
public final class ValidNumber {

    /** What an answer is to the rule; only {@code VALID} enters a comparison. */
    public enum Status {
        VALID,
        /** Not plain decimal text, not a level, or not finite: text in a number. */
        NOT_A_NUMBER,
        /** A number outside the declared range. */
        OUTSIDE_RANGE,
        /** A codebook missing code or a value the screen excluded. */
        LEFT_OUT
    }

    private final Map<String, Integer> levelRank;
    private final ValueRange range;
    private final Codebook codebook;
    private final Set<String> excluded;

    private ValidNumber(Map<String, Integer> levelRank, ValueRange range, Codebook codebook, Set<String> excluded) {
        this.levelRank = levelRank;
        this.range = range;
        this.codebook = codebook;
        this.excluded = excluded;
    }

    /** The rule of a variable as configured: its levels, declared range and codebook codes. */
    public static ValidNumber of(VariableConfig v) {
        Map<String, Integer> levelRank = new HashMap<>();
        for (int i = 0; i < v.levels().size(); i++) {
            levelRank.put(v.levels().get(i), i + 1);
        }
        return new ValidNumber(Map.copyOf(levelRank), VariableScreen.range(v).orElse(null),
                VariableScreen.codebook(v), Set.of());
    }

    /**
     * The rule as one wave's screen applied it: the raw answers that screen left out (codebook codes as the column's
     * type matches them, confident disguised missing values, values outside the range, text) are left out exactly.
     */
    public static ValidNumber ofScreen(VariableConfig v, Collection<String> leftOut) {
        ValidNumber configured = of(v);
        return new ValidNumber(configured.levelRank, configured.range, Codebook.empty(), Set.copyOf(leftOut));
    }

    /** The number written in plain decimal text, or null when the text is not a finite plain decimal. */
    public static Double parse(String text) {
        if (text == null) {
            return null;
        }
        String t = text.strip();
        if (!NumberText.isPlainDecimal(t)) {
            return null;
        }
        try {
            double x = Double.parseDouble(t);
            return Double.isFinite(x) ? x : null;
        } catch (NumberFormatException e) {
            return null;
        }
    }

    /** What the answer is to this rule. */
    public Status status(String text) {
        if (text == null || excluded.contains(text) || codebook.reasonOf(text).isPresent()) {
            return Status.LEFT_OUT;
        }
        Double x = number(text);
        if (x == null) {
            return Status.NOT_A_NUMBER;
        }
        return outside(x) ? Status.OUTSIDE_RANGE : Status.VALID;
    }

    /** The answer's value when it is valid (a level's rank for an ordinal variable with levels), else NaN. */
    public double value(String text) {
        if (text == null || excluded.contains(text) || codebook.reasonOf(text).isPresent()) {
            return Double.NaN;
        }
        Double x = number(text);
        return x == null || outside(x) ? Double.NaN : x == 0.0 ? 0.0 : x; // -0 and 0 are one answer
    }

    /** The answer as a number before range and codes are looked at: a level's rank, or the plain decimal. */
    public Double number(String text) {
        if (!levelRank.isEmpty()) {
            Integer rank = levelRank.get(text.strip());
            return rank == null ? null : (double) rank;
        }
        return parse(text);
    }

    /** Whether a number lies outside the declared range (never, without one). */
    public boolean outside(double x) {
        return range != null && ((range.min() != null && x < range.min()) || (range.max() != null && x > range.max()));
    }
}
