package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyOut;
import org.wavewarden.config.Identifiers;

import java.sql.Connection;
import java.sql.SQLException;
import java.util.List;
import java.util.function.LongConsumer;

/**
 * Reads two selections of a source side by side, respondent by respondent: two releases of one wave, or two waves
 * of a panel. One {@code COPY (SELECT ... FROM before FULL JOIN after USING (key, r)) TO STDOUT} streams every row of
 * both sides exactly once, so the JVM holds one joined row at a time and the source is read in one statement.
 *
 * <p>Each side numbers its rows within a key ({@code r}) and counts them ({@code n}) in the same pass. Joining on
 * the key and that number pairs a respondent's row with its counterpart when the key is unique on both sides, and
 * keeps every row of a key that is duplicated (or NULL) on one side a row of its own, never a cross product. Such a
 * row cannot be matched to one respondent: it goes to {@link Visitor#unmatched} and is counted in {@link SideKeys},
 * a data-quality problem to report rather than a reason to fail.
 *
 * <p>Values arrive in PostgreSQL's text form ({@code DateStyle} ISO, as the wave scanners read them) with NULL as
 * {@code null}; keys are compared as text, so a key that changed type between two tables still matches.
 */
public final class KeyedPairReader {

    /** Example keys kept per side for duplicate keys. */
    public static final int EXAMPLES = 5;

    private KeyedPairReader() {
    }

    /**
     * One side of the pair.
     *
     * @param label      how a reader knows this side ("release 2 of wave 2025-Q1")
     * @param fromClause its {@code FROM ... [WHERE ...]} as {@link WaveSource#fromClause} builds it: identifiers
     *                   quoted, labels escaped as literals
     */
    public record Selection(String label, String fromClause) {
    }

    /** What the reader hands on, one joined row at a time. The arrays are reused: copy what must be kept. */
    public interface Visitor {

        /**
         * A respondent whose key is unique on each side it appears on: {@code before == null} for an added respondent,
         * {@code after == null} for a removed one; otherwise the two rows of the same respondent.
         */
        void row(String key, String[] before, String[] after);

        /**
         * A row whose key is NULL ({@code key == null}) or occurs more than once on a side: it belongs to its side's
         * answers but cannot be matched to one respondent. Every such row comes exactly once; either array may be
         * null.
         */
        void unmatched(String key, String[] before, String[] after);
    }

    /**
     * The respondent keys of one side.
     *
     * @param rows              rows of the side
     * @param nullKeyRows       rows whose key is NULL
     * @param duplicateKeys     distinct keys that occur more than once
     * @param duplicateKeyRows  rows carrying such a key
     * @param duplicateExamples up to {@link #EXAMPLES} of those keys, the smallest in {@link KeyOrder}
     */
    public record SideKeys(long rows, long nullKeyRows, long duplicateKeys, long duplicateKeyRows,
                           List<String> duplicateExamples) {

        public SideKeys {
            duplicateExamples = List.copyOf(duplicateExamples);
        }

        /** Rows that can be matched to one respondent. */
        public long keyedRows() {
            return rows - nullKeyRows - duplicateKeyRows;
        }
    }

    /** The outcome of one read: how many joined rows came and what the keys of each side looked like. */
    public record PairScan(long joinedRows, SideKeys before, SideKeys after) {
    }

    /**
     * Streams the pair to the visitor.
     *
     * @param keyColumn the respondent key, a validated identifier present on both sides
     * @param columns   the columns to hand on, present on both sides, in the order of the visitor's arrays
     * @param progress  told the joined rows read so far every 65,536 rows; may be null
     * @throws WaveScanner.SourceReadException when the source cannot be read
     */
    public static PairScan read(Handle h, String keyColumn, List<String> columns, Selection before, Selection after,
                                Visitor visitor, LongConsumer progress) {
        String sql = copySql(keyColumn, columns, before, after);
        int k = columns.size();
        String[] fields = new String[5 + 2 * k];
        String[] b = new String[k];
        String[] a = new String[k];
        Side sb = new Side();
        Side sa = new Side();
        long joined = 0;
        try {
            Connection c = h.getConnection();
            try (var st = c.createStatement()) {
                st.execute("SET DateStyle = 'ISO, YMD'"); // the text forms the wave scanners read
            }
            CopyOut copy = c.unwrap(PGConnection.class).getCopyAPI().copyOut(sql);
            byte[] row;
            while ((row = copy.readFromCopy()) != null) {
                int n = CopyTextRow.split(row, fields);
                if (n != fields.length) {
                    throw new IllegalStateException("COPY row had " + n + " fields, expected " + fields.length);
                }
                String key = fields[0];
                boolean hasBefore = fields[2] != null;
                boolean hasAfter = fields[4] != null;
                if (hasBefore) {
                    System.arraycopy(fields, 5, b, 0, k);
                }
                if (hasAfter) {
                    System.arraycopy(fields, 5 + k, a, 0, k);
                }
                boolean dupBefore = hasBefore && sb.count(key, fields[1], fields[2]);
                boolean dupAfter = hasAfter && sa.count(key, fields[3], fields[4]);
                if (key == null || dupBefore || dupAfter) {
                    visitor.unmatched(key, hasBefore ? b : null, hasAfter ? a : null);
                } else {
                    visitor.row(key, hasBefore ? b : null, hasAfter ? a : null);
                }
                joined++;
                if ((joined & 0xFFFF) == 0 && progress != null) {
                    progress.accept(joined);
                }
            }
        } catch (SQLException e) {
            throw new WaveScanner.SourceReadException("reading " + before.label() + " beside " + after.label()
                    + " failed: " + e.getMessage(), e);
        }
        return new PairScan(joined, sb.keys(), sa.keys());
    }

    /** The form in which a value enters a tally or a report: long values shortened as the wave scanners keep them. */
    public static String tallied(String value) {
        return ValueText.kept(value);
    }

    static String copySql(String keyColumn, List<String> columns, Selection before, Selection after) {
        StringBuilder sql = new StringBuilder("COPY (SELECT k, a.r, a.n, b.r, b.n");
        for (String side : new String[] {"a", "b"}) {
            for (int i = 0; i < columns.size(); i++) {
                sql.append(", ").append(side).append(".c").append(i);
            }
        }
        sql.append(" FROM ").append(side(keyColumn, columns, before)).append(" a FULL JOIN ")
                .append(side(keyColumn, columns, after)).append(" b USING (k, r)) TO STDOUT");
        return sql.toString();
    }

    /**
     * One side with every output column renamed ({@code k, r, n, c0, c1, ...}), so no source column name can
     * collide with the bookkeeping columns or make a reference ambiguous.
     */
    private static String side(String keyColumn, List<String> columns, Selection s) {
        String key = Identifiers.quote(keyColumn) + "::text";
        StringBuilder sb = new StringBuilder("(SELECT ").append(key)
                .append(" AS k, row_number() OVER w AS r, count(*) OVER w AS n");
        for (int i = 0; i < columns.size(); i++) {
            sb.append(", ").append(Identifiers.quote(columns.get(i))).append(" AS c").append(i);
        }
        return sb.append(s.fromClause()).append(" WINDOW w AS (PARTITION BY ").append(key).append("))").toString();
    }

    /** Counts one side's keys as its rows go by. */
    private static final class Side {
        long rows;
        long nullKeyRows;
        long duplicateKeys;
        long duplicateKeyRows;
        final KeyOrder.Smallest<String> examples = new KeyOrder.Smallest<>(EXAMPLES, x -> x);

        /** Counts a row of this side; true when its key is duplicated here. */
        boolean count(String key, String rowNumber, String rowsOfKey) {
            rows++;
            if (key == null) {
                nullKeyRows++;
                return false;
            }
            if (rowsOfKey.equals("1")) {
                return false;
            }
            duplicateKeyRows++;
            if (rowNumber.equals("1")) {
                duplicateKeys++;
                examples.offer(key);
            }
            return true;
        }

        SideKeys keys() {
            return new SideKeys(rows, nullKeyRows, duplicateKeys, duplicateKeyRows, examples.sorted());
        }
    }
}
