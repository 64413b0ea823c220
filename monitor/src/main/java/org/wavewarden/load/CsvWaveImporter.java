package org.wavewarden.load;

import org.postgresql.PGConnection;
import org.postgresql.copy.PGCopyOutputStream;
import org.postgresql.util.PSQLException;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.config.Suggest;
import org.wavewarden.deliver.DataText;

import java.io.BufferedWriter;
import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.Charset;
import java.nio.charset.IllegalCharsetNameException;
import java.nio.charset.StandardCharsets;
import java.nio.charset.UnsupportedCharsetException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.function.IntPredicate;
import java.util.function.LongConsumer;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.zip.GZIPInputStream;

/**
 * Loads one wave from a CSV file into a source table. The file is read in its own encoding and delimiter (given,
 * or guessed and printed), split into records here, and written to {@code COPY ... FROM STDIN (FORMAT csv)} as
 * UTF-8 with commas, each record with the physical line it started on; so every refusal (a row with too many or
 * too few fields, a value the column cannot hold, a NUL byte, bytes invalid in the encoding, an unclosed quote)
 * names the file, the line an editor shows and the column's number and header name. An unquoted empty field is
 * NULL, a quoted empty field ({@code ""}) an empty string, as PostgreSQL defines the format. Header names are
 * matched to the table's columns without regard to case.
 *
 * <p>The rows go through a temporary staging table and are inserted with {@link WaveLoad}, the steps every import
 * shares: one transaction, so a failed import leaves nothing behind; the wave's advisory lock taken before its rows
 * are counted, so of two concurrent imports the second sees the first one's rows; the table-creation lock; the
 * refusal without {@code --replace}; the wave label bound as a parameter, never pasted into SQL. With
 * {@code create}, a missing table is created from
 * the file: its rows go to an all-text staging table, each column's type is decided in SQL over every row
 * ({@link CsvColumnTypes}), and {@link TableShape#ensure} creates the table or refuses an existing one that
 * cannot take the file.
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

        public ImportRefusedException(String message, Throwable cause) {
            super(message, cause);
        }
    }

    /** COPY's error context: {@code COPY wavewarden_staging, line 3, column score: "abc"}. */
    private static final Pattern COPY_WHERE = Pattern.compile("COPY \\S+, line (\\d+)(?:, column ([^:]+))?");
    private static final Pattern QUOTED_VALUE = Pattern.compile(": \"(.*)\"$", Pattern.DOTALL);
    private static final String STAGING = "wavewarden_staging";

    /**
     * How a CSV file is written: its field delimiter and character encoding, each null to be detected from the file
     * (the guess is printed).
     */
    public record CsvFormat(Character delimiter, Charset encoding) {
        public static CsvFormat detect() {
            return new CsvFormat(null, null);
        }

        /**
         * The format the command line gives: {@code delimiter} one of {@code , ; | tab \t} (or a tab character),
         * {@code encoding} any charset name Java knows; either null to detect it.
         *
         * @throws ConfigException naming {@code --delimiter} or {@code --encoding}
         */
        public static CsvFormat parse(String delimiter, String encoding) {
            Character d = null;
            if (delimiter != null) {
                String t = delimiter.equalsIgnoreCase("tab") || delimiter.equals("\\t") ? "\t" : delimiter;
                if (t.length() != 1 || new String(CsvSniffer.DELIMITERS).indexOf(t.charAt(0)) < 0) {
                    throw new ConfigException("--delimiter", "expected one of ',' ';' '|' or tab (\"tab\" or \\t)"
                            + " but got '" + DataText.visible(delimiter) + "'");
                }
                d = t.charAt(0);
            }
            Charset e = null;
            if (encoding != null) {
                try {
                    e = Charset.forName(encoding.strip());
                } catch (IllegalCharsetNameException | UnsupportedCharsetException ex) {
                    throw new ConfigException("--encoding", "unknown encoding '" + DataText.visible(encoding)
                            + "'; for example UTF-8, windows-1252, ISO-8859-1, UTF-16");
                }
            }
            return new CsvFormat(d, e);
        }
    }

    public static Imported load(Connection c, TableName table, String waveColumn, String wave, Path csv,
                                boolean replace, LongConsumer bytesRead) throws SQLException, IOException {
        return load(c, table, waveColumn, wave, csv, replace, bytesRead, CsvFormat.detect(), null);
    }

    /** Loads a CSV file of the given format; {@code notes} receives the printed guesses (may be null). */
    public static Imported load(Connection c, TableName table, String waveColumn, String wave, Path csv,
                                boolean replace, LongConsumer bytesRead, CsvFormat format,
                                PrintWriter notes) throws SQLException, IOException {
        return load(c, table, waveColumn, wave, csv, replace, bytesRead, format, false, null, notes);
    }

    /**
     * Loads a CSV file of the given format, creating the table first when {@code create} is set and it does not
     * exist.
     *
     * @param codebook whose storage types decide a created table's column types before the values do; may be null
     * @param notes    receives the format read, the types chosen and the table created (may be null)
     */
    public static Imported load(Connection c, TableName table, String waveColumn, String wave, Path csv,
                                boolean replace, LongConsumer bytesRead, CsvFormat format, boolean create,
                                DatasetCodebook codebook, PrintWriter notes) throws SQLException, IOException {
        Identifiers.require("waveColumn", waveColumn);
        CsvSniffer.Sniffed sniffed = CsvSniffer.sniff(csv, format == null ? CsvFormat.detect() : format);
        String file = csv.getFileName().toString();
        String read = "read " + file + " as " + CsvSniffer.show(sniffed.delimiter()) + "-separated "
                + sniffed.encoding().name();
        note(notes, read + (sniffed.guesses().isEmpty() ? " (as given)" : " (guessed: "
                + String.join("; ", sniffed.guesses()) + "; pass --encoding/--delimiter to override)"));
        try (CsvParser parser = new CsvParser(new DecodingReader(counting(open(csv), bytesRead),
                sniffed.encoding()), sniffed.delimiter())) {
            return WaveLoad.inOneTransaction(c, () -> {
                Map<String, String> have = WaveLoad.lockWaveAndFindTable(c, table, waveColumn, wave, create);
                List<String> header = new ArrayList<>();
                try {
                    if (!parser.next(header)) {
                        throw new ConfigException("csv", csv + " is empty: expected a header row");
                    }
                } catch (CsvParser.BadRowException e) {
                    throw refused(csv, List.of(), e, sniffed);
                }
                checkHeader(file, header);
                Rows rows = new Rows(csv, header, parser, sniffed);
                return have.isEmpty() || create
                        ? loadCreating(c, table, waveColumn, wave, rows, have, replace, codebook, notes)
                        : loadTyped(c, table, waveColumn, wave, rows, have, replace);
            });
        }
    }

    private static void note(PrintWriter notes, String line) {
        if (notes != null) {
            notes.println(line);
            notes.flush();
        }
    }

    /** Every header name a plain identifier, none repeated when case is ignored. */
    static void checkHeader(String file, List<String> header) {
        Map<String, Integer> seen = new HashMap<>();
        for (int i = 0; i < header.size(); i++) {
            String h = header.get(i);
            String key = file + " line 1, column " + (i + 1);
            if (h == null || h.isBlank()) {
                throw new ConfigException(key, "the header has no name for column " + (i + 1));
            }
            if (!Identifiers.isPlain(h)) {
                throw new ConfigException(key, "the header name '" + DataText.visible(h) + "' is not a plain name"
                        + " (letters, digits and _, not starting with a digit, at most 63 characters); rename it in"
                        + " the header, for example to " + TableShape.columnName(h));
            }
            Integer before = seen.putIfAbsent(h.toLowerCase(Locale.ROOT), i);
            if (before != null) {
                throw new ConfigException(key, "the header names '" + DataText.visible(header.get(before)) + "' (column "
                        + (before + 1) + ") and '" + DataText.visible(h) + "' are the same when case is ignored;"
                        + " rename one");
            }
        }
    }

    /**
     * The table's column for each header name: the same name, else the one name equal when case is ignored.
     * Unmatched names are null.
     */
    static List<String> match(List<String> header, Map<String, String> have) {
        List<String> out = new ArrayList<>();
        for (String h : header) {
            if (have.containsKey(h)) {
                out.add(h);
                continue;
            }
            List<String> same = have.keySet().stream().filter(k -> k.equalsIgnoreCase(h)).toList();
            out.add(same.size() == 1 ? same.get(0) : null);
        }
        return out;
    }

    /** The refusal of header names that match no column of the table, each with the closest column. */
    static ConfigException unmatched(String file, TableName table, List<String> header, List<String> matched,
                                     Map<String, String> have, String extra) {
        List<String> problems = new ArrayList<>();
        String key = null;
        for (int i = 0; i < header.size(); i++) {
            if (matched.get(i) == null) {
                String h = header.get(i);
                key = key == null ? file + " line 1, column " + (i + 1) : key;
                problems.add("'" + h + "' (column " + (i + 1) + ")" + Suggest.nearest(h, have.keySet())
                        .map(s -> " (did you mean '" + s + "'?)").orElse(""));
            }
        }
        return new ConfigException(key, "the header names " + String.join(", ", problems) + " match no column of "
                + table + " (compared without regard to case); its columns are " + String.join(", ", have.keySet())
                + extra);
    }

    /** The table exists: the rows go through a staging copy of it, so COPY itself checks each value's type. */
    private static Imported loadTyped(Connection c, TableName table, String waveColumn, String wave, Rows rows,
                                      Map<String, String> have, boolean replace) throws SQLException, IOException {
        List<String> columns = match(rows.header, have);
        if (columns.contains(null)) {
            throw unmatched(rows.file, table, rows.header, columns, have, "");
        }
        long existing = WaveLoad.existingRows(c, table, waveColumn, wave, replace);
        String line = lineColumn(have);
        try (Statement st = c.createStatement()) {
            // CREATE TABLE AS copies no NOT NULL constraint, so the file need not have the wave column.
            st.execute("CREATE TEMP TABLE " + STAGING + " ON COMMIT DROP AS SELECT NULL::bigint AS "
                    + Identifiers.quote(line) + ", * FROM " + table.quoted() + " WITH NO DATA");
        }
        String cols = String.join(", ", columns.stream().map(Identifiers::quote).toList());
        rows.copy(c, "COPY " + STAGING + " (" + Identifiers.quote(line) + ", " + cols + ") FROM STDIN (FORMAT csv)",
                columns);
        // The file's own wave column, if it has one, gives way to the wave label.
        List<WaveLoad.Filled> filled = columns.stream().filter(col -> !col.equals(waveColumn))
                .map(WaveLoad.Filled::same).toList();
        long n = WaveLoad.replaceWave(c, table, waveColumn, wave, existing, STAGING, filled, have.get(waveColumn),
                e -> rowsDoNotFit(c, rows, table, columns, columns, Identifiers.quote(line), i -> true, e));
        return new Imported(wave, n);
    }

    /**
     * The table may not exist: the rows go to an all-text staging table, each column's type is decided over every
     * row, and {@link TableShape#ensure} creates the table or checks that the existing one can take them.
     */
    private static Imported loadCreating(Connection c, TableName table, String waveColumn, String wave, Rows rows,
                                         Map<String, String> have, boolean replace, DatasetCodebook codebook,
                                         PrintWriter notes) throws SQLException, IOException {
        long existing = have.isEmpty() ? 0 : WaveLoad.existingRows(c, table, waveColumn, wave, replace);
        List<String> staged = new ArrayList<>();
        StringBuilder defs = new StringBuilder("wavewarden_line bigint");
        for (int i = 0; i < rows.header.size(); i++) {
            staged.add("c" + (i + 1));
            defs.append(", c").append(i + 1).append(" text");
        }
        try (Statement st = c.createStatement()) {
            st.execute("CREATE TEMP TABLE " + STAGING + " (" + defs + ") ON COMMIT DROP");
        }
        rows.copy(c, "COPY " + STAGING + " (wavewarden_line, " + String.join(", ", staged)
                + ") FROM STDIN (FORMAT csv)", staged);
        List<String> matched = have.isEmpty() ? List.of() : match(rows.header, have);
        List<String> names = new ArrayList<>();
        for (int i = 0; i < rows.header.size(); i++) {
            String m = matched.isEmpty() ? null : matched.get(i);
            names.add(m != null ? m : TableShape.columnName(rows.header.get(i)));
        }
        List<TableShape.Column> guessed = CsvColumnTypes.decide(c, STAGING, rows.csv.toString(), rows.header, names,
                CsvColumnTypes.scan(c, STAGING, names.size()), codebook);
        List<TableShape.Column> columns = new ArrayList<>();
        for (TableShape.Column col : guessed) {
            // The wave column holds the wave's label, whatever the file's own values in it look like.
            columns.add(col.name().equals(waveColumn) ? new TableShape.Column(col.name(), "text", "the wave column")
                    : col);
        }
        if (codebook != null) {
            List<String> absent = codebook.variables().stream().map(v -> v.name())
                    .filter(v -> rows.header.stream().noneMatch(h -> h.equalsIgnoreCase(v))).toList();
            if (!absent.isEmpty()) {
                note(notes, "the codebook (" + codebook.source() + ") describes " + absent.size()
                        + " variables the file does not have: " + String.join(", ", absent));
            }
        }
        TableShape.Outcome outcome;
        try {
            outcome = TableShape.ensure(c, table, waveColumn, judged(columns, have), true);
        } catch (ConfigException e) {
            if (!have.isEmpty() && matched.contains(null)) {
                throw unmatched(rows.file, table, rows.header, matched, have, "; " + e.problem());
            }
            throw e;
        }
        outcome.lines().forEach(l -> note(notes, l));
        Map<String, String> target = TableShape.existing(c, table);
        List<WaveLoad.Filled> filled = new ArrayList<>();
        for (int i = 0; i < names.size(); i++) {
            if (!names.get(i).equals(waveColumn)) {
                filled.add(new WaveLoad.Filled(names.get(i), cast(staged.get(i), target.get(names.get(i)))));
            }
        }
        // Only a column cast from text can hold the value the server names.
        long n = WaveLoad.replaceWave(c, table, waveColumn, wave, existing, STAGING, filled, target.get(waveColumn),
                e -> rowsDoNotFit(c, rows, table, staged, names, "wavewarden_line",
                        i -> !cast(staged.get(i), target.get(names.get(i))).equals(staged.get(i)), e));
        return new Imported(wave, n);
    }

    /**
     * The columns TableShape judges: an existing column of a type it does not know (boolean, numeric with a
     * scale, ...) is left to the cast on insert, which names the line of a value it cannot hold.
     */
    private static List<TableShape.Column> judged(List<TableShape.Column> columns, Map<String, String> have) {
        List<TableShape.Column> out = new ArrayList<>();
        for (TableShape.Column col : columns) {
            String type = have.get(col.name());
            boolean known = type == null || TableShape.holds(type, "text") || TableShape.holds(type, "bigint")
                    || TableShape.holds(type, "date");
            if (known) {
                out.add(col);
            }
        }
        return out;
    }

    private static String cast(String staged, String type) {
        String base = type.replaceAll("\\(.*\\)", "").strip();
        if (base.equals("text") || base.startsWith("character")) {
            return staged;
        }
        return "CAST(" + CsvColumnTypes.trimmed(staged) + " AS " + type + ")";
    }

    /** A staging column for the line numbers that no column of the table is called. */
    private static String lineColumn(Map<String, String> have) {
        String name = "wavewarden_line";
        for (int i = 2; have.containsKey(name); i++) {
            name = "wavewarden_line_" + i;
        }
        return name;
    }

    /**
     * The insert from staging failed on a value (a NOT NULL or CHECK constraint, a value out of a column's range):
     * the line is looked up from the staged rows where the server's message allows.
     */
    private static ImportRefusedException rowsDoNotFit(Connection c, Rows rows, TableName table,
                                                        List<String> staged, List<String> tableNames,
                                                        String lineColumn, IntPredicate typed, SQLException e)
            throws SQLException {
        String column = e instanceof PSQLException p && p.getServerErrorMessage() != null
                ? p.getServerErrorMessage().getColumn() : null;
        String where = null;
        if ("23502".equals(e.getSQLState()) && column != null) {
            int i = tableNames.indexOf(column);
            if (i >= 0) {
                where = firstLine(c, "SELECT min(" + lineColumn + ") FROM " + STAGING + " WHERE "
                        + Identifiers.quote(staged.get(i)) + " IS NULL", null, i, rows);
            }
        } else if (e.getSQLState() != null && e.getSQLState().startsWith("22")) {
            Matcher v = QUOTED_VALUE.matcher(e instanceof PSQLException p && p.getServerErrorMessage() != null
                    ? String.valueOf(p.getServerErrorMessage().getMessage()) : "");
            if (v.find()) {
                for (int i = 0; i < staged.size() && where == null; i++) {
                    if (!typed.test(i)) {
                        continue;
                    }
                    where = firstLine(c, "SELECT min(" + lineColumn + ") FROM " + STAGING + " WHERE btrim("
                            + Identifiers.quote(staged.get(i)) + "::text) = ?", v.group(1).strip(), i, rows);
                }
            }
        }
        return new ImportRefusedException((where == null ? "the rows of " + rows.csv + " do not fit " + table
                : where) + ": " + WaveLoad.serverMessage(e) + "; nothing was imported");
    }

    private static String firstLine(Connection c, String sql, String value, int column, Rows rows)
            throws SQLException {
        try (PreparedStatement ps = c.prepareStatement(sql)) {
            if (value != null) {
                ps.setString(1, value);
            }
            try (ResultSet rs = ps.executeQuery()) {
                rs.next();
                long line = rs.getLong(1);
                return rs.wasNull() ? null : rows.at(line, column + 1);
            }
        }
    }

    /** The file being read, past its header, and what is known of it for messages. */
    private static final class Rows {
        final Path csv;
        final String file;
        final List<String> header;
        final CsvParser parser;
        final CsvSniffer.Sniffed sniffed;
        /**
         * COPY's line number at the end of a record, mapped to the file's line where the record starts: from each
         * key on, the difference to add (stored only where it changes).
         */
        final TreeMap<Long, Long> lineOffsets = new TreeMap<>();

        Rows(Path csv, List<String> header, CsvParser parser, CsvSniffer.Sniffed sniffed) {
            this.csv = csv;
            this.file = csv.getFileName().toString();
            this.header = List.copyOf(header);
            this.parser = parser;
            this.sniffed = sniffed;
        }

        /** "households.csv line 5, column 2 (score)"; column 0 leaves the column out. */
        String at(long line, int column) {
            StringBuilder s = new StringBuilder(csv.toString()).append(" line ").append(line);
            if (column > 0) {
                s.append(", column ").append(column);
                if (column <= header.size()) {
                    s.append(" (").append(DataText.visible(header.get(column - 1))).append(')');
                }
            }
            return s.toString();
        }

        /** The file's line for the line number COPY gives in an error. */
        long lineOf(long copyLine) {
            Map.Entry<Long, Long> e = lineOffsets.floorEntry(copyLine);
            return copyLine + (e == null ? 1 : e.getValue());
        }

        /**
         * Streams every record to COPY, the physical line first, then the fields in header order, each quoted
         * (so an empty string stays one) or left empty for NULL.
         */
        long copy(Connection c, String sql, List<String> staged) throws SQLException, IOException {
            PGCopyOutputStream out = new PGCopyOutputStream(c.unwrap(PGConnection.class), sql, 1 << 16);
            long records = 0;
            try {
                Writer w = new BufferedWriter(new OutputStreamWriter(out, StandardCharsets.UTF_8), 1 << 16);
                List<String> fields = new ArrayList<>(header.size());
                long blank = 0;
                long lastOffset = Long.MIN_VALUE;
                long copyLine = 0;
                while (parser.next(fields)) {
                    if (header.size() > 1 && fields.size() == 1 && fields.get(0) == null) {
                        // Blank lines at the end of a file are common and harmless; one between rows is not.
                        blank = blank == 0 ? parser.recordLine() : blank;
                        continue;
                    }
                    if (blank != 0) {
                        throw new CsvParser.BadRowException(blank, 0, "the line is empty but rows follow it", null);
                    }
                    if (fields.size() != header.size()) {
                        throw fieldCount(fields);
                    }
                    records++;
                    copyLine += 1 + copyCountedBreaks(fields, records == 1 ? '\r' : '\n');
                    long offset = parser.recordLine() - copyLine;
                    if (offset != lastOffset) {
                        lineOffsets.put(copyLine, offset);
                        lastOffset = offset;
                    }
                    w.write(Long.toString(parser.recordLine()));
                    for (String f : fields) {
                        w.write(',');
                        if (f != null) {
                            quote(w, f);
                        }
                    }
                    w.write('\n');
                }
                w.flush();
                long n = out.endCopy();
                if (n == 0) {
                    throw new ImportRefusedException(csv + " has a header row but no data rows; nothing was"
                            + " imported");
                }
                return n;
            } catch (CsvParser.BadRowException e) {
                throw refused(csv, header, e, sniffed);
            } catch (IOException e) {
                if (e.getCause() instanceof SQLException s) {
                    throw copyFailed(s, staged);
                }
                throw e;
            } catch (SQLException e) {
                throw copyFailed(e, staged);
            } finally {
                if (out.isActive()) {
                    try {
                        out.cancelCopy();
                    } catch (SQLException ignored) {
                        // The copy is abandoned with its transaction, which the caller rolls back.
                    }
                }
            }
        }

        /**
         * The line breaks inside quoted values that COPY adds to its line count, which it reports at the end of the
         * record: once it has seen the first record end with LF it counts each LF inside quotes; before that, each
         * CR (PostgreSQL's CopyReadLineText).
         */
        private static long copyCountedBreaks(List<String> fields, char counted) {
            long n = 0;
            for (String f : fields) {
                if (f != null) {
                    for (int i = f.indexOf(counted); i >= 0; i = f.indexOf(counted, i + 1)) {
                        n++;
                    }
                }
            }
            return n;
        }

        private CsvParser.BadRowException fieldCount(List<String> fields) {
            long line = parser.recordLine();
            if (fields.size() > header.size()) {
                return new CsvParser.BadRowException(line, header.size() + 1, "the row has " + fields.size()
                        + " fields but the header has " + header.size() + " (is a value with a delimiter in it"
                        + " not quoted?)", null);
            }
            return new CsvParser.BadRowException(line, fields.size() + 1, "the row ends after " + fields.size()
                    + " fields but the header has " + header.size(), null);
        }

        private SQLException copyFailed(SQLException e, List<String> staged) {
            if (!WaveLoad.isBadInput(e)) {
                return e;
            }
            String where = e instanceof PSQLException p && p.getServerErrorMessage() != null
                    ? p.getServerErrorMessage().getWhere() : null;
            Matcher m = where == null ? null : COPY_WHERE.matcher(where);
            if (m == null || !m.find()) {
                throw new ImportRefusedException(csv + ": " + WaveLoad.serverMessage(e) + "; nothing was imported");
            }
            long line = lineOf(Long.parseLong(m.group(1)));
            int column = m.group(2) == null ? 0 : staged.indexOf(m.group(2).strip()) + 1;
            throw new ImportRefusedException(at(line, column) + ": " + WaveLoad.serverMessage(e) + "; nothing was imported");
        }
    }

    private static void quote(Writer w, String f) throws IOException {
        w.write('"');
        if (f.indexOf('"') < 0) {
            w.write(f);
        } else {
            w.write(f.replace("\"", "\"\""));
        }
        w.write('"');
    }

    private static ImportRefusedException refused(Path csv, List<String> header, CsvParser.BadRowException e,
                                                  CsvSniffer.Sniffed sniffed) {
        StringBuilder s = new StringBuilder(csv.toString()).append(" line ").append(e.line);
        if (e.column > 0) {
            s.append(", column ").append(e.column);
            if (e.column <= header.size()) {
                s.append(" (").append(DataText.visible(header.get(e.column - 1))).append(')');
            }
        }
        s.append(": ").append(e.getMessage());
        if (e.getCause() instanceof DecodingReader.MalformedBytesException) {
            s.append(" are not valid ").append(sniffed.encoding().name());
            s.append(sniffed.encodingGuess() == null ? " (the encoding given)" : " (the encoding guessed: "
                    + sniffed.encodingGuess() + ")");
            s.append("; pass the file's encoding, for example --encoding ").append(
                    sniffed.encoding().equals(CsvSniffer.WINDOWS_1252) ? "ISO-8859-1 (which takes every byte)"
                            : "windows-1252");
        }
        return new ImportRefusedException(s + "; nothing was imported");
    }

    static InputStream open(Path csv) throws IOException {
        InputStream in = Files.newInputStream(csv);
        return csv.toString().endsWith(".gz") ? new GZIPInputStream(in, 1 << 16) : in;
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
