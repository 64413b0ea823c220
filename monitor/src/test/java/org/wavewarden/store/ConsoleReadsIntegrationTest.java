package org.wavewarden.store;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.store.ConsoleReads.DatasetSummary;
import org.wavewarden.store.ConsoleReads.FindingView;
import org.wavewarden.store.ConsoleReads.Grid;
import org.wavewarden.store.ConsoleReads.GridCell;
import org.wavewarden.store.ConsoleReads.GridFilter;
import org.wavewarden.store.ConsoleReads.GridRow;
import org.wavewarden.store.ConsoleReads.SearchHit;
import org.wavewarden.store.ConsoleReads.TrendPoint;
import org.wavewarden.store.ConsoleReads.WaveView;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.time.Clock;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * What the console reads, on a real PostgreSQL server with runs written by the pipeline: two Harrowmere surveys,
 * households (hh: {@code score} rises in w2, a MATERIAL shift; w3 judged twice, its first run superseded by a
 * correction of the data) and persons (pp: two quiet waves). The reads are checked against what the stores already
 * say: AlertReviews for alerts and their states, ResultsStore's stored reports for findings.
 */
class ConsoleReadsIntegrationTest {

    static final String SCHEMA = "console_results";
    static final Comparator<String> WAVES = Comparator.naturalOrder();

    static Session session;
    static ConsoleReads reads;
    static AlertReviews reviews;
    static ResultsStore store;
    static long supersededRun;
    static long currentW3Run;
    static long scoreAlert;

    @BeforeAll
    static void setUp() throws Exception {
        String url = TestDatabase.freshDatabase("console_reads");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.hh (wave text NOT NULL, pid integer NOT NULL, score double precision,
                        region text);
                    INSERT INTO src.hh SELECT w, p, CASE WHEN w = 'w1' THEN 40 ELSE 46 END + (p * 7) % 21,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4]
                        FROM generate_series(1, 400) p, unnest(ARRAY['w1', 'w2', 'w3']) w;
                    CREATE TABLE src.pp (wave text NOT NULL, pid integer NOT NULL, age double precision);
                    INSERT INTO src.pp SELECT w, p, 20 + p % 50 FROM generate_series(1, 300) p,
                        unnest(ARRAY['w1', 'w2']) w;
                    """);
        }
        // The region's label holds every character a LIKE pattern or a quoted string would read specially.
        WardenConfig config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n"
                + "  schema: " + SCHEMA + "\nalpha: 0.05\ndatasets:\n"
                + "  - name: hh\n    table: src.hh\n    waveColumn: wave\n    exclude: [pid]\n    variables:\n"
                + "      - {name: score, kind: continuous, unit: points, label: 'Household score'}\n"
                + "      - {name: region, kind: categorical, label: 'Region: 100% _as_ reported \\ in ''quotes'' \"here\"'}\n"
                + "  - name: pp\n    table: src.pp\n    waveColumn: wave\n    exclude: [pid]\n    variables:\n"
                + "      - {name: age, kind: continuous, unit: years, label: 'Age in years'}\n");
        session = Session.open(config, null, Map.of());
        session.migrate();
        store = session.store();
        reviews = new AlertReviews(store.jdbi(), SCHEMA);
        reads = new ConsoleReads(store.jdbi(), SCHEMA, Clock.systemUTC());
        WaveJudge judge = new WaveJudge(session, Clock.systemUTC());
        for (String w : List.of("w1", "w2", "w3")) {
            JudgedWave j = judge.judge(config.dataset("hh"), w, null, null, null);
            if (w.equals("w3")) {
                supersededRun = j.runId();
            }
        }
        // A correction of w3's data: judged again, the first run of w3 is superseded.
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("UPDATE src.hh SET score = score + 9 WHERE wave = 'w3'");
        }
        currentW3Run = judge.judge(config.dataset("hh"), "w3", null, null, null).runId();
        judge.judge(config.dataset("pp"), "w1", null, null, null);
        judge.judge(config.dataset("pp"), "w2", null, null, null);
        scoreAlert = reviews.list(new AlertReviews.Filter("hh", "w2", null, "MATERIAL", null)).stream()
                .filter(a -> a.variable().equals("score")).findFirst().orElseThrow().alertId();
        reviews.explain(scoreAlert, "Ines Calloway", ReviewReason.parse("real-change").orElseThrow(),
                "The new Harrowmere housing estate.", "command");
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    @Test
    void theHistoryHasWhatTheseTestsNeed() {
        assertNotEquals(supersededRun, currentW3Run, "w3 was judged again on corrected data");
        assertEquals(AlertState.EXPLAINED, reviews.get(scoreAlert).orElseThrow().state());
    }

    /** The alerts of current runs, read through AlertReviews alone. */
    static List<AlertView> currentAlerts(String dataset) {
        // The waves from the run table itself, not from a console read, so the check is not circular.
        List<String> waves = store.jdbi().withHandle(h -> h.createQuery("SELECT DISTINCT wave FROM " + SCHEMA
                + ".run WHERE dataset = :d").bind("d", dataset).mapTo(String.class).list());
        assertFalse(waves.isEmpty(), dataset);
        Set<Long> current = waves.stream()
                .map(w -> store.currentRun(dataset, w).orElseThrow().runId()).collect(Collectors.toSet());
        return reviews.list(new AlertReviews.Filter(dataset, null, null, null, null)).stream()
                .filter(a -> current.contains(a.runId())).toList();
    }

    @Test
    void theOverviewCountsAlertsByVerdictAndStateAsTheLifecycleListsThem() {
        List<DatasetSummary> all = reads.datasets();
        assertEquals(List.of("hh", "pp"), all.stream().map(DatasetSummary::dataset).toList());
        for (DatasetSummary d : all) {
            List<AlertView> alerts = currentAlerts(d.dataset());
            Map<AlertState, Integer> byState = new HashMap<>();
            Map<String, Integer> open = new TreeMap<>();
            for (AlertView a : alerts) {
                byState.merge(a.state(), 1, Integer::sum);
                if (a.state() == AlertState.OPEN) {
                    open.merge(a.verdict() == null ? ConsoleReads.NO_VERDICT : a.verdict(), 1, Integer::sum);
                }
            }
            assertEquals(byState, d.byState(), d.dataset());
            assertEquals(open, d.openByVerdict(), d.dataset());
        }
        DatasetSummary hh = all.get(0);
        assertEquals(1, hh.byState().get(AlertState.EXPLAINED), "the explained score alert");
        assertEquals(3, hh.wavesJudged(), "w3's two runs are one judged wave");
        assertEquals("w3", hh.lastWave());
        assertFalse(hh.lastWaveSignedOff());
        assertEquals(null, hh.lastSignOff());
    }

    @Test
    void aSignOffShowsInTheOverviewAndOnTheWavePage() {
        SignOffs signOffs = new SignOffs(store.jdbi(), SCHEMA);
        var signed = signOffs.signOff(new SignOffs.Request("pp", "w2", "2024.1", "Ines Calloway", true,
                "Harrowmere board meets tomorrow."));
        DatasetSummary pp = reads.datasets().stream().filter(d -> d.dataset().equals("pp")).findFirst().orElseThrow();
        assertEquals(signed.signOffId(), pp.lastSignOff().signOffId());
        assertTrue(pp.lastWaveSignedOff());
        WaveView w2 = reads.wave("pp", "w2").orElseThrow();
        assertEquals(List.of(signed.signOffId()), w2.signOffs().stream().map(s -> s.signOffId()).toList());
    }

    /** Most urgent first, as the grid's cell says: MATERIAL, UNCERTAIN, MINOR, STABLE, CLEARED, none. */
    static int urgency(String verdict) {
        return verdict == null ? 5 : List.of("MATERIAL", "UNCERTAIN", "MINOR", "STABLE", "CLEARED").indexOf(verdict);
    }

    @Test
    void eachCellIsTheMostUrgentFindingOfItsVariableInTheWavesCurrentRun() {
        Grid grid = reads.grid("hh", GridFilter.ANY, WAVES);
        assertEquals(List.of("w1", "w2", "w3"), grid.waves());
        assertEquals(List.of("region", "score"), grid.rows().stream().map(GridRow::variable).toList());
        for (int col = 0; col < grid.waves().size(); col++) {
            String wave = grid.waves().get(col);
            long run = store.currentRun("hh", wave).orElseThrow().runId();
            List<Finding> findings = store.storedReport(run).orElseThrow().findings();
            for (GridRow row : grid.rows()) {
                List<Finding> own = findings.stream().filter(f -> f.variable().equals(row.variable())).toList();
                GridCell cell = row.cells().get(col);
                assertEquals(own.size(), cell.findings(), row.variable() + " in " + wave);
                if (own.isEmpty()) {
                    assertTrue(cell.empty(), row.variable() + " in " + wave);
                    continue;
                }
                int best = own.stream().mapToInt(f -> urgency(f.verdict() == null ? null : f.verdict().name()))
                        .min().orElseThrow();
                assertEquals(best, urgency(cell.verdict()), row.variable() + " in " + wave);
                FindingView shown = reads.finding(cell.findingId(), WAVES).orElseThrow();
                assertEquals(run, shown.runId(), "the cell's finding is of the current run");
            }
        }
        GridRow score = grid.rows().get(1);
        assertEquals("Household score", score.label());
        assertEquals("MATERIAL", score.cells().get(1).verdict());
        assertEquals(AlertState.EXPLAINED, score.cells().get(1).alertState());
        assertTrue(grid.kinds().contains("SHIFT"), grid.kinds().toString());
    }

    @Test
    void theGridFollowsTheWaveOrderItIsGiven() {
        assertEquals(List.of("w3", "w2", "w1"), reads.grid("hh", GridFilter.ANY, WAVES.reversed()).waves());
    }

    @ParameterizedTest(name = "kind {0}, verdict {1}")
    @CsvSource(nullValues = "null", value = {
            "SHIFT, null",
            "null,  MATERIAL",
            "SHIFT, MATERIAL",
            "null,  STABLE",
    })
    void aFilteredGridShowsOnlyFindingsThatPassTheFilter(String kind, String verdict) {
        Grid grid = reads.grid("hh", new GridFilter(kind, verdict), WAVES);
        assertEquals(List.of("w1", "w2", "w3"), grid.waves(), "every judged wave stays a column");
        assertFalse(grid.rows().isEmpty(), "the planted score shift and the stable variables pass every filter here");
        for (GridRow row : grid.rows()) {
            assertTrue(row.cells().stream().anyMatch(c -> !c.empty()), "a row has a finding that passes");
            for (GridCell c : row.cells()) {
                if (!c.empty()) {
                    assertTrue(kind == null || kind.equals(c.kind()), c.toString());
                    assertTrue(verdict == null || verdict.equals(c.verdict()), c.toString());
                }
            }
        }
    }

    @Test
    void theMaterialFilterFindsTheScoreShift() {
        Grid grid = reads.grid("hh", new GridFilter(null, "MATERIAL"), WAVES);
        GridRow score = grid.rows().stream().filter(r -> r.variable().equals("score")).findFirst().orElseThrow();
        assertEquals("MATERIAL", score.cells().get(1).verdict());
        assertTrue(score.cells().get(0).empty(), "nothing to compare w1 with");
    }

    @Test
    void supersededRunsAreNotShown() {
        Set<Long> superseded = store.jdbi().withHandle(h -> h.createQuery("SELECT finding_id FROM " + SCHEMA
                + ".finding WHERE run_id = :r").bind("r", supersededRun).mapTo(Long.class).set());
        assertFalse(superseded.isEmpty());
        Grid grid = reads.grid("hh", GridFilter.ANY, WAVES);
        for (GridRow row : grid.rows()) {
            for (GridCell c : row.cells()) {
                assertFalse(superseded.contains(c.findingId()), "cell of " + row.variable());
            }
        }
        assertEquals(currentW3Run, reads.wave("hh", "w3").orElseThrow().runId());
        long scoreW3 = grid.rows().get(1).cells().get(2).findingId();
        List<TrendPoint> trend = reads.finding(scoreW3, WAVES).orElseThrow().trend();
        assertTrue(trend.stream().noneMatch(p -> superseded.contains(p.findingId())), trend.toString());
    }

    @Test
    void aFindingCarriesItsAlertsHistoryInOrderAndATrendOverEveryWaveInWaveOrder() {
        AlertView alert = reviews.get(scoreAlert).orElseThrow();
        long findingId = reads.grid("hh", GridFilter.ANY, WAVES).rows().get(1).cells().get(1).findingId();
        FindingView v = reads.finding(findingId, WAVES).orElseThrow();
        assertEquals("hh", v.dataset());
        assertEquals("w2", v.wave());
        assertEquals("w1", v.againstWave());
        assertEquals("score", v.finding().variable());
        assertEquals(alert.alertId(), v.alert().alertId());
        assertEquals(AlertState.EXPLAINED, v.alert().state());
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.EXPLAINED),
                v.history().stream().map(e -> e.action()).toList());
        assertEquals(reviews.history(scoreAlert), v.history());
        // The first wave has nothing to be compared with, so no shift finding: the trend holds w2 and w3.
        assertEquals(List.of("w2", "w3"), v.trend().stream().map(TrendPoint::wave).toList());
        assertEquals(List.of("w3", "w2"), reads.finding(findingId, WAVES.reversed()).orElseThrow().trend().stream()
                .map(TrendPoint::wave).toList());
        TrendPoint w2 = v.trend().get(0);
        assertEquals(findingId, w2.findingId());
        assertEquals(v.finding().effect().estimate(), w2.estimate());
        assertEquals(v.finding().effect().ciLow(), w2.low());
        assertEquals(v.finding().effect().ciHigh(), w2.high());
        assertNotNull(w2.level(), "a shift of a mean stores the wave's mean with its interval");
        assertTrue(w2.levelLow() <= w2.level() && w2.level() <= w2.levelHigh(), w2.toString());
    }

    @Test
    void aWaveHoldsItsCurrentRunsAlertsInEveryState() {
        WaveView w2 = reads.wave("hh", "w2").orElseThrow();
        long run = store.currentRun("hh", "w2").orElseThrow().runId();
        assertEquals(run, w2.runId());
        assertEquals("w1", w2.againstWave());
        assertEquals(reviews.list(new AlertReviews.Filter("hh", "w2", null, null, null)).stream()
                        .filter(a -> a.runId() == run).map(AlertView::alertId).toList(),
                w2.alerts().stream().map(AlertView::alertId).toList());
        assertTrue(w2.alerts().stream().anyMatch(a -> a.state() == AlertState.EXPLAINED));
        assertTrue(w2.findings() > 0);
        assertNotNull(w2.judgedAt());
    }

    @ParameterizedTest(name = "\"{0}\" finds {1}")
    @CsvSource(delimiter = '|', value = {
            "SCORE             | hh/score",
            "household         | hh/score",
            "AGE               | pp/age",
            "100%              | hh/region",
            "%                 | hh/region",
            "_as_              | hh/region",
            "_                 | hh/region",
            "\\                | hh/region",
            "in 'quotes'       | hh/region",
            "\"here\"          | hh/region",
            "e                 | hh/region hh/score pp/age",
            "100%_             | ''",
            "%e%               | ''",
            "x'; DROP TABLE x; | ''",
    })
    void searchMatchesNameOrLabelCaseInsensitivelyAndReadsWhatIsTypedAsPlainText(String text, String expected) {
        List<String> hits = reads.search(text, 50).stream().map(h -> h.dataset() + "/" + h.variable()).toList();
        assertEquals(expected.isEmpty() ? List.of() : List.of(expected.split(" ")), hits);
    }

    @Test
    void aSearchHitNamesTheLatestWaveAndItsMostUrgentFinding() {
        SearchHit score = reads.search("score", 10).get(0);
        assertEquals("w3", score.lastWave());
        FindingView v = reads.finding(score.findingId(), WAVES).orElseThrow();
        assertEquals(currentW3Run, v.runId());
        assertEquals(1, reads.search("e", 1).size(), "the limit holds");
    }

    @Test
    void unknownIdsAndNamesGiveNothing() {
        assertTrue(reads.finding(987_654_321L, WAVES).isEmpty());
        assertTrue(reads.wave("hh", "w9").isEmpty());
        assertTrue(reads.wave("no such survey", "w1").isEmpty());
        assertTrue(reads.grid("no such survey", GridFilter.ANY, WAVES).rows().isEmpty());
        assertTrue(reads.search("   ", 10).isEmpty());
    }
}
