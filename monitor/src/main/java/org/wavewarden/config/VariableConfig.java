package org.wavewarden.config;

import java.util.List;

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
 */
public record VariableConfig(String name, VariableKind kind, String unit, RangeSpec range,
                             List<MissingCodeSpec> missingCodes, Threshold threshold, String successValue,
                             List<String> levels, Reference reference, LocationTestPin locationTest) {

    /** A variable without a pinned location test. */
    public VariableConfig(String name, VariableKind kind, String unit, RangeSpec range,
                          List<MissingCodeSpec> missingCodes, Threshold threshold, String successValue,
                          List<String> levels, Reference reference) {
        this(name, kind, unit, range, missingCodes, threshold, successValue, levels, reference, null);
    }

    public VariableConfig {
        missingCodes = missingCodes == null ? List.of() : List.copyOf(missingCodes);
        levels = levels == null ? List.of() : List.copyOf(levels);
    }

    public static VariableConfig inferred(String name, VariableKind kind) {
        return new VariableConfig(name, kind, null, null, List.of(), null, null, List.of(), null);
    }
}
