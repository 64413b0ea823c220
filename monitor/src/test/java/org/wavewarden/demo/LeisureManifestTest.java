package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.FindingsSchema;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo's third dataset end to end on an embedded PostgreSQL server: the leisure survey's SPSS waves are imported
 * (the first creating the table from its dictionary), judged with no variable listed in the configuration (the DDI
 * codebook and each wave's dictionary say what every variable is), and held to {@code demo-data/leisure-manifest.yaml}:
 * every plant is found with its kind, variable, wave and verdict, every other comparison is STABLE, and no alert is
 * left that no plant explains.
 */
class LeisureManifestTest {

    @TempDir
    static Path out;
    static DemoRun.Outcome outcome;
    static String console;
    static JsonNode manifest;
    static final Map<String, FindingsReport> byWave = new LinkedHashMap<>();
    static final List<String> waves = LeisureScenarioGenerator.WAVES.stream().map(LeisureScenarioGenerator.Wave::label)
            .toList();

    @BeforeAll
    static void runTheDemo() throws Exception {
        StringWriter text = new StringWriter();
        outcome = DemoRun.run(out, new PrintWriter(text, true));
        console = text.toString();
        outcome.leisureReports().forEach(r -> byWave.put(r.wave(), r));
        manifest = new ObjectMapper(new YAMLFactory()).readTree(Path.of("..", "demo-data", "leisure-manifest.yaml")
                .toFile());
    }

    @Test
    void everyWaveIsImportedFromItsSpssFileJudgedAndWrittenToTheContract() {
        assertEquals(waves, List.copyOf(byWave.keySet()));
        Path dir = out.resolve(DemoRun.LEISURE_FOLDER);
        for (LeisureScenarioGenerator.Wave w : LeisureScenarioGenerator.WAVES) {
            assertTrue(console.contains("imported " + manifest.get("dataset").asText() + " wave " + w.label()
                    + " from " + w.fileName() + ": " + w.respondents() + " rows"), console);
            FindingsReport back = FindingsFiles.read(OutputPaths.under(dir, w.label()).resolve("findings.json"));
            assertEquals(manifest.get("dataset").asText(), back.dataset());
            assertEquals(byWave.get(w.label()).findings().size(), back.findings().size());
        }
        assertTrue(outcome.outputs().contains(dir.resolve("digest.html")));
        assertTrue(console.contains(manifest.get("dataset").asText() + ": judged 2025-Q2 against 2025-Q1"), console);
    }

    @Test
    void eachWaveIsImportedWithTheDictionaryItsFileCarries() {
        LeisureScenarioGenerator generator = new LeisureScenarioGenerator();
        assertEquals(waves, List.copyOf(outcome.leisureImports().keySet()));
        for (LeisureScenarioGenerator.Wave w : LeisureScenarioGenerator.WAVES) {
            DatasetCodebook written = generator.dictionary(w);
            DatasetCodebook read = outcome.leisureImports().get(w.label());
            for (VariableMeta expected : written.variables()) {
                VariableMeta got = read.variable(expected.name()).orElseThrow(() -> new AssertionError(
                        w.label() + ": " + expected.name() + " missing from the dictionary read"));
                String at = w.label() + " " + expected.name();
                assertEquals(expected.label(), got.label(), at);
                assertEquals(expected.storage(), got.storage(), at);
                assertEquals(expected.measure(), got.measure(), at);
                assertEquals(expected.valueLabels(), got.valueLabels(), at);
                assertEquals(expected.missingCodes().stream().map(m -> m.value()).toList(),
                        got.missingCodes().stream().map(m -> m.value()).toList(), at);
                assertEquals(expected.missingRanges().stream().map(r -> r.low() + ".." + r.high()).toList(),
                        got.missingRanges().stream().map(r -> r.low() + ".." + r.high()).toList(), at);
            }
        }
    }

    @TestFactory
    Stream<DynamicTest> everyPlantIsFoundWithItsVerdict() {
        List<DynamicTest> tests = new ArrayList<>();
        for (JsonNode p : manifest.get("plants")) {
            tests.add(DynamicTest.dynamicTest(p.get("id").asText(), () -> {
                String kind = p.get("kind").asText();
                Assumptions.assumeTrue(!p.has("needs") || hasKind(kind), () -> p.get("id").asText() + " needs the "
                        + kind + " finding, which this build of the monitor does not have: skipped");
                FindingsReport r = byWave.get(p.get("wave").asText());
                assertEquals(p.path("against").asText(null), r.againstWave(), "judged against");
                Finding f = find(r, p.get("variable").asText(), kind).orElseThrow(() -> new AssertionError("no " + kind
                        + " finding for " + p.get("variable").asText() + " in " + r.wave() + "; found "
                        + r.findings().stream().map(x -> x.variable() + " " + x.kind()).toList()));
                if (p.has("verdict")) {
                    assertEquals(p.get("verdict").asText(), String.valueOf(f.verdict()), f.sentence());
                }
                String shift = p.path("shiftVerdict").asText("");
                Optional<Finding> s = find(r, p.get("variable").asText(), "SHIFT");
                if (shift.equals("none")) {
                    assertTrue(s.isEmpty(), () -> "no comparison expected: " + s.get().sentence());
                } else if (!shift.isEmpty() && !shift.equals("any")) {
                    assertEquals(shift, s.map(x -> String.valueOf(x.verdict())).orElse("no SHIFT finding"),
                            s.map(Finding::sentence).orElse(""));
                }
            }));
        }
        return tests.stream();
    }

    @Test
    void everyComparisonWithoutAPlantIsStableAndTheUncomparedAreNotCompared() {
        List<String> notCompared = new ArrayList<>();
        manifest.get("expectedElsewhere").get("notCompared").forEach(v -> notCompared.add(v.asText()));
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : byWave.values()) {
            for (Finding f : r.findings()) {
                if (f.kind() != FindingKind.SHIFT) {
                    continue;
                }
                String expected = expectedShiftVerdict(r.wave(), f.variable());
                if (notCompared.contains(f.variable())) {
                    problems.add(r.wave() + " " + f.variable() + ": compared, but the manifest says it is not");
                } else if (!expected.equals("any") && !expected.equals(String.valueOf(f.verdict()))) {
                    problems.add(r.wave() + " " + f.variable() + ": " + f.verdict() + ", expected " + expected + " ("
                            + f.sentence() + ")");
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void everyAnswerIsComparedThoughTheConfigListsNoVariable() {
        FindingsReport r = byWave.get("2025-Q1");
        for (String v : LeisureScenarioGenerator.VARIABLES) {
            boolean compared = find(r, v, "SHIFT").isPresent();
            boolean expected = !List.of("respondent_id", "comments").contains(v);
            assertEquals(expected, compared, v + (expected ? " is an answer the codebook describes"
                    : " is the excluded key or free text"));
        }
    }

    @Test
    void noMaterialVerdictAndNoAlertThatNoPlantExplains() {
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : byWave.values()) {
            for (Finding f : r.findings()) {
                if (f.verdict() == Verdict.MATERIAL && plantsFor(f.variable()).isEmpty()) {
                    problems.add(r.wave() + " " + f.variable() + " " + f.kind() + ": " + f.sentence());
                }
            }
            for (Finding f : Alerts.select(r.findings())) {
                if (!explained(r.wave(), f)) {
                    problems.add("alert " + r.wave() + " " + f.variable() + " " + f.kind() + ": " + f.sentence());
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void sentencesSpeakOfTheCodebooksLabels() {
        Assumptions.assumeTrue(hasKind("LABEL_CHANGED"), "this build has no value-label findings: skipped");
        Finding renamed = find(byWave.get("2025-Q1"), "membership", "LABEL_CHANGED").orElseThrow();
        assertTrue(renamed.sentence().contains("Concession") && renamed.sentence().contains("Reduced rate"),
                renamed.sentence());
        // the code that moved most is named by its label
        Finding membership = find(byWave.get("2025-Q1"), "membership", "SHIFT").orElseThrow();
        assertTrue(Stream.of("'No card'", "'Standard'", "'Reduced rate'").anyMatch(membership.sentence()::contains),
                membership.sentence());
    }

    @Test
    void everyFindingsFileMatchesItsJsonSchema() throws Exception {
        List<String> problems = new ArrayList<>();
        for (String w : waves) {
            Path f = OutputPaths.under(out.resolve(DemoRun.LEISURE_FOLDER), w).resolve("findings.json");
            FindingsSchema.problems(Json.mapper().readTree(Files.readString(f))).forEach(p -> problems.add(w + ": " + p));
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    // ---- support --------------------------------------------------------------------------------------------

    static boolean hasKind(String name) {
        return Stream.of(FindingKind.values()).anyMatch(k -> k.name().equals(name));
    }

    static Optional<Finding> find(FindingsReport r, String variable, String kind) {
        return r.findings().stream().filter(f -> f.variable().equals(variable) && f.kind().name().equals(kind))
                .findFirst();
    }

    static List<JsonNode> plantsFor(String variable) {
        List<JsonNode> out = new ArrayList<>();
        manifest.get("plants").forEach(p -> {
            if (p.get("variable").asText().equals(variable)) {
                out.add(p);
            }
        });
        return out;
    }

    static String expectedShiftVerdict(String wave, String variable) {
        for (JsonNode p : plantsFor(variable)) {
            if (p.get("wave").asText().equals(wave)) {
                if (p.get("kind").asText().equals("SHIFT")) {
                    return p.get("verdict").asText();
                }
                if (p.has("shiftVerdict")) {
                    return p.get("shiftVerdict").asText();
                }
            }
        }
        return manifest.get("expectedElsewhere").get("verdict").asText();
    }

    /**
     * An alert is explained by a plant on its variable: the plant's own kind while its condition lasts, or a kind it
     * may also report at the wave it starts or the wave after it ends; or by an allowed report of the manifest.
     */
    static boolean explained(String wave, Finding f) {
        int at = waves.indexOf(wave);
        for (JsonNode p : plantsFor(f.variable())) {
            int start = waves.indexOf(p.get("wave").asText());
            int end = p.has("lastWave") ? waves.indexOf(p.get("lastWave").asText()) : start;
            if (p.get("kind").asText().equals(f.kind().name()) && at >= start && at <= end) {
                return true;
            }
            if (p.get("kind").asText().equals("SHIFT") && f.kind() == FindingKind.SHIFT && at == start) {
                return true;
            }
            for (JsonNode k : p.path("mayAlsoReport")) {
                if (k.asText().equals(f.kind().name()) && at >= start && at <= end + 1) {
                    return true;
                }
            }
            if (f.kind() == FindingKind.SHIFT && p.path("shiftVerdict").asText().equals("any") && at == start) {
                return true;
            }
        }
        for (JsonNode m : manifest.get("expectedElsewhere").path("mayReport")) {
            if (m.get("variable").asText().equals(f.variable())) {
                for (JsonNode k : m.get("kinds")) {
                    if (k.asText().equals(f.kind().name())) {
                        return true;
                    }
                }
            }
        }
        return false;
    }
}
