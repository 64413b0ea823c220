package org.wavewarden.missing;

import java.util.Objects;

/**
 * One value suspected of meaning "no answer", with the evidence in words and a confidence.
 *
 * @param value      the raw value in its text form
 * @param kind       why it is suspected
 * @param count      rows carrying the value
 * @param share      count divided by the column's non-null rows
 * @param confidence how sure the detector is, in [0, 1]: about 0.9 for blanks and strong placeholders, 0.6 to 0.95
 *                   for sentinels depending on how far apart they stand, 0.3 to 0.5 for shape outliers
 * @param evidence   a plain sentence saying what was seen
 */
public record MissingCandidate(String value, CandidateKind kind, long count, double share, double confidence,
                               String evidence) {

    public MissingCandidate {
        Objects.requireNonNull(value, "value");
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(evidence, "evidence");
        if (count <= 0) {
            throw new IllegalArgumentException("count must be positive, was " + count + " for '" + value + "'");
        }
        if (!(share >= 0 && share <= 1)) {
            throw new IllegalArgumentException("share must lie in [0, 1], was " + share + " for '" + value + "'");
        }
        if (!(confidence >= 0 && confidence <= 1)) {
            throw new IllegalArgumentException("confidence must lie in [0, 1], was " + confidence + " for '" + value
                    + "'");
        }
    }
}
