package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;

import java.util.List;
import java.util.Optional;

/**
 * The case lists of a run, as stored beside its findings: for every data-quality finding and every flagged
 * interviewer, the respondent keys involved with the offending values only (no other answer), capped and counted.
 */
public final class CaseLists {

    /**
     * One finding's case list.
     *
     * @param findingId  the finding's row
     * @param runId      its run
     * @param variable   the variable whose values are listed
     * @param kind       the finding's kind (name)
     * @param selection  what selected the cases, for a reader, e.g. "height_cm = 999, interviewer_id = H17"
     * @param total      how many cases matched
     * @param rows       the cases kept, at most the cap, in respondent-key order
     */
    public record CaseList(long findingId, long runId, String variable, String kind, String selection, long total,
                           List<CaseRow> rows) {

        public CaseList {
            rows = List.copyOf(rows);
        }

        /** Whether more cases matched than were kept. */
        public boolean capped() {
            return total > rows.size();
        }
    }

    /** One case: the respondent key and the offending value (text form; null for SQL NULL). */
    public record CaseRow(String respondentKey, String value) {
    }

    private final Jdbi jdbi;
    private final String schema;

    public CaseLists(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.schema = schema;
    }

    /** Every case list of a run, in finding order. */
    public List<CaseList> forRun(long runId) {
        throw new UnsupportedOperationException("skeleton: case-list owner implements");
    }

    /** The case list of one finding, if it has one. */
    public Optional<CaseList> forFinding(long findingId) {
        throw new UnsupportedOperationException("skeleton: case-list owner implements");
    }
}
