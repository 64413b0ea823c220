package org.wavewarden.codebook;

import org.wavewarden.config.VariableConfig;

import java.math.BigDecimal;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.regex.Pattern;

/**
 * The labels of one variable: its variable label and the label of each of its codes. This is the one lookup of
 * "the label of this code of this variable" that sentences, details, plots and digests all use, so a code is named
 * the same way everywhere.
 *
 * <p>A code is matched to its label as written first, then as a number: the answer counted as {@code 1} (the text
 * PostgreSQL prints for a number) finds the label keyed {@code 1}, {@code 1.0} or {@code 01}; a text code that is
 * not a number matches only itself. Labels are data: this class shows them in sentences with control, format and
 * line-breaking characters written as a backslash-u escape and cut at {@link #SHOWN_LENGTH} characters, and the outputs
 * escape them further for their own markup.
 */
public final class CodeLabels {

    /** No labels: every code is shown as itself. */
    public static final CodeLabels NONE = new CodeLabels(null, Map.of());

    /** Characters of a label a sentence shows before cutting it with "..."; the full label is in the detail. */
    static final int SHOWN_LENGTH = 60;

    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+\\.?\\d*|\\.\\d+)([eE][+-]?\\d+)?");

    private final String variableLabel;
    private final Map<String, String> valueLabels;
    private final Map<String, String> byNumber = new HashMap<>();

    public CodeLabels(String variableLabel, Map<String, String> valueLabels) {
        this.variableLabel = variableLabel == null || variableLabel.isBlank() ? null : variableLabel;
        this.valueLabels = valueLabels == null ? Map.of() : new LinkedHashMap<>(valueLabels);
        this.valueLabels.forEach((code, label) -> {
            String n = numericKey(code);
            if (n != null) {
                byNumber.putIfAbsent(n, label);
            }
        });
    }

    public static CodeLabels of(VariableConfig v) {
        return v == null ? NONE : new CodeLabels(v.label(), v.valueLabels());
    }

    /** The variable label, or null when the variable has none. */
    public String variableLabel() {
        return variableLabel;
    }

    /** True when the variable's codes have labels at all. */
    public boolean hasValueLabels() {
        return !valueLabels.isEmpty();
    }

    /** The label of {@code code}, or null when it has none. */
    public String label(String code) {
        if (code == null) {
            return null;
        }
        String exact = valueLabels.get(code);
        if (exact != null) {
            return exact;
        }
        String n = numericKey(code);
        return n == null ? null : byNumber.get(n);
    }

    /** "'Council tenant' (COUN)" for a labelled code, "'COUN'" for one without a label. */
    public String quoted(String code) {
        String label = label(code);
        return label == null ? "'" + code + "'" : "'" + shown(label) + "' (" + code + ")";
    }

    /** "tenure (Tenure of the home)" when the variable has a label, else its name. */
    public String named(String variable) {
        return variableLabel == null ? variable : variable + " (" + shown(variableLabel) + ")";
    }

    /**
     * A label as a sentence shows it: printable characters as they are, every other whitespace, control or format
     * character (a line break, a right-to-left override) as a backslash-u escape, at most {@link #SHOWN_LENGTH}
     * characters.
     */
    public static String shown(String label) {
        StringBuilder out = new StringBuilder();
        int[] cps = label.codePoints().toArray();
        int limit = Math.min(cps.length, SHOWN_LENGTH);
        for (int i = 0; i < limit; i++) {
            int cp = cps[i];
            int type = Character.getType(cp);
            boolean invisible = cp != ' ' && (Character.isWhitespace(cp) || Character.isSpaceChar(cp)
                    || type == Character.CONTROL || type == Character.FORMAT || type == Character.LINE_SEPARATOR
                    || type == Character.PARAGRAPH_SEPARATOR);
            if (invisible) {
                out.append(String.format("\\u%04X", cp));
            } else {
                out.appendCodePoint(cp);
            }
        }
        return cps.length > SHOWN_LENGTH ? out + "..." : out.toString();
    }

    /**
     * The {@link Codes#of} form of a code that is a decimal number ("01" and "1.0" give "1"), or null for any other
     * text: the key under which numeric codes are matched.
     */
    public static String numericKey(String code) {
        if (code == null || !NUMBER.matcher(code.strip()).matches()) {
            return null;
        }
        double v = new BigDecimal(code.strip()).doubleValue();
        return Double.isFinite(v) ? Codes.of(v) : null;
    }
}
