package org.wavewarden.load;

import org.postgresql.PGConnection;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;

import java.io.BufferedReader;
import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.function.LongConsumer;
import java.util.zip.GZIPInputStream;

/**
 * Loads one wave from a CSV file into a source table with {@code COPY ... FROM STDIN (FORMAT csv)}: an unquoted
 * empty field is NULL, a quoted empty field ({@code ""}) is an empty string, as PostgreSQL defines the format.
 * The rows go through a temporary staging table and are inserted in one transaction, so a failed import leaves
 * nothing behind; the wave label is bound as a parameter, never pasted into SQL.
 */
public final class CsvWaveImporter {

    private CsvWaveImporter() {
    }

    public record Imported(String wave, long rows) {
    }

    public static Imported load(Connection c, TableName table, String waveColumn, String wave, Path csv,
                                boolean replace, LongConsumer bytesRead) throws SQLException, IOException {
        List<String> header = header(csv);
        List<String> tableColumns = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT a.attname FROM pg_catalog.pg_attribute a"
                + " JOIN pg_catalog.pg_class k ON k.oid = a.attrelid JOIN pg_catalog.pg_namespace n"
                + " ON n.oid = k.relnamespace WHERE n.nspname = ? AND k.relname = ? AND a.attnum > 0"
                + " AND NOT a.attisdropped ORDER BY a.attnum")) {
            ps.setString(1, table.schema());
            ps.setString(2, table.table());
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    tableColumns.add(rs.getString(1));
                }
            }
        }
        if (tableColumns.isEmpty()) {
            throw new ConfigException("table", "table " + table + " does not exist");
        }
        for (int i = 0; i < header.size(); i++) {
            String h = header.get(i);
            Identifiers.require("csv header column " + (i + 1), h);
            if (!tableColumns.contains(h)) {
                throw new ConfigException("csv header column " + (i + 1), "column " + h + " is not in " + table
                        + "; it has " + tableColumns);
            }
        }
        boolean autoCommit = c.getAutoCommit();
        c.setAutoCommit(false);
        try {
            long existing;
            try (PreparedStatement ps = c.prepareStatement("SELECT count(*) FROM " + table.quoted() + " WHERE "
                    + Identifiers.quote(waveColumn) + "::text = ?")) {
                ps.setString(1, wave);
                try (ResultSet rs = ps.executeQuery()) {
                    rs.next();
                    existing = rs.getLong(1);
                }
            }
            if (existing > 0 && !replace) {
                throw new ConfigException("--wave", "wave '" + wave + "' already has " + existing + " rows in " + table
                        + "; pass --replace to load it again");
            }
            try (Statement st = c.createStatement()) {
                // CREATE TABLE AS copies no NOT NULL constraint, so the wave column may stay empty until set below.
                st.execute("CREATE TEMP TABLE wavewarden_staging ON COMMIT DROP AS SELECT * FROM " + table.quoted()
                        + " WITH NO DATA");
            }
            String cols = String.join(", ", header.stream().map(Identifiers::quote).toList());
            long rows;
            try (InputStream in = counting(open(csv), bytesRead)) {
                rows = c.unwrap(PGConnection.class).getCopyAPI().copyIn("COPY wavewarden_staging (" + cols
                        + ") FROM STDIN (FORMAT csv, HEADER true)", in);
            }
            try (PreparedStatement ps = c.prepareStatement("UPDATE wavewarden_staging SET "
                    + Identifiers.quote(waveColumn) + " = ?")) {
                ps.setObject(1, wave, java.sql.Types.OTHER);
                ps.executeUpdate();
            }
            if (existing > 0) {
                try (PreparedStatement ps = c.prepareStatement("DELETE FROM " + table.quoted() + " WHERE "
                        + Identifiers.quote(waveColumn) + "::text = ?")) {
                    ps.setString(1, wave);
                    ps.executeUpdate();
                }
            }
            String wc = Identifiers.quote(waveColumn);
            String insertCols = header.contains(waveColumn) ? cols : cols + ", " + wc;
            try (Statement st = c.createStatement()) {
                // Naming the columns lets the table's own defaults fill any column the file does not have.
                st.executeUpdate("INSERT INTO " + table.quoted() + " (" + insertCols + ") SELECT " + insertCols
                        + " FROM wavewarden_staging");
            }
            c.commit();
            return new Imported(wave, rows);
        } catch (SQLException | IOException | RuntimeException e) {
            c.rollback();
            throw e;
        } finally {
            c.setAutoCommit(autoCommit);
        }
    }

    static InputStream open(Path csv) throws IOException {
        InputStream in = Files.newInputStream(csv);
        return csv.toString().endsWith(".gz") ? new GZIPInputStream(in, 1 << 16) : in;
    }

    /** The header row's column names (simple CSV: names are plain identifiers, quotes are stripped). */
    static List<String> header(Path csv) throws IOException {
        try (BufferedReader r = new BufferedReader(new InputStreamReader(open(csv), StandardCharsets.UTF_8))) {
            String line = r.readLine();
            if (line == null) {
                throw new ConfigException("csv", csv + " is empty: expected a header row");
            }
            if (line.startsWith("\uFEFF")) {
                line = line.substring(1);
            }
            List<String> out = new ArrayList<>();
            for (String part : line.split(",", -1)) {
                String p = part.strip();
                if (p.length() >= 2 && p.startsWith("\"") && p.endsWith("\"")) {
                    p = p.substring(1, p.length() - 1);
                }
                out.add(p);
            }
            return out;
        }
    }

    static InputStream counting(InputStream in, LongConsumer bytes) {
        return new FilterInputStream(in) {
            long n;

            @Override
            public int read(byte[] b, int off, int len) throws IOException {
                int r = super.read(b, off, len);
                if (r > 0 && bytes != null) {
                    n += r;
                    bytes.accept(n);
                }
                return r;
            }
        };
    }
}
