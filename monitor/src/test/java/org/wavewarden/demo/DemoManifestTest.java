package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo end to end on an embedded PostgreSQL server, held to the manifest of planted events
 * ({@code demo-data/manifest.yaml}): every plant is found with its kind, variable, wave and verdict; every other
 * comparison is STABLE (or what the manifest says for that variable); and no data-quality alert appears that no
 * plant explains.
 */
class DemoManifestTest {

    @TempDir
    static Path out;
    static Map<String, FindingsReport> byWave = new LinkedHashMap<>();
    static JsonNode manifest;
    static List<String> waves = new ArrayList<>();

    @BeforeAll
    static void runTheDemo() throws Exception {
        StringWriter console = new StringWriter();
        DemoRun.Outcome outcome = DemoRun.run(out, new PrintWriter(console, true));
        for (FindingsReport r : outcome.reports()) {
            byWave.put(r.wave(), r);
            waves.add(r.wave());
        }
        manifest = new ObjectMapper(new YAMLFactory()).readTree(Files.readString(Path.of("..", "demo-data",
                "manifest.yaml")));
    }

    @Test
    void everyWaveIsJudgedAndWrittenToTheContract() {
        assertEquals(List.of("2024-Q1", "2024-Q2", "2024-Q3", "2024-Q4", "2025-Q1", "2025-Q2", "2025-Q3"), waves);
        for (String w : waves) {
            Path json = out.resolve(w).resolve("findings.json");
            assertTrue(Files.exists(json), json.toString());
            FindingsReport back = FindingsFiles.read(json);
            assertEquals(manifest.get("dataset").asText(), back.dataset());
            assertEquals(byWave.get(w).findings().size(), back.findings().size());
        }
        assertTrue(Files.exists(out.resolve("digest.md")));
    }

    @Test
    void everyPlantIsFoundWithItsVerdict() {
        List<String> problems = new ArrayList<>();
        for (JsonNode p : manifest.get("plants")) {
            String id = p.get("id").asText();
            FindingsReport r = byWave.get(p.get("wave").asText());
            if (p.has("against") && !p.get("against").asText().equals(r.againstWave())) {
                problems.add(id + ": judged against " + r.againstWave());
            }
            FindingKind kind = FindingKind.valueOf(p.get("kind").asText());
            Optional<Finding> f = find(r, p.get("variable").asText(), kind);
            if (f.isEmpty()) {
                problems.add(id + ": no " + kind + " finding for " + p.get("variable").asText() + " in " + r.wave());
                continue;
            }
            if (p.has("verdict") && !p.get("verdict").asText().equals(String.valueOf(f.get().verdict()))) {
                problems.add(id + ": verdict " + f.get().verdict() + ", planted " + p.get("verdict").asText() + " ("
                        + f.get().sentence() + ")");
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void everyShiftWithoutAPlantGetsTheExpectedVerdict() {
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : byWave.values()) {
            for (Finding f : r.findings()) {
                if (f.kind() != FindingKind.SHIFT) {
                    continue;
                }
                String expected = expectedShiftVerdict(r.wave(), f.variable());
                if (expected.equals("none")) {
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
    void noMaterialVerdictOnAVariableWithoutAPlant() {
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : byWave.values()) {
            for (Finding f : r.findings()) {
                if (f.verdict() == org.wavewarden.judge.Verdict.MATERIAL && plantsFor(f.variable()).isEmpty()) {
                    problems.add(r.wave() + " " + f.variable() + " " + f.kind() + ": " + f.sentence());
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void noDataQualityAlertThatNoPlantExplains() {
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : byWave.values()) {
            for (Finding f : r.findings()) {
                if (f.kind().isDataQuality() && Alerts.worthAPerson(f) && !explained(r.wave(), f)) {
                    problems.add(r.wave() + " " + f.variable() + " " + f.kind() + ": " + f.sentence());
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    /** A data-quality alert is explained by a plant on its variable whose condition covers its wave. */
    static boolean explained(String wave, Finding f) {
        for (JsonNode p : plantsFor(f.variable())) {
            int start = waves.indexOf(p.get("wave").asText());
            int end = p.has("lastWave") ? waves.indexOf(p.get("lastWave").asText()) : start;
            int at = waves.indexOf(wave);
            boolean sameKind = p.get("kind").asText().equals(f.kind().name());
            boolean alsoAllowed = false;
            if (p.has("mayAlsoReport")) {
                for (JsonNode k : p.get("mayAlsoReport")) {
                    alsoAllowed |= k.asText().equals(f.kind().name());
                }
            }
            // Level findings may repeat while the condition lasts; a change finding belongs to the wave where the
            // condition starts, or the wave after it ends (the rate going back).
            if (sameKind && at >= start && at <= end) {
                return true;
            }
            if (alsoAllowed && (at == start || at == end + 1 || (at >= start && at <= end))) {
                return true;
            }
        }
        return false;
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
        for (JsonNode v : manifest.get("expectedElsewhere").get("byVariable")) {
            if (v.get("variable").asText().equals(variable)) {
                return v.get("verdict").asText();
            }
        }
        return manifest.get("expectedElsewhere").get("verdict").asText();
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

    static Optional<Finding> find(FindingsReport r, String variable, FindingKind kind) {
        return r.findings().stream().filter(f -> f.variable().equals(variable) && f.kind() == kind).findFirst();
    }
}
