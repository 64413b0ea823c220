package org.wavewarden.load.spss;

import com.fasterxml.jackson.databind.JsonNode;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * What independent readers make of a written file: R's haven (through {@code sav-writer/read-back.R}) and GNU PSPP,
 * run live when they are on the PATH, and the comparison of haven's reading with the sample that was written.
 */
final class SavWriterReadBack {

    private static final long TIMEOUT_SECONDS = 120;

    private SavWriterReadBack() {
    }

    /** The tool's path; skips the test when it is missing, except on CI, where a missing tool is a failure. */
    static String tool(String name, String debianPackage) {
        for (String p : System.getenv().getOrDefault("PATH", "").split(File.pathSeparator)) {
            Path exe = Path.of(p, name);
            if (Files.isExecutable(exe)) {
                return exe.toString();
            }
        }
        String why = name + " is not on PATH (Debian: apt-get install " + debianPackage + ")";
        if ("true".equals(System.getenv("CI"))) {
            return fail(why + "; on CI the checks against independent readers must run");
        }
        assumeTrue(false, why);
        return null;
    }

    record Run(int exit, String output) {
    }

    static Run run(Path dir, List<String> command) throws IOException, InterruptedException {
        Path log = Files.createTempFile(dir, "run", ".log");
        Process p = new ProcessBuilder(command).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(log.toFile()).start();
        if (!p.waitFor(TIMEOUT_SECONDS, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail(command.get(0) + " did not finish within " + TIMEOUT_SECONDS + " s");
        }
        return new Run(p.exitValue(), Files.readString(log));
    }

    /** Runs {@code read-back.R} (R 4.2.2, haven 2.5.1, jsonlite 1.8.4) over the files; the JSON it writes. */
    static Path haven(Path dir, List<Path> files) throws IOException, InterruptedException {
        String rscript = tool("Rscript", "r-cran-haven r-cran-jsonlite");
        Path script = dir.resolve("read-back.R");
        try (var in = SavWriterReadBack.class.getResourceAsStream("/sav-writer/read-back.R")) {
            assertNotNull(in, "the read-back script is on the test class path");
            Files.copy(in, script, java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        }
        Path out = dir.resolve("read-back.json");
        List<String> cmd = new ArrayList<>(List.of(rscript, script.toString(), out.toString()));
        files.forEach(f -> cmd.add(f.toString()));
        Run r = run(dir, cmd);
        assertEquals(0, r.exit(), "R's haven reads every file: " + r.output());
        return out;
    }

    /**
     * Checks haven's reading of one file against the sample it was written from: the file label, the number of
     * cases, and for every variable its name, label, format, kind, user-missing values and range, value labels and
     * every value.
     */
    static void assertHavenReads(SavWriterSamples.Sample sample, JsonNode file, String what) {
        assertEquals(sample.codebook().title(), file.path("file_label").asText(null), what + ": file label");
        assertEquals(sample.cases(), file.path("rows").asInt(), what + ": cases");
        JsonNode vars = file.path("variables");
        assertEquals(sample.columns().size(), vars.size(), what + ": variables");
        for (int c = 0; c < sample.columns().size(); c++) {
            SavWriterSamples.Column col = sample.columns().get(c);
            VariableMeta m = col.meta();
            JsonNode v = vars.get(c);
            String at = what + ", " + m.name();
            assertEquals(m.name(), v.path("name").asText(), at + ": name");
            assertEquals(m.label(), v.path("label").isNull() ? null : v.path("label").asText(), at + ": label");
            assertEquals(col.format(), v.path("format").asText(), at + ": format");
            assertEquals(switch (m.storage()) {
                case NUMBER -> "number";
                case TEXT -> "string";
                case DATE -> "date";
                case DATETIME -> "datetime";
            }, v.path("kind").asText(), at + ": kind");
            assertMissing(m, v, at);
            assertLabels(m, v, at);
            JsonNode values = v.path("values");
            assertEquals(sample.cases(), values.size(), at + ": values");
            for (int i = 0; i < sample.cases(); i++) {
                assertValue(m, col.value().apply(i), values.get(i), at + ", case " + (i + 1));
            }
        }
    }

    private static void assertMissing(VariableMeta m, JsonNode v, String at) {
        JsonNode values = v.path("na_values");
        assertEquals(m.missingCodes().size(), values.size(), at + ": na_values " + values);
        for (int i = 0; i < m.missingCodes().size(); i++) {
            MissingCodeSpec code = m.missingCodes().get(i);
            if (m.storage() == StorageType.TEXT) {
                assertEquals(code.value(), values.get(i).asText(), at + ": na_values");
            } else {
                assertEquals(Double.parseDouble(code.value()), Double.parseDouble(values.get(i).asText()),
                        at + ": na_values");
            }
        }
        JsonNode range = v.path("na_range");
        if (m.missingRanges().isEmpty()) {
            assertEquals(0, range.size(), at + ": na_range " + range);
        } else {
            MissingRangeSpec r = m.missingRanges().get(0);
            assertEquals(2, range.size(), at + ": na_range " + range);
            assertEquals(r.low() == null ? Double.NEGATIVE_INFINITY : r.low(), number(range.get(0)), at + ": low");
            assertEquals(r.high() == null ? Double.POSITIVE_INFINITY : r.high(), number(range.get(1)), at + ": high");
        }
    }

    private static void assertLabels(VariableMeta m, JsonNode v, String at) {
        Map<String, String> read = new HashMap<>();
        for (JsonNode l : v.path("labels")) {
            String value = l.path("value").asText();
            read.put(m.storage() == StorageType.TEXT ? value : Double.toString(Double.parseDouble(value)),
                    l.path("label").asText());
        }
        Map<String, String> written = new HashMap<>();
        m.valueLabels().forEach((k, label) -> written.put(
                m.storage() == StorageType.TEXT ? k : Double.toString(Double.parseDouble(k)), label));
        assertEquals(written, read, at + ": value labels");
    }

    private static double number(JsonNode n) {
        return switch (n.asText()) {
            case "-Inf" -> Double.NEGATIVE_INFINITY;
            case "Inf" -> Double.POSITIVE_INFINITY;
            default -> Double.parseDouble(n.asText());
        };
    }

    private static void assertValue(VariableMeta m, Object written, JsonNode read, String at) {
        switch (m.storage()) {
            case TEXT -> assertEquals(written == null ? "" : ((String) written).stripTrailing(), read.asText(), at);
            case NUMBER -> {
                double d = written == null ? Double.NaN : ((Number) written).doubleValue();
                if (Double.isNaN(d)) {
                    assertTrue(read.isNull(), at + ": system-missing, read " + read);
                } else {
                    assertEquals(d, number(read), at);
                }
            }
            case DATE -> assertEquals(written == null ? null : written.toString(),
                    read.isNull() ? null : read.asText(), at);
            case DATETIME -> {
                if (written == null) {
                    assertTrue(read.isNull(), at + ": system-missing, read " + read);
                } else {
                    LocalDateTime t = (LocalDateTime) written;
                    double seconds = t.toEpochSecond(ZoneOffset.UTC) + t.getNano() / 1e9;
                    // seconds since 1582 in a double resolve to about 2 microseconds in this century
                    assertEquals(seconds, number(read), 1e-5, at);
                }
            }
        }
    }

    /**
     * GNU PSPP 1.6.2's reading of a file: {@code GET FILE}, {@code DISPLAY DICTIONARY} and {@code LIST}, with the
     * output as CSV tables and everything PSPP said on the terminal.
     *
     * @param tables  each table's title ("Variables", "Data List") -> its rows, the header row first
     * @param console what PSPP printed, where its warnings and errors appear
     */
    record Pspp(int exit, Map<String, List<List<String>>> tables, String console) {

        /** The row of the Variables table for that variable: column name -> cell. */
        Map<String, String> variable(String name) {
            List<List<String>> rows = tables.getOrDefault("Variables", List.of());
            assertFalse(rows.isEmpty(), "PSPP listed the variables:\n" + console);
            for (List<String> row : rows.subList(1, rows.size())) {
                if (row.get(0).equals(name)) {
                    Map<String, String> out = new HashMap<>();
                    for (int i = 0; i < rows.get(0).size() && i < row.size(); i++) {
                        out.put(rows.get(0).get(i), row.get(i));
                    }
                    return out;
                }
            }
            return fail("PSPP does not list " + name + " among the variables");
        }
    }

    static Pspp pspp(Path dir, Path file) throws IOException, InterruptedException {
        return pspp(dir, file, "LIST.");
    }

    static Pspp pspp(Path dir, Path file, String list) throws IOException, InterruptedException {
        String pspp = tool("pspp", "pspp");
        String stem = file.getFileName().toString().replace('.', '-');
        Path syntax = dir.resolve(stem + ".sps");
        Path csv = dir.resolve(stem + ".csv");
        Files.writeString(syntax, "GET FILE='" + file.getFileName() + "'.\nDISPLAY DICTIONARY.\n" + list + "\n");
        Run r = run(dir, List.of(pspp, "-o", csv.getFileName().toString(), syntax.getFileName().toString()));
        String text = Files.exists(csv) ? Files.readString(csv) : "";
        return new Pspp(r.exit(), tables(text), r.output() + text);
    }

    /** PSPP's CSV output: blocks that start with "Table: TITLE", one CSV row per line, a blank line after each. */
    static Map<String, List<List<String>>> tables(String csv) {
        Map<String, List<List<String>>> out = new LinkedHashMap<>();
        List<List<String>> current = null;
        for (String line : csv.split("\n", -1)) {
            if (line.startsWith("Table: ")) {
                current = new ArrayList<>();
                out.put(line.substring("Table: ".length()).strip(), current);
            } else if (line.isBlank()) {
                current = null;
            } else if (current != null) {
                current.add(ToolReadback.csvFields(line));
            }
        }
        return out;
    }
}
