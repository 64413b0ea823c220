package org.wavewarden.config;

import java.util.List;
import java.util.Map;

/**
 * One monitored variable as the user declared it (or as inference filled it in).
 *
 * @param name         source column
 * @param kind         how it is compared
 * @param unit         unit for sentences ("years", "minutes"); optional
 * @param range        declared valid range; optional
 * @param missingCodes codebook values meaning "no answer"; never counted as valid
 * @param threshold    smallest change that matters; optional (defaults by kind)
 * @param successValue for binary variables, the answer whose share is tracked; optional
 * @param levels       for ordinal text answers, the order of the levels, lowest first; optional
 * @param reference    a fixed mean or fixed shares to test every wave against; optional
 * @param locationTest for continuous variables, the location test fixed in the configuration; optional (chosen
 *                     from the variable's first waves)
 * @param label        the variable label ("Tenure of the home"); optional
 * @param valueLabels  code -> label ("COUN" -> "Council tenant"), in codebook order; numeric codes in the form
 *                     PostgreSQL prints them ({@code 1}, {@code -9}, {@code 2.5}); optional
 * @param missingRanges ranges of values meaning "no answer" (an SPSS user-missing range); optional
 */
public record VariableConfig(String name, VariableKind kind, String unit, RangeSpec range,
                             List<MissingCodeSpec> missingCodes, Threshold threshold, String successValue,
                             List<String> levels, Reference reference, LocationTestPin locationTest, String label,
                             Map<String, String> valueLabels, List<MissingRangeSpec> missingRanges) {

    /** A variable without labels or missing ranges. */
    public VariableConfig(String name, VariableKind kind, String unit, RangeSpec range,
                          List<MissingCodeSpec> missingCodes, Threshold threshold, String successValue,
                          List<String> levels, Reference reference, LocationTestPin locationTest) {
        this(name, kind, unit, range, missingCodes, threshold, successValue, levels, reference, locationTest, null,
                null, null);
    }

    /** A variable without a pinned location test. */
    public VariableConfig(String name, VariableKind kind, String unit, RangeSpec range,
                          List<MissingCodeSpec> missingCodes, Threshold threshold, String successValue,
                          List<String> levels, Reference reference) {
        this(name, kind, unit, range, missingCodes, threshold, successValue, levels, reference, null);
    }

    public VariableConfig {
        missingCodes = missingCodes == null ? List.of() : List.copyOf(missingCodes);
        levels = levels == null ? List.of() : List.copyOf(levels);
        valueLabels = valueLabels == null ? Map.of()
                : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(valueLabels));
        missingRanges = missingRanges == null ? List.of() : List.copyOf(missingRanges);
    }

    public static VariableConfig inferred(String name, VariableKind kind) {
        return new VariableConfig(name, kind, null, null, List.of(), null, null, List.of(), null);
    }
}
