package org.wavewarden.codebook;

import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Our CSV codebook format (documented in docs/codebook-csv.md), read as a {@link DatasetCodebook}: UTF-8,
 * comma-separated, quoted as RFC 4180 quotes; a header naming the columns (any order, any case); then one row per
 * variable, one per code and one per missing range, each naming its variable. A row with a {@code code} is a code
 * row; one with {@code missing_from} or {@code missing_to} is a range row; any other row describes the variable.
 * A variable's own fields (label, level, type, unit, valid range) may stand on any of its rows, but say one thing.
 */
public final class CsvCodebook {

    /** The columns, in the order the documentation lists them. */
    static final List<String> COLUMNS = List.of("variable", "label", "level", "type", "unit", "valid_min",
            "valid_max", "code", "code_label", "missing", "reason", "missing_from", "missing_to");

    private CsvCodebook() {
    }

    /** What one variable's rows have said so far, in the order first met. */
    private static final class Draft {
        final String name;
        final Map<String, String> fields = new LinkedHashMap<>();
        final Map<String, String> labels = new LinkedHashMap<>();
        final List<String[]> missing = new ArrayList<>();
        final List<MissingRangeSpec> ranges = new ArrayList<>();
        /** Each code as written, with the line and column it stands on. */
        final Map<String, int[]> codeAt = new LinkedHashMap<>();

        Draft(String name) {
            this.name = name;
        }
    }

    /**
     * @throws CodebookFormatException naming the file, line and column of the first problem
     */
    public static DatasetCodebook read(Path file) throws IOException {
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(Files.readAllBytes(file)))
                    .toString();
        } catch (CharacterCodingException e) {
            throw new CodebookFormatException(file, 1, 0, null, "not UTF-8 text; save the codebook as UTF-8");
        }
        if (text.startsWith("\uFEFF")) {
            text = text.substring(1);
        }
        List<Row> rows = rows(file, text);
        if (rows.isEmpty()) {
            throw new CodebookFormatException(file, 1, 0, null, "empty: expected a header with the columns "
                    + String.join(", ", COLUMNS));
        }
        Row header = rows.get(0);
        int[] index = new int[COLUMNS.size()];
        java.util.Arrays.fill(index, -1);
        for (int i = 0; i < header.cells.size(); i++) {
            String h = header.cells.get(i).strip().toLowerCase(Locale.ROOT);
            int k = COLUMNS.indexOf(h);
            if (k < 0) {
                throw new CodebookFormatException(file, header.line, i + 1, "header '" + header.cells.get(i) + "'",
                        "unknown column; expected some of " + String.join(", ", COLUMNS));
            }
            if (index[k] >= 0) {
                throw new CodebookFormatException(file, header.line, i + 1, "header '" + header.cells.get(i) + "'",
                        "the column is given twice");
            }
            index[k] = i;
        }
        if (index[0] < 0) {
            throw new CodebookFormatException(file, header.line, 0, null, "the header has no column 'variable'");
        }
        Map<String, Draft> drafts = new LinkedHashMap<>();
        for (Row row : rows.subList(1, rows.size())) {
            if (row.cells.stream().allMatch(String::isBlank)) {
                continue;
            }
            if (row.cells.size() > header.cells.size()) {
                throw new CodebookFormatException(file, row.line, header.cells.size() + 1, null, "the row has "
                        + row.cells.size() + " cells but the header " + header.cells.size());
            }
            Cells c = new Cells(file, row, index);
            String name = c.get("variable");
            if (name == null) {
                throw c.fail("variable", "every row names its variable");
            }
            Draft d = drafts.computeIfAbsent(name.toLowerCase(Locale.ROOT), k -> new Draft(name));
            for (String f : List.of("label", "level", "type", "unit", "valid_min", "valid_max")) {
                String v = c.get(f);
                if (v == null) {
                    continue;
                }
                String before = d.fields.putIfAbsent(f, v);
                if (before != null && !before.equals(v)) {
                    throw c.fail(f, "variable " + d.name + " already has " + f + " '" + before + "'; a variable's "
                            + f + " is given once");
                }
            }
            String code = c.get("code");
            String from = c.get("missing_from");
            String to = c.get("missing_to");
            boolean missing = c.flag("missing");
            if (code != null && (from != null || to != null)) {
                throw c.fail("missing_from", "a row holds either a code or a missing range, not both");
            }
            if (code != null) {
                String codeLabel = c.get("code_label");
                if (d.labels.containsKey(code) || d.missing.stream().anyMatch(m -> m[0].equals(code))) {
                    throw c.fail("code", "code '" + code + "' of " + d.name + " is listed twice");
                }
                d.codeAt.put(code, new int[] {row.line, index[COLUMNS.indexOf("code")] + 1});
                if (codeLabel != null) {
                    d.labels.put(code, codeLabel);
                }
                if (missing) {
                    String reason = c.get("reason");
                    d.missing.add(new String[] {code, reason != null ? reason : codeLabel != null ? codeLabel
                            : "declared missing in the codebook"});
                } else if (c.get("reason") != null) {
                    throw c.fail("reason", "a reason is given for a code not marked missing");
                }
            } else if (from != null || to != null) {
                Double lo = c.number("missing_from");
                Double hi = c.number("missing_to");
                if (lo != null && hi != null && lo > hi) {
                    throw c.fail("missing_to", "the range's end " + hi + " is below its start " + lo);
                }
                String reason = c.get("reason");
                d.ranges.add(new MissingRangeSpec(lo, hi, reason == null ? "declared missing range in the codebook"
                        : reason));
            } else if (c.get("code_label") != null || missing || c.get("reason") != null) {
                throw c.fail(c.get("code_label") != null ? "code_label" : missing ? "missing" : "reason",
                        "a code's label, missing flag or reason needs the code in the column 'code'");
            }
            d.fields.putIfAbsent("#line", Integer.toString(row.line));
        }
        if (drafts.isEmpty()) {
            throw new CodebookFormatException(file, header.line, 0, null, "the codebook describes no variable");
        }
        List<VariableMeta> out = new ArrayList<>();
        for (Draft d : drafts.values()) {
            out.add(meta(file, d));
        }
        return new DatasetCodebook(file.getFileName() + ", CSV codebook", null, out);
    }

    private static VariableMeta meta(Path file, Draft d) throws CodebookFormatException {
        int line = Integer.parseInt(d.fields.get("#line"));
        StorageType storage = switch (lower(d.fields.get("type"))) {
            case "", "number", "numeric" -> StorageType.NUMBER;
            case "text", "string", "character" -> StorageType.TEXT;
            case "date" -> StorageType.DATE;
            case "datetime" -> StorageType.DATETIME;
            default -> throw new CodebookFormatException(file, line, 0, "variable " + d.name + ", column type",
                    "expected number, text, date or datetime but got '" + d.fields.get("type") + "'");
        };
        Measure measure = switch (lower(d.fields.get("level"))) {
            case "" -> Measure.UNKNOWN;
            case "nominal" -> Measure.NOMINAL;
            case "ordinal" -> Measure.ORDINAL;
            case "scale", "interval", "ratio" -> Measure.SCALE;
            default -> throw new CodebookFormatException(file, line, 0, "variable " + d.name + ", column level",
                    "expected nominal, ordinal or scale (interval and ratio are read as scale) but got '"
                            + d.fields.get("level") + "'");
        };
        Double lo = number(file, line, d, "valid_min");
        Double hi = number(file, line, d, "valid_max");
        if (lo != null && hi != null && lo > hi) {
            throw new CodebookFormatException(file, line, 0, "variable " + d.name + ", column valid_max",
                    "valid_max " + hi + " is below valid_min " + lo);
        }
        Map<String, String> seen = new java.util.HashMap<>();
        for (var e : d.codeAt.entrySet()) {
            String before = seen.put(Codes.of(e.getKey(), storage), e.getKey());
            if (before != null) {
                throw new CodebookFormatException(file, e.getValue()[0], e.getValue()[1], "column code", "code '"
                        + e.getKey() + "' of " + d.name + " is listed twice (as '" + before + "' too)");
            }
        }
        Map<String, String> labels = new LinkedHashMap<>();
        d.labels.forEach((k, v) -> labels.put(Codes.of(k, storage), v));
        List<MissingCodeSpec> missing = new ArrayList<>();
        d.missing.forEach(m -> missing.add(new MissingCodeSpec(Codes.of(m[0], storage), m[1])));
        return new VariableMeta(d.name, d.fields.get("label"), storage, null, null, null, measure,
                d.fields.get("unit"), labels, missing, d.ranges, lo == null && hi == null ? null : new RangeSpec(lo, hi));
    }

    private static Double number(Path file, int line, Draft d, String field) throws CodebookFormatException {
        String v = d.fields.get(field);
        if (v == null) {
            return null;
        }
        try {
            return Double.parseDouble(v);
        } catch (NumberFormatException e) {
            throw new CodebookFormatException(file, line, 0, "variable " + d.name + ", column " + field,
                    "expected a number but got '" + v + "'");
        }
    }

    private static String lower(String s) {
        return s == null ? "" : s.strip().toLowerCase(Locale.ROOT);
    }

    private record Row(int line, List<String> cells) {
    }

    /** One row's cells by column name, with errors that point at the cell. */
    private record Cells(Path file, Row row, int[] index) {

        String get(String column) {
            int i = index[COLUMNS.indexOf(column)];
            if (i < 0 || i >= row.cells.size()) {
                return null;
            }
            String v = row.cells.get(i).strip();
            return v.isEmpty() ? null : v;
        }

        boolean flag(String column) throws CodebookFormatException {
            String v = get(column);
            if (v == null) {
                return false;
            }
            return switch (v.toLowerCase(Locale.ROOT)) {
                case "y", "yes", "true", "1" -> true;
                case "n", "no", "false", "0" -> false;
                default -> throw fail(column, "expected yes or no (or empty) but got '" + v + "'");
            };
        }

        Double number(String column) throws CodebookFormatException {
            String v = get(column);
            if (v == null) {
                return null;
            }
            try {
                double d = Double.parseDouble(v);
                if (!Double.isFinite(d)) {
                    throw new NumberFormatException();
                }
                return d;
            } catch (NumberFormatException e) {
                throw fail(column, "expected a number but got '" + v + "'");
            }
        }

        CodebookFormatException fail(String column, String problem) {
            int i = index[COLUMNS.indexOf(column)];
            return new CodebookFormatException(file, row.line, i + 1, "column " + column, problem);
        }
    }

    /** RFC 4180 records with the line each starts on; a quoted cell may hold commas, quotes ("") and line breaks. */
    private static List<Row> rows(Path file, String text) throws CodebookFormatException {
        List<Row> out = new ArrayList<>();
        List<String> cells = new ArrayList<>();
        StringBuilder cell = new StringBuilder();
        int line = 1;
        int start = 1;
        boolean quoted = false;
        boolean wasQuoted = false;
        int n = text.length();
        for (int i = 0; i < n; i++) {
            char ch = text.charAt(i);
            if (quoted) {
                if (ch == '"') {
                    if (i + 1 < n && text.charAt(i + 1) == '"') {
                        cell.append('"');
                        i++;
                    } else {
                        quoted = false;
                    }
                } else {
                    if (ch == '\n') {
                        line++;
                    }
                    cell.append(ch);
                }
                continue;
            }
            if (ch == '"') {
                if (cell.length() > 0 || wasQuoted) {
                    throw new CodebookFormatException(file, line, cells.size() + 1, null,
                            "a quote inside an unquoted cell; quote the whole cell and double the quote");
                }
                quoted = true;
                wasQuoted = true;
            } else if (ch == ',') {
                cells.add(cell.toString());
                cell.setLength(0);
                wasQuoted = false;
            } else if (ch == '\r' || ch == '\n') {
                if (ch == '\r' && i + 1 < n && text.charAt(i + 1) == '\n') {
                    i++;
                }
                cells.add(cell.toString());
                out.add(new Row(start, List.copyOf(cells)));
                cells.clear();
                cell.setLength(0);
                wasQuoted = false;
                line++;
                start = line;
            } else {
                if (wasQuoted) {
                    throw new CodebookFormatException(file, line, cells.size() + 1, null,
                            "text after the closing quote of a cell");
                }
                cell.append(ch);
            }
        }
        if (quoted) {
            throw new CodebookFormatException(file, start, cells.size() + 1, null, "a quote is opened and never"
                    + " closed");
        }
        if (cell.length() > 0 || !cells.isEmpty() || wasQuoted) {
            cells.add(cell.toString());
            out.add(new Row(start, List.copyOf(cells)));
        }
        return out;
    }
}
