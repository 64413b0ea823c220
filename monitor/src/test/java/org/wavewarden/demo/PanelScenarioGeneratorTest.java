package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The committed panel waves ({@code demo-data/panel}) are exactly what {@link PanelScenarioGenerator} writes, they
 * have the panel's design (strata, clusters, attrition and refreshment, a calibrated weight, one wave published
 * twice), and they carry the planted events at the sizes {@code demo-data/panel-manifest.yaml} states.
 *
 * <p>Reference values marked "R 4.2.2" come from {@code demo-data/measure-panel.R} (R 4.2.2, Debian r-base-core, with
 * survey 4.1.1, Debian r-cran-survey) run on the committed files; the lines of its output are quoted beside them.
 */
class PanelScenarioGeneratorTest {

    private static Path root;
    private static Map<String, String> texts;
    private static Map<String, List<Map<String, String>>> rows;

    /** Rewrites {@code demo-data/panel} from the generator; run from the repository root or the monitor module. */
    public static void main(String[] args) throws IOException {
        Path target = repositoryRoot().resolve("demo-data").resolve("panel");
        new PanelScenarioGenerator().writeAll(target);
        System.out.println("wrote " + PanelScenarioGenerator.WAVES.size() + " waves to " + target);
    }

    @BeforeAll
    static void generate() {
        root = repositoryRoot();
        texts = new LinkedHashMap<>();
        rows = new LinkedHashMap<>();
        PanelScenarioGenerator generator = new PanelScenarioGenerator();
        for (String wave : PanelScenarioGenerator.WAVES) {
            String text = generator.csv(wave);
            texts.put(wave, text);
            rows.put(wave, parse(text));
        }
    }

    // ---- reproducibility ------------------------------------------------------------------------------------

    @Test
    void committedPanelFilesAreByteForByteTheGeneratorOutput() throws IOException {
        Path dir = root.resolve("demo-data").resolve("panel");
        Set<String> expected = new TreeSet<>();
        for (String wave : PanelScenarioGenerator.WAVES) {
            expected.add(PanelScenarioGenerator.fileName(wave));
            byte[] committed = Files.readAllBytes(dir.resolve(PanelScenarioGenerator.fileName(wave)));
            assertArrayEquals(texts.get(wave).getBytes(StandardCharsets.UTF_8), committed, wave + ".csv differs from"
                    + " the generator output; rerun PanelScenarioGeneratorTest.main if the change is intended");
        }
        Set<String> present = new TreeSet<>();
        try (var files = Files.list(dir)) {
            files.forEach(p -> present.add(p.getFileName().toString()));
        }
        assertEquals(expected, present, "demo-data/panel must hold exactly one file per wave");
    }

    @Test
    void sameSeedGivesSameBytesAndAnotherSeedGivesOtherNoise() {
        String first = PanelScenarioGenerator.WAVES.get(0);
        assertEquals(texts.get(first), new PanelScenarioGenerator().csv(first));
        String other = new PanelScenarioGenerator(PanelScenarioGenerator.SEED + 1).csv(first);
        assertNotEquals(texts.get(first), other);
        assertEquals(texts.get(first).split("\n").length, other.split("\n").length, "recruitment has a fixed size");
    }

    @Test
    void refusesAWaveThatIsNotPartOfThePanel() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new PanelScenarioGenerator().csv("2024-Q1"));
        assertTrue(e.getMessage().startsWith("wave "), e.getMessage());
    }

    @Test
    void csvHeaderMatchesTheColumnsOfThePanelTableDefinition() throws IOException {
        String ddl = Files.readString(root.resolve("sql/demo/V2__demo_panel_table.sql"));
        Matcher m = Pattern.compile("(?m)^\\s{4}(\\w+)\\s+(text|bigint|integer|smallint|numeric)\\b").matcher(ddl);
        List<String> columns = new ArrayList<>();
        while (m.find()) {
            columns.add(m.group(1));
        }
        assertEquals(PanelScenarioGenerator.COLUMNS, columns);
        for (String text : texts.values()) {
            assertEquals(String.join(",", PanelScenarioGenerator.COLUMNS), text.substring(0, text.indexOf('\n')));
        }
    }

    // ---- the design -----------------------------------------------------------------------------------------

    @Test
    void villagesAreClustersNestedInTheSixDistricts() {
        Map<String, Set<String>> villages = new TreeMap<>();
        for (List<Map<String, String>> wave : rows.values()) {
            for (Map<String, String> r : wave) {
                assertTrue(r.get("village").startsWith(r.get("district") + "-"), r.toString());
                villages.computeIfAbsent(r.get("district"), k -> new TreeSet<>()).add(r.get("village"));
            }
        }
        assertEquals(Set.of("GUL", "SAL", "BRN", "TID", "MOR", "KES"), villages.keySet());
        villages.forEach((d, v) -> assertTrue(v.size() >= 8 && v.size() <= 15, d + " has " + v.size()));
        assertEquals(65, villages.values().stream().mapToInt(Set::size).sum());
        // 49 households recruited in every village
        Map<String, Integer> recruited = new HashMap<>();
        rows.get("2024-Q4").forEach(r -> recruited.merge(r.get("village"), 1, Integer::sum));
        assertEquals(Set.of(49), new HashSet<>(recruited.values()));
    }

    @Test
    void householdsKeepTheirIdAcrossWavesSomeLeaveAndNewOnesJoin() {
        // R 4.2.2 (measure-panel.R, "== shape"): "households ever interviewed 4680; in one wave only 1338;
        // in all four 2471"; in both waves of each pair 2924, 2902 and 2873
        Map<String, Integer> waves = new HashMap<>();
        Map<String, String> village = new HashMap<>();
        for (String w : PanelScenarioGenerator.WAVES) {
            for (Map<String, String> r : latest(w)) {
                waves.merge(r.get("household_id"), 1, Integer::sum);
                String before = village.putIfAbsent(r.get("household_id"), r.get("village"));
                assertTrue(before == null || before.equals(r.get("village")), "a household stays in its village");
            }
        }
        assertEquals(4680, waves.size());
        assertEquals(1338, waves.values().stream().filter(n -> n == 1).count());
        assertEquals(2471, waves.values().stream().filter(n -> n == 4).count());
        int[] inBoth = {2924, 2902, 2873};
        for (int i = 1; i < PanelScenarioGenerator.WAVES.size(); i++) {
            Set<String> before = ids(latest(PanelScenarioGenerator.WAVES.get(i - 1)));
            Set<String> after = ids(latest(PanelScenarioGenerator.WAVES.get(i)));
            after.retainAll(before);
            assertEquals(inBoth[i - 1], after.size(), PanelScenarioGenerator.WAVES.get(i));
        }
        for (String w : PanelScenarioGenerator.WAVES) {
            int n = latest(w).size();
            assertTrue(n >= 3000 && n <= 4000, w + " has " + n + " households");
        }
    }

    @Test
    void onlyTheRevisedWaveHasASecondRelease() {
        for (String w : PanelScenarioGenerator.WAVES) {
            Set<String> revisions = new TreeSet<>();
            Set<String> keys = new HashSet<>();
            for (Map<String, String> r : rows.get(w)) {
                revisions.add(r.get("revision"));
                assertTrue(keys.add(r.get("revision") + "/" + r.get("household_id")), "one row per key and release");
            }
            assertEquals(w.equals(PanelScenarioGenerator.REVISED_WAVE) ? Set.of("1", "2") : Set.of("1"), revisions, w);
        }
    }

    @Test
    void weightsAddUpToTheRegisterInEveryDistrictAndRelease() {
        for (String w : PanelScenarioGenerator.WAVES) {
            long[] register = w.compareTo("2025-Q2") >= 0 ? PanelScenarioGenerator.REGISTER_REVISED
                    : PanelScenarioGenerator.REGISTER;
            for (String release : Set.of("1", "2")) {
                double[] sums = new double[register.length];
                int n = 0;
                for (Map<String, String> r : rows.get(w)) {
                    if (r.get("revision").equals(release)) {
                        sums[List.of(PanelScenarioGenerator.DISTRICTS).indexOf(r.get("district"))]
                                += Double.parseDouble(r.get("weight"));
                        n++;
                    }
                }
                if (n == 0) {
                    continue;
                }
                for (int d = 0; d < register.length; d++) {
                    // each weight is rounded to 0.001, so a district's sum is its register count within n / 2000
                    assertEquals(register[d], sums[d], n / 2000.0, w + " release " + release + " "
                            + PanelScenarioGenerator.DISTRICTS[d]);
                }
            }
        }
    }

    // ---- the planted events are in the data -----------------------------------------------------------------

    @Test
    void aQuarterOfTheEmployeesBecomeContractorsIn2025Q1() {
        // R 4.2.2 (measure-panel.R): "largest flow EMP -> SELF (364)" of 2924 pairs; no other flow above 7
        Map<String, Integer> flows = flows("2024-Q4", "2025-Q1", "employment_status");
        assertEquals(364, flows.get("EMP>SELF"));
        flows.remove("EMP>SELF");
        assertTrue(flows.values().stream().allMatch(n -> n <= 7), flows.toString());
        assertTrue(flows("2025-Q1", "2025-Q2", "employment_status").values().stream().allMatch(n -> n <= 20));
    }

    @Test
    void theStormCutsTheWaterInThreeVillagesOnlyIn2025Q1() {
        // R 4.2.2 (measure-panel.R): "villages where most households lost water: BRN-06 GUL-01 TID-04"
        for (String w : PanelScenarioGenerator.WAVES) {
            Map<String, int[]> byVillage = new TreeMap<>();
            for (Map<String, String> r : latest(w)) {
                int[] c = byVillage.computeIfAbsent(r.get("village"), k -> new int[2]);
                c[0] += r.get("water_outage").equals("yes") ? 1 : 0;
                c[1]++;
            }
            Set<String> hit = new TreeSet<>();
            byVillage.forEach((v, c) -> {
                if (c[0] > c[1] / 2) {
                    hit.add(v);
                }
            });
            assertEquals(w.equals("2025-Q1") ? Set.of("BRN-06", "GUL-01", "TID-04") : Set.of(), hit, w);
        }
    }

    @Test
    void theRecalibrationMovesOnlyTheWeightsNotTheAnswers() {
        // R 4.2.2 (measure-panel.R): Gullhaven's weighted share 0.24 -> 0.411; mains gas unweighted 0.2222 ->
        // 0.2233, weighted 0.3129 -> 0.4498
        assertEquals(0.240, weightedShare("2025-Q1", "district", "GUL"), 5e-4);
        assertEquals(0.411, weightedShare("2025-Q2", "district", "GUL"), 5e-4);
        assertEquals(0.2222, share("2025-Q1", "mains_gas", "yes"), 5e-5);
        assertEquals(0.2233, share("2025-Q2", "mains_gas", "yes"), 5e-5);
        assertEquals(0.3129, weightedShare("2025-Q1", "mains_gas", "yes"), 5e-5);
        assertEquals(0.4498, weightedShare("2025-Q2", "mains_gas", "yes"), 5e-5);
    }

    @Test
    void theTopUpFromTheFlatListIsMostlyPeopleLivingAlone() {
        // R 4.2.2 (measure-panel.R): "2025-Q3 households new to the panel: 1040 (0.2658 of the wave), living alone
        // 0.775 (the rest of the wave 0.3004)"; one-person share 0.4265 against the register's 0.30
        Set<String> before = ids(latest("2025-Q2"));
        long recruited = latest("2025-Q3").stream().filter(r -> !before.contains(r.get("household_id"))).count();
        assertEquals(1040, recruited);
        assertEquals(0.4265, share("2025-Q3", "household_size", "1"), 5e-5);
        for (String w : List.of("2024-Q4", "2025-Q1", "2025-Q2")) {
            assertEquals(PanelScenarioGenerator.HOUSEHOLD_SIZE[0], share(w, "household_size", "1"), 0.005, w);
        }
    }

    @Test
    void theRevisedReleaseCorrectsIncomesKeyedInCentsAndAddsAndRemovesHouseholds() {
        // R 4.2.2 (measure-panel.R, "== the two releases of 2025-Q2"): release 1 3078, release 2 3162; in both
        // 3065, added 97, removed 13; income changed in 96 cells, all in BRN-03 and BRN-07, by a factor of 100
        Map<String, Map<String, String>> first = new HashMap<>();
        Map<String, Map<String, String>> second = new HashMap<>();
        for (Map<String, String> r : rows.get("2025-Q2")) {
            (r.get("revision").equals("1") ? first : second).put(r.get("household_id"), r);
        }
        assertEquals(3078, first.size());
        assertEquals(3162, second.size());
        int changed = 0;
        int matched = 0;
        for (var e : first.entrySet()) {
            Map<String, String> later = second.get(e.getKey());
            if (later == null) {
                continue;
            }
            matched++;
            long before = Long.parseLong(e.getValue().get("income_monthly"));
            long after = Long.parseLong(later.get("income_monthly"));
            if (before != after) {
                changed++;
                assertEquals(100 * after, before);
                assertTrue(Set.of("BRN-03", "BRN-07").contains(later.get("village")));
            }
            for (String c : PanelScenarioGenerator.COLUMNS) {
                if (!Set.of("revision", "weight", "income_monthly").contains(c)) {
                    assertEquals(e.getValue().get(c), later.get(c), c + " of " + e.getKey());
                }
            }
        }
        assertEquals(3065, matched);
        assertEquals(96, changed);
    }

    // ---- manifest and configuration agree with the data ------------------------------------------------------

    @Test
    void panelManifestNamesOnlyRealWavesVariablesAndKinds() throws IOException {
        JsonNode manifest = yaml(root.resolve("demo-data/panel-manifest.yaml"));
        JsonNode dataset = yaml(root.resolve("config/demo.yaml")).path("datasets").path(1);
        assertEquals(dataset.path("name").asText(), manifest.path("dataset").asText());
        Set<String> relationships = new HashSet<>();
        dataset.path("relationships").forEach(r -> relationships.add(r.path("x").asText() + " ~ "
                + r.path("y").asText()));
        Set<String> kinds = Set.of("SHIFT", "PANEL_SHIFT", "RELATIONSHIP_CHANGE", "REFERENCE");
        Set<String> verdicts = Set.of("MATERIAL", "MINOR", "UNCERTAIN", "STABLE");
        List<String> labels = PanelScenarioGenerator.WAVES;
        Set<String> ids = new HashSet<>();
        Set<String> verdictsSeen = new HashSet<>();
        Set<String> kindsSeen = new HashSet<>();
        for (JsonNode p : manifest.path("plants")) {
            String id = p.path("id").asText();
            assertTrue(ids.add(id), "duplicate id " + id);
            int at = labels.indexOf(p.path("wave").asText());
            assertTrue(at >= 0, id + ": wave");
            assertEquals(at == 0 ? "" : labels.get(at - 1), p.path("against").asText(), id + ": against");
            String kind = p.path("kind").asText();
            assertTrue(kinds.contains(kind), id + ": kind " + kind);
            kindsSeen.add(kind);
            String variable = p.path("variable").asText();
            assertTrue(kind.equals("RELATIONSHIP_CHANGE") ? relationships.contains(variable)
                    : PanelScenarioGenerator.COLUMNS.contains(variable), id + ": variable " + variable);
            assertTrue(verdicts.contains(p.path("verdict").asText()), id + ": verdict");
            verdictsSeen.add(p.path("verdict").asText());
            assertTrue(!p.has("needs") || Set.of("design", "panel", "relationships").contains(p.path("needs").asText()),
                    id + ": needs");
            assertTrue(p.path("measured").has("effect"), id + ": measured.effect");
            assertFalse(p.path("note").asText().isBlank(), id + ": note");
        }
        assertEquals(verdicts, verdictsSeen, "every verdict is planted at least once");
        assertEquals(kinds, kindsSeen);
        assertEquals(PanelScenarioGenerator.REVISED_WAVE, manifest.path("releases").path(0).path("wave").asText());
    }

    @Test
    void configDeclaresThePanelsDesignAndTheRegisterShares() throws IOException {
        JsonNode dataset = yaml(root.resolve("config/demo.yaml")).path("datasets").path(1);
        assertEquals("survey_demo.panel_wave", dataset.path("table").asText());
        assertEquals("household_id", dataset.path("respondentKey").asText());
        assertEquals("revision", dataset.path("releases").path("column").asText());
        assertEquals("weight", dataset.path("weightColumn").asText());
        assertEquals("district", dataset.path("design").path("strata").asText());
        assertEquals("village", dataset.path("design").path("clusters").asText());
        Set<String> declared = new TreeSet<>();
        JsonNode reference = null;
        for (JsonNode v : dataset.path("variables")) {
            declared.add(v.path("name").asText());
            if (v.has("reference")) {
                reference = v.path("reference").path("shares");
            }
        }
        Set<String> answers = new TreeSet<>(PanelScenarioGenerator.COLUMNS);
        answers.removeAll(List.of("wave", "revision", "household_id", "district", "village", "weight"));
        assertEquals(answers, declared, "every answer column is declared");
        for (int k = 0; k < 5; k++) {
            assertEquals(PanelScenarioGenerator.HOUSEHOLD_SIZE[k], reference.path(Integer.toString(k + 1)).asDouble(),
                    1e-12, "the reference shares are the ones the households were drawn from");
        }
    }

    // ---- support --------------------------------------------------------------------------------------------

    private static List<Map<String, String>> latest(String wave) {
        String last = wave.equals(PanelScenarioGenerator.REVISED_WAVE) ? "2" : "1";
        return rows.get(wave).stream().filter(r -> r.get("revision").equals(last)).toList();
    }

    private static Set<String> ids(List<Map<String, String>> wave) {
        Set<String> out = new HashSet<>();
        wave.forEach(r -> out.add(r.get("household_id")));
        return out;
    }

    private static Map<String, Integer> flows(String before, String after, String column) {
        Map<String, String> earlier = new HashMap<>();
        latest(before).forEach(r -> earlier.put(r.get("household_id"), r.get(column)));
        Map<String, Integer> out = new TreeMap<>();
        for (Map<String, String> r : latest(after)) {
            String was = earlier.get(r.get("household_id"));
            if (was != null && !was.equals(r.get(column))) {
                out.merge(was + ">" + r.get(column), 1, Integer::sum);
            }
        }
        return out;
    }

    private static double share(String wave, String column, String value) {
        List<Map<String, String>> w = latest(wave);
        return (double) w.stream().filter(r -> value.equals(r.get(column))).count() / w.size();
    }

    private static double weightedShare(String wave, String column, String value) {
        double hit = 0;
        double all = 0;
        for (Map<String, String> r : latest(wave)) {
            double weight = Double.parseDouble(r.get("weight"));
            all += weight;
            hit += value.equals(r.get(column)) ? weight : 0;
        }
        return hit / all;
    }

    /** The panel files hold no quoted fields: split on commas, an empty field is NULL. */
    private static List<Map<String, String>> parse(String text) {
        String[] lines = text.split("\n");
        String[] header = lines[0].split(",", -1);
        List<Map<String, String>> out = new ArrayList<>(lines.length - 1);
        for (int i = 1; i < lines.length; i++) {
            String[] f = lines[i].split(",", -1);
            assertEquals(header.length, f.length, "line " + (i + 1));
            Map<String, String> row = new HashMap<>();
            for (int c = 0; c < header.length; c++) {
                row.put(header[c], f[c].isEmpty() ? null : f[c]);
            }
            out.add(row);
        }
        assertTrue(text.endsWith("\n"), "the file ends with a line break");
        return out;
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
