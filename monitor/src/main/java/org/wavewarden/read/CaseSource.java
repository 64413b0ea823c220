package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.statement.Query;
import org.wavewarden.config.Identifiers;
import org.wavewarden.missing.CaseSelection.Selection;
import org.wavewarden.store.CaseLists.CaseRow;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Reads the cases of every case list of a run in one statement over the judged wave: the respondent key, the
 * variables involved and the interviewer columns, of the rows any list selects. The rows are routed to the lists
 * here, each list counting every row it matches and keeping the first {@code maxCases} in respondent-key order, so
 * the memory held is bounded by the cap, not by the wave.
 *
 * <p>Values are compared in PostgreSQL's text form ({@code format('%s', column)}), the form the wave scanner tallied
 * them in, under the same {@code DateStyle}. Every value, the wave label included, is a bind parameter (the values of
 * a list as one text array); the SQL text holds only validated, quoted identifiers.
 */
public final class CaseSource {

    private CaseSource() {
    }

    /** What one list gathered: every matching row counted, the first ones kept. */
    public record Gathered(long total, List<CaseRow> rows) {
    }

    /**
     * Reads the lists' cases. Runs in a transaction of its own on {@code h}: {@code SET LOCAL DateStyle} (a setting,
     * not a read) gives dates the text form the scanner read, and the query streams its rows.
     *
     * @param source        where the wave is
     * @param wave          the judged wave
     * @param respondentKey the column identifying a respondent (validated here)
     * @param lists         the selections, at least one
     * @param maxCases      most rows kept per list
     * @return per selection, in the order given, its total and kept rows
     */
    public static List<Gathered> read(Handle h, WaveSource source, String wave, String respondentKey,
                                      List<Selection> lists, int maxCases) {
        if (lists.isEmpty()) {
            return List.of();
        }
        String key = Identifiers.quote(Identifiers.require("respondentKey", respondentKey));
        Map<String, Integer> columns = new LinkedHashMap<>();
        for (Selection s : lists) {
            columns.putIfAbsent(s.variable(), columns.size());
            if (s.interviewerColumn() != null) {
                columns.putIfAbsent(s.interviewerColumn(), columns.size());
            }
        }
        StringBuilder sql = new StringBuilder("SELECT ").append(text(key)).append(" AS k");
        for (Map.Entry<String, Integer> c : columns.entrySet()) {
            sql.append(", ").append(text(Identifiers.quote(c.getKey())))
                    .append(" AS c").append(c.getValue());
        }
        sql.append(from(source, wave)).append(" AND (");
        for (int j = 0; j < lists.size(); j++) {
            Selection s = lists.get(j);
            String col = Identifiers.quote(s.variable());
            List<String> either = new ArrayList<>();
            if (s.anyAnswer()) {
                either.add(col + " IS NOT NULL");
            }
            if (!s.values().isEmpty()) {
                either.add("format('%s', " + col + ") = ANY(CAST(:v" + j + " AS text[]))");
            }
            if (s.nulls()) {
                either.add(col + " IS NULL");
            }
            sql.append(j == 0 ? "" : " OR ").append('(');
            if (s.interviewerColumn() != null) {
                sql.append("format('%s', ").append(Identifiers.quote(s.interviewerColumn())).append(") = :i").append(j)
                        .append(" AND ");
            }
            sql.append('(').append(either.isEmpty() ? "false" : String.join(" OR ", either)).append("))");
        }
        sql.append(") ORDER BY ").append(key).append(", 1");

        long[] totals = new long[lists.size()];
        List<List<CaseRow>> kept = new ArrayList<>();
        lists.forEach(s -> kept.add(new ArrayList<>()));
        try {
            gather(h, sql.toString(), source, wave, lists, columns, maxCases, totals, kept);
        } catch (org.jdbi.v3.core.JdbiException e) {
            // As a failed scan: the source could not be read now, and the run is retried rather than written
            // without the lists its findings should have.
            throw new WaveScanner.SourceReadException("the case lists of wave " + wave + " could not be read: "
                    + e.getClass().getSimpleName(), e);
        }
        List<Gathered> out = new ArrayList<>();
        for (int j = 0; j < lists.size(); j++) {
            out.add(new Gathered(totals[j], kept.get(j)));
        }
        return out;
    }

    private static void gather(Handle h, String sql, WaveSource source, String wave, List<Selection> lists,
                               Map<String, Integer> columns, int maxCases, long[] totals, List<List<CaseRow>> kept) {
        h.useTransaction(tx -> {
            tx.execute("SET LOCAL DateStyle = 'ISO, YMD'");
            Query q = tx.createQuery(sql).setFetchSize(1_000);
            if (!source.onePerWave()) {
                q.bind("wave", wave);
            }
            for (int j = 0; j < lists.size(); j++) {
                Selection s = lists.get(j);
                if (!s.values().isEmpty()) {
                    q.bind("v" + j, s.values().stream().sorted().toArray(String[]::new));
                }
                if (s.interviewerColumn() != null) {
                    q.bind("i" + j, s.interviewer());
                }
            }
            try (var rows = q.map((rs, ctx) -> {
                String[] row = new String[columns.size() + 1];
                for (int i = 0; i < row.length; i++) {
                    row[i] = rs.getString(i + 1);
                }
                return row;
            }).stream()) {
                rows.forEach(row -> {
                    for (int j = 0; j < lists.size(); j++) {
                        Selection s = lists.get(j);
                        String value = row[1 + columns.get(s.variable())];
                        String interviewer = s.interviewerColumn() == null ? null
                                : row[1 + columns.get(s.interviewerColumn())];
                        if (s.matches(value, interviewer)) {
                            totals[j]++;
                            if (kept.get(j).size() < maxCases) {
                                kept.get(j).add(new CaseRow(row[0], value));
                            }
                        }
                    }
                });
            }
        });
    }

    /** A column in the text form the scanner tallies, SQL NULL kept as NULL ({@code format} would print ''). */
    private static String text(String quoted) {
        return "CASE WHEN " + quoted + " IS NULL THEN NULL ELSE format('%s', " + quoted + ") END";
    }

    /**
     * {@code FROM table WHERE <the wave>}: as {@link WaveSource#fromClause(String)} selects it (the latest release
     * only, where releases are kept), with the wave label bound as {@code :wave} rather than written as a literal.
     */
    static String from(WaveSource source, String wave) {
        String table = source.tableFor(wave).quoted();
        StringBuilder sb = new StringBuilder(" FROM ").append(table).append(" WHERE ");
        if (!source.onePerWave()) {
            sb.append(Identifiers.quote(source.waveColumn())).append("::text = :wave");
        } else {
            sb.append("true"); // the table holds this wave alone
        }
        if (source.releaseColumn() != null) {
            String rc = Identifiers.quote(source.releaseColumn());
            sb.append(" AND ").append(rc).append(" = (SELECT max(r.").append(rc).append(") FROM ").append(table)
                    .append(" r");
            if (!source.onePerWave()) {
                sb.append(" WHERE r.").append(Identifiers.quote(source.waveColumn())).append("::text = :wave");
            }
            sb.append(')');
        }
        return sb.toString();
    }
}
