package org.wavewarden.profile;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * Every distinct non-null value of one column in one wave, in PostgreSQL's text form, with its count.
 *
 * <p>The read stage builds one per monitored column in a single pass over the wave; the missing-in-disguise
 * detectors and the typed distributions ({@link NumericDistribution}, {@link CategoryCounts}) are derived from it.
 * A numeric column with more distinct values than the reader keeps exactly is summarised instead
 * ({@link RelativeBins}): code-like numbers stay exact, every other value is replaced by its bin's stand-in, and
 * {@code binning} says how far a stand-in can be from the values it replaces.
 *
 * @param column      the source column name
 * @param type        the column's storage class
 * @param rowCount    rows in the wave
 * @param nullCount   rows where the column is SQL NULL
 * @param valueCounts distinct non-null values (text form, untrimmed) to counts; iteration order is not meaningful
 * @param truncated   true when a non-numeric column had more distinct values than the reader keeps; then
 *                    valueCounts holds only the values seen before the cap and {@code rowCount - nullCount} exceeds
 *                    their sum
 * @param binning     {@link Binning#EXACT}, or the relative bins numeric values were summarised in
 */
public record ColumnTally(String column, ColumnType type, long rowCount, long nullCount,
                          Map<String, Long> valueCounts, boolean truncated, Binning binning) {

    public ColumnTally {
        if (nullCount < 0 || nullCount > rowCount) {
            throw new IllegalArgumentException("nullCount " + nullCount + " outside [0, rowCount=" + rowCount + "]");
        }
        valueCounts = Collections.unmodifiableMap(new LinkedHashMap<>(valueCounts));
        binning = binning == null ? Binning.EXACT : binning; // summaries stored before binning existed were exact
    }

    public ColumnTally(String column, ColumnType type, long rowCount, long nullCount, Map<String, Long> valueCounts,
                       boolean truncated) {
        this(column, type, rowCount, nullCount, valueCounts, truncated, Binning.EXACT);
    }

    /** Rows with a non-null value. */
    public long nonNullCount() {
        return rowCount - nullCount;
    }

    public int distinctCount() {
        return valueCounts.size();
    }

}
