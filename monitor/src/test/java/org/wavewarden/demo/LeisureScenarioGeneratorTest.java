package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.apache.commons.math3.stat.inference.TTest;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.demo.LeisureScenarioGenerator.Wave;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.function.Predicate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The leisure survey's committed files are exactly what the generator writes, its dictionaries and cases carry the
 * planted events at the sizes {@code demo-data/leisure-manifest.yaml} states, and its configuration lists no variable.
 *
 * <p>Reference values are from {@code demo-data/measure-leisure.R} (R 4.2.2, haven 2.5.1, the SPSS files read with
 * {@code read_sav(user_na = TRUE)}); the test recomputes them from the generator's cases.
 */
class LeisureScenarioGeneratorTest {

    private static Path root;
    private static Path folder;
    private static LeisureScenarioGenerator generator;
    private static JsonNode manifest;

    /** Rewrites {@code demo-data/leisure}; run from the repository root or the monitor module. */
    public static void main(String[] args) throws IOException {
        Path target = repositoryRoot().resolve("demo-data").resolve(LeisureScenarioGenerator.FOLDER);
        new LeisureScenarioGenerator().writeAll(target);
        System.out.println("wrote " + LeisureScenarioGenerator.WAVES.size() + " waves and the codebook to " + target);
    }

    @BeforeAll
    static void generate() throws IOException {
        root = repositoryRoot();
        folder = root.resolve("demo-data").resolve(LeisureScenarioGenerator.FOLDER);
        generator = new LeisureScenarioGenerator();
        manifest = yaml(root.resolve("demo-data/leisure-manifest.yaml"));
    }

    // ---- reproducibility ------------------------------------------------------------------------------------

    @Test
    void committedDdiCodebookIsByteForByteTheGeneratorOutput() throws IOException {
        byte[] committed = Files.readAllBytes(folder.resolve(LeisureScenarioGenerator.CODEBOOK_FILE));
        assertArrayEquals(generator.ddi().getBytes(StandardCharsets.UTF_8), committed,
                "the codebook differs from the generator output; rerun LeisureScenarioGeneratorTest.main if the"
                        + " change to the scenario is intended");
    }

    @Test
    void committedSpssFilesAreByteForByteTheGeneratorOutputAndNothingElseIsThere() throws IOException {
        Path fresh = Files.createTempDirectory("leisure");
        generator.writeAll(fresh);
        Set<String> expected = new TreeSet<>();
        expected.add(LeisureScenarioGenerator.CODEBOOK_FILE);
        for (Wave w : LeisureScenarioGenerator.WAVES) {
            expected.add(w.fileName());
            assertArrayEquals(Files.readAllBytes(fresh.resolve(w.fileName())),
                    Files.readAllBytes(folder.resolve(w.fileName())), w.fileName() + " differs from the generator"
                            + " output; rerun LeisureScenarioGeneratorTest.main if the change is intended");
        }
        Set<String> present = new TreeSet<>();
        try (var files = Files.list(folder)) {
            files.forEach(p -> present.add(p.getFileName().toString()));
        }
        assertEquals(expected, present);
    }

    @Test
    void theSameSeedGivesTheSameCasesAndAnotherSeedOtherNoise() {
        Wave w = LeisureScenarioGenerator.WAVES.get(0);
        List<Object[]> again = new LeisureScenarioGenerator().cases(w);
        List<Object[]> mine = generator.cases(w);
        assertEquals(mine.size(), again.size());
        for (int i = 0; i < mine.size(); i++) {
            assertArrayEquals(mine.get(i), again.get(i), "case " + i);
        }
        List<Object[]> other = new LeisureScenarioGenerator(LeisureScenarioGenerator.SEED + 1).cases(w);
        assertFalse(Arrays.equals(column(mine, "age", x -> true), column(other, "age", x -> true)));
    }

    // ---- the dictionaries -----------------------------------------------------------------------------------

    @Test
    void everyWaveFileDescribesEveryVariableWithItsLevelLabelAndFormat() {
        for (Wave w : LeisureScenarioGenerator.WAVES) {
            DatasetCodebook d = generator.dictionary(w);
            assertEquals(w.fileName(), d.source());
            assertEquals(LeisureScenarioGenerator.VARIABLES, d.variables().stream().map(VariableMeta::name).toList());
            for (VariableMeta v : d.variables()) {
                assertFalse(v.label() == null || v.label().isBlank(), v.name() + " has a variable label");
                assertNotEquals(Measure.UNKNOWN, v.measure(), v.name());
                assertFalse(v.format() == null || v.format().isBlank(), v.name());
                assertEquals(null, v.unit(), "an SPSS dictionary has no units; the DDI codebook gives them");
            }
            VariableMeta visits = d.variable("library_visits").orElseThrow();
            assertEquals(List.of(new MissingCodeSpec("-9", "Refused"), new MissingCodeSpec("-8", "Don't know")),
                    visits.missingCodes());
            assertEquals(List.of(new MissingRangeSpec(997.0, 999.0, "not given")),
                    d.variable("age").orElseThrow().missingRanges());
            assertTrue(d.variable("sport_hours").orElseThrow().missingCodes().isEmpty(), "99 is never declared");
            assertEquals(StorageType.DATE, d.variable("visit_date").orElseThrow().storage());
            assertEquals("DATE11", d.variable("visit_date").orElseThrow().format());
            assertEquals(300, d.variable("comments").orElseThrow().width());
            assertEquals(Set.of("1", "2", "3", "4", "5", "6"),
                    d.variable("main_activity").orElseThrow().valueLabels().keySet(), "code 7 is never labelled");
        }
    }

    @ParameterizedTest(name = "{0}: membership code 3 is labelled ''{1}''")
    @CsvSource({"2024-Q3, Concession", "2024-Q4, Concession", "2025-Q1, Reduced rate", "2025-Q2, Reduced rate"})
    void theMembershipLabelOfCode3ChangesBetween2024Q4And2025Q1(String wave, String label) {
        assertEquals(label, generator.dictionary(wave(wave)).variable("membership").orElseThrow().valueLabels().get("3"));
    }

    @Test
    void theStudyCodebookIsTheLatestDictionaryWithUnitsAndTheValidRange() {
        DatasetCodebook study = generator.studyCodebook();
        assertEquals(LeisureScenarioGenerator.TITLE, study.title());
        assertEquals("visits per month", study.variable("library_visits").orElseThrow().unit());
        assertEquals("hours per week", study.variable("sport_hours").orElseThrow().unit());
        assertEquals("Reduced rate", study.variable("membership").orElseThrow().valueLabels().get("3"));
        assertEquals(180.0, study.variable("travel_minutes").orElseThrow().validRange().max());
        assertEquals(Measure.UNKNOWN, study.variable("comments").orElseThrow().measure(),
                "free text has no measurement level, so it is judged as text, not as categories");
        assertFalse(generator.ddi().contains("name=\"comments\" files=\"F1\" intrvl=\"discrete\" nature="));
        assertTrue(generator.ddi().contains("measUnit=\"visits per month\""));
    }

    @Test
    void theLongCommentNeedsMoreThan255BytesAndFitsItsWidth() {
        int longest = 0;
        for (Wave w : LeisureScenarioGenerator.WAVES) {
            int at = LeisureScenarioGenerator.VARIABLES.indexOf("comments");
            for (Object[] row : generator.cases(w)) {
                longest = Math.max(longest, ((String) row[at]).getBytes(StandardCharsets.UTF_8).length);
            }
        }
        // measure-leisure.R: longest 289 bytes (nchar(type = "bytes"))
        assertEquals(289, longest);
        assertTrue(longest > 255 && longest <= 300, "a very long string (more than one 255-byte segment)");
    }

    // ---- the plants, against measure-leisure.R -------------------------------------------------------------

    /** Shares of the declared and undeclared missing values; R: measure-leisure.R, "declared and undeclared". */
    @ParameterizedTest(name = "{0}: visits -9 {1}, -8 {2}, satisfaction 8 {3}, 9 {4}, age 997-999 {5}, sport 99 {6}")
    @CsvSource({
        "2024-Q3, 0.0177, 0.0206, 0.0319, 0.0105, 0.0238, 0.0",
        "2024-Q4, 0.0146, 0.0190, 0.0261, 0.0087, 0.0257, 0.0273",
        "2025-Q1, 0.0118, 0.0163, 0.0232, 0.0114, 0.0280, 0.0317",
        "2025-Q2, 0.0151, 0.0187, 0.0235, 0.0135, 0.0255, 0.0283"})
    void missingValueSharesAreThoseRReads(String wave, double refused, double dontKnow, double satisfactionDontKnow,
                                          double satisfactionRefused, double ageNotGiven, double sport99) {
        List<Object[]> c = generator.cases(wave(wave));
        assertEquals(refused, share(c, "library_visits", x -> x == -9), 5e-5);
        assertEquals(dontKnow, share(c, "library_visits", x -> x == -8), 5e-5);
        assertEquals(satisfactionDontKnow, share(c, "satisfaction", x -> x == 8), 5e-5);
        assertEquals(satisfactionRefused, share(c, "satisfaction", x -> x == 9), 5e-5);
        assertEquals(ageNotGiven, share(c, "age", x -> x >= 997), 5e-5);
        assertEquals(sport99, share(c, "sport_hours", x -> x == 99), 5e-5);
    }

    @Test
    void theOpeningHoursCutIsTheManifestsEffectInR() {
        JsonNode m = plant("library-hours-cut").get("measured");
        double[] before = column(generator.cases(wave("2024-Q4")), "library_visits", x -> x >= 0);
        double[] after = column(generator.cases(wave("2025-Q1")), "library_visits", x -> x >= 0);
        assertEquals(m.get("nBaseline").asInt(), before.length);
        assertEquals(m.get("nCurrent").asInt(), after.length);
        assertEquals(m.get("meanBefore").asDouble(), mean(before), 5e-4);
        assertEquals(m.get("meanAfter").asDouble(), mean(after), 5e-4);
        assertEquals(m.get("hedgesG").asDouble(), hedgesG(after, before), 5e-4);
        // commons-math3 3.6.1 Welch test on the raw values against R's t.test
        double p = new TTest().tTest(after, before);
        assertEquals(m.get("welchP").asDouble(), p, 0.05 * m.get("welchP").asDouble());
    }

    @Test
    void travelTimeAndSportHoursWithout99DoNotMove() {
        JsonNode travel = plant("travel-time-nobody-expects-to-move").get("measured");
        assertEquals(travel.get("hedgesG").asDouble(), hedgesG(
                column(generator.cases(wave("2025-Q1")), "travel_minutes", x -> true),
                column(generator.cases(wave("2024-Q4")), "travel_minutes", x -> true)), 5e-4);
        JsonNode sport = plant("sport-not-asked-99").get("measured");
        assertEquals(sport.get("hedgesGWithout99").asDouble(), hedgesG(
                column(generator.cases(wave("2024-Q4")), "sport_hours", x -> x != 99),
                column(generator.cases(wave("2024-Q3")), "sport_hours", x -> x != 99)), 5e-4);
    }

    @Test
    void code7OfMainActivityAppearsOnlyInTheLastWave() {
        for (Wave w : LeisureScenarioGenerator.WAVES) {
            double share = share(generator.cases(w), "main_activity", x -> x == 7);
            if (w.label().equals("2025-Q2")) {
                assertEquals(plant("makerspace-code-appears").get("measured").get("share").asDouble(), share, 5e-5);
            } else {
                assertEquals(0.0, share, w.label());
            }
        }
    }

    // ---- configuration and manifest -------------------------------------------------------------------------

    @Test
    void theConfigListsNoVariableAndNamesTheCommittedCodebookRelativeToItself() throws IOException {
        Path config = root.resolve("config/demo.yaml");
        JsonNode dataset = null;
        for (JsonNode d : yaml(config).path("datasets")) {
            if (d.path("name").asText().equals(manifest.path("dataset").asText())) {
                dataset = d;
            }
        }
        assertTrue(dataset != null, "config/demo.yaml has the dataset " + manifest.path("dataset").asText());
        assertFalse(dataset.has("variables"), "zero hand-written variable entries");
        assertEquals("survey_demo.leisure_wave", dataset.path("table").asText());
        assertEquals("wave", dataset.path("waveColumn").asText());
        assertEquals(List.of("respondent_id"), List.of(dataset.path("exclude").path(0).asText()));
        Path ddi = config.getParent().resolve(dataset.path("codebook").path("ddi").asText()).normalize();
        assertEquals(folder.resolve(LeisureScenarioGenerator.CODEBOOK_FILE).normalize(), ddi);
        assertTrue(Files.isRegularFile(ddi));
    }

    @Test
    void theDemoStagesItsConfigFromTheJarBesideTheCodebookItNames() throws IOException {
        Path staging = Files.createTempDirectory("staged");
        Path config = DemoRun.stageConfig(staging);
        assertArrayEquals(Files.readAllBytes(root.resolve("config/demo.yaml")), Files.readAllBytes(config));
        String relative = null;
        for (JsonNode d : yaml(config).path("datasets")) {
            if (d.has("codebook")) {
                relative = d.path("codebook").path("ddi").asText();
            }
        }
        Path ddi = config.getParent().resolve(relative).normalize();
        assertTrue(ddi.startsWith(staging), "the codebook resolves inside the staging folder: " + ddi);
        assertArrayEquals(Files.readAllBytes(folder.resolve(LeisureScenarioGenerator.CODEBOOK_FILE)),
                Files.readAllBytes(ddi));
    }

    @Test
    void manifestNamesOnlyRealWavesVariablesAndKinds() {
        List<String> labels = LeisureScenarioGenerator.WAVES.stream().map(Wave::label).toList();
        Set<String> kinds = new HashSet<>(Arrays.stream(org.wavewarden.judge.FindingKind.values()).map(Enum::name)
                .toList());
        kinds.addAll(List.of("LABEL_CHANGED", "CODE_UNLABELLED"));   // the value-label checks (needs: labels)
        Set<String> ids = new HashSet<>();
        List<String> seen = new ArrayList<>();
        for (JsonNode p : manifest.path("plants")) {
            String id = p.path("id").asText();
            assertTrue(ids.add(id), "duplicate id " + id);
            int at = labels.indexOf(p.path("wave").asText());
            assertTrue(at >= 0, id + ": wave");
            assertEquals(at == 0 ? "" : labels.get(at - 1), p.path("against").asText(), id + ": against");
            assertTrue(kinds.contains(p.path("kind").asText()), id + ": kind " + p.path("kind").asText());
            assertTrue(LeisureScenarioGenerator.VARIABLES.contains(p.path("variable").asText()), id + ": variable");
            assertTrue(!p.has("needs") || p.path("needs").asText().equals("labels"), id + ": needs");
            assertFalse(p.path("note").asText().isBlank(), id + ": note");
            seen.add(p.path("kind").asText());
        }
        assertTrue(seen.containsAll(List.of("SHIFT", "NUMERIC_SENTINEL", "MISSING_CODE", "CODE_APPEARED",
                "LABEL_CHANGED", "CODE_UNLABELLED")), seen.toString());
    }

    // ---- support --------------------------------------------------------------------------------------------

    private static JsonNode plant(String id) {
        for (JsonNode p : manifest.path("plants")) {
            if (p.path("id").asText().equals(id)) {
                return p;
            }
        }
        throw new AssertionError("no plant " + id);
    }

    private static Wave wave(String label) {
        return LeisureScenarioGenerator.WAVES.stream().filter(w -> w.label().equals(label)).findFirst().orElseThrow();
    }

    private static double[] column(List<Object[]> cases, String variable, Predicate<Double> keep) {
        int at = LeisureScenarioGenerator.VARIABLES.indexOf(variable);
        return cases.stream().map(r -> (Double) r[at]).filter(keep).mapToDouble(Double::doubleValue).toArray();
    }

    private static double share(List<Object[]> cases, String variable, Predicate<Double> hit) {
        return (double) column(cases, variable, hit).length / cases.size();
    }

    private static double mean(double[] x) {
        return Arrays.stream(x).average().orElseThrow();
    }

    /** Hedges' g of x against y as measure-leisure.R computes it (J = 1 - 3 / (4 (n1 + n2) - 9), pooled SD). */
    private static double hedgesG(double[] x, double[] y) {
        double mx = mean(x);
        double my = mean(y);
        double ss = Arrays.stream(x).map(v -> (v - mx) * (v - mx)).sum()
                + Arrays.stream(y).map(v -> (v - my) * (v - my)).sum();
        double sp = Math.sqrt(ss / (x.length + y.length - 2));
        return (1 - 3.0 / (4 * (x.length + y.length) - 9)) * (mx - my) / sp;
    }

    private static JsonNode yaml(Path file) throws IOException {
        return new ObjectMapper(new YAMLFactory()).readTree(file.toFile());
    }

    private static Path repositoryRoot() {
        Path dir = Path.of("").toAbsolutePath();
        while (dir != null && !Files.isDirectory(dir.resolve("demo-data"))) {
            dir = dir.getParent();
        }
        if (dir == null) {
            throw new IllegalStateException("no demo-data folder above the working directory");
        }
        return dir;
    }
}
