package org.wavewarden.store;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.compare.release.ReleaseRevision;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.ReleaseReport;

import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.util.List;
import java.util.Optional;

/**
 * Release comparisons in the results schema, append-only: each comparison of two publications of a wave with its
 * counts, its {@code releases.json} (as jsonb) and its {@code releases.md} (as written), so that a reader of the
 * results schema alone (the console) can show and hand out what the comparison found.
 */
public final class ReleaseComparisons {

    private final Jdbi jdbi;
    private final String s;

    public ReleaseComparisons(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
    }

    /**
     * One stored comparison. {@code release} and {@code againstRelease} are the two publications as the report names
     * them; the counts are the report's own (cells over the compared columns among the matched respondents).
     *
     * @param variablesChanged compared columns with at least one changed cell
     * @param reportJson       the stored {@code releases.json} content (as PostgreSQL gives jsonb back: same
     *                         content, keys in jsonb's order)
     * @param markdown         {@code releases.md} exactly as written beside the JSON
     */
    public record Stored(long comparisonId, String dataset, String wave, String release, String againstRelease,
                         Instant comparedAt, String toolVersion, long rowsBefore, long rowsAfter, long matched,
                         long rowsAdded, long rowsRemoved, long cellsCompared, long cellsChanged,
                         int variablesChanged, String reportJson, String markdown) {
    }

    private static final String COLUMNS = "comparison_id, dataset, wave, release, against_release, compared_at, tool_version,"
            + " rows_before, rows_after, matched, rows_added, rows_removed, cells_compared, cells_changed,"
            + " variables_changed, report::text AS report_text, markdown";

    /** Stores a comparison with the JSON and Markdown written for it; returns its id. */
    public long save(ReleaseReport report, String json, String markdown, String toolVersion) {
        ReleaseRevision v = report.revision();
        long compared = v.variables().stream().mapToLong(ReleaseRevision.VariableChanges::comparedCells).sum();
        long changed = v.variables().stream().mapToLong(ReleaseRevision.VariableChanges::changedCells).sum();
        int variablesChanged = (int) v.variables().stream().filter(c -> c.changedCells() > 0).count();
        return jdbi.withHandle(h -> h.createUpdate("INSERT INTO " + s + ".release_comparison (dataset, wave, release,"
                        + " against_release, compared_at, tool_version, rows_before, rows_after, matched, rows_added,"
                        + " rows_removed, cells_compared, cells_changed, variables_changed, report, markdown) VALUES"
                        + " (:dataset, :wave, :release, :against, :at, :tool, :rowsBefore, :rowsAfter, :matched,"
                        + " :added, :removed, :compared, :changed, :variablesChanged, CAST(:report AS jsonb),"
                        + " :markdown)")
                .bind("dataset", report.dataset()).bind("wave", report.wave())
                .bind("release", report.after()).bind("against", report.before())
                .bind("at", OffsetDateTime.ofInstant(report.generatedAt(), java.time.ZoneOffset.UTC))
                .bind("tool", toolVersion)
                .bind("rowsBefore", v.rowsBefore()).bind("rowsAfter", v.rowsAfter()).bind("matched", v.matched())
                .bind("added", v.added()).bind("removed", v.removed())
                .bind("compared", compared).bind("changed", changed).bind("variablesChanged", variablesChanged)
                .bind("report", json).bind("markdown", markdown)
                .executeAndReturnGeneratedKeys("comparison_id").mapTo(Long.class).one());
    }

    /** The wave's latest comparison, if it was ever compared. */
    public Optional<Stored> latest(String dataset, String wave) {
        return jdbi.withHandle(h -> ofWave(h, dataset, wave, 1).stream().findFirst());
    }

    /** Every comparison of the wave, latest first. */
    public List<Stored> all(String dataset, String wave) {
        return jdbi.withHandle(h -> ofWave(h, dataset, wave, Integer.MAX_VALUE));
    }

    /** The wave's comparisons, latest first, at most {@code limit}: one statement (the console's wave read too). */
    List<Stored> ofWave(Handle h, String dataset, String wave, int limit) {
        return h.createQuery("SELECT " + COLUMNS + " FROM " + s + ".release_comparison WHERE dataset = :d AND wave = :w"
                        + " ORDER BY comparison_id DESC LIMIT :limit")
                .bind("d", dataset).bind("w", wave).bind("limit", limit)
                .map((rs, ctx) -> stored(rs))
                .list();
    }

    private static Stored stored(ResultSet rs) throws SQLException {
        return new Stored(rs.getLong("comparison_id"), rs.getString("dataset"), rs.getString("wave"),
                rs.getString("release"), rs.getString("against_release"),
                rs.getObject("compared_at", OffsetDateTime.class).toInstant(), rs.getString("tool_version"),
                rs.getLong("rows_before"), rs.getLong("rows_after"), rs.getLong("matched"), rs.getLong("rows_added"),
                rs.getLong("rows_removed"), rs.getLong("cells_compared"), rs.getLong("cells_changed"),
                rs.getInt("variables_changed"), rs.getString("report_text"), rs.getString("markdown"));
    }
}
