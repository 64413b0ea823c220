package org.wavewarden.load;

import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.deliver.DataText;

import java.sql.Array;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * The type each column of a CSV file needs, decided over every row of the file once it is in an all-text staging
 * table: {@code bigint} when every non-empty value is an integer, {@code double precision} when every one is a
 * number, {@code date} when every one is an ISO date, {@code timestamp} when every one is an ISO date or
 * date-time, else {@code text}. A codebook's storage type wins over the guess; a value the declared type cannot
 * hold is refused with its line. Each decision carries its evidence, printed for the user.
 */
final class CsvColumnTypes {

    /** Five aggregates per column; PostgreSQL allows 1,664 entries in a select list. */
    private static final int COLUMNS_PER_SCAN = 200;

    /** European spreadsheets write 2,5 for 2.5; such a column stays text, and the reason says why. */
    private static final java.util.regex.Pattern DECIMAL_COMMA =
            java.util.regex.Pattern.compile("\\s*[+-]?[0-9]*,[0-9]+\\s*");

    private CsvColumnTypes() {
    }

    /**
     * What the rows say of one column.
     *
     * @param values           the non-empty values
     * @param firstNotInteger  the line of the first non-empty value that is not an integer bigint holds, or null
     * @param firstNotNumber   likewise for a number
     * @param firstNotDate     likewise for an ISO date
     * @param firstNotDateTime likewise for an ISO date or date-time
     */
    record Evidence(long values, Long firstNotInteger, Long firstNotNumber, Long firstNotDate,
                    Long firstNotDateTime) {
    }

    /** The empty value, and its cast to another type: a blank field of a typed column is NULL. */
    static String trimmed(String column) {
        return "NULLIF(btrim(" + column + "), '')";
    }

    private static final String INTEGER = "'^[+-]?[0-9]{1,18}$'";
    private static final String NUMBER = "'^[+-]?([0-9]+[.]?[0-9]*|[.][0-9]+)([eE][+-]?[0-9]{1,2})?$'";
    private static final String DATE = "'^[0-9]{4}-[0-9]{2}-[0-9]{2}$'";
    private static final String DATE_TIME =
            "'^[0-9]{4}-[0-9]{2}-[0-9]{2}([ T]([01][0-9]|2[0-3]):[0-5][0-9](:[0-5][0-9]([.][0-9]{1,6})?)?)?$'";

    /**
     * Whether the ISO date at the start of {@code v} exists in the calendar, without a cast that could fail:
     * evaluated only after the pattern matched (CASE keeps that order).
     */
    private static String realDate(String v) {
        String y = "substr(" + v + ", 1, 4)::int";
        String m = "substr(" + v + ", 6, 2)::int";
        String d = "substr(" + v + ", 9, 2)::int";
        return "(" + y + " >= 1 AND " + m + " BETWEEN 1 AND 12 AND " + d + " BETWEEN 1 AND CASE WHEN " + m
                + " IN (4, 6, 9, 11) THEN 30 WHEN " + m + " <> 2 THEN 31 WHEN (" + y + " % 4 = 0 AND " + y
                + " % 100 <> 0) OR " + y + " % 400 = 0 THEN 29 ELSE 28 END)";
    }

    private static String firstLineNot(String v, String test) {
        return "min(wavewarden_line) FILTER (WHERE " + v + " IS NOT NULL AND NOT (" + test + "))";
    }

    /** Scans the staging table ({@code wavewarden_line}, {@code c1..cN}); one scan per 200 columns. */
    static List<Evidence> scan(Connection c, String staging, int columns) throws SQLException {
        List<Evidence> out = new ArrayList<>();
        for (int from = 0; from < columns; from += COLUMNS_PER_SCAN) {
            int to = Math.min(columns, from + COLUMNS_PER_SCAN);
            List<String> select = new ArrayList<>();
            for (int i = from; i < to; i++) {
                String v = trimmed("c" + (i + 1));
                select.add("count(" + v + ")");
                select.add(firstLineNot(v, v + " ~ " + INTEGER));
                select.add(firstLineNot(v, v + " ~ " + NUMBER));
                select.add(firstLineNot(v, "CASE WHEN " + v + " ~ " + DATE + " THEN " + realDate(v) + " ELSE false END"));
                select.add(firstLineNot(v, "CASE WHEN " + v + " ~ " + DATE_TIME + " THEN " + realDate(v)
                        + " ELSE false END"));
            }
            try (PreparedStatement ps = c.prepareStatement("SELECT " + String.join(", ", select) + " FROM " + staging);
                 ResultSet rs = ps.executeQuery()) {
                rs.next();
                for (int i = 0; i < to - from; i++) {
                    int k = i * 5;
                    out.add(new Evidence(rs.getLong(k + 1), line(rs, k + 2), line(rs, k + 3), line(rs, k + 4),
                            line(rs, k + 5)));
                }
            }
        }
        return out;
    }

    private static Long line(ResultSet rs, int i) throws SQLException {
        long v = rs.getLong(i);
        return rs.wasNull() ? null : v;
    }

    /** The values at the given lines, keyed "column index:line", fetched in one scan per 200 columns. */
    static Map<String, String> values(Connection c, String staging, Map<Integer, Set<Long>> wanted)
            throws SQLException {
        Map<String, String> out = new HashMap<>();
        List<Integer> cols = new ArrayList<>(wanted.keySet());
        for (int from = 0; from < cols.size(); from += COLUMNS_PER_SCAN) {
            List<Integer> part = cols.subList(from, Math.min(cols.size(), from + COLUMNS_PER_SCAN));
            Set<Long> lines = new LinkedHashSet<>();
            part.forEach(i -> lines.addAll(wanted.get(i)));
            StringBuilder sql = new StringBuilder("SELECT wavewarden_line");
            part.forEach(i -> sql.append(", c").append(i + 1));
            sql.append(" FROM ").append(staging).append(" WHERE wavewarden_line = ANY(?)");
            try (PreparedStatement ps = c.prepareStatement(sql.toString())) {
                Array a = c.createArrayOf("bigint", lines.toArray());
                ps.setArray(1, a);
                try (ResultSet rs = ps.executeQuery()) {
                    while (rs.next()) {
                        long line = rs.getLong(1);
                        for (int k = 0; k < part.size(); k++) {
                            out.put(part.get(k) + ":" + line, rs.getString(k + 2));
                        }
                    }
                }
            }
        }
        return out;
    }

    /**
     * The type of each column with its evidence.
     *
     * @param names    the columns' names in the file's header
     * @param codebook whose storage types win over the guess; may be null
     * @throws CsvWaveImporter.ImportRefusedException when a value is not of the type the codebook declares
     */
    static List<TableShape.Column> decide(Connection c, String staging, String file, List<String> names,
                                          List<String> tableNames, List<Evidence> evidence,
                                          DatasetCodebook codebook) throws SQLException {
        Map<Integer, Set<Long>> wanted = new HashMap<>();
        for (int i = 0; i < evidence.size(); i++) {
            Evidence e = evidence.get(i);
            for (Long l : new Long[] {e.firstNotInteger(), e.firstNotNumber(), e.firstNotDate(),
                    e.firstNotDateTime()}) {
                if (l != null) {
                    wanted.computeIfAbsent(i, k -> new LinkedHashSet<>()).add(l);
                }
            }
        }
        Map<String, String> at = wanted.isEmpty() ? Map.of() : values(c, staging, wanted);
        List<TableShape.Column> out = new ArrayList<>();
        for (int i = 0; i < evidence.size(); i++) {
            Evidence e = evidence.get(i);
            int col = i;
            java.util.function.Function<Long, String> shown = l -> "value '" + cut(at.get(col + ":" + l)) + "' at line "
                    + String.format(Locale.ROOT, "%,d", l);
            String every = "every one of " + String.format(Locale.ROOT, "%,d", e.values()) + " values ";
            Optional<VariableMeta> declared = codebook == null ? Optional.empty() : codebook.variable(names.get(i));
            String name = tableNames.get(i);
            if (declared.isPresent()) {
                StorageType s = declared.get().storage();
                String by = "the codebook (" + codebook.source() + ") declares " + s.name().toLowerCase(Locale.ROOT);
                Long bad = switch (s) {
                    case TEXT -> null;
                    case NUMBER -> e.firstNotNumber();
                    case DATE -> e.firstNotDate();
                    case DATETIME -> e.firstNotDateTime();
                };
                if (bad != null) {
                    throw new CsvWaveImporter.ImportRefusedException(file + " line " + String.format(Locale.ROOT,
                            "%,d", bad) + ", column " + (i + 1) + " (" + DataText.visible(names.get(i)) + "): '"
                            + cut(at.get(col + ":" + bad)) + "' is not a " + s.name().toLowerCase(Locale.ROOT)
                            + " but " + by + "; nothing was imported");
                }
                out.add(switch (s) {
                    case TEXT -> new TableShape.Column(name, "text", by);
                    case NUMBER -> e.firstNotInteger() == null
                            ? new TableShape.Column(name, "bigint", by + "; " + every + "is an integer")
                            : new TableShape.Column(name, "double precision", by + "; "
                            + shown.apply(e.firstNotInteger()) + " is not an integer");
                    case DATE -> new TableShape.Column(name, "date", by);
                    case DATETIME -> new TableShape.Column(name, "timestamp", by);
                });
                continue;
            }
            if (e.values() == 0) {
                out.add(new TableShape.Column(name, "text", "no values"));
            } else if (e.firstNotInteger() == null) {
                out.add(new TableShape.Column(name, "bigint", every + "is an integer"));
            } else if (e.firstNotNumber() == null) {
                out.add(new TableShape.Column(name, "double precision", every + "is a number; "
                        + shown.apply(e.firstNotInteger()) + " is not an integer"));
            } else if (e.firstNotDate() == null) {
                out.add(new TableShape.Column(name, "date", every + "is an ISO date (YYYY-MM-DD)"));
            } else if (e.firstNotDateTime() == null) {
                out.add(new TableShape.Column(name, "timestamp", every + "is an ISO date or date-time"));
            } else {
                // A column that starts with dates fails the number test first: its odd value is the non-date.
                boolean dateLike = e.firstNotNumber() < e.firstNotDateTime();
                String odd = at.get(col + ":" + e.firstNotNumber());
                String comma = odd != null && DECIMAL_COMMA.matcher(odd).matches()
                        ? " (numbers are read with a decimal point only)" : "";
                out.add(new TableShape.Column(name, "text", dateLike
                        ? shown.apply(e.firstNotDateTime()) + " is not a date"
                        : shown.apply(e.firstNotNumber()) + " is not a number" + comma));
            }
        }
        return out;
    }

    private static String cut(String v) {
        String s = DataText.visible(v == null ? "" : v);
        return s.length() > 40 ? s.substring(0, 40) + "..." : s;
    }
}
