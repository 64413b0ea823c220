package org.wavewarden.missing;

/** Why a value is suspected of meaning "no answer" although it is not SQL NULL. */
public enum CandidateKind {
    /** The empty string or ASCII white space only. */
    BLANK,
    /** Only no-break spaces, zero-width characters, other Unicode space separators (and white space). */
    INVISIBLE,
    /** A token people write for "no answer": "N/A", "null", "-", "don't know", ... */
    PLACEHOLDER,
    /** A value whose character shape is rare and unlike the column's dominant shapes. */
    PATTERN_OUTLIER,
    /** A number of sentinel shape (9, 99, 999, 98, -1, -9, ...) standing apart from the bulk or spiking in it. */
    NUMERIC_SENTINEL,
    /** A repeated number outside the declared range that is not of sentinel shape, e.g. 0 where 1..5 is declared. */
    OUT_OF_RANGE_SENTINEL,
    /** A non-number in a text column whose values are otherwise numbers. */
    TEXT_IN_NUMERIC,
    /** A placeholder date (1900-01-01, 1970-01-01, 9999-12-31, ...) standing apart from the bulk or spiking in it. */
    SENTINEL_DATE,
    /** An ordinary-looking value repeated far more often than its neighbours, as a form default would be. */
    INLIER_SPIKE
}
