package org.wavewarden.demo;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.apache.commons.math3.stat.inference.TTest;
import org.apache.commons.math3.util.FastMath;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The committed demo waves are exactly what the generator writes, and they carry the planted events at the sizes
 * the manifest and the demo README state.
 *
 * <p>Reference values marked "R 4.2.2" were computed with R 4.2.2 (Debian r-base-core) on the committed CSV files,
 * read with {@code read.csv(colClasses = "character", na.strings = character(0))}, sentinels removed as noted.
 * Run {@link #main} to rewrite the files after a deliberate change to the scenario, then recompute those values.
 */
class DemoScenarioGeneratorTest {

    private static Path root;
    private static Map<String, Wave> waves;

    /** Rewrites {@code demo-data/waves} from the generator; run from the repository root or the monitor module. */
    public static void main(String[] args) throws IOException {
        Path target = repositoryRoot().resolve("demo-data").resolve("waves");
        new DemoScenarioGenerator().writeAll(target);
        System.out.println("wrote " + DemoScenarioGenerator.WAVES.size() + " waves to " + target);
    }

    @BeforeAll
    static void generate() {
        root = repositoryRoot();
        waves = new LinkedHashMap<>();
        DemoScenarioGenerator generator = new DemoScenarioGenerator();
        for (DemoWave wave : DemoScenarioGenerator.WAVES) {
            String text = generator.csv(wave);
            waves.put(wave.label(), new Wave(text, parseCsv(text)));
        }
    }

    // ---- reproducibility ------------------------------------------------------------------------------------

    @Test
    void committedWaveFilesAreByteForByteTheGeneratorOutput() throws IOException {
        Path dir = root.resolve("demo-data").resolve("waves");
        Set<String> expectedFiles = new TreeSet<>();
        for (DemoWave wave : DemoScenarioGenerator.WAVES) {
            expectedFiles.add(wave.fileName());
            byte[] committed = Files.readAllBytes(dir.resolve(wave.fileName()));
            byte[] generated = waves.get(wave.label()).text.getBytes(StandardCharsets.UTF_8);
            assertArrayEquals(generated, committed, wave.fileName() + " differs from the generator output; rerun "
                    + "DemoScenarioGeneratorTest.main if the change to the scenario is intended");
        }
        Set<String> present = new TreeSet<>();
        try (var files = Files.list(dir)) {
            files.forEach(p -> present.add(p.getFileName().toString()));
        }
        assertEquals(expectedFiles, present, "demo-data/waves must hold exactly one file per wave");
    }

    @Test
    void sameSeedGivesSameBytesAndAnotherSeedGivesOtherNoise() {
        DemoWave first = DemoScenarioGenerator.WAVES.get(0);
        assertEquals(waves.get(first.label()).text, new DemoScenarioGenerator().csv(first));
        String other = new DemoScenarioGenerator(DemoScenarioGenerator.SEED + 1).csv(first);
        assertNotEquals(waves.get(first.label()).text, other);
        assertEquals(first.respondents() + 1, other.split("\n", -1).length - 1, "same size with another seed");
    }

    @Test
    void refusesAWaveThatIsNotPartOfTheScenario() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new DemoScenarioGenerator().csv(new DemoWave("2030-Q1", 0, 10)));
        assertTrue(e.getMessage().startsWith("wave "), e.getMessage());
    }

    // ---- shape ----------------------------------------------------------------------------------------------

    @Test
    void csvHeaderMatchesTheColumnsOfTheSourceTableDefinition() throws IOException {
        String ddl = Files.readString(root.resolve("sql/demo/V1__demo_source_tables.sql"));
        String body = ddl.substring(ddl.indexOf("CREATE TABLE survey_demo.household_wave"));
        Matcher m = Pattern.compile("(?m)^\\s{4}(\\w+)\\s+(text|bigint|integer|smallint|date)\\b").matcher(body);
        List<String> columns = new ArrayList<>();
        while (m.find()) {
            columns.add(m.group(1));
        }
        assertEquals(DemoScenarioGenerator.COLUMNS, columns);
        for (Wave w : waves.values()) {
            assertEquals(DemoScenarioGenerator.COLUMNS, Arrays.asList(w.rows.get(0)));
        }
    }

    @Test
    void sevenOrMoreWavesOfRegularSizeAndOneBoosterWave() {
        List<DemoWave> all = DemoScenarioGenerator.WAVES;
        assertTrue(all.size() >= 7);
        int boosters = 0;
        for (int i = 0; i < all.size(); i++) {
            DemoWave w = all.get(i);
            assertEquals(i, w.index());
            if (i > 0) {
                assertTrue(all.get(i - 1).label().compareTo(w.label()) < 0, "labels must sort in time order");
            }
            int n = waves.get(w.label()).rows.size() - 1;
            assertEquals(w.respondents(), n);
            if (n >= 30_000) {
                boosters++;
            } else {
                assertTrue(n >= 3000 && n <= 5000, w.label() + " has " + n + " rows");
            }
        }
        assertEquals(1, boosters);
    }

    @Test
    void respondentIdsAreUniqueAcrossWaves() {
        Set<String> ids = new HashSet<>();
        long rows = 0;
        for (Wave w : waves.values()) {
            for (String id : w.column("respondent_id")) {
                ids.add(id);
                rows++;
            }
        }
        assertEquals(rows, ids.size());
    }

    @Test
    void fieldsFollowPostgresCsvRulesForNullAndEmptyString() throws IOException {
        assertEquals("", field(null));
        assertEquals("\"\"", field(""));
        assertEquals("\"  \"", field("  "));
        assertEquals("teacher", field("teacher"));
        assertEquals("\"manager, retail\"", field("manager, retail"));
        assertEquals("\"odd jobs (\"\"whatever comes\"\")\"", field("odd jobs (\"whatever comes\")"));
        // and the parser used below reads them back, telling NULL from ""
        String[] back = parseCsv(field(null) + "," + field("") + "," + field(" a,\"b\" ") + "\n").get(0);
        assertNull(back[0]);
        assertEquals("", back[1]);
        assertEquals(" a,\"b\" ", back[2]);
    }

    @Test
    void inverseNormalAgreesWithCommonsMathToEightDigits() {
        // commons-math3 3.6.1 NormalDistribution.inverseCumulativeProbability as the reference
        var reference = new org.apache.commons.math3.distribution.NormalDistribution(0, 1);
        for (double p : new double[] {1e-9, 1e-4, 0.01, 0.02425, 0.1, 0.3, 0.5, 0.7, 0.97575, 0.999, 1 - 1e-9}) {
            double expected = reference.inverseCumulativeProbability(p);
            assertEquals(expected, DemoScenarioGenerator.inverseNormal(p), 1.2e-8 * Math.max(1, Math.abs(expected)),
                    "p = " + p);
        }
        assertEquals(-DemoScenarioGenerator.inverseNormal(0.2), DemoScenarioGenerator.inverseNormal(0.8), 1e-15);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> DemoScenarioGenerator.inverseNormal(1.0));
        assertTrue(e.getMessage().startsWith("p "), e.getMessage());
    }

    // ---- the planted events are in the data -----------------------------------------------------------------

    @Test
    void occupationBlanksJumpFromAboutOneToAboutTenPercentAtTheSecondWave() {
        double[] expected = {0.0105, 0.0939, 0.1000, 0.0990, 0.1003, 0.1029, 0.0887}; // R 4.2.2: share "" or spaces
        int i = 0;
        for (Wave w : waves.values()) {
            long blank = 0;
            long nulls = 0;
            List<String> occupation = w.column("occupation");
            for (String v : occupation) {
                if (v == null) {
                    nulls++;
                } else if (v.isBlank()) {
                    blank++;
                }
            }
            assertEquals(expected[i++], (double) blank / occupation.size(), 5e-5);
            assertTrue(nulls > 0.02 * occupation.size() && nulls < 0.04 * occupation.size(), "steady NULL share");
        }
    }

    @Test
    void sentinelsAppearOnlyInThePlantedWaves() {
        Map<String, Double> height999 = Map.of("2024-Q3", 0.0269, "2025-Q2", 0.0198); // R 4.2.2
        Map<String, Double> children77 = Map.of("2025-Q1", 0.0175, "2025-Q2", 0.0152, "2025-Q3", 0.0134);
        Map<String, Double> date1900 = Map.of("2024-Q4", 0.0247);
        for (var e : waves.entrySet()) {
            Wave w = e.getValue();
            assertEquals(height999.getOrDefault(e.getKey(), 0.0), w.share("height_cm", "999"), 5e-5, e.getKey());
            assertEquals(children77.getOrDefault(e.getKey(), 0.0), w.share("children", "77"), 5e-5, e.getKey());
            assertEquals(date1900.getOrDefault(e.getKey(), 0.0), w.share("move_in_date", "1900-01-01"), 5e-5,
                    e.getKey());
            double refused = w.share("income_monthly", "-9");
            assertTrue(refused > 0.015 && refused < 0.035, "the declared -9 stays near 2.5%: " + refused);
            for (String v : w.column("height_cm")) {
                int h = Integer.parseInt(v);
                assertTrue(h == 999 || (h >= 120 && h <= 215), "height " + h);
            }
        }
    }

    @Test
    void tenureCodeFrameChangesOnceWhenCouncilHomesMoveToTheHousingAssociation() {
        Set<String> before = Set.of("OWN", "MORT", "PRIV", "COUN", "FREE");
        Set<String> after = Set.of("OWN", "MORT", "PRIV", "HASS", "FREE");
        for (var e : waves.entrySet()) {
            Set<String> codes = new HashSet<>(e.getValue().column("tenure"));
            assertEquals(e.getKey().compareTo("2025-Q2") < 0 ? before : after, codes, e.getKey());
        }
    }

    @Test
    void categoricalCodeFramesOtherThanTenureNeverChange() {
        Map<String, Set<String>> frames = new HashMap<>();
        for (Wave w : waves.values()) {
            for (String column : List.of("interview_mode", "district", "heating_fuel", "has_broadband", "owns_boat",
                    "housing_satisfaction", "life_satisfaction")) {
                Set<String> codes = new TreeSet<>(w.column(column));
                Set<String> first = frames.putIfAbsent(column, codes);
                if (first != null) {
                    assertEquals(first, codes, column);
                }
            }
        }
        assertEquals(Set.of("web", "telephone", "in_person"), frames.get("interview_mode"));
        assertEquals(11, frames.get("life_satisfaction").size());
    }

    @Test
    void whippleIndexIsAboutOneHundredUntilTheTelephoneWaveAndRoughAfter() {
        // R 4.2.2: a2 <- age[age >= 23 & age <= 62]; 500 * sum(a2 %% 5 == 0) / length(a2)
        double[] expected = {103.4, 104.6, 95.4, 101.1, 170.5, 167.7, 174.4};
        int i = 0;
        for (var e : waves.entrySet()) {
            double whipple = whipple(e.getValue().column("age"));
            assertEquals(expected[i++], whipple, 0.05, e.getKey());
            assertTrue(e.getKey().compareTo("2025-Q1") < 0 ? whipple < 105 : whipple > 150, e.getKey());
        }
    }

    @Test
    void unplantedNumbersShowNoPreferenceForRoundValues() {
        // Income and commute minutes are not rounded: values ending in 0 or 5 keep their natural fifth.
        for (var e : waves.entrySet()) {
            for (String column : List.of("income_monthly", "commute_minutes", "height_cm", "mooring_fee")) {
                long round = 0;
                long n = 0;
                for (String v : e.getValue().column(column)) {
                    if (v == null || (column.equals("income_monthly") && v.equals("-9"))
                            || (column.equals("height_cm") && v.equals("999"))) {
                        continue;
                    }
                    n++;
                    round += Long.parseLong(v) % 5 == 0 ? 1 : 0;
                }
                double ratio = 5.0 * round / n;
                double slack = n < 100 ? 0.8 : 0.15; // boat owners are few: only a loose check there
                assertTrue(Math.abs(ratio - 1) < slack, e.getKey() + " " + column + " round-number ratio " + ratio);
            }
        }
    }

    @Test
    void boatOwnersAreThirtyToFortyPerRegularWaveAndOnlyTheyPayAMooringFee() {
        for (var e : waves.entrySet()) {
            Wave w = e.getValue();
            List<String> boat = w.column("owns_boat");
            List<String> fee = w.column("mooring_fee");
            int owners = 0;
            for (int i = 0; i < boat.size(); i++) {
                boolean owner = boat.get(i).equals("1");
                owners += owner ? 1 : 0;
                assertEquals(owner, fee.get(i) != null, e.getKey() + " row " + i);
            }
            if (boat.size() < 10_000) {
                assertTrue(owners >= 30 && owners <= 40, e.getKey() + ": " + owners);
            } else {
                assertEquals(288, owners);
            }
        }
    }

    @Test
    void plantedShiftsHaveTheSizesComputedInR() {
        // R 4.2.2: Hedges' g = J * (mean(x) - mean(y)) / pooled sd, J = 1 - 3 / (4 (n1 + n2) - 9);
        // Cliff's delta = 2 * W / (n1 n2) - 1 with W from wilcox.test(x, y); x the later wave
        double[] commuteQ2 = numbers("2024-Q2", "commute_minutes");
        double[] commuteQ3 = numbers("2024-Q3", "commute_minutes");
        assertEquals(0.472787, hedgesG(commuteQ2, commuteQ3), 1e-6);
        assertEquals(0.275720, cliffsDelta(commuteQ2, commuteQ3), 1e-6);

        double[] incomeQ3 = numbers("2024-Q3", "income_monthly");
        double[] incomeQ4 = numbers("2024-Q4", "income_monthly");
        assertEquals(0.092017, hedgesG(incomeQ3, incomeQ4), 1e-6);
        assertEquals(0.058611, cliffsDelta(incomeQ3, incomeQ4), 1e-6);
        // R 4.2.2: t.test(x, y)$p.value; commons-math3 3.6.1 on the same raw data agrees
        assertEquals(5.44766e-08, new TTest().tTest(incomeQ4, incomeQ3), 0.0005e-08);

        double[] mooringQ1 = numbers("2025-Q1", "mooring_fee");
        double[] mooringQ2 = numbers("2025-Q2", "mooring_fee");
        assertEquals(0.393740, hedgesG(mooringQ1, mooringQ2), 1e-6);
        assertEquals(0.213900, cliffsDelta(mooringQ1, mooringQ2), 1e-6);
        assertEquals(0.0960507, new TTest().tTest(mooringQ2, mooringQ1), 1e-7); // R 4.2.2: t.test(x, y)$p.value

        // the booster's small rise is kept, not reversed, in the wave after it
        assertEquals(-0.021261, hedgesG(incomeQ4, numbers("2025-Q1", "income_monthly")), 1e-6);
    }

    @Test
    void plantedCategoricalShiftsHaveTheCramersVComputedInR() {
        // R 4.2.2: sqrt(chisq.test(table(wave, variable), correct = FALSE)$statistic / n)
        assertEquals(0.209926, cramersV("2025-Q2", "2025-Q3", "heating_fuel"), 1e-6);
        assertEquals(0.618445, cramersV("2024-Q4", "2025-Q1", "interview_mode"), 1e-6);
        assertEquals(0.242188, cramersV("2025-Q1", "2025-Q2", "tenure"), 1e-6);
        assertTrue(cramersV("2025-Q2", "2025-Q3", "district") < 0.05);
    }

    // ---- manifest and configuration agree with the data ------------------------------------------------------

    @Test
    void manifestNamesOnlyRealWavesVariablesAndKinds() throws IOException {
        JsonNode manifest = new ObjectMapper(new YAMLFactory()).readTree(root.resolve("demo-data/manifest.yaml")
                .toFile());
        JsonNode config = new ObjectMapper(new YAMLFactory()).readTree(root.resolve("config/demo.yaml").toFile());
        assertEquals(config.path("datasets").path(0).path("name").asText(), manifest.path("dataset").asText());
        Set<String> kinds = Set.of("SHIFT", "BLANK", "PLACEHOLDER", "NUMERIC_SENTINEL", "SENTINEL_DATE",
                "CODE_APPEARED", "CODE_VANISHED", "HEAPING", "MISSING_RATE_CHANGE", "MISSING_CODE",
                "INTERVIEWER_OUTLIER", "INTERVIEWER_EFFECT");
        Set<String> verdicts = Set.of("MATERIAL", "MINOR", "UNCERTAIN", "STABLE");
        List<String> labels = DemoScenarioGenerator.WAVES.stream().map(DemoWave::label).toList();
        Set<String> ids = new HashSet<>();
        Set<String> kindsSeen = new HashSet<>();
        Set<String> verdictsSeen = new HashSet<>();
        JsonNode plants = manifest.path("plants");
        assertTrue(plants.size() >= 12, "plants: " + plants.size());
        for (JsonNode p : plants) {
            String id = p.path("id").asText();
            assertTrue(ids.add(id), "duplicate id " + id);
            int at = labels.indexOf(p.path("wave").asText());
            assertTrue(at >= 0, id + ": wave");
            if (at == 0) {
                assertTrue(!p.has("against"), id + ": the first wave is screened alone");
            } else {
                assertEquals(labels.get(at - 1), p.path("against").asText(), id + ": against the previous wave");
            }
            assertTrue(DemoScenarioGenerator.COLUMNS.contains(p.path("variable").asText()), id + ": variable");
            String kind = p.path("kind").asText();
            assertTrue(kinds.contains(kind), id + ": kind " + kind);
            kindsSeen.add(kind);
            boolean judged = kind.equals("SHIFT") || kind.equals("MISSING_RATE_CHANGE");
            assertEquals(judged, p.has("verdict"), id + ": verdict exactly for SHIFT and MISSING_RATE_CHANGE");
            if (judged) {
                assertTrue(verdicts.contains(p.path("verdict").asText()), id);
                verdictsSeen.add(p.path("verdict").asText());
            } else {
                String shift = p.path("shiftVerdict").asText();
                assertTrue(verdicts.contains(shift) || shift.equals("any") || shift.equals("none"), id + ": " + shift);
            }
            if (p.has("lastWave")) {
                assertTrue(labels.indexOf(p.path("lastWave").asText()) >= at, id + ": lastWave");
            }
            assertFalse(p.path("note").asText().isBlank(), id + ": note");
        }
        assertEquals(verdicts, verdictsSeen, "every verdict is planted at least once");
        assertEquals(Set.of("SHIFT", "BLANK", "NUMERIC_SENTINEL", "SENTINEL_DATE", "CODE_APPEARED", "CODE_VANISHED",
                "HEAPING", "MISSING_RATE_CHANGE", "MISSING_CODE", "INTERVIEWER_OUTLIER"), kindsSeen);
        for (JsonNode v : manifest.path("expectedElsewhere").path("byVariable")) {
            assertTrue(DemoScenarioGenerator.COLUMNS.contains(v.path("variable").asText()), v.toString());
        }
        // the second baseline: the same quarter a year back, four waves before
        assertTrue(manifest.path("sameQuarter").size() > 0);
        for (JsonNode q : manifest.path("sameQuarter")) {
            int at = labels.indexOf(q.path("wave").asText());
            assertTrue(at >= 4, q.toString());
            assertEquals(labels.get(at - 4), q.path("against").asText(), q.toString());
            assertTrue(DemoScenarioGenerator.COLUMNS.contains(q.path("variable").asText()), q.toString());
            assertTrue(kinds.contains(q.path("kind").asText()), q.toString());
            String verdict = q.path("verdict").asText();
            assertTrue(verdicts.contains(verdict) || verdict.equals("any"), q.toString());
        }
    }

    @Test
    void configDeclaresEveryColumnButOneLeftForInference() throws IOException {
        JsonNode config = new ObjectMapper(new YAMLFactory()).readTree(root.resolve("config/demo.yaml").toFile());
        JsonNode dataset = config.path("datasets").path(0);
        assertEquals("survey_demo.household_wave", dataset.path("table").asText());
        assertEquals("wave", dataset.path("waveColumn").asText());
        assertFalse(config.path("source").has("password"), "the config never holds a password");
        Set<String> declared = new HashSet<>();
        Map<String, JsonNode> byName = new HashMap<>();
        for (JsonNode v : dataset.path("variables")) {
            String name = v.path("name").asText();
            assertTrue(DemoScenarioGenerator.COLUMNS.contains(name), name);
            assertTrue(declared.add(name), "declared twice: " + name);
            byName.put(name, v);
        }
        Set<String> undeclared = new TreeSet<>(DemoScenarioGenerator.COLUMNS);
        undeclared.removeAll(declared);
        undeclared.remove("wave");
        dataset.path("exclude").forEach(x -> undeclared.remove(x.asText()));
        assertEquals(Set.of("owns_boat"), undeclared);
        assertEquals("-9", byName.get("income_monthly").path("missingCodes").path(0).path("value").asText());
        assertTrue(byName.get("children").path("missingCodes").isMissingNode(),
                "77 in children is left for the detector to find");
        assertTrue(byName.get("height_cm").path("missingCodes").isMissingNode(),
                "999 in height is left for the detector to find");
        assertNotNull(byName.get("has_broadband").get("successValue"));
    }

    // ---- where it changed: interviewer, district, mode and season plants ------------------------------------

    @ParameterizedTest(name = "{0}: {1} interviewers, workloads {2}..{3}, H17 {4} interviews of which {5} hold 999")
    @CsvSource({
        // wave,   interviewers, least, most, H17, H17's 999s   (R 4.2.2: table(interviewer_id), measure-household-breakdowns.R)
        "2024-Q1, 30,  57,  268, 143,   0",
        "2024-Q2, 30,  61,  284, 140,   0",
        "2024-Q3, 30,  52,  231, 231, 105",
        "2024-Q4, 60, 214, 1267, 443,   0",
        "2025-Q1, 30,  53,  254, 134,   0",
        "2025-Q2, 30,  49,  237, 237,  83",
        "2025-Q3, 30,  61,  236,  94,   0"})
    void oneInterviewerKeysEveryHeightNotMeasuredBesidesAnOrdinaryWorkload(String wave, int interviewers, int least,
                                                                         int most, int h17, int h17Sentinels) {
        Wave w = waves.get(wave);
        List<String> interviewer = w.column("interviewer_id");
        List<String> height = w.column("height_cm");
        Map<String, Integer> load = new HashMap<>();
        int sentinelsElsewhere = 0;
        int sentinelsOfH17 = 0;
        for (int i = 0; i < interviewer.size(); i++) {
            load.merge(interviewer.get(i), 1, Integer::sum);
            if (height.get(i).equals("999")) {
                if (interviewer.get(i).equals(DemoScenarioGenerator.NOT_MEASURED_INTERVIEWER)) {
                    sentinelsOfH17++;
                } else {
                    sentinelsElsewhere++;
                }
            }
        }
        assertEquals(interviewers, load.size());
        assertEquals(least, load.values().stream().mapToInt(Integer::intValue).min().orElseThrow());
        assertEquals(most, load.values().stream().mapToInt(Integer::intValue).max().orElseThrow());
        assertEquals(h17, load.get("H17"));
        assertEquals(h17Sentinels, sentinelsOfH17);
        assertEquals(0, sentinelsElsewhere, "no other interviewer keys 999");
    }

    @Test
    void theInterviewerPlantsCaseListsAreExactlyTheHouseholdsWith999() throws IOException {
        JsonNode manifest = new ObjectMapper(new YAMLFactory()).readTree(root.resolve("demo-data/manifest.yaml")
                .toFile());
        int plants = 0;
        for (JsonNode p : manifest.path("plants")) {
            if (!p.path("kind").asText().equals("INTERVIEWER_OUTLIER")) {
                continue;
            }
            plants++;
            Wave w = waves.get(p.path("wave").asText());
            List<String> ids = w.column("respondent_id");
            List<String> height = w.column("height_cm");
            List<String> interviewer = w.column("interviewer_id");
            List<String> expected = new ArrayList<>();
            for (int i = 0; i < ids.size(); i++) {
                if (height.get(i).equals("999") && interviewer.get(i).equals(p.path("interviewer").asText())) {
                    expected.add(ids.get(i));
                }
            }
            expected.sort(null); // keys of one wave have the same number of digits: text order is key order
            List<String> listed = new ArrayList<>();
            p.path("cases").path("keys").forEach(k -> listed.add(k.asText()));
            assertEquals(expected, listed, p.path("id").asText());
            assertEquals(expected.size(), p.path("cases").path("total").asInt());
            assertEquals(expected.get(0), p.path("cases").path("first").asText());
            assertEquals(expected.get(expected.size() - 1), p.path("cases").path("last").asText());
        }
        assertEquals(2, plants, "2024-Q3 and 2025-Q2");
    }

    @ParameterizedTest(name = "{0} {1}: {2} of {3} report low water pressure")
    @CsvSource({
        // wave,   district,  yes, households   (R 4.2.2: sum(water_pressure_low == "yes"), measure-household-breakdowns.R)
        "2024-Q1, KES,        29,  422",
        "2024-Q1, elsewhere, 250, 3578",
        "2024-Q4, KES,       244, 3488",
        "2024-Q4, elsewhere, 1996, 28512",
        "2025-Q1, KES,        30,  435",
        "2025-Q1, elsewhere, 249, 3565",
        "2025-Q2, KES,       113,  453",
        "2025-Q2, elsewhere, 300, 3747",
        "2025-Q3, KES,       103,  412",
        "2025-Q3, elsewhere, 271, 3388"})
    void lowWaterPressureRisesEighteenPointsInKestlePointAndOnePointElsewhere(String wave, String district, int yes,
                                                                             int households) {
        Wave w = waves.get(wave);
        List<String> districts = w.column("district");
        List<String> low = w.column("water_pressure_low");
        int n = 0;
        int y = 0;
        for (int i = 0; i < districts.size(); i++) {
            if (districts.get(i).equals("KES") == district.equals("KES")) {
                n++;
                y += low.get(i).equals("yes") ? 1 : 0;
            }
        }
        assertEquals(households, n);
        assertEquals(yes, y);
    }

    @ParameterizedTest(name = "{0}: web {1}, telephone {2}, in person {3}, all {4}")
    @CsvSource({
        // wave,   web,    telephone, in_person, all   (R 4.2.2: tapply(neighbourhood_safe, interview_mode, mean))
        "2024-Q1, 3.2299, 3.8228, 3.5293, 3.3112",
        "2024-Q4, 3.2048, 3.8794, 3.5545, 3.2992",
        "2025-Q1, 3.2035, 3.9096, 3.5755, 3.8003",
        "2025-Q3, 3.1587, 3.8660, 3.5482, 3.7566"})
    void neighbourhoodSafetyMovesWithTheModeMixNotWithinAMode(String wave, double web, double telephone,
                                                             double inPerson, double all) {
        Wave w = waves.get(wave);
        List<String> mode = w.column("interview_mode");
        List<String> safe = w.column("neighbourhood_safe");
        Map<String, double[]> sums = new HashMap<>();
        double total = 0;
        for (int i = 0; i < mode.size(); i++) {
            double v = Double.parseDouble(safe.get(i));
            sums.computeIfAbsent(mode.get(i), k -> new double[2])[0] += v;
            sums.get(mode.get(i))[1]++;
            total += v;
        }
        assertEquals(web, sums.get("web")[0] / sums.get("web")[1], 5e-5);
        assertEquals(telephone, sums.get("telephone")[0] / sums.get("telephone")[1], 5e-5);
        assertEquals(inPerson, sums.get("in_person")[0] / sums.get("in_person")[1], 5e-5);
        assertEquals(all, total / mode.size(), 5e-5);
    }

    @ParameterizedTest(name = "{0}: mean {1} hours of heating a week")
    @CsvSource({
        // wave,   mean   (R 4.2.2: mean(as.numeric(heating_hours)), measure-household-breakdowns.R)
        "2024-Q1, 44.19",
        "2024-Q2, 24.40",
        "2024-Q3, 11.01",
        "2024-Q4, 35.54",
        "2025-Q1, 43.71",
        "2025-Q2, 24.09",
        "2025-Q3, 11.12"})
    void heatingHoursFollowTheSeasonsTheSameEachYear(String wave, double mean) {
        List<String> hours = waves.get(wave).column("heating_hours");
        double sum = 0;
        for (String h : hours) {
            int v = Integer.parseInt(h);
            assertTrue(v >= 0 && v <= 168, h);
            sum += v;
        }
        assertEquals(mean, sum / hours.size(), 0.005);
    }

    // ---- support --------------------------------------------------------------------------------------------

    private record Wave(String text, List<String[]> rows) {
        List<String> column(String name) {
            int c = DemoScenarioGenerator.COLUMNS.indexOf(name);
            List<String> out = new ArrayList<>(rows.size() - 1);
            for (int i = 1; i < rows.size(); i++) {
                out.add(rows.get(i)[c]);
            }
            return out;
        }

        double share(String name, String value) {
            List<String> values = column(name);
            return (double) values.stream().filter(value::equals).count() / values.size();
        }
    }

    private static double[] numbers(String wave, String column) {
        // the sentinels a detector is expected to remove: -9 in income (codebook), 999 in height (found)
        String sentinel = column.equals("income_monthly") ? "-9" : column.equals("height_cm") ? "999" : null;
        return waves.get(wave).column(column).stream()
                .filter(v -> v != null && !v.equals(sentinel))
                .mapToDouble(Double::parseDouble).toArray();
    }

    private static double whipple(List<String> ages) {
        long inRange = 0;
        long heaped = 0;
        for (String v : ages) {
            int a = Integer.parseInt(v);
            if (a >= 23 && a <= 62) {
                inRange++;
                heaped += a % 5 == 0 ? 1 : 0;
            }
        }
        return 500.0 * heaped / inRange;
    }

    /** Hedges' g of current against baseline (positive when current is larger), with the small-sample factor. */
    private static double hedgesG(double[] baseline, double[] current) {
        int n0 = baseline.length;
        int n1 = current.length;
        double m0 = Arrays.stream(baseline).average().orElseThrow();
        double m1 = Arrays.stream(current).average().orElseThrow();
        double ss0 = Arrays.stream(baseline).map(x -> (x - m0) * (x - m0)).sum();
        double ss1 = Arrays.stream(current).map(x -> (x - m1) * (x - m1)).sum();
        double sp = FastMath.sqrt((ss0 + ss1) / (n0 + n1 - 2));
        return (1 - 3.0 / (4.0 * (n0 + n1) - 9)) * (m1 - m0) / sp;
    }

    /** P(current > baseline) - P(current < baseline) by counting against the sorted baseline. */
    private static double cliffsDelta(double[] baseline, double[] current) {
        double[] sorted = baseline.clone();
        Arrays.sort(sorted);
        double greater = 0;
        double less = 0;
        for (double x : current) {
            int below = lowerBound(sorted, x);
            int notAbove = upperBound(sorted, x);
            less += sorted.length - notAbove;
            greater += below;
        }
        return (greater - less) / ((double) baseline.length * current.length);
    }

    private static int lowerBound(double[] a, double x) {
        int lo = 0;
        int hi = a.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (a[mid] < x) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    private static int upperBound(double[] a, double x) {
        int lo = 0;
        int hi = a.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (a[mid] <= x) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    private static double cramersV(String baseline, String current, String column) {
        Map<String, long[]> table = new HashMap<>();
        List<String> b = waves.get(baseline).column(column);
        List<String> c = waves.get(current).column(column);
        b.forEach(v -> table.computeIfAbsent(v, k -> new long[2])[0]++);
        c.forEach(v -> table.computeIfAbsent(v, k -> new long[2])[1]++);
        double n = b.size() + c.size();
        double x2 = 0;
        for (long[] cell : table.values()) {
            double total = cell[0] + cell[1];
            double e0 = total * b.size() / n;
            double e1 = total * c.size() / n;
            x2 += (cell[0] - e0) * (cell[0] - e0) / e0 + (cell[1] - e1) * (cell[1] - e1) / e1;
        }
        return FastMath.sqrt(x2 / n); // two waves: min(r, c) - 1 = 1
    }

    private static String field(String value) throws IOException {
        StringBuilder out = new StringBuilder();
        DemoScenarioGenerator.appendField(out, value);
        return out.toString();
    }

    /** RFC 4180 reader that returns null for an unquoted empty field and "" for a quoted one. */
    private static List<String[]> parseCsv(String text) {
        List<String[]> rows = new ArrayList<>();
        List<String> row = new ArrayList<>();
        StringBuilder cell = new StringBuilder();
        boolean quoted = false;
        boolean inQuotes = false;
        for (int i = 0; i < text.length(); i++) {
            char ch = text.charAt(i);
            if (inQuotes) {
                if (ch == '"' && i + 1 < text.length() && text.charAt(i + 1) == '"') {
                    cell.append('"');
                    i++;
                } else if (ch == '"') {
                    inQuotes = false;
                } else {
                    cell.append(ch);
                }
            } else if (ch == '"') {
                inQuotes = true;
                quoted = true;
            } else if (ch == ',' || ch == '\n') {
                row.add(cell.length() == 0 && !quoted ? null : cell.toString());
                cell.setLength(0);
                quoted = false;
                if (ch == '\n') {
                    rows.add(row.toArray(new String[0]));
                    row.clear();
                }
            } else {
                cell.append(ch);
            }
        }
        assertTrue(row.isEmpty() && cell.length() == 0, "the file ends with a line break");
        return rows;
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
