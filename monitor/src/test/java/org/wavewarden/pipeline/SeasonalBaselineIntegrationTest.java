package org.wavewarden.pipeline;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Alert;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.sql.Statement;
import java.time.Clock;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A quarterly survey whose answers follow the seasons: hours of heating per week are 60 in the first quarter, 45 in
 * the second and fourth, 30 in the third, every year alike. Compared with the quarter before, the second quarter of
 * 2025 shows a MATERIAL fall of 15 hours, which is only the season; compared with the same quarter a year back it is
 * STABLE. Judged with {@code compareWith: [previous, {sameWaveBack: 4}]} both comparisons are made in one run, in one
 * false-discovery-rate family, each finding naming the baseline it used.
 *
 * <p>The figures are exact by construction: every wave of a quarter holds the same 800 answers (the quarter's level
 * plus the same spread of -10 .. +10 hours), so the change against the same quarter is 0 and against the quarter
 * before the difference of the two levels.
 */
class SeasonalBaselineIntegrationTest {

    static final List<String> WAVES = List.of("2024-Q1", "2024-Q2", "2024-Q3", "2024-Q4", "2025-Q1", "2025-Q2");
    static final int ROWS = 800;
    static String url;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("seasonal");
        try (Connection c = TestDatabase.connect(url); Statement st = c.createStatement()) {
            st.execute("CREATE SCHEMA src");
            st.execute("CREATE TABLE src.household (wave text NOT NULL, respondent_id integer NOT NULL,"
                    + " heating_hours double precision, rooms integer)");
            for (String wave : WAVES) {
                int level = switch (wave.substring(5)) {
                    case "Q1" -> 60;
                    case "Q3" -> 30;
                    default -> 45;
                };
                // The spread (i * 37) mod 21 - 10 runs over -10 .. 10; rooms 1 .. 6 the same in every wave.
                st.execute("INSERT INTO src.household SELECT '" + wave + "', i, " + level
                        + " + ((i * 37) % 21) - 10, 1 + (i % 6) FROM generate_series(1, " + ROWS + ") i");
            }
        }
    }

    static WardenConfig config(String compareWith) {
        return ConfigLoader.parse("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results:
                  schema: ww_results
                alpha: 0.05
                datasets:
                  - name: harrowmere-heating
                    table: src.household
                    waveColumn: wave
                    exclude: [respondent_id]
                    compareWith: %s
                    variables:
                      - name: heating_hours
                        kind: continuous
                        unit: hours
                        threshold: {raw: 5}
                        locationTest: means
                      - name: rooms
                        kind: continuous
                        unit: rooms
                        threshold: {raw: 1}
                """.formatted(url, compareWith));
    }

    static JudgedWave judge(String compareWith, String wave) {
        WardenConfig c = config(compareWith);
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            return new WaveJudge(s, Clock.systemUTC()).judge(c.datasets().get(0), wave, null, null, null);
        }
    }

    static Optional<Finding> find(JudgedWave j, String variable, FindingKind kind, String against) {
        return j.report().findings().stream().filter(f -> f.variable().equals(variable) && f.kind() == kind
                && java.util.Objects.equals(f.against(), against)).findFirst();
    }

    @Test
    void thePreviousQuarterSeesTheSeasonAndTheSameQuarterAYearBackDoesNot() {
        JudgedWave j = judge("[previous, {sameWaveBack: 4}]", "2025-Q2");
        assertEquals("2025-Q1 + 2024-Q2 (4 waves back)", j.report().againstWave());

        Finding previous = find(j, "heating_hours", FindingKind.SHIFT, null).orElseThrow();
        Finding seasonal = find(j, "heating_hours", FindingKind.SHIFT, "2024-Q2 (4 waves back)").orElseThrow();
        assertEquals(Verdict.MATERIAL, previous.verdict(), previous.sentence());
        assertEquals(Verdict.STABLE, seasonal.verdict(), seasonal.sentence());
        // By construction: 45 - 60 hours against the quarter before, 45 - 45 against the same quarter.
        assertEquals(-15.0, previous.effect().estimate(), 1e-9, previous.effect().name());
        assertEquals(0.0, seasonal.effect().estimate(), 1e-9, seasonal.effect().name());
        // R 4.2.2, t.test(45 + s, 60 + s) with s = ((1:800 * 37) %% 21) - 10 (Welch): t = -49.543139,
        // 95% interval of the difference -15.59386112 .. -14.40613888; against the same quarter t = 0, p = 1.
        assertEquals("Welch t", previous.test());
        assertEquals(-49.543139, previous.statistic(), 1e-6);
        assertEquals(-15.59386112, previous.effect().ciLow(), 1e-6);
        assertEquals(-14.40613888, previous.effect().ciHigh(), 1e-6);
        assertEquals(0.0, seasonal.statistic(), 1e-9);
        assertEquals(1.0, seasonal.pValue(), 1e-9);
        assertEquals(ROWS, previous.nBaseline());
        assertEquals(ROWS, seasonal.nBaseline());
        assertTrue(seasonal.sentence().startsWith("Against 2024-Q2, 4 waves back: "), seasonal.sentence());

        // One family: every tested finding of the run counts the comparisons of both baselines.
        List<Integer> families = j.report().findings().stream().map(Finding::fdrFamilySize)
                .filter(java.util.Objects::nonNull).distinct().toList();
        assertEquals(1, families.size(), families.toString());
        int alone = judge("previous", "2025-Q2").report().findings().stream().map(Finding::fdrFamilySize)
                .filter(java.util.Objects::nonNull).findFirst().orElseThrow();
        assertTrue(families.get(0) > alone, families + " against " + alone + " with the previous wave alone");

        // What the judged wave shows on its own is not repeated per baseline; rooms never move.
        assertEquals(Verdict.STABLE, find(j, "rooms", FindingKind.SHIFT, "2024-Q2 (4 waves back)").orElseThrow()
                .verdict());
        assertTrue(j.report().findings().stream().filter(f -> f.against() != null)
                .allMatch(f -> WaveJudge.ALONGSIDE_KINDS.contains(f.kind())), j.report().findings().toString());

        // The seasonal finding is stored with its baseline and read back with it.
        WardenConfig c = config("[previous, {sameWaveBack: 4}]");
        try (Session s = Session.open(c, null, Map.of())) {
            List<Finding> stored = s.store().storedReport(j.runId()).orElseThrow().findings();
            assertEquals(j.report().findings().stream().map(Finding::against).toList(),
                    stored.stream().map(Finding::against).toList());
        }

        // Only the previous-wave shift asks for a person: the seasonal comparison is quiet.
        assertEquals(List.of("heating_hours"), j.alerts().stream().map(Alert::variable).toList());
        assertNull(j.alerts().get(0).against());
    }

    @Test
    void aSameQuarterRuleAloneIsTheRunsOneBaseline() {
        JudgedWave j = judge("{sameWaveBack: 4}", "2025-Q2");
        assertEquals("2024-Q2", j.report().againstWave());
        Finding heating = find(j, "heating_hours", FindingKind.SHIFT, null).orElseThrow();
        assertEquals(Verdict.STABLE, heating.verdict(), heating.sentence());
        assertTrue(j.report().findings().stream().allMatch(f -> f.against() == null));
        assertTrue(j.alerts().isEmpty(), j.alerts().toString());
    }

    @Test
    void aWaveWithNoWaveFourBackIsJudgedAgainstTheOtherRulesWithANote() {
        JudgedWave j = judge("[previous, {sameWaveBack: 4}]", "2024-Q3");
        assertEquals("2024-Q2", j.report().againstWave());
        assertTrue(j.report().findings().stream().allMatch(f -> f.against() == null));
        assertTrue(j.report().inference().stream().anyMatch(n -> n.equals("Wave 2024-Q3 has no baseline 4 waves"
                + " back (no earlier wave with rows that far back), so it is judged against 2024-Q2 (previous wave)"
                + " and the other rules' baselines only.")), j.report().inference().toString());
    }

    @Test
    void whenTheFirstRuleHasNoBaselineTheNextOneIsTheMainBaseline() {
        JudgedWave j = judge("[{sameWaveBack: 4}, previous]", "2024-Q3");
        assertEquals("2024-Q2", j.report().againstWave());
        Finding heating = find(j, "heating_hours", FindingKind.SHIFT, null).orElseThrow();
        assertEquals(Verdict.MATERIAL, heating.verdict(), heating.sentence());
        assertTrue(j.report().inference().stream().anyMatch(n -> n.startsWith("Wave 2024-Q3 has no baseline 4 waves"
                + " back")), j.report().inference().toString());
        JudgedWave later = judge("[{sameWaveBack: 4}, previous]", "2025-Q2");
        assertEquals("2024-Q2 + 2025-Q1 (previous wave)", later.report().againstWave());
        assertEquals(Verdict.MATERIAL, find(later, "heating_hours", FindingKind.SHIFT, "2025-Q1 (previous wave)")
                .orElseThrow().verdict());
    }

    @Test
    void theDigestShowsAnAlertOfAFurtherBaselineWithItsBaseline() {
        WardenConfig c = config("[{sameWaveBack: 4}, previous]");
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            var d = c.datasets().get(0);
            JudgedWave j = new WaveJudge(s, Clock.systemUTC()).judge(d, "2025-Q2", null, null, null);
            assertEquals(List.of("2025-Q1 (previous wave)"), j.alerts().stream().map(Alert::against).toList());
            String html = new DigestAssembler(s).html(d, List.of(j.report()), java.time.Instant.now());
            assertTrue(html.contains("<span class=\"against\">against 2025-Q1, previous wave</span>"), html);
            String md = new DigestAssembler(s).markdown(d, List.of(j.report()));
            assertTrue(md.contains(", against 2025-Q1, previous wave |"), md);
        }
    }

    @Test
    void theRunKeyNamesEveryBaseline() {
        JudgedWave first = judge("[previous, {sameWaveBack: 4}]", "2025-Q1");
        JudgedWave again = judge("[previous, {sameWaveBack: 4}]", "2025-Q1");
        assertEquals("2024-Q4 + 2024-Q1 (4 waves back)", first.report().againstWave());
        assertEquals(first.runId(), again.runId(), "the same data, configuration and baselines: the same run");
        JudgedWave previousOnly = judge("previous", "2025-Q1");
        assertEquals("2024-Q4", previousOnly.report().againstWave());
        assertNotEquals(first.runId(), previousOnly.runId());
        WardenConfig c = config("previous");
        try (Session s = Session.open(c, null, Map.of())) {
            List<String> keys = s.store().jdbi().withHandle(h -> h.createQuery("SELECT against_wave FROM"
                    + " ww_results.run WHERE dataset = 'harrowmere-heating' AND wave = '2025-Q1' ORDER BY run_id")
                    .mapTo(String.class).list());
            assertEquals(List.of("2024-Q4 + 2024-Q1 (4 waves back)", "2024-Q4"), keys);
        }
    }

    @Test
    void baselineWavesFollowEachRule() {
        var d = config("[previous, {sameWaveBack: 4}, {sameWaveBack: 5}]").datasets().get(0);
        List<org.wavewarden.read.WaveInfo> listed = WAVES.stream().map(w -> new org.wavewarden.read.WaveInfo(w,
                w.equals("2024-Q2") ? 0 : ROWS)).toList();
        assertEquals(List.of(new WaveJudge.RuleWaves(d.compareWith().rules().get(0), List.of("2025-Q1")),
                        new WaveJudge.RuleWaves(d.compareWith().rules().get(1), List.of()),
                        new WaveJudge.RuleWaves(d.compareWith().rules().get(2), List.of("2024-Q1"))),
                WaveJudge.ruleBaselines(d, listed, "2025-Q2"),
                "a season's wave without rows is no baseline, and no nearer wave stands in");
        assertEquals(List.of("2024-Q2"), WaveJudge.baselineWaves(d.compareWith().rules().get(1), d, WAVES,
                "2025-Q2"));
        assertEquals(List.of(), WaveJudge.baselineWaves(d.compareWith().rules().get(1), d, WAVES, "2024-Q4"));
    }
}
