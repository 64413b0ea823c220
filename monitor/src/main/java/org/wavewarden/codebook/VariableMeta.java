package org.wavewarden.codebook;

import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * One variable as a codebook describes it. Every field but {@code name} and {@code storage} may be absent (null or
 * empty) when the source says nothing of it.
 *
 * @param name          the column name
 * @param label         the variable label ("Tenure of the home")
 * @param storage       how the values are stored
 * @param width         characters of a text variable; null for numbers and dates
 * @param decimals      decimals the source's display format shows (SPSS F8.2 gives 2); null when unknown
 * @param format        the source's own format name, kept for the reader ("F8.2", "A20", "DATE11", "ADATE10")
 * @param measure       the declared measurement level
 * @param unit          the unit of an interval or ratio variable ("minutes"), when the codebook gives one
 * @param valueLabels   code -> label in the codebook's order; numeric codes in the form of {@link Codes#of}
 * @param missingCodes  values declared as "no answer", each with its reason (the value's label when it has one)
 * @param missingRanges ranges declared as "no answer"
 * @param validRange    the declared valid range, when the codebook gives one
 */
public record VariableMeta(String name, String label, StorageType storage, Integer width, Integer decimals,
                           String format, Measure measure, String unit, Map<String, String> valueLabels,
                           List<MissingCodeSpec> missingCodes, List<MissingRangeSpec> missingRanges,
                           RangeSpec validRange) {

    public VariableMeta {
        if (name == null || name.isBlank()) {
            throw new IllegalArgumentException("a codebook variable needs a name");
        }
        storage = storage == null ? StorageType.NUMBER : storage;
        measure = measure == null ? Measure.UNKNOWN : measure;
        valueLabels = valueLabels == null ? Map.of() : Collections.unmodifiableMap(new LinkedHashMap<>(valueLabels));
        missingCodes = missingCodes == null ? List.of() : List.copyOf(missingCodes);
        missingRanges = missingRanges == null ? List.of() : List.copyOf(missingRanges);
    }
}
