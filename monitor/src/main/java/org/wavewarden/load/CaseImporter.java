package org.wavewarden.load;

import org.postgresql.PGConnection;
import org.postgresql.util.PSQLException;
import org.wavewarden.codebook.Codes;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.config.Suggest;
import org.wavewarden.deliver.DataText;

import java.io.IOException;
import java.io.PrintWriter;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.LongConsumer;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Loads one wave from a {@link CaseSource} (an SPSS system file) into a source table, in one transaction: the cases
 * are streamed with binary {@code COPY} into a staging table typed from the file's dictionary, each column's table
 * type is then decided from the dictionary and the values read, the table is created ({@code --create}) or checked
 * ({@link TableShape#ensure}: never widened or retyped), and the rows are inserted with the wave label
 * ({@link WaveLoad}: the same lock, refusal and replacement as a CSV import).
 */
public final class CaseImporter {

    private static final String STAGING = "wavewarden_case_staging";
    /** Doubles represent every integer up to 2^53 exactly; beyond it "an integer" no longer means one value. */
    private static final String EXACT_INTEGER_LIMIT = "9007199254740992";
    private static final Pattern COPY_TUPLE = Pattern.compile("COPY \\S+, line (\\d+)(?:, column ([^:]+))?");

    private CaseImporter() {
    }

    /**
     * What an import did.
     *
     * @param imported the wave and its row count
     * @param codebook the file's dictionary with each variable named as its table column, the form a wave's
     *                 codebook is saved and matched against the table in
     */
    public record Loaded(CsvWaveImporter.Imported imported, DatasetCodebook codebook) {
    }

    /**
     * @param create create the table from the file's dictionary when it does not exist
     * @param notes  receives what was decided (types, created table); may be null
     */
    public static CsvWaveImporter.Imported load(Connection c, TableName table, String waveColumn, String wave,
                                                CaseSource cases, boolean replace, boolean create, PrintWriter notes)
            throws SQLException, IOException {
        return loadWithCodebook(c, table, waveColumn, wave, cases, replace, create, notes, null).imported();
    }

    /**
     * As {@link #load}, also giving the dictionary in the table's names.
     *
     * @param rowsSent receives the count of cases sent so far; may be null
     */
    public static Loaded loadWithCodebook(Connection c, TableName table, String waveColumn, String wave,
                                          CaseSource cases, boolean replace, boolean create, PrintWriter notes,
                                          LongConsumer rowsSent) throws SQLException, IOException {
        Identifiers.require("waveColumn", waveColumn);
        DatasetCodebook dictionary = cases.codebook();
        String file = dictionary.source() == null ? "the file" : dictionary.source();
        List<String> printed = new ArrayList<>();
        Loaded loaded = WaveLoad.inOneTransaction(c, () -> {
            Map<String, String> have = WaveLoad.lockWaveAndFindTable(c, table, waveColumn, wave, create);
            long existing = have.isEmpty() ? 0 : WaveLoad.existingRows(c, table, waveColumn, wave, replace);
            List<String> names = columnNames(dictionary, have, waveColumn, file, printed);
            if (names.stream().allMatch(n -> n == null)) {
                throw new CsvWaveImporter.ImportRefusedException(file + " has no variables besides the wave column;"
                        + " nothing was imported");
            }
            stage(c, dictionary, names);
            long rows = copy(c, cases, dictionary, names, file, rowsSent);
            if (rows == 0) {
                throw new CsvWaveImporter.ImportRefusedException(file + " has no cases; nothing was imported and wave '"
                        + DataText.visible(wave) + "' was not created");
            }
            List<TableShape.Column> columns = types(c, dictionary, names);
            TableShape.Outcome outcome = TableShape.ensure(c, table, waveColumn, columns, create);
            printed.addAll(outcome.lines());
            String waveType = TableShape.existing(c, table).get(waveColumn);
            long inserted = WaveLoad.replaceWave(c, table, waveColumn, wave, existing, STAGING,
                    columns.stream().map(col -> WaveLoad.Filled.same(col.name())).toList(), waveType,
                    WaveLoad.doNotFit("the cases of " + file, table));
            return new Loaded(new CsvWaveImporter.Imported(wave, inserted), renamed(dictionary, names));
        });
        if (notes != null) {
            printed.forEach(notes::println);
            notes.flush();
        }
        return loaded;
    }

    /**
     * Each variable's column: in a table to be created, {@link TableShape#columnName}; in an existing table, the
     * column of the same name, else of the same name in another case, else of the created-table form. A variable the
     * table lacks is refused here, before any case is read, with the nearest column name. The file's own wave
     * column, if it has one, gives way to the wave label (null in the result).
     */
    static List<String> columnNames(DatasetCodebook dictionary, Map<String, String> have, String waveColumn,
                                    String file, List<String> printed) {
        List<String> out = new ArrayList<>();
        List<String> lacking = new ArrayList<>();
        Map<String, String> taken = new HashMap<>();
        for (VariableMeta v : dictionary.variables()) {
            String name = have.isEmpty() ? TableShape.columnName(v.name()) : match(v.name(), have);
            if (name == null) {
                String hint = Suggest.nearest(v.name(), have.keySet()).map(s -> " (did you mean " + s + "?)")
                        .orElse("");
                lacking.add(DataText.visible(v.name()) + hint);
                out.add(null);
                continue;
            }
            String before = taken.putIfAbsent(name, v.name());
            if (before != null) {
                throw new CsvWaveImporter.ImportRefusedException("the variables " + DataText.visible(before) + " and "
                        + DataText.visible(v.name()) + " of " + file + " would both be column " + name
                        + "; rename one in the file; nothing was imported");
            }
            if (name.equals(waveColumn)) {
                printed.add("the file's variable " + DataText.visible(v.name()) + " is the wave column: its values"
                        + " are replaced by the wave label");
                out.add(null);
                continue;
            }
            if (!name.equals(v.name())) {
                printed.add("variable " + DataText.visible(v.name()) + " -> column " + name);
            }
            out.add(name);
        }
        if (!lacking.isEmpty()) {
            throw new ConfigException("table", "the table has no column for the variables " + String.join(", ",
                    lacking) + " of " + file + "; a table is never widened by an import (add the columns with"
                    + " ALTER TABLE if they are intended); nothing was imported");
        }
        return out;
    }

    private static String match(String variable, Map<String, String> have) {
        if (have.containsKey(variable)) {
            return variable;
        }
        String lower = variable.toLowerCase(Locale.ROOT);
        List<String> sameLetters = have.keySet().stream().filter(k -> k.toLowerCase(Locale.ROOT).equals(lower))
                .toList();
        if (sameLetters.size() == 1) {
            return sameLetters.get(0);
        }
        String tableForm = TableShape.columnName(variable);
        return have.containsKey(tableForm) ? tableForm : null;
    }

    /** The staging table: each column in the type the file's values come in, before any is narrowed. */
    private static void stage(Connection c, DatasetCodebook dictionary, List<String> names) throws SQLException {
        List<String> defs = new ArrayList<>();
        for (int i = 0; i < names.size(); i++) {
            if (names.get(i) != null) {
                defs.add(Identifiers.quote(names.get(i)) + " " + stagingType(dictionary.variables().get(i).storage()));
            }
        }
        try (Statement st = c.createStatement()) {
            st.execute("CREATE TEMP TABLE " + STAGING + " (" + String.join(", ", defs) + ") ON COMMIT DROP");
        }
    }

    private static String stagingType(StorageType storage) {
        return switch (storage) {
            case NUMBER -> "double precision";
            case TEXT -> "text";
            case DATE -> "date";
            case DATETIME -> "timestamp";
        };
    }

    private static long copy(Connection c, CaseSource cases, DatasetCodebook dictionary, List<String> names,
                             String file, LongConsumer rowsSent) throws SQLException, IOException {
        List<VariableMeta> vars = dictionary.variables();
        int fields = (int) names.stream().filter(n -> n != null).count();
        String cols = String.join(", ", names.stream().filter(n -> n != null).map(Identifiers::quote).toList());
        Object[] values = new Object[vars.size()];
        long sent = 0;
        var copyIn = c.unwrap(PGConnection.class).getCopyAPI().copyIn("COPY " + STAGING + " (" + cols
                + ") FROM STDIN (FORMAT binary)");
        try {
            CopyBinaryOut out = new CopyBinaryOut(copyIn);
            while (cases.next(values)) {
                sent++;
                out.startRow(fields);
                for (int i = 0; i < vars.size(); i++) {
                    if (names.get(i) != null) {
                        write(out, vars.get(i), values[i], file, sent);
                    }
                }
                if (rowsSent != null && sent % 10_000 == 0) {
                    rowsSent.accept(sent);
                }
            }
            long rows = out.finish();
            if (rowsSent != null) {
                rowsSent.accept(rows);
            }
            return rows;
        } catch (SQLException e) {
            if (WaveLoad.isBadInput(e)) {
                throw refused(file, e);
            }
            throw e;
        } finally {
            if (copyIn.isActive()) {
                copyIn.cancelCopy();
            }
        }
    }

    private static void write(CopyBinaryOut out, VariableMeta v, Object value, String file, long caseNumber)
            throws SQLException {
        if (value == null) {
            out.nullField();
            return;
        }
        switch (v.storage()) {
            case NUMBER -> {
                if (!(value instanceof Number n)) {
                    throw wrongValue(v, value, file, caseNumber);
                }
                out.float8(n.doubleValue());
            }
            case TEXT -> out.text(value.toString());
            case DATE -> {
                if (value instanceof LocalDate d) {
                    out.date(d);
                } else if (value instanceof LocalDateTime t) {
                    out.date(t.toLocalDate());
                } else {
                    throw wrongValue(v, value, file, caseNumber);
                }
            }
            case DATETIME -> {
                if (value instanceof LocalDateTime t) {
                    out.timestamp(t);
                } else if (value instanceof LocalDate d) {
                    out.timestamp(d.atStartOfDay());
                } else {
                    throw wrongValue(v, value, file, caseNumber);
                }
            }
        }
    }

    private static CsvWaveImporter.ImportRefusedException wrongValue(VariableMeta v, Object value, String file,
                                                                     long caseNumber) {
        return new CsvWaveImporter.ImportRefusedException(file + " case " + caseNumber + ", variable "
                + DataText.visible(v.name()) + ": a " + value.getClass().getSimpleName() + " where the dictionary"
                + " declares " + v.storage().name().toLowerCase(Locale.ROOT) + "; nothing was imported");
    }

    /** The server's refusal of a case, said as the file's case number and variable. */
    private static CsvWaveImporter.ImportRefusedException refused(String file, SQLException e) {
        String where = e instanceof PSQLException p && p.getServerErrorMessage() != null
                ? p.getServerErrorMessage().getWhere() : null;
        Matcher m = where == null ? null : COPY_TUPLE.matcher(where);
        StringBuilder at = new StringBuilder(file);
        if (m != null && m.find()) {
            // Binary COPY counts tuples after the header from 1, so its "line" is the case number.
            at.append(" case ").append(m.group(1));
            if (m.group(2) != null) {
                at.append(", column ").append(DataText.visible(m.group(2).strip()));
            }
        }
        return new CsvWaveImporter.ImportRefusedException(at + ": " + WaveLoad.serverMessage(e)
                + "; nothing was imported");
    }

    /**
     * Each column's table type. A number whose format shows no decimals is a {@code bigint} when every value read
     * is an integer a double holds exactly, found in one pass over the staging table; any other number stays
     * {@code double precision}. Text, dates and date-times keep their own types.
     */
    private static List<TableShape.Column> types(Connection c, DatasetCodebook dictionary, List<String> names)
            throws SQLException {
        List<VariableMeta> vars = dictionary.variables();
        List<Integer> whole = new ArrayList<>();
        List<String> probes = new ArrayList<>();
        for (int i = 0; i < vars.size(); i++) {
            VariableMeta v = vars.get(i);
            if (names.get(i) != null && v.storage() == StorageType.NUMBER && Integer.valueOf(0).equals(v.decimals())) {
                String q = Identifiers.quote(names.get(i));
                whole.add(i);
                probes.add("min(" + q + ") FILTER (WHERE NOT (" + q + " = trunc(" + q + ") AND abs(" + q + ") <= "
                        + EXACT_INTEGER_LIMIT + "))");
                probes.add("count(" + q + ")");
            }
        }
        Map<Integer, Double> notInteger = new HashMap<>();
        Map<Integer, Long> present = new HashMap<>();
        if (!whole.isEmpty()) {
            try (Statement st = c.createStatement();
                 ResultSet rs = st.executeQuery("SELECT " + String.join(", ", probes) + " FROM " + STAGING)) {
                rs.next();
                for (int k = 0; k < whole.size(); k++) {
                    double d = rs.getDouble(2 * k + 1);
                    if (!rs.wasNull()) {
                        notInteger.put(whole.get(k), d);
                    }
                    present.put(whole.get(k), rs.getLong(2 * k + 2));
                }
            }
        }
        List<TableShape.Column> out = new ArrayList<>();
        for (int i = 0; i < vars.size(); i++) {
            if (names.get(i) == null) {
                continue;
            }
            VariableMeta v = vars.get(i);
            String format = v.format() == null ? "no format given" : "SPSS format " + v.format();
            String type = stagingType(v.storage());
            String why = format;
            if (whole.contains(i)) {
                Double example = notInteger.get(i);
                if (example == null) {
                    type = "bigint";
                    why = format + (present.get(i) == 0 ? ", no value given" : ", every value an integer");
                } else if (Double.isFinite(example) && example == Math.rint(example)) {
                    why = format + ", but " + example + " is beyond the integers a double holds exactly";
                } else {
                    why = format + ", but " + (Double.isFinite(example) ? Codes.of(example) : example)
                            + " is not an integer";
                }
            }
            out.add(new TableShape.Column(names.get(i), type, why));
        }
        return out;
    }

    /** The dictionary with each variable named as its column; the file's wave column is left out. */
    private static DatasetCodebook renamed(DatasetCodebook dictionary, List<String> names) {
        List<VariableMeta> out = new ArrayList<>();
        for (int i = 0; i < names.size(); i++) {
            String n = names.get(i);
            if (n != null) {
                VariableMeta v = dictionary.variables().get(i);
                out.add(new VariableMeta(n, v.label(), v.storage(), v.width(), v.decimals(), v.format(), v.measure(),
                        v.unit(), v.valueLabels(), v.missingCodes(), v.missingRanges(), v.validRange()));
            }
        }
        return new DatasetCodebook(dictionary.source(), dictionary.title(), out);
    }
}
