package org.wavewarden.load.spss;

import org.wavewarden.codebook.Codes;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;

/**
 * What the independent tools read back from a system file, held against what {@link SavReader} reads from it.
 * {@code FILE.haven.tsv} is written by {@code readback.R} (R 4.2.2, haven 2.5.1, {@code read_sav(user_na = TRUE)});
 * {@code FILE.pspp.csv} is GNU PSPP 1.6.2's {@code DISPLAY DICTIONARY} (haven 2.5.1 does not expose measurement
 * levels). Every difference is collected, so one run lists all of them.
 */
final class ToolReadback {

    /** What was compared, and every difference found. */
    record Comparison(int variables, int values, int labels, int missing, int measures, List<String> differences) {
    }

    private ToolReadback() {
    }

    static Comparison compareWithHaven(Path sav, Path havenTsv, Path psppCsv) throws IOException {
        List<String> diffs = new ArrayList<>();
        Map<String, String[]> vars = new LinkedHashMap<>();
        Map<String, Map<String, String>> labels = new HashMap<>();
        Map<String, List<String>> naValues = new HashMap<>();
        Map<String, String[]> naRange = new HashMap<>();
        Map<String, TreeMap<Integer, String>> values = new HashMap<>();
        for (String line : Files.readAllLines(havenTsv, StandardCharsets.UTF_8)) {
            String[] f = line.split("\t", -1);
            for (int i = 0; i < f.length; i++) {
                f[i] = unescape(f[i]);
            }
            switch (f[0]) {
                case "var" -> vars.put(f[1], f);
                case "vlabel" -> labels.computeIfAbsent(f[1], k -> new LinkedHashMap<>()).put(f[2], f[3]);
                case "na_value" -> naValues.computeIfAbsent(f[1], k -> new ArrayList<>()).add(f[2]);
                case "na_range" -> naRange.put(f[1], new String[]{f[2], f[3]});
                case "value" -> values.computeIfAbsent(f[2], k -> new TreeMap<>()).put(Integer.parseInt(f[1]), f[3]);
                default -> {
                }
            }
        }
        Map<String, Measure> measures = psppMeasures(psppCsv);
        int valueCount = 0;
        int labelCount = 0;
        int missingCount = 0;
        int measureCount = 0;
        try (SavReader reader = SavFiles.open(sav)) {
            DatasetCodebook book = reader.codebook();
            List<String> names = book.variables().stream().map(VariableMeta::name).toList();
            if (!names.equals(new ArrayList<>(vars.keySet()))) {
                diffs.add("variables: reader " + names + ", haven " + vars.keySet());
                return new Comparison(0, 0, 0, 0, 0, diffs);
            }
            for (VariableMeta v : book.variables()) {
                String[] r = vars.get(v.name());
                String cls = r[2];
                StorageType expected = switch (cls) {
                    case "character" -> StorageType.TEXT;
                    case "Date" -> StorageType.DATE;
                    case "POSIXct" -> StorageType.DATETIME;
                    default -> v.format().startsWith("YMDHMS") ? StorageType.DATETIME : StorageType.NUMBER;
                };
                check(diffs, v.name() + " storage", expected, v.storage());
                check(diffs, v.name() + " format", r[3], v.format());
                check(diffs, v.name() + " label", r[4].isEmpty() ? null : r[4], v.label());
                Map<String, String> havenLabels = new LinkedHashMap<>();
                labels.getOrDefault(v.name(), Map.of()).forEach((code, label) ->
                        havenLabels.put(code(v, code), label));
                check(diffs, v.name() + " value labels", new TreeMap<>(havenLabels), new TreeMap<>(v.valueLabels()));
                labelCount += havenLabels.size();
                List<String> havenMissing = new ArrayList<>();
                for (String m : naValues.getOrDefault(v.name(), List.of())) {
                    havenMissing.add(code(v, m));
                }
                check(diffs, v.name() + " missing values", havenMissing,
                        v.missingCodes().stream().map(MissingCodeSpec::value).toList());
                for (MissingCodeSpec m : v.missingCodes()) {
                    check(diffs, v.name() + " reason of missing " + m.value(),
                            havenLabels.getOrDefault(m.value(), SavReader.DECLARED_MISSING), m.reason());
                }
                missingCount += havenMissing.size();
                String[] range = naRange.get(v.name());
                List<String> expectedRanges = range == null ? List.of()
                        : List.of(bound(range[0]) + ".." + bound(range[1]));
                check(diffs, v.name() + " missing range", expectedRanges,
                        v.missingRanges().stream().map(x -> x.low() + ".." + x.high()).toList());
                missingCount += expectedRanges.size();
                if (measures.containsKey(v.name())) {
                    check(diffs, v.name() + " measure (PSPP DISPLAY DICTIONARY)", measures.get(v.name()), v.measure());
                    measureCount++;
                }
            }
            Object[] row = new Object[names.size()];
            int caseNo = 0;
            while (reader.next(row)) {
                caseNo++;
                for (int i = 0; i < names.size(); i++) {
                    String name = names.get(i);
                    String expected = values.get(name).get(caseNo);
                    if (expected == null) {
                        diffs.add("case " + caseNo + ": haven has no such case");
                        continue;
                    }
                    VariableMeta v = book.variables().get(i);
                    if (expected.equals("NA") && row[i] instanceof String s
                            && v.missingCodes().stream().anyMatch(m -> m.value().equals(s))) {
                        // haven 2.5.1 gives NA for a user-missing string value of a file it wrote itself, even
                        // with user_na = TRUE; the reader returns the value as it is (CaseSource's contract).
                        expected = s;
                    }
                    compareValue(diffs, "case " + caseNo + " " + name, expected, row[i]);
                    valueCount++;
                }
            }
            int havenCases = values.isEmpty() ? 0 : values.values().iterator().next().size();
            check(diffs, "case count", havenCases, caseNo);
        }
        return new Comparison(vars.size(), valueCount, labelCount, missingCount, measureCount, diffs);
    }

    private static void compareValue(List<String> diffs, String where, String haven, Object ours) {
        if (haven.equals("NA")) {
            check(diffs, where, null, ours);
        } else if (ours instanceof Double d) {
            check(diffs, where, Double.parseDouble(haven), d);
        } else if (ours instanceof LocalDate d) {
            check(diffs, where, haven, d.toString());
        } else if (ours instanceof LocalDateTime t) {
            String expected = haven.contains("T") ? haven
                    // haven 2.5.1 reads YMDHMS as a plain number of seconds since 1582-10-14.
                    : LocalDateTime.of(1582, 10, 14, 0, 0).plusSeconds((long) Double.parseDouble(haven)).toString();
            check(diffs, where, LocalDateTime.parse(expected), t.withNano(0));
        } else {
            check(diffs, where, haven, ours);
        }
    }

    /**
     * A code as the codebook keys it: numbers in the form of {@link Codes#of}; text without the blanks SPSS pads it
     * with (haven 2.5.1 keeps them up to the variable's width for files PSPP wrote, "OWN " for A4).
     */
    private static String code(VariableMeta v, String havenCode) {
        return v.storage() == StorageType.TEXT ? havenCode.stripTrailing() : Codes.of(Double.parseDouble(havenCode));
    }

    private static Double bound(String r) {
        return r.equals("-Inf") || r.equals("Inf") ? null : Double.parseDouble(r);
    }

    private static void check(List<String> diffs, String what, Object expected, Object actual) {
        if (!Objects.equals(expected, actual)) {
            diffs.add(what + ": expected " + expected + ", reader gave " + actual);
        }
    }

    /** The measurement level of each variable in PSPP's DISPLAY DICTIONARY table "Variables". */
    static Map<String, Measure> psppMeasures(Path csv) throws IOException {
        Map<String, Measure> out = new LinkedHashMap<>();
        for (Map<String, String> row : psppVariables(csv)) {
            out.put(row.get("Name"), Measure.valueOf(row.get("Measurement Level").toUpperCase(Locale.ROOT)));
        }
        return out;
    }

    /** The rows of PSPP's DISPLAY DICTIONARY table "Variables", by column name. */
    static List<Map<String, String>> psppVariables(Path csv) throws IOException {
        List<String> lines = Files.readAllLines(csv, StandardCharsets.UTF_8);
        List<Map<String, String>> rows = new ArrayList<>();
        int at = lines.indexOf("Table: Variables");
        if (at < 0) {
            return rows;
        }
        List<String> header = csvFields(lines.get(at + 1));
        for (int i = at + 2; i < lines.size() && !lines.get(i).isEmpty(); i++) {
            List<String> fields = csvFields(lines.get(i));
            Map<String, String> row = new LinkedHashMap<>();
            for (int k = 0; k < header.size() && k < fields.size(); k++) {
                row.put(header.get(k), fields.get(k));
            }
            rows.add(row);
        }
        return rows;
    }

    /** One line of the comma-separated text PSPP prints, split as RFC 4180 quotes it. */
    static List<String> csvFields(String line) {
        List<String> out = new ArrayList<>();
        StringBuilder cur = new StringBuilder();
        boolean quoted = false;
        for (int i = 0; i < line.length(); i++) {
            char c = line.charAt(i);
            if (quoted) {
                if (c == '"' && i + 1 < line.length() && line.charAt(i + 1) == '"') {
                    cur.append('"');
                    i++;
                } else if (c == '"') {
                    quoted = false;
                } else {
                    cur.append(c);
                }
            } else if (c == '"') {
                quoted = true;
            } else if (c == ',') {
                out.add(cur.toString());
                cur.setLength(0);
            } else {
                cur.append(c);
            }
        }
        out.add(cur.toString());
        return out;
    }

    private static String unescape(String s) {
        StringBuilder out = new StringBuilder(s.length());
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            if (c == '\\' && i + 1 < s.length()) {
                char n = s.charAt(++i);
                out.append(n == 't' ? '\t' : n == 'n' ? '\n' : n);
            } else {
                out.append(c);
            }
        }
        return out.toString();
    }
}
