package org.wavewarden.load;

import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;

import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * The table a wave is imported into: created when it does not exist and the user asked for it ({@code --create}),
 * one table per dataset with the wave column first; never widened or retyped when it exists. A file column the
 * table lacks, or whose values the table's column cannot hold (text into a number column, a fraction into an
 * integer column), is refused before a row is loaded, with the statement the user could run if the change is
 * intended.
 */
public final class TableShape {

    private TableShape() {
    }

    /**
     * A column the file brings, with the PostgreSQL type its values need.
     *
     * @param name    the column name in the table (see {@link #columnName})
     * @param sqlType {@code bigint}, {@code double precision}, {@code date}, {@code timestamp} or {@code text}
     * @param why     where the type came from, printed with the guess ("SPSS format F8.2", "every value an integer")
     */
    public record Column(String name, String sqlType, String why) {
    }

    /**
     * What was found or done.
     *
     * @param created whether the table was created now
     * @param lines   one line per decision, for the user to read
     */
    public record Outcome(boolean created, List<String> lines) {
    }

    /** Types a column of the first kind can take values of the second kind into without loss. */
    private static final Map<String, Set<String>> HOLDS = Map.of(
            "text", Set.of("text", "bigint", "double precision", "date", "timestamp"),
            "double precision", Set.of("double precision", "bigint"),
            "numeric", Set.of("double precision", "bigint"),
            "real", Set.of("bigint"),
            "bigint", Set.of("bigint"),
            "integer", Set.of("bigint"),
            "smallint", Set.of("bigint"),
            "date", Set.of("date"),
            "timestamp without time zone", Set.of("timestamp", "date"),
            "timestamp with time zone", Set.of("timestamp", "date"));

    /**
     * The column name a file's variable gets in a created table: lower case (SPSS names are case-insensitive and a
     * mixed-case PostgreSQL name must be quoted for ever after), every character outside letters, digits and
     * underscore replaced by an underscore, a leading digit prefixed with {@code v_}, cut to 63 characters.
     */
    public static String columnName(String fileName) {
        return org.wavewarden.codebook.ColumnNames.of(fileName);
    }

    /** The table's columns and their types ({@code format_type}), in order; empty when the table does not exist. */
    public static Map<String, String> existing(Connection c, TableName table) throws SQLException {
        Map<String, String> out = new LinkedHashMap<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT a.attname, format_type(a.atttypid, a.atttypmod)"
                + " FROM pg_catalog.pg_attribute a JOIN pg_catalog.pg_class k ON k.oid = a.attrelid"
                + " JOIN pg_catalog.pg_namespace n ON n.oid = k.relnamespace WHERE n.nspname = ? AND k.relname = ?"
                + " AND a.attnum > 0 AND NOT a.attisdropped ORDER BY a.attnum")) {
            ps.setString(1, table.schema());
            ps.setString(2, table.table());
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    out.put(rs.getString(1), rs.getString(2));
                }
            }
        }
        return out;
    }

    /**
     * Creates the table when it does not exist and {@code create} is set; otherwise checks that it can take the
     * file's columns as they are. Runs in the caller's transaction, so a refused or failed import leaves no table.
     *
     * @param waveColumn the dataset's wave column; created as {@code text NOT NULL} unless the file has it
     * @param columns    the file's columns (names already in table form), in file order
     * @throws ConfigException with key {@code table} when the table is missing and {@code create} is not set, or
     *                         when it exists but lacks a column or cannot hold a column's values
     */
    public static Outcome ensure(Connection c, TableName table, String waveColumn, List<Column> columns,
                                 boolean create) throws SQLException {
        Identifiers.require("waveColumn", waveColumn);
        Map<String, String> have = existing(c, table);
        List<String> lines = new ArrayList<>();
        if (have.isEmpty()) {
            if (!create) {
                throw new ConfigException("table", "table " + table + " does not exist; pass --create to create it"
                        + " from the file's columns");
            }
            List<String> defs = new ArrayList<>();
            if (columns.stream().noneMatch(col -> col.name().equals(waveColumn))) {
                defs.add(Identifiers.quote(waveColumn) + " text NOT NULL");
                lines.add(waveColumn + " text (the wave column)");
            }
            for (Column col : columns) {
                Identifiers.require("column " + col.name(), col.name());
                if (!HOLDS.containsKey(col.sqlType()) && !col.sqlType().equals("timestamp")) {
                    throw new IllegalArgumentException("unsupported column type " + col.sqlType());
                }
                defs.add(Identifiers.quote(col.name()) + " " + col.sqlType());
                lines.add(col.name() + " " + col.sqlType() + (col.why() == null ? "" : " (" + col.why() + ")"));
            }
            try (Statement st = c.createStatement()) {
                st.execute("CREATE SCHEMA IF NOT EXISTS " + Identifiers.quote(table.schema()));
                st.execute("CREATE TABLE " + table.quoted() + " (" + String.join(", ", defs) + ")");
                st.execute("CREATE INDEX ON " + table.quoted() + " (" + Identifiers.quote(waveColumn) + ")");
            }
            lines.add(0, "created table " + table + " with " + defs.size() + " columns and an index on "
                    + waveColumn + ":");
            return new Outcome(true, lines);
        }
        if (!have.containsKey(waveColumn)) {
            throw new ConfigException("waveColumn", "table " + table + " has no column " + waveColumn);
        }
        List<String> refused = new ArrayList<>();
        for (Column col : columns) {
            String type = have.get(col.name());
            if (type == null) {
                refused.add("the file's column " + col.name() + " is not in the table (to add it: ALTER TABLE "
                        + table.quoted() + " ADD COLUMN " + Identifiers.quote(col.name()) + " " + col.sqlType() + ")");
            } else if (!holds(type, col.sqlType())) {
                refused.add("column " + col.name() + " is " + type + " in the table but the file's values need "
                        + col.sqlType() + (col.why() == null ? "" : " (" + col.why() + ")"));
            }
        }
        if (!refused.isEmpty()) {
            throw new ConfigException("table", "table " + table + " exists and is never widened or retyped by an"
                    + " import: " + String.join("; ", refused) + "; nothing was imported");
        }
        lines.add("table " + table + " exists and holds every column of the file");
        return new Outcome(false, lines);
    }

    /** Whether a table column of {@code tableType} takes the values of a file column needing {@code fileType}. */
    static boolean holds(String tableType, String fileType) {
        String t = tableType.replaceAll("\\(.*\\)", "").strip();
        if (t.startsWith("character varying") || t.startsWith("character") || t.equals("text")) {
            return true;
        }
        Set<String> ok = HOLDS.get(t);
        return ok != null && ok.contains(fileType);
    }
}
