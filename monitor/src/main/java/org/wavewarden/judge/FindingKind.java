package org.wavewarden.judge;

/** What a finding is about: a distribution shift, a changed relationship, or one of the data-quality signals. */
public enum FindingKind {
    /** The variable's distribution moved between the waves (location, shares or proportion). */
    SHIFT,
    /**
     * The answers of the respondents present in both waves moved, compared pair by pair (paired t or signed rank,
     * McNemar, Stuart-Maxwell); judged and alerted like {@link #SHIFT}.
     */
    PANEL_SHIFT,
    /** The location test is quiet but the shape changed (KS or Wasserstein beyond its threshold). */
    SHAPE_CHANGE,
    /** The wave against a configured reference mean or reference shares (one-sample tests). */
    REFERENCE,
    /**
     * Two configured variables go together more or less strongly than in the baseline: the difference of their
     * Spearman correlations, judged like a shift.
     */
    RELATIONSHIP_CHANGE,
    /** Codebook missing codes, counted by reason. */
    MISSING_CODE,
    /** The share of a missing reason moved between the waves. */
    MISSING_RATE_CHANGE,
    BLANK,
    INVISIBLE,
    PLACEHOLDER,
    PATTERN_OUTLIER,
    NUMERIC_SENTINEL,
    OUT_OF_RANGE_SENTINEL,
    TEXT_IN_NUMERIC,
    SENTINEL_DATE,
    INLIER_SPIKE,
    /** Values outside the declared range. */
    OUT_OF_RANGE,
    /** A category present in the current wave but not the baseline. */
    CODE_APPEARED,
    /** A category present in the baseline but not the current wave. */
    CODE_VANISHED,
    /** A code answered in this wave that has no value label, while the variable's other codes have labels. */
    CODE_UNLABELLED,
    /** The same code has another label in this wave's codebook than in the baseline wave's. */
    LABEL_CHANGED,
    /** Digit preference on ages (Whipple's or Myers' index). */
    HEAPING,
    /** Terminal-digit preference on other numeric answers. */
    DIGIT_PREFERENCE,
    /** A wave listed with no rows at all: a finding on the dataset; the wave is never a baseline. */
    EMPTY_WAVE,
    /**
     * A rerun of a signed-off wave changed its findings: the release was signed on other numbers. A finding on the
     * whole wave.
     */
    SIGNED_WAVE_CHANGED,
    COLUMN_ADDED,
    COLUMN_DROPPED,
    COLUMN_RETYPED,
    ALL_NULL,
    CONSTANT,
    /**
     * An interviewer whose answers of a variable stand out from every other interviewer's beyond chance (after
     * false-discovery-rate control over the wave's interviewer tests): more missing or disguised-missing answers, or
     * another distribution. A finding on the interviewer's work, with a case list.
     */
    INTERVIEWER_OUTLIER,
    /** The intra-interviewer correlation of a variable lies above its threshold: answers cluster by interviewer. */
    INTERVIEWER_EFFECT,
    /** More distinct values than the monitor keeps; the comparison was skipped or bounded. */
    TOO_MANY_DISTINCT,
    /** A variable that could not be compared this time, with the reason. */
    SKIPPED;

    public boolean isDataQuality() {
        return this != SHIFT && this != PANEL_SHIFT && this != SHAPE_CHANGE && this != REFERENCE
                && this != RELATIONSHIP_CHANGE && this != SKIPPED;
    }

    /** A change of the answers themselves, between two waves' distributions or within the same respondents. */
    public boolean isShift() {
        return this == SHIFT || this == PANEL_SHIFT;
    }
}
