package org.wavewarden.store;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.statement.PreparedBatch;
import org.wavewarden.config.Identifiers;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The case lists of a run, as stored beside its findings: for every data-quality finding and every flagged
 * interviewer, the respondent keys involved with the offending values only (no other answer), capped and counted.
 * They are written in the run's own transaction ({@link ResultsStore#writeRun}) and read back for the files, the
 * digest's links and the console.
 */
public final class CaseLists {

    /**
     * One finding's case list.
     *
     * @param findingId         the finding's row
     * @param runId             its run
     * @param variable          the variable whose values are listed
     * @param kind              the finding's kind (name)
     * @param selection         what selected the cases, for a reader, e.g. "height_cm = '999'"
     * @param total             how many cases matched
     * @param rows              the cases kept, at most the cap, in respondent-key order
     * @param interviewerColumn for an interviewer's list, the interviewer column; null otherwise
     * @param interviewer       for an interviewer's list, the interviewer's id
     * @param position          the finding's place among the run's findings (0 first, in the order written), so a
     *                          report's finding finds its list
     */
    public record CaseList(long findingId, long runId, String variable, String kind, String selection, long total,
                           List<CaseRow> rows, String interviewerColumn, String interviewer, int position) {

        public CaseList {
            rows = List.copyOf(rows);
        }

        /** A data-quality finding's list, outside any run's order. */
        public CaseList(long findingId, long runId, String variable, String kind, String selection, long total,
                        List<CaseRow> rows) {
            this(findingId, runId, variable, kind, selection, total, rows, null, null, -1);
        }

        /** Whether more cases matched than were kept. */
        public boolean capped() {
            return total > rows.size();
        }

        /**
         * The list's file beside {@code findings.json}, relative to it: {@code cases/<finding id>-<variable>.csv}
         * (and the interviewer for an interviewer's list). The variable and interviewer are data: only letters,
         * digits, '_' and '-' of them are kept, so a name is never a path; the finding id keeps names apart.
         */
        public String fileName() {
            return "cases/" + findingId + "-" + safe(variable)
                    + (interviewer == null ? "" : "-" + safe(interviewer)) + ".csv";
        }

        /** "12 cases" or "first 5,000 of 12,345 cases": what a link to the list says. */
        public String count() {
            return capped() ? String.format(java.util.Locale.ROOT, "first %,d of %,d cases", rows.size(), total)
                    : String.format(java.util.Locale.ROOT, "%,d case%s", total, total == 1 ? "" : "s");
        }
    }

    /** One case: the respondent key and the offending value (text form; null for SQL NULL). */
    public record CaseRow(String respondentKey, String value) {
    }

    /**
     * A case list made by a run, before its finding has a row: the finding is named by its place in the run's
     * findings as written.
     */
    public record Draft(int findingIndex, String variable, String kind, String selection, long total,
                        List<CaseRow> rows, String interviewerColumn, String interviewer) {

        public Draft {
            rows = List.copyOf(rows);
        }
    }

    /** Longest part of a file name made from data. */
    private static final int MAX_NAME_PART = 60;

    static String safe(String part) {
        StringBuilder sb = new StringBuilder();
        part.codePoints().limit(MAX_NAME_PART).forEach(cp -> sb.append(cp < 128 && (Character.isLetterOrDigit(cp)
                || cp == '_' || cp == '-') ? (char) cp : '_'));
        return sb.isEmpty() ? "_" : sb.toString();
    }

    private final Jdbi jdbi;
    private final String schema;
    private final String s;

    public CaseLists(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.schema = schema;
        this.s = Identifiers.quote(schema);
    }

    /**
     * Writes a run's case lists inside the run's transaction, after its findings: each draft's finding is the run's
     * finding at that place in the order written.
     */
    void insert(Handle h, long runId, List<Draft> drafts) {
        if (drafts.isEmpty()) {
            return;
        }
        List<Long> findingIds = h.createQuery("SELECT finding_id FROM " + s + ".finding WHERE run_id = :run"
                + " ORDER BY finding_id").bind("run", runId).mapTo(Long.class).list();
        PreparedBatch lists = h.prepareBatch("INSERT INTO " + s + ".case_list (finding_id, run_id, variable, kind,"
                + " selection, total, interviewer_column, interviewer) VALUES (:finding, :run, :variable, :kind,"
                + " :selection, :total, :interviewerColumn, :interviewer)");
        PreparedBatch rows = h.prepareBatch("INSERT INTO " + s + ".case_list_row (finding_id, position,"
                + " respondent_key, value) VALUES (:finding, :position, :key, :value)");
        boolean anyRow = false;
        for (Draft d : drafts) {
            long finding = findingIds.get(d.findingIndex());
            lists.bind("finding", finding).bind("run", runId).bind("variable", d.variable()).bind("kind", d.kind())
                    .bind("selection", d.selection()).bind("total", d.total())
                    .bind("interviewerColumn", d.interviewerColumn()).bind("interviewer", d.interviewer()).add();
            for (int i = 0; i < d.rows().size(); i++) {
                rows.bind("finding", finding).bind("position", i).bind("key", d.rows().get(i).respondentKey())
                        .bind("value", d.rows().get(i).value()).add();
                anyRow = true;
            }
        }
        lists.execute();
        if (anyRow) {
            rows.execute();
        }
    }

    /** Every case list of a run, in finding order. */
    public List<CaseList> forRun(long runId) {
        return read("c.run_id = :id", runId);
    }

    /** The case list of one finding, if it has one. */
    public Optional<CaseList> forFinding(long findingId) {
        return read("c.finding_id = :id", findingId).stream().findFirst();
    }

    /** The lists matching {@code where} (fixed SQL text with the one bind {@code :id}) with their rows. */
    private List<CaseList> read(String where, long id) {
        return jdbi.withHandle(h -> {
            Map<Long, List<CaseRow>> rows = new LinkedHashMap<>();
            h.createQuery("SELECT r.finding_id, r.respondent_key, r.value FROM " + s + ".case_list_row r JOIN " + s
                            + ".case_list c USING (finding_id) WHERE " + where + " ORDER BY r.finding_id, r.position")
                    .bind("id", id)
                    .map((rs, ctx) -> {
                        rows.computeIfAbsent(rs.getLong(1), k -> new ArrayList<>())
                                .add(new CaseRow(rs.getString(2), rs.getString(3)));
                        return 0;
                    }).list();
            return h.createQuery("SELECT c.finding_id, c.run_id, c.variable, c.kind, c.selection, c.total,"
                            + " c.interviewer_column, c.interviewer, (SELECT count(*) FROM " + s + ".finding f"
                            + " WHERE f.run_id = c.run_id AND f.finding_id < c.finding_id) AS position FROM " + s
                            + ".case_list c WHERE " + where + " ORDER BY c.finding_id")
                    .bind("id", id)
                    .map((rs, ctx) -> new CaseList(rs.getLong("finding_id"), rs.getLong("run_id"),
                            rs.getString("variable"), rs.getString("kind"), rs.getString("selection"),
                            rs.getLong("total"), rows.getOrDefault(rs.getLong("finding_id"), List.of()),
                            rs.getString("interviewer_column"), rs.getString("interviewer"), rs.getInt("position")))
                    .list();
        });
    }

    /** The schema the lists live in. */
    public String schema() {
        return schema;
    }
}
