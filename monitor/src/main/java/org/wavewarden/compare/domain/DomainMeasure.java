package org.wavewarden.compare.domain;

import java.util.Set;

/**
 * The one number per domain and wave a breakdown compares.
 *
 * @param kind     what the number is
 * @param variable the monitored column it is computed from
 * @param target   SHARE and RATE: the values (text form, as tallied) counted; {@link #NULL} in a RATE's target
 *                 counts SQL NULLs too; ignored for MEAN
 * @param excluded SHARE and MEAN: values left out of the valid answers (declared and found missing codes, values
 *                 outside the range), as the whole wave's comparison leaves them out
 * @param label    what the number is for a reader, e.g. "share answering yes", "mean", "share of 999"
 * @param unit     "points" for SHARE and RATE (reported as percentage points), the variable's unit for MEAN
 */
public record DomainMeasure(Kind kind, String variable, Set<String> target, Set<String> excluded, String label,
                            String unit) {

    /** Stands for SQL NULL in a RATE's target. */
    public static final String NULL = "\u0000NULL";

    public enum Kind {
        /** Weighted share of the target values among the valid answers (non-null, not excluded). */
        SHARE,
        /** Weighted mean of the valid numeric answers. */
        MEAN,
        /**
         * Unweighted share of the domain's rows whose value is a target (NULLs in the denominator): how often the
         * data hold a sentinel, a blank or a code, a question about records rather than the population.
         */
        RATE
    }

    public DomainMeasure {
        target = target == null ? Set.of() : Set.copyOf(target);
        excluded = excluded == null ? Set.of() : Set.copyOf(excluded);
    }
}
