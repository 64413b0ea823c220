package org.wavewarden.missing;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.ArrayList;
import java.util.Collection;
import java.util.List;
import java.util.Locale;
import java.util.regex.Pattern;

/**
 * Guesses the kind of a variable nobody declared, from its storage class and how many distinct values it has.
 * The cut-offs are common practice, no source: a handful of integer codes reads as a scale, a few dozen text
 * values as codes, and anything with a value per respondent as free text or a measurement. An integer column named
 * like an age ({@link #AGE_NAME}) whose values lie in 0..{@value #MAX_AGE} is an age in years, checked for heaping
 * as a declared age is.
 */
public final class VariableInference {

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(VariableInference.class);

    /** At most this many distinct integers: an ordinal scale (0..10 has 11). */
    static final int MAX_SCALE_VALUES = 11;
    /** At most this many distinct text values: categorical codes. */
    static final int MAX_CATEGORIES = 50;

    /**
     * Names read as an age (case-insensitive): {@code age}, {@code age_years}, {@code age_yrs}, {@code age_in_years}
     * and anything ending in {@code _age} ({@code respondent_age}, {@code hh_head_age}). {@code age_group} is not
     * one: it names bands.
     */
    static final Pattern AGE_NAME = Pattern.compile("age|age_(in_)?(years|yrs)|\\w+_age", Pattern.CASE_INSENSITIVE);
    /** Plausible ages in years: a person's age is not negative and nobody is older than this. */
    static final int MAX_AGE = 120;

    private VariableInference() {
    }

    public record Inferred(VariableConfig variable, String reason) {
    }

    /**
     * The variables of a wave: the declared ones, and for every other tallied column the inferred one, described in
     * {@code inference}. A column whose kind cannot be inferred is screened as text (for disguised missing values
     * only) rather than lost with the run.
     */
    public static List<VariableConfig> variables(DatasetConfig d, Collection<ColumnTally> tallies,
                                                 List<String> inference) {
        List<VariableConfig> out = new ArrayList<>();
        for (VariableConfig v : d.variables()) {
            out.add(v.kind() != null ? v : completed(v, tallies.stream().filter(t -> t.column().equals(v.name()))
                    .findFirst().orElse(null), inference));
        }
        for (ColumnTally t : tallies) {
            if (declared(d, t.column()) == null) {
                out.add(inferOrText(t, inference));
            }
        }
        return out;
    }

    /**
     * A variable declared without a kind (a codebook that gave its labels and missing values but no measurement
     * level): the kind inferred from its answers, the declared missing values left out of the count so that a
     * "don't know" code does not turn two answers into three; everything declared is kept.
     */
    private static VariableConfig completed(VariableConfig v, ColumnTally t, List<String> inference) {
        VariableConfig kind;
        if (t == null) {
            inference.add(v.name() + ": text (no kind declared and the column is not in this wave)");
            kind = VariableConfig.inferred(v.name(), VariableKind.TEXT);
        } else {
            Codebook declared = VariableScreen.codebook(v);
            java.util.Map<String, Long> answers = new java.util.LinkedHashMap<>();
            t.valueCounts().forEach((value, n) -> {
                if (declared.reasonOf(value).isEmpty()) {
                    answers.put(value, n);
                }
            });
            ColumnTally withoutMissing = new ColumnTally(t.column(), t.type(), t.rowCount(), t.nullCount(), answers,
                    t.truncated(), t.binning());
            kind = inferOrText(withoutMissing, new ArrayList<>());
            inference.add(v.name() + ": " + kind.kind().configName() + " (inferred from the data: the codebook"
                    + " declares no measurement level)");
        }
        return new VariableConfig(v.name(), kind.kind(), v.unit() != null ? v.unit() : kind.unit(), v.range(),
                v.missingCodes(), v.threshold(), v.successValue(), v.levels(), v.reference(), v.locationTest(),
                v.label(), v.valueLabels(), v.missingRanges());
    }

    /**
     * One column's variable as {@link #variables} makes it: declared, else inferred from its tally (null without
     * one), so that a later reader of a stored wave takes the column for what the run took it for.
     */
    public static VariableConfig variable(DatasetConfig d, String column, ColumnTally tally) {
        VariableConfig declared = declared(d, column);
        if (declared != null && declared.kind() == null) {
            return completed(declared, tally, new ArrayList<>());
        }
        return declared != null || tally == null ? declared : inferOrText(tally, new ArrayList<>());
    }

    private static VariableConfig declared(DatasetConfig d, String column) {
        return d.variables().stream().filter(v -> v.name().equals(column)).findFirst().orElse(null);
    }

    private static VariableConfig inferOrText(ColumnTally t, List<String> inference) {
        try {
            Inferred i = infer(t);
            inference.add(describe(i));
            return i.variable();
        } catch (RuntimeException e) {
            LOG.warn("the kind of column {} could not be inferred: {}", t.column(), e.toString(), e);
            inference.add(t.column() + ": kind could not be inferred (" + e.getClass().getSimpleName()
                    + "); screened as text");
            return VariableConfig.inferred(t.column(), VariableKind.TEXT);
        }
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
            long[] ageRange = integers && distinct > MAX_SCALE_VALUES ? ageRange(t) : null;
            if (ageRange != null) {
                // An age gets the heaping indices (Whipple, Myers) a declared unit of years gives it.
                return new Inferred(new VariableConfig(name, VariableKind.CONTINUOUS, "years", null, List.of(), null,
                        null, List.of(), null), "inferred as an age in years from its name and integer range "
                        + ageRange[0] + "-" + ageRange[1]);
            }
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

    /**
     * The range of an integer column named like an age whose values lie in 0..{@value #MAX_AGE}, or null. Values
     * of sentinel shape outside that range (-9, 999) are codes for no answer, screened later, and do not decide
     * the range. Up to {@value #MAX_SCALE_VALUES} distinct values stay a scale: a column "age" coded 1..7 holds
     * age bands, not ages.
     */
    static long[] ageRange(ColumnTally t) {
        if (!AGE_NAME.matcher(t.column()).matches()) {
            return null;
        }
        long min = Long.MAX_VALUE;
        long max = Long.MIN_VALUE;
        for (String v : t.valueCounts().keySet()) {
            long x;
            try {
                x = Long.parseLong(v.strip());
            } catch (NumberFormatException e) {
                return null;
            }
            boolean plausible = x >= 0 && x <= MAX_AGE;
            if (!plausible && DisguisedMissingDetector.isSentinelNumber(x)) {
                continue;
            }
            if (!plausible) {
                return null;
            }
            min = Math.min(min, x);
            max = Math.max(max, x);
        }
        return min <= max ? new long[] {min, max} : null;
    }

    /** One line for the console and the report, e.g. {@code district: categorical (7 distinct text values ...)}. */
    public static String describe(Inferred i) {
        return i.variable().name() + ": " + i.variable().kind().name().toLowerCase(Locale.ROOT) + " (" + i.reason() + ")";
    }
}
