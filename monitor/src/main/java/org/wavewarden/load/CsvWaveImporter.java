package org.wavewarden.load;

import org.postgresql.PGConnection;
import org.postgresql.util.PSQLException;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.deliver.DataText;

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
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.zip.GZIPInputStream;

/**
 * Loads one wave from a CSV file into a source table with {@code COPY ... FROM STDIN (FORMAT csv)}: an unquoted
 * empty field is NULL, a quoted empty field ({@code ""}) is an empty string, as PostgreSQL defines the format.
 * The rows go through a temporary staging table and are inserted in one transaction, so a failed import leaves
 * nothing behind; the wave label is bound as a parameter, never pasted into SQL. Imports of one wave into one
 * table are serialised by a transaction-level advisory lock taken before the wave's rows are counted, so of two
 * concurrent imports the second sees the first one's rows. A file the server cannot read (bytes that are not
 * UTF-8, a row with too many or too few fields, a value of the wrong type) is refused with its file, line and
 * column, as is a file with no data rows.
 */
public final class CsvWaveImporter {

    private CsvWaveImporter() {
    }

    public record Imported(String wave, long rows) {
    }

    /** The file cannot be imported as it is (exit code 2); the message says where and why. */
    public static final class ImportRefusedException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public ImportRefusedException(String message) {
            super(message);
        }
    }

    /** COPY's error context: {@code COPY wavewarden_staging, line 3, column score: "abc"}. */
    private static final Pattern COPY_WHERE = Pattern.compile("COPY \\S+, line (\\d+)(?:, column ([^:]+))?");
    private static final Pattern COLUMN_IN_MESSAGE = Pattern.compile("column \"([^\"]+)\"");

    /**
     * How a CSV file is written: its field delimiter and character encoding, each null to be detected from the file
     * (the guess is printed).
     */
    public record CsvFormat(Character delimiter, java.nio.charset.Charset encoding) {
        public static CsvFormat detect() {
            return new CsvFormat(null, null);
        }
    }

    /** Loads a CSV file of the given format; {@code notes} receives the printed guesses (may be null). */
    public static Imported load(Connection c, TableName table, String waveColumn, String wave, Path csv,
                                boolean replace, LongConsumer bytesRead, CsvFormat format,
                                java.io.PrintWriter notes) throws SQLException, IOException {
        return load(c, table, waveColumn, wave, csv, replace, bytesRead);
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
            try (PreparedStatement ps = c.prepareStatement("SELECT pg_advisory_xact_lock(hashtext(?), hashtext(?))")) {
                ps.setString(1, "wavewarden import " + table.quoted());
                ps.setString(2, wave);
                ps.execute();
            }
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
            } catch (SQLException e) {
                if (isBadInput(e)) {
                    throw refusedCopy(csv, header, e);
                }
                throw e;
            }
            if (rows == 0) {
                throw new ImportRefusedException(csv + " has a header row but no data rows; nothing was imported"
                        + " and wave '" + DataText.visible(wave) + "' was not created");
            }
            try (PreparedStatement ps = c.prepareStatement("UPDATE wavewarden_staging SET "
                    + Identifiers.quote(waveColumn) + " = ?")) {
                ps.setObject(1, wave, java.sql.Types.OTHER);
                ps.executeUpdate();
            } catch (SQLException e) {
                if (isBadInput(e)) {
                    throw new ConfigException("--wave", "'" + DataText.visible(wave) + "' is not a value the wave"
                            + " column " + waveColumn + " can hold: " + serverMessage(e));
                }
                throw e;
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
            } catch (SQLException e) {
                if (isBadInput(e)) {
                    throw new ImportRefusedException("the rows of " + csv + " do not fit " + table + ": "
                            + serverMessage(e) + "; nothing was imported");
                }
                throw e;
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

    /** Data exceptions (class 22) and integrity violations (class 23): the file's content, not the server, is wrong. */
    static boolean isBadInput(SQLException e) {
        String state = e.getSQLState();
        return state != null && (state.startsWith("22") || state.startsWith("23"));
    }

    /** The COPY error as the file's author can act on it: file, line, column number and name, what is wrong. */
    static ImportRefusedException refusedCopy(Path csv, List<String> header, SQLException e) {
        String where = e instanceof PSQLException p && p.getServerErrorMessage() != null
                ? p.getServerErrorMessage().getWhere() : null;
        Matcher m = where == null ? null : COPY_WHERE.matcher(where);
        StringBuilder at = new StringBuilder(csv.toString());
        String column = null;
        if (m != null && m.find()) {
            at.append(" line ").append(m.group(1));
            column = m.group(2);
        }
        if (column == null) {
            Matcher named = COLUMN_IN_MESSAGE.matcher(serverMessage(e));
            column = named.find() ? named.group(1) : null;
        }
        if (column != null) {
            int index = header.indexOf(column.strip());
            at.append(", column ").append(index < 0 ? "" : (index + 1) + " ").append('(')
                    .append(DataText.visible(column.strip())).append(')');
        }
        String hint = "22021".equals(e.getSQLState()) ? "; the file must be UTF-8 (convert it, for example from"
                + " Latin-1, before importing)" : "";
        return new ImportRefusedException(at + ": " + serverMessage(e) + hint + "; nothing was imported");
    }

    /** The server's own sentence, with data in it made visible and cut short. */
    static String serverMessage(SQLException e) {
        String m = e instanceof PSQLException p && p.getServerErrorMessage() != null
                && p.getServerErrorMessage().getMessage() != null ? p.getServerErrorMessage().getMessage()
                : e.getClass().getSimpleName();
        String shown = DataText.visible(m);
        return shown.length() > 300 ? shown.substring(0, 300) + "..." : shown;
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
