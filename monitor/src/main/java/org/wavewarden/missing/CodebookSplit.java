package org.wavewarden.missing;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import org.wavewarden.profile.ColumnTally;

/**
 * A column tally split by a {@link Codebook} into the rows coded as missing (counted per reason) and the valid rows.
 *
 * @param countsByReason rows carrying a missing code, per reason, in codebook order; every reason of the codebook is
 *                       present, with 0 when none of its codes occurs, so that rates can be compared between waves
 * @param validOnly      the tally without the coded values; its {@code rowCount} excludes the coded rows, so that
 *                       {@code validOnly.nonNullCount()} is the number of valid answers
 */
public record CodebookSplit(Map<String, Long> countsByReason, ColumnTally validOnly) {

    public CodebookSplit {
        countsByReason = Collections.unmodifiableMap(new LinkedHashMap<>(countsByReason));
        for (Map.Entry<String, Long> e : countsByReason.entrySet()) {
            if (e.getValue() == null || e.getValue() < 0) {
                throw new IllegalArgumentException("countsByReason[" + e.getKey() + "] must be a non-negative count, was "
                        + e.getValue());
            }
        }
    }

    /** Rows carrying any missing code. */
    public long codedMissingCount() {
        return countsByReason.values().stream().mapToLong(Long::longValue).sum();
    }
}
