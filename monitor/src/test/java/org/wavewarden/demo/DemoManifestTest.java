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
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.compare.release.ReleaseRevision;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.ReleaseReport;
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
import java.util.Set;
import java.util.TreeMap;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo end to end on an embedded PostgreSQL server, held to the manifests of planted events: for the household
 * survey ({@code demo-data/manifest.yaml}) every plant is found with its kind, variable, wave and verdict, every other
 * comparison is STABLE (or what the manifest says for that variable), and no data-quality alert appears that no
 * plant explains; for the panel ({@code demo-data/panel-manifest.yaml}) every plant is found with its verdict and
 * with the effect R computed from the committed files, every other finding is STABLE, no alert is left unexplained,
 * and the release comparison of the revised wave reports the exact counts.
 */
class DemoManifestTest {

    @TempDir
    static Path out;
    static Map<String, FindingsReport> byWave = new LinkedHashMap<>();
    static JsonNode manifest;
    static List<String> waves = new ArrayList<>();
    static DemoRun.Outcome outcome;
    static String console;
    static Map<String, FindingsReport> panelByWave = new LinkedHashMap<>();
    static JsonNode panelManifest;

    @BeforeAll
    static void runTheDemo() throws Exception {
        StringWriter text = new StringWriter();
        outcome = DemoRun.run(out, new PrintWriter(text, true));
        console = text.toString();
        for (FindingsReport r : outcome.reports()) {
            byWave.put(r.wave(), r);
            waves.add(r.wave());
        }
        outcome.panelReports().forEach(r -> panelByWave.put(r.wave(), r));
        ObjectMapper yaml = new ObjectMapper(new YAMLFactory());
        manifest = yaml.readTree(Files.readString(Path.of("..", "demo-data", "manifest.yaml")));
        panelManifest = yaml.readTree(Files.readString(Path.of("..", "demo-data", "panel-manifest.yaml")));
    }

    @Test
    void everyWaveIsJudgedAndWrittenToTheContract() {
        assertEquals(List.of("2024-Q1", "2024-Q2", "2024-Q3", "2024-Q4", "2025-Q1", "2025-Q2", "2025-Q3"), waves);
        for (String w : waves) {
            Path json = OutputPaths.under(out, w).resolve("findings.json");
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
            if (p.has("against") && !mainBaselineIs(r, p.get("against").asText())) {
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
                if (f.kind() != FindingKind.SHIFT || !againstMainBaseline(r, f)) {
                    continue; // the same-quarter comparisons are held to their own section of the manifest
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
    void everyComparisonAgainstTheSameQuarterAYearBackGetsTheExpectedVerdict() {
        List<String> problems = new ArrayList<>();
        for (JsonNode q : manifest.get("sameQuarter")) {
            FindingsReport r = byWave.get(q.get("wave").asText());
            boolean found = r.findings().stream().anyMatch(f -> f.variable().equals(q.get("variable").asText())
                    && f.kind().name().equals(q.get("kind").asText()) && !againstMainBaseline(r, f)
                    && f.against().startsWith(q.get("against").asText()));
            if (!found) {
                problems.add("no " + q.get("kind").asText() + " of " + q.get("variable").asText() + " in "
                        + r.wave() + " against " + q.get("against").asText());
            }
        }
        for (FindingsReport r : byWave.values()) {
            for (Finding f : r.findings()) {
                if (againstMainBaseline(r, f) || !(f.kind() == FindingKind.SHIFT
                        || f.kind() == FindingKind.MISSING_RATE_CHANGE)) {
                    continue;
                }
                if (f.kind() == FindingKind.MISSING_RATE_CHANGE && !listedAgainstSameQuarter(r.wave(), f)) {
                    continue; // a sentinel present in one of the two waves only: allowed, not planted
                }
                String expected = expectedAgainstSameQuarter(r.wave(), f.variable(), f.kind());
                if (!expected.equals("any") && !expected.equals(String.valueOf(f.verdict()))) {
                    problems.add(r.wave() + " " + f.variable() + " " + f.kind() + " against " + f.against() + ": "
                            + f.verdict() + ", expected " + expected + " (" + f.sentence() + ")");
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

    // ---- the panel ------------------------------------------------------------------------------------------

    /** The finding kinds a panel finding can have that a verdict is planted for. */
    private static final Set<FindingKind> JUDGED = Set.of(FindingKind.SHIFT, FindingKind.PANEL_SHIFT,
            FindingKind.RELATIONSHIP_CHANGE, FindingKind.REFERENCE, FindingKind.SHAPE_CHANGE);

    @Test
    void everyPanelWaveIsJudgedAndWrittenToTheContract() {
        assertEquals(PanelScenarioGenerator.WAVES, List.copyOf(panelByWave.keySet()));
        Path dir = out.resolve(DemoRun.PANEL_FOLDER);
        for (String w : PanelScenarioGenerator.WAVES) {
            FindingsReport back = FindingsFiles.read(OutputPaths.under(dir, w).resolve("findings.json"));
            assertEquals(panelManifest.get("dataset").asText(), back.dataset());
            assertEquals(panelByWave.get(w).findings().size(), back.findings().size());
        }
        for (Path p : outcome.outputs()) {
            assertTrue(Files.isRegularFile(p), "named but not written: " + p);
            assertTrue(console.contains(out.relativize(p).toString()), "written but not named: " + p);
        }
        assertTrue(outcome.outputs().contains(dir.resolve("digest.html")));
        assertTrue(outcome.outputs().contains(OutputPaths.under(dir.resolve("releases"), "2025-Q2").resolve("releases.json")));
    }

    @TestFactory
    Stream<DynamicTest> everyPanelPlantIsFoundWithItsVerdictAndTheEffectComputedInR() {
        List<DynamicTest> tests = new ArrayList<>();
        for (JsonNode p : panelManifest.get("plants")) {
            tests.add(DynamicTest.dynamicTest(p.get("id").asText(), () -> {
                String needs = p.path("needs").asText("");
                Assumptions.assumeTrue(hasFeature(needs), () -> p.get("id").asText() + " needs '" + needs
                        + "', which this build of the monitor does not have: skipped");
                FindingsReport r = panelByWave.get(p.get("wave").asText());
                assertEquals(p.path("against").asText(null), r.againstWave(), "judged against");
                FindingKind kind = FindingKind.valueOf(p.get("kind").asText());
                Finding f = find(r, p.get("variable").asText(), kind).orElseThrow(() -> new AssertionError("no "
                        + kind + " finding for " + p.get("variable").asText() + " in " + r.wave()));
                assertEquals(p.get("verdict").asText(), String.valueOf(f.verdict()), f.sentence());
                JsonNode m = p.get("measured");
                assertEquals(m.get("effect").asDouble(), f.effect().estimate(), 5e-4, "effect against R: " + f.sentence());
                if (m.has("effectCI")) {
                    assertEquals(m.get("effectCI").get(0).asDouble(), f.effect().ciLow(), 5e-4, "interval against R");
                    assertEquals(m.get("effectCI").get(1).asDouble(), f.effect().ciHigh(), 5e-4, "interval against R");
                }
                if (needs.equals("design")) {
                    assertTrue(f.test().endsWith(WeightedComparator.WITH_DESIGN), f.test());
                }
                if (p.has("largestFlow")) {
                    JsonNode flow = Json.mapper().valueToTree(f.detail()).path("paired").path("largestFlows").path(0);
                    JsonNode planted = p.get("largestFlow");
                    assertEquals(planted.get("from").asText(), flow.path("from").asText(), "largest flow: " + flow);
                    assertEquals(planted.get("to").asText(), flow.path("to").asText(), "largest flow: " + flow);
                    assertEquals(planted.get("count").asLong(), flow.path("count").asLong(), "largest flow: " + flow);
                }
            }));
        }
        return tests.stream();
    }

    @Test
    void everyPanelFindingWithoutAPlantIsStable() {
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : panelByWave.values()) {
            for (Finding f : r.findings()) {
                if (JUDGED.contains(f.kind()) && panelPlant(r.wave(), f).isEmpty()
                        && !panelManifest.get("expectedElsewhere").get("verdict").asText()
                        .equals(String.valueOf(f.verdict()))) {
                    problems.add(r.wave() + " " + f.variable() + " " + f.kind() + ": " + f.verdict() + " ("
                            + f.sentence() + ")");
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void noPanelAlertThatNoPlantExplains() {
        List<String> problems = new ArrayList<>();
        for (FindingsReport r : panelByWave.values()) {
            for (Finding f : Alerts.select(r.findings())) {
                if (panelPlant(r.wave(), f).isEmpty()) {
                    problems.add(r.wave() + " " + f.variable() + " " + f.kind() + ": " + f.sentence());
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void roomsAreComparedAsTwoSamplesButNotPairedBecauseNobodysRoomsChange() {
        for (JsonNode v : panelManifest.get("expectedElsewhere").get("notComparedPaired")) {
            String variable = v.get("variable").asText();
            for (FindingsReport r : panelByWave.values()) {
                if (r.againstWave() == null) {
                    continue;
                }
                assertTrue(find(r, variable, FindingKind.PANEL_SHIFT).isEmpty(), r.wave());
                assertTrue(find(r, variable, FindingKind.SHIFT).isPresent(), r.wave());
                assertTrue(r.inference().stream().anyMatch(i -> i.startsWith(variable + ": not compared paired")),
                        r.inference().toString());
            }
        }
    }

    @Test
    void theRevisedReleaseIsReportedWithItsExactCounts() {
        JsonNode planted = panelManifest.get("releases").get(0);
        ReleaseReport report = outcome.release();
        assertEquals(planted.get("wave").asText(), report.wave());
        assertEquals(planted.get("before").asText(), report.before());
        assertEquals(planted.get("after").asText(), report.after());
        ReleaseRevision rev = report.revision();
        assertEquals(planted.get("rowsBefore").asLong(), rev.rowsBefore());
        assertEquals(planted.get("rowsAfter").asLong(), rev.rowsAfter());
        assertEquals(planted.get("matched").asLong(), rev.matched());
        assertEquals(planted.get("added").asLong(), rev.added());
        assertEquals(planted.get("removed").asLong(), rev.removed());
        Map<String, Long> changed = new TreeMap<>();
        rev.variables().forEach(v -> changed.put(v.variable(), v.changedCells()));
        Map<String, Long> expected = new TreeMap<>();
        planted.get("changedCells").fields().forEachRemaining(e -> expected.put(e.getKey(), e.getValue().asLong()));
        assertEquals(expected, changed);
        rev.variables().stream().filter(v -> v.variable().equals("income_monthly")).flatMap(v -> v.examples().stream())
                .forEach(e -> assertEquals(100 * Long.parseLong(e.after()), Long.parseLong(e.before()), e.key()));
        for (JsonNode f : planted.get("findings")) {
            Finding found = rev.findings().stream().filter(x -> x.variable().equals(f.get("variable").asText())
                    && x.kind().name().equals(f.get("kind").asText())).findFirst().orElseThrow();
            assertEquals(f.get("verdict").asText(), String.valueOf(found.verdict()), found.sentence());
        }
        rev.findings().stream().filter(x -> x.kind() == FindingKind.SHIFT).forEach(x -> assertEquals(
                planted.get("distributionsElsewhere").asText(), String.valueOf(x.verdict()), x.sentence()));
        Path dir = OutputPaths.under(out.resolve(DemoRun.PANEL_FOLDER).resolve("releases"), report.wave());
        assertTrue(Files.isRegularFile(dir.resolve("releases.json")) && Files.isRegularFile(dir.resolve("releases.md")));
        assertTrue(console.contains(planted.get("added").asText() + " added")
                && console.contains(planted.get("removed").asText() + " removed"), console);
    }

    /** The plant that names this finding (same wave, variable and kind), if any. */
    static Optional<JsonNode> panelPlant(String wave, Finding f) {
        for (JsonNode p : panelManifest.get("plants")) {
            if (p.get("wave").asText().equals(wave) && p.get("variable").asText().equals(f.variable())
                    && p.get("kind").asText().equals(f.kind().name())) {
                return Optional.of(p);
            }
        }
        return Optional.empty();
    }

    /** Whether this build of the monitor has a feature a plant depends on. */
    static boolean hasFeature(String feature) {
        return switch (feature) {
            case "" -> true;
            case "panel" -> Stream.of(FindingKind.values()).anyMatch(k -> k.name().equals("PANEL_SHIFT"));
            case "relationships" -> Stream.of(FindingKind.values()).anyMatch(k -> k.name().equals("RELATIONSHIP_CHANGE"));
            case "design" -> panelByWave.values().stream().flatMap(r -> r.findings().stream())
                    .anyMatch(f -> f.kind() == FindingKind.SHIFT && f.test() != null
                            && f.test().endsWith(WeightedComparator.WITH_DESIGN));
            default -> throw new IllegalArgumentException("unknown feature '" + feature + "' in the panel manifest");
        };
    }

    /** A data-quality alert is explained by a plant on its variable whose condition covers its wave. */
    static boolean explained(String wave, Finding f) {
        FindingsReport r = byWave.get(wave);
        if (r != null && !againstMainBaseline(r, f)) {
            // against the same quarter a year back: listed there, or a kind the manifest allows a detector to add
            for (JsonNode k : manifest.path("sameQuarterMayAlsoReport")) {
                if (k.asText().equals(f.kind().name())) {
                    return true;
                }
            }
            return !expectedAgainstSameQuarter(wave, f.variable(), f.kind()).equals("STABLE");
        }
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

    @Test
    void everyFindingsFileOfBothDemoDatasetsMatchesItsJsonSchema() throws Exception {
        List<Path> files = new ArrayList<>();
        waves.forEach(w -> files.add(OutputPaths.under(out, w).resolve("findings.json")));
        panelByWave.keySet().forEach(w -> files.add(OutputPaths.under(out.resolve(DemoRun.PANEL_FOLDER), w)
                .resolve("findings.json")));
        assertEquals(waves.size() + panelByWave.size(), files.size());
        List<String> problems = new ArrayList<>();
        int tested = 0;
        for (Path f : files) {
            JsonNode doc = Json.mapper().readTree(Files.readString(f));
            org.wavewarden.deliver.FindingsSchema.problems(doc).forEach(p -> problems.add(f.getParent()
                    .getFileName() + ": " + p));
            for (JsonNode finding : doc.get("findings")) {
                tested += finding.get("qValue").isNumber() ? 1 : 0;
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
        assertTrue(tested > 0, "the demo's files hold tested findings, whose family the schema requires");
    }

    /** The finding of a variable and kind made against the run's first baseline (the previous wave). */
    static Optional<Finding> find(FindingsReport r, String variable, FindingKind kind) {
        return r.findings().stream().filter(f -> f.variable().equals(variable) && f.kind() == kind)
                .filter(f -> againstMainBaseline(r, f)).findFirst();
    }

    /**
     * Whether a finding was made against the run's first baseline: a dataset that also compares with the same quarter
     * a year back names that baseline in the finding's {@code against}; the previous wave's findings name none, or
     * the previous wave.
     */
    static boolean againstMainBaseline(FindingsReport r, Finding f) {
        return f.against() == null || (r.againstWave() != null && f.against().startsWith(r.againstWave()));
    }

    /**
     * Whether the run's first baseline is {@code wave}: a run judged against several baselines names them all,
     * the first first ("2025-Q1 + 2024-Q2 (4 waves back)").
     */
    static boolean mainBaselineIs(FindingsReport r, String wave) {
        return r.againstWave() != null && (r.againstWave().equals(wave) || r.againstWave().startsWith(wave + " + "));
    }

    static boolean listedAgainstSameQuarter(String wave, Finding f) {
        for (JsonNode q : manifest.get("sameQuarter")) {
            if (q.get("wave").asText().equals(wave) && q.get("variable").asText().equals(f.variable())
                    && q.get("kind").asText().equals(f.kind().name())) {
                return true;
            }
        }
        return false;
    }

    /** What the manifest expects of a comparison against the same quarter a year back, or STABLE. */
    static String expectedAgainstSameQuarter(String wave, String variable, FindingKind kind) {
        for (JsonNode q : manifest.get("sameQuarter")) {
            if (q.get("wave").asText().equals(wave) && q.get("variable").asText().equals(variable)
                    && q.get("kind").asText().equals(kind.name())) {
                return q.get("verdict").asText();
            }
        }
        for (JsonNode v : manifest.get("expectedElsewhere").get("byVariable")) {
            if (v.get("variable").asText().equals(variable)) {
                return v.get("verdict").asText();
            }
        }
        return manifest.get("expectedElsewhere").get("verdict").asText();
    }
}
