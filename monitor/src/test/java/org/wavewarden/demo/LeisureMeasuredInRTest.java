package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.File;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The committed SPSS files of the leisure survey, read by an independent reader, hold what the manifest says: runs
 * {@code demo-data/measure-leisure.R} (R 4.2.2 with haven 2.5.1, Debian {@code r-cran-haven}, as CI installs them) on
 * the committed files and compares what R reads (cases, value labels per wave, code frames, missing-value shares, the
 * planted effect) with {@code leisure-manifest.yaml}. Skipped, and says so, where {@code Rscript} is not on the PATH.
 */
class LeisureMeasuredInRTest {

    private static String printed;
    private static JsonNode manifest;

    @BeforeAll
    static void runTheScript() throws Exception {
        Assumptions.assumeTrue(onPath("Rscript"), "Rscript is not on the PATH: the R check of the leisure files is"
                + " skipped");
        Path root = Path.of("..").toAbsolutePath().normalize();
        Process p = new ProcessBuilder("Rscript", "demo-data/measure-leisure.R", "demo-data/leisure")
                .directory(root.toFile()).redirectErrorStream(true).start();
        byte[] out = p.getInputStream().readAllBytes();
        assertTrue(p.waitFor(5, TimeUnit.MINUTES), "the script ends");
        printed = new String(out, StandardCharsets.UTF_8);
        assertEquals(0, p.exitValue(), printed);
        manifest = new ObjectMapper(new YAMLFactory()).readTree(root.resolve("demo-data/leisure-manifest.yaml")
                .toFile());
    }

    @Test
    void rReadsEveryWavesCasesLabelsAndCodeFrameAsWritten() {
        for (LeisureScenarioGenerator.Wave w : LeisureScenarioGenerator.WAVES) {
            String label = w.index() >= 2 ? "Reduced rate" : "Concession";
            String codes = w.label().equals("2025-Q2") ? "1 2 3 4 5 6 7" : "1 2 3 4 5 6";
            assertTrue(printed.contains(w.label() + ": " + w.respondents() + " cases; membership 3 is labelled '"
                    + label + "'; main_activity codes " + codes + ", labelled 1 2 3 4 5 6"), printed);
        }
    }

    @Test
    void rReadsTheDeclaredAndUndeclaredMissingSharesOfTheManifest() {
        JsonNode visits = plant("visits-declared-missing").get("measured");
        JsonNode sport = plant("sport-not-asked-99").get("measured");
        JsonNode age = plant("age-declared-range").get("measured");
        for (LeisureScenarioGenerator.Wave w : LeisureScenarioGenerator.WAVES) {
            int k = w.index();
            String expected = String.format(Locale.ROOT, "%s  visits -9 %.4f -8 %.4f |", w.label(),
                    visits.get("refusedShare").get(k).asDouble(), visits.get("dontKnowShare").get(k).asDouble());
            assertTrue(printed.contains(expected), expected + "\n" + printed);
            String tail = String.format(Locale.ROOT, "| age 997-999 %.4f | sport 99 %.4f", age.get("notGivenShare")
                    .get(k).asDouble(), sport.get("share").get(k).asDouble());
            assertTrue(printed.contains(tail), tail + "\n" + printed);
        }
    }

    @Test
    void rMeasuresThePlantedShiftOfTheManifest() {
        JsonNode m = plant("library-hours-cut").get("measured");
        Matcher line = Pattern.compile("-- 2025-Q1 against 2024-Q4 \\n(?s:.*?)library_visits +n (\\d+) / (\\d+) .*?g "
                + "(-?[0-9.]+) \\((-?[0-9.]+), (-?[0-9.]+)\\).*?delta (-?[0-9.]+) \\((-?[0-9.]+), (-?[0-9.]+)\\)")
                .matcher(printed);
        assertTrue(line.find(), printed);
        assertEquals(m.get("nBaseline").asInt(), Integer.parseInt(line.group(1)));
        assertEquals(m.get("nCurrent").asInt(), Integer.parseInt(line.group(2)));
        assertEquals(m.get("hedgesG").asDouble(), Double.parseDouble(line.group(3)), 5e-4);
        assertEquals(m.get("gCI").get(0).asDouble(), Double.parseDouble(line.group(4)), 5e-4);
        assertEquals(m.get("gCI").get(1).asDouble(), Double.parseDouble(line.group(5)), 5e-4);
        assertEquals(m.get("cliffsDelta").asDouble(), Double.parseDouble(line.group(6)), 5e-4);
        assertEquals(m.get("deltaCI").get(0).asDouble(), Double.parseDouble(line.group(7)), 5e-4);
        assertEquals(m.get("deltaCI").get(1).asDouble(), Double.parseDouble(line.group(8)), 5e-4);
        assertTrue(printed.contains("longest  289  bytes"), "the 289-byte comment survives the very long string");
    }

    private static JsonNode plant(String id) {
        for (JsonNode p : manifest.path("plants")) {
            if (p.path("id").asText().equals(id)) {
                return p;
            }
        }
        throw new AssertionError("no plant " + id);
    }

    private static boolean onPath(String program) throws IOException {
        String path = System.getenv("PATH");
        if (path == null) {
            return false;
        }
        for (String dir : path.split(File.pathSeparator)) {
            if (Files.isExecutable(Path.of(dir, program))) {
                return true;
            }
        }
        return false;
    }
}
