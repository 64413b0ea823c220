package org.wavewarden.review;

import java.time.Instant;
import java.util.List;

/**
 * An alert as a reader of its lifecycle sees it: the stored event (named by its lead finding) with its state and
 * its latest action.
 *
 * @param againstWave the comparison wave, '' when there is none (as in the results schema)
 * @param verdict     the lead's verdict, null for a data-quality finding without one
 * @param otherKinds  the kinds of the event's other findings, in order of urgency
 * @param last        the latest entry of its history (never null once written: creation is an entry)
 */
public record AlertView(long alertId, long runId, String dataset, String wave, String againstWave, String variable,
                        String kind, String verdict, String sentence, List<String> otherKinds, Instant createdAt,
                        AlertState state, ReviewEntry last) {

    public AlertView {
        otherKinds = otherKinds == null ? List.of() : List.copyOf(otherKinds);
    }
}
