package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.Session;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo's three surveys across all their waves on an embedded PostgreSQL server, counting the alerts of every
 * wave twice: "before", as the rules without repeats would raise them (every finding worth a person, a repeat
 * counted as news and a CLEARED finding as the MATERIAL change it used to be), and "after", the alert rows the runs
 * actually wrote. A finding that says what the previous wave said no longer alerts: the boat owners' mooring fee,
 * too few answers to judge in every wave, alerts once; the blank occupation answers alert when they appear and when
 * they jump, not in every later wave; and nothing planted in the manifests is lost.
 */
class DemoAlertCountsTest {

    @TempDir
    static Path out;
    /** Every judged wave of the three surveys, in the order judged. */
    static List<FindingsReport> reports = new ArrayList<>();
    /** The alert rows of each wave's current run, keyed by dataset and wave. */
    static Map<String, List<AlertRow>> written = new LinkedHashMap<>();
    static Map<String, JsonNode> manifests = new LinkedHashMap<>();

    /** An alert row; {@code against} is empty for the run's main baseline, else the further baseline's name. */
    record AlertRow(String variable, String kind, String verdict, String against) {
    }

    @BeforeAll
    static void runTheDemo() throws Exception {
        DemoRun.Outcome outcome = DemoRun.run(out, new PrintWriter(new StringWriter(), true),
                DemoAlertCountsTest::readAlertRows);
        reports.addAll(outcome.reports());
        reports.addAll(outcome.panelReports());
        reports.addAll(outcome.leisureReports());
        ObjectMapper yaml = new ObjectMapper(new YAMLFactory());
        for (String file : List.of("manifest.yaml", "panel-manifest.yaml", "leisure-manifest.yaml")) {
            manifests.put(file, yaml.readTree(Files.readString(Path.of("..", "demo-data", file))));
        }
        System.out.println(table());
    }

    static void readAlertRows(Session s) {
        String schema = s.config().results().schema();
        for (var d : s.config().datasets()) {
            for (var w : new org.wavewarden.pipeline.WaveJudge(s, java.time.Clock.systemUTC()).waves(d)) {
                long run = s.store().currentRun(d.name(), w.wave()).orElseThrow().runId();
                written.put(key(d.name(), w.wave()), s.store().jdbi().withHandle(h -> h.createQuery(
                                "SELECT variable, kind, verdict, against FROM " + schema + ".alert WHERE run_id = :run"
                                        + " ORDER BY alert_id")
                        .bind("run", run)
                        .map((rs, ctx) -> new AlertRow(rs.getString("variable"), rs.getString("kind"),
                                rs.getString("verdict"), rs.getString("against")))
                        .list()));
            }
        }
    }

    static String key(String dataset, String wave) {
        return dataset + " " + wave;
    }

    /** A finding as the rules without repeats and without the direction of a change saw it. */
    static Finding asBefore(Finding f) {
        Finding news = f.withRepeat(null);
        return news.verdict() == Verdict.CLEARED ? news.withVerdict(Verdict.MATERIAL) : news;
    }

    static int before(FindingsReport r) {
        return Alerts.group(r.findings().stream().map(DemoAlertCountsTest::asBefore).toList()).size();
    }

    static int after(FindingsReport r) {
        return written.get(key(r.dataset(), r.wave())).size();
    }

    static String table() {
        StringBuilder sb = new StringBuilder(String.format(Locale.ROOT, "%n| dataset | wave | alerts before |"
                + " alerts after |%n|---|---|---:|---:|%n"));
        Map<String, int[]> totals = new LinkedHashMap<>();
        for (FindingsReport r : reports) {
            sb.append(String.format(Locale.ROOT, "| %s | %s | %d | %d |%n", r.dataset(), r.wave(), before(r),
                    after(r)));
            int[] t = totals.computeIfAbsent(r.dataset(), k -> new int[2]);
            t[0] += before(r);
            t[1] += after(r);
        }
        totals.forEach((d, t) -> sb.append(String.format(Locale.ROOT, "| %s | all waves | %d | %d |%n", d, t[0],
                t[1])));
        return sb.toString();
    }

    @Test
    void everyWaveWritesTheAlertsItsFindingsRaiseAndNeverMoreThanBefore() {
        assertEquals(reports.size(), written.size(), "every judged wave has a current run");
        int before = 0;
        int after = 0;
        for (FindingsReport r : reports) {
            assertEquals(Alerts.group(r.findings()).size(), after(r), r.dataset() + " " + r.wave());
            assertTrue(after(r) <= before(r), r.dataset() + " " + r.wave() + ": " + after(r) + " after, " + before(r)
                    + " before");
            before += before(r);
            after += after(r);
        }
        assertTrue(after < before, "repeats hold back some alerts: " + after + " after, " + before + " before");
    }

    /**
     * The README's table of alerts per wave, held to the run: the demo data are fixed, so the counts are too, and a
     * change to the rules that moves them must move the README with them.
     */
    @ParameterizedTest(name = "{0} {1}: {2} before, {3} after")
    @CsvSource({
            "harrowmere-household, 2024-Q1, 1, 1",
            "harrowmere-household, 2024-Q2, 3, 3",
            "harrowmere-household, 2024-Q3, 5, 3",
            "harrowmere-household, 2024-Q4, 5, 2",
            "harrowmere-household, 2025-Q1, 15, 12",
            "harrowmere-household, 2025-Q2, 16, 12",
            "harrowmere-household, 2025-Q3, 15, 9",
            "harrowmere-panel,     2024-Q4, 0, 0",
            "harrowmere-panel,     2025-Q1, 3, 3",
            "harrowmere-panel,     2025-Q2, 3, 2",
            "harrowmere-panel,     2025-Q3, 2, 2",
            "harrowmere-leisure,   2024-Q3, 1, 1",
            "harrowmere-leisure,   2024-Q4, 2, 1",
            "harrowmere-leisure,   2025-Q1, 4, 2",
            "harrowmere-leisure,   2025-Q2, 3, 1",
    })
    void theReadmesAlertsPerWaveAreTheOnesTheDemoWrites(String dataset, String wave, int before, int after) {
        FindingsReport r = reports.stream().filter(x -> x.dataset().equals(dataset) && x.wave().equals(wave))
                .findFirst().orElseThrow(() -> new AssertionError("no report of " + dataset + " " + wave));
        assertEquals(before, before(r), "alerts the rules without repeats would raise");
        assertEquals(after, after(r), "alert rows written");
    }

    /**
     * The household demo judges each wave against the previous one and against the same quarter a year back: under
     * each baseline the fee alerts at its first comparison only, and every later comparison under that baseline is
     * kept as still too few answers to judge.
     */
    @Test
    void theMooringFeeTooFewAnswersToJudgeAlertsOnceNotEveryWave() {
        List<FindingsReport> household = household();
        for (boolean main : List.of(true, false)) {
            List<String> alerted = new ArrayList<>();
            List<String> quiet = new ArrayList<>();
            List<String> compared = new ArrayList<>();
            for (FindingsReport r : household) {
                if (written.get(key(r.dataset(), r.wave())).stream().anyMatch(a -> a.variable().equals("mooring_fee")
                        && a.against().isEmpty() == main)) {
                    alerted.add(r.wave());
                }
                Optional<Finding> fee = r.findings().stream().filter(f -> f.variable().equals("mooring_fee")
                        && f.kind() == FindingKind.SHIFT && (f.against() == null) == main).findFirst();
                if (fee.isEmpty()) {
                    continue;
                }
                compared.add(r.wave());
                if (fee.get().repeat() != null) {
                    assertEquals(Finding.Repeat.Kind.STILL_UNRESOLVABLE, fee.get().repeat().kind(),
                            fee.get().sentence());
                    assertEquals(compared.get(0), fee.get().repeat().firstWave(), fee.get().sentence());
                    quiet.add(r.wave());
                }
            }
            String baseline = main ? "against the previous wave" : "against the same quarter a year back";
            assertTrue(compared.size() >= 2, baseline + ": " + compared);
            assertEquals(List.of(compared.get(0)), alerted, baseline + ": alerted at the first comparison only");
            assertEquals(compared.size() - 1, quiet.size(), baseline + ": every later comparison is still too few"
                    + " answers: " + quiet);
            if (main) {
                assertEquals(household.get(1).wave(), compared.get(0), "the first comparison is the second wave");
            }
        }
    }

    @Test
    void theBlankOccupationAnswersAlertWhenTheyAppearAndWhenTheyJumpNotInEveryLaterWave() {
        List<String> planted = new ArrayList<>();
        manifests.get("manifest.yaml").get("plants").forEach(p -> {
            if (p.get("variable").asText().equals("occupation") && p.get("kind").asText().equals("BLANK")) {
                planted.add(p.get("wave").asText());
            }
        });
        List<String> alerted = new ArrayList<>();
        List<String> stillPresent = new ArrayList<>();
        for (FindingsReport r : household()) {
            Optional<Finding> blank = find(r, "occupation", FindingKind.BLANK);
            if (blank.isPresent() && Alerts.worthAPerson(blank.get())) {
                alerted.add(r.wave());
            } else if (blank.isPresent()) {
                assertEquals(Finding.Repeat.Kind.STILL_PRESENT, blank.get().repeat().kind());
                stillPresent.add(r.wave());
            }
        }
        System.out.println("occupation BLANK alerted in " + alerted + ", still present in " + stillPresent);
        assertEquals(planted, alerted, "the blanks alert in the waves their plants start, and only there");
        assertEquals(household().size() - planted.size(), stillPresent.size(), "still present in every other wave");
    }

    /**
     * Every plant of the three manifests whose expectation is an alert (a MATERIAL or UNCERTAIN verdict, or a
     * data-quality kind that alerts) is still alerted in its wave. The one exception is the point of the change: an
     * UNCERTAIN plant on a variable that was already too small to judge in the previous wave is kept in the
     * findings as still unresolvable (the digest's standing "too few answers to judge" section), not alerted again.
     */
    @TestFactory
    Stream<DynamicTest> nothingPlantedIsLost() {
        List<DynamicTest> tests = new ArrayList<>();
        manifests.forEach((file, manifest) -> {
            String dataset = manifest.get("dataset").asText();
            for (JsonNode p : manifest.get("plants")) {
                if (!expectsAnAlert(p)) {
                    continue;
                }
                tests.add(DynamicTest.dynamicTest(file + " " + p.get("id").asText(), () -> {
                    FindingsReport r = reports.stream().filter(x -> x.dataset().equals(dataset)
                            && x.wave().equals(p.get("wave").asText())).findFirst().orElseThrow();
                    Finding f = find(r, p.get("variable").asText(), FindingKind.valueOf(p.get("kind").asText()))
                            .orElseThrow(() -> new AssertionError("no finding for " + p));
                    if (p.has("verdict")) {
                        assertEquals(p.get("verdict").asText(), String.valueOf(f.verdict()), f.sentence());
                    }
                    if (f.repeat() != null) {
                        assertEquals("UNCERTAIN", p.path("verdict").asText(), "only a plant too small to judge may"
                                + " be held back: " + f.sentence());
                        assertEquals(Finding.Repeat.Kind.STILL_UNRESOLVABLE, f.repeat().kind(), f.sentence());
                        System.out.println(p.get("id").asText() + ": kept as too few answers to judge since "
                                + f.repeat().firstWave() + ", not alerted again");
                        return;
                    }
                    assertTrue(Alerts.worthAPerson(f), f.sentence());
                    assertTrue(Alerts.group(r.findings()).stream().anyMatch(a -> a.facets().contains(f)),
                            "in one of the wave's alerts: " + f.sentence());
                    assertTrue(written.get(key(dataset, r.wave())).stream().anyMatch(a -> a.variable()
                            .equals(f.variable())), "an alert row of the run names " + f.variable());
                }));
            }
        });
        assertTrue(tests.size() >= 10, "the manifests plant alerts: " + tests.size());
        return tests.stream();
    }

    static boolean expectsAnAlert(JsonNode plant) {
        if (plant.has("verdict")) {
            String v = plant.get("verdict").asText();
            return v.equals("MATERIAL") || v.equals("UNCERTAIN");
        }
        FindingKind kind = FindingKind.valueOf(plant.get("kind").asText());
        return kind.isDataQuality() && kind != FindingKind.MISSING_CODE;
    }

    static List<FindingsReport> household() {
        String dataset = manifests.get("manifest.yaml").get("dataset").asText();
        return reports.stream().filter(r -> r.dataset().equals(dataset)).toList();
    }

    static Optional<Finding> find(FindingsReport r, String variable, FindingKind kind) {
        return r.findings().stream().filter(f -> f.variable().equals(variable) && f.kind() == kind).findFirst();
    }
}
