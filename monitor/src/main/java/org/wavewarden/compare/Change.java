package org.wavewarden.compare;

/**
 * The change a reader cares about, in the variable's own terms, for the sentence of a finding.
 *
 * @param measure   what moved, e.g. "mean commute_minutes", "share answering 'heat pump'"
 * @param before    its value in the baseline wave
 * @param after     its value in the current wave
 * @param percent   true when before and after are shares (rendered as %, their difference as points)
 * @param unit      unit of before/after when not a share; may be null
 * @param ciLow     lower limit of the difference after - before (same scale), or NaN
 * @param ciHigh    upper limit of the difference, or NaN
 * @param note      an extra clause, e.g. "the largest move among 6 categories"; may be empty
 */
public record Change(String measure, double before, double after, boolean percent, String unit, double ciLow,
                     double ciHigh, String note) {

    public double difference() {
        return after - before;
    }
}
