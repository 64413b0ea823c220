package org.wavewarden.pipeline;

import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.Locale;

/**
 * Guesses the kind of a variable nobody declared, from its storage class and how many distinct values it has.
 * The cut-offs are common practice, no source: a handful of integer codes reads as a scale, a few dozen text
 * values as codes, and anything with a value per respondent as free text or a measurement.
 */
public final class VariableInference {

    /** At most this many distinct integers: an ordinal scale (0..10 has 11). */
    static final int MAX_SCALE_VALUES = 11;
    /** At most this many distinct text values: categorical codes. */
    static final int MAX_CATEGORIES = 50;

    private VariableInference() {
    }

    public record Inferred(VariableConfig variable, String reason) {
    }

    public static Inferred infer(ColumnTally t) {
        int distinct = t.distinctCount();
        ColumnType type = t.type();
        String name = t.column();
        if (type == ColumnType.BOOLEAN || distinct == 2) {
            return new Inferred(VariableConfig.inferred(name, VariableKind.BINARY),
                    type == ColumnType.BOOLEAN ? "boolean column" : "exactly 2 distinct values");
        }
        if (type == ColumnType.DATE || type == ColumnType.TIMESTAMP) {
            return new Inferred(VariableConfig.inferred(name, VariableKind.DATE), "date column");
        }
        if (type.isNumeric()) {
            boolean integers = t.valueCounts().keySet().stream().allMatch(v -> v.matches("-?\\d+"));
            if (integers && distinct <= MAX_SCALE_VALUES) {
                return new Inferred(VariableConfig.inferred(name, VariableKind.ORDINAL),
                        distinct + " distinct integers: read as a scale");
            }
            return new Inferred(VariableConfig.inferred(name, VariableKind.CONTINUOUS),
                    distinct + " distinct numbers");
        }
        if (distinct <= MAX_CATEGORIES) {
            return new Inferred(VariableConfig.inferred(name, VariableKind.CATEGORICAL),
                    distinct + " distinct text values: read as codes");
        }
        return new Inferred(VariableConfig.inferred(name, VariableKind.TEXT),
                distinct + " distinct text values: read as free text");
    }

    /** One line for the console and the report, e.g. {@code district: categorical (7 distinct text values ...)}. */
    public static String describe(Inferred i) {
        return i.variable().name() + ": " + i.variable().kind().name().toLowerCase(Locale.ROOT) + " (" + i.reason() + ")";
    }
}
