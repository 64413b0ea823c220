package org.wavewarden.compare;

/**
 * The change a reader cares about, in the variable's own terms, for the sentence of a finding.
 *
 * @param measure   what moved, e.g. "mean commute_minutes", "share answering 'heat pump'"
 * @param before    its value in the baseline wave
 * @param after     its value in the current wave
 * @param percent   true when before and after are shares (rendered as %, their difference as points)
 * @param unit      unit of before/after when not a share; may be null
 * @param estimate  the estimated change whose interval is given: after - before, or a shift estimate such as
 *                  Hodges-Lehmann's when the measure is a median
 * @param ciLow     lower limit of that change (same scale), or NaN
 * @param ciHigh    upper limit of that change, or NaN
 * @param note      an extra clause, e.g. "the largest move among 6 categories"; may be empty
 */
public record Change(String measure, double before, double after, boolean percent, String unit, double estimate,
                     double ciLow, double ciHigh, String note) {
}
