package org.wavewarden.store;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.daemon.Deliveries;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.MarkdownDigest;
import org.wavewarden.deliver.sink.AlertMessage;
import org.wavewarden.deliver.sink.AlertSink;
import org.wavewarden.deliver.sink.JsonLinesSink;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * One event, one alert, end to end on a real PostgreSQL server: a weighted panel of 400 respondents in two waves
 * where {@code score} rises for the same respondents (a paired and a weighted shift of one variable) and
 * {@code height_cm} gets 999 for one respondent in eight (a sentinel and the missing-rate change it causes). Each
 * variable is one alert row, one outbox row per sink and one line of the JSON Lines file, listing its facets;
 * {@code findings.json} keeps every finding.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class OneAlertPerEventIntegrationTest {

    @TempDir
    static Path dir;
    static String url;
    static WardenConfig config;
    static Session session;
    static JudgedWave judged;
    static JsonLinesSink sink;
    static String SINK;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("events");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.ev (wave text NOT NULL, pid integer NOT NULL, w double precision,
                        score double precision, height_cm double precision, region text);
                    INSERT INTO src.ev SELECT 'w1', p, 1 + p % 3, 40 + (p * 7) % 21, 150 + (p * 11) % 41,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;
                    INSERT INTO src.ev SELECT 'w2', p, 1 + p % 3, 46 + (p * 7) % 21 + (p * 13) % 5 - 2,
                        CASE WHEN p % 8 = 0 THEN 999 ELSE 150 + (p * 11) % 41 END,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;
                    """);
        }
        config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n"
                + "  schema: ev_results\nalpha: 0.05\ndatasets:\n"
                + "  - name: ev\n    table: src.ev\n    waveColumn: wave\n    respondentKey: pid\n"
                + "    weightColumn: w\n    variables:\n"
                + "      - {name: score, kind: continuous, unit: points}\n"
                + "      - {name: height_cm, kind: continuous, unit: cm}\n"
                + "      - {name: region, kind: categorical}\n");
        sink = new JsonLinesSink(dir.resolve("events.jsonl"), SinkFilter.all());
        SINK = sink.name();
        session = Session.open(config, null, Map.of());
        session.migrate();
        WaveJudge judge = new WaveJudge(session, Clock.systemUTC());
        judge.judge(config.dataset("ev"), "w1", null, null, null);
        judged = judge.judgeWithOutputs(config.dataset("ev"), "w2", null,
                new OutboxStore.Outputs(null, null, List.of(SINK)), null);
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    static Alert alertOf(String variable) {
        return judged.alerts().stream().filter(a -> a.variable().equals(variable)).findFirst()
                .orElseThrow(() -> new AssertionError("no alert for " + variable + ": " + judged.alerts()));
    }

    static long count(String sql) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement(); ResultSet rs = st.executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    @Test
    @Order(1)
    void aPairedAndAWeightedShiftOfOneVariableAreOneAlertWithTwoFacets() {
        Alert score = alertOf("score");
        assertEquals(List.of(FindingKind.PANEL_SHIFT, FindingKind.SHIFT).stream().sorted().toList(),
                score.facets().stream().map(Finding::kind).sorted().toList(), score.toString());
        assertEquals(1, judged.alerts().stream().filter(a -> a.variable().equals("score")).count());
    }

    @Test
    @Order(2)
    void aSentinelAndItsMissingRateChangeAreOneAlert() {
        Alert height = alertOf("height_cm");
        List<FindingKind> kinds = height.facets().stream().map(Finding::kind).toList();
        assertTrue(kinds.contains(FindingKind.NUMERIC_SENTINEL) || kinds.contains(FindingKind.OUT_OF_RANGE_SENTINEL),
                kinds.toString());
        assertTrue(kinds.contains(FindingKind.MISSING_RATE_CHANGE), kinds.toString());
        assertEquals(1, judged.alerts().stream().filter(a -> a.variable().equals("height_cm")).count());
    }

    @Test
    @Order(3)
    void theResultsSchemaHasOneAlertRowPerEventWithItsOtherKindsAndKeepsEveryFinding() throws Exception {
        long run = judged.runId();
        assertEquals(judged.alerts().size(), count("SELECT count(*) FROM ev_results.alert WHERE run_id = " + run
                + " AND superseded_at IS NULL"));
        assertEquals(judged.alerts().size(), count("SELECT alerts_count FROM ev_results.run WHERE run_id = " + run));
        assertEquals(judged.report().findings().size(), count("SELECT count(*) FROM ev_results.finding WHERE run_id = "
                + run));
        for (ResultsStore.AlertRow row : session.store().openAlerts("ev")) {
            if (row.wave().equals("w2")) {
                Alert a = alertOf(row.variable());
                assertEquals(a.kind().name(), row.kind());
                assertEquals(a.otherKinds().stream().map(Enum::name).toList(), row.otherKinds());
            }
        }
        assertEquals(judged.alerts().size(), count("SELECT count(*) FROM ev_results.outbox WHERE product = 'alert'"
                + " AND sink <> 'files'"));
    }

    @Test
    @Order(4)
    void theMessageOfAnEventListsEveryFacetLeadFirstUnderTheLeadsKey() throws Exception {
        Alert score = alertOf("score");
        long alertId = count("SELECT alert_id FROM ev_results.alert WHERE wave = 'w2' AND variable = 'score'"
                + " AND superseded_at IS NULL");
        AlertMessage m = session.store().outbox().message(alertId).orElseThrow();
        assertEquals(score.kind(), m.kind());
        assertEquals(score.facets().stream().map(Finding::kind).toList(),
                m.facets().stream().map(AlertMessage.Part::kind).toList());
        assertEquals(score.facets().stream().map(Finding::sentence).toList(),
                m.facets().stream().map(AlertMessage.Part::sentence).toList());
        assertEquals(score.facets().stream().map(Finding::qValue).toList(),
                m.facets().stream().map(AlertMessage.Part::qValue).toList());
        String checksum = session.store().currentRun("ev", "w2").orElseThrow().summaryChecksum();
        assertEquals(AlertMessage.idempotencyKey("ev", "w2", "w1", "score", score.kind(), checksum),
                m.idempotencyKey());
    }

    @Test
    @Order(5)
    void eachEventIsDeliveredOnceAsOneLineAndARerunDeliversNothingMore() throws Exception {
        Path file = sink.file();
        Deliveries deliveries = new Deliveries(session, Map.of("ev", List.<AlertSink>of(sink)), Clock.systemUTC(),
                Deliveries.DEAD_LETTER_BACKOFF);
        deliveries.deliver("ev");
        List<String> lines = Files.readAllLines(file);
        long open = count("SELECT count(*) FROM ev_results.alert WHERE superseded_at IS NULL");
        assertEquals(open, lines.size(), String.join("\n", lines));
        JsonNode score = lines.stream().map(l -> Json.read(l, JsonNode.class))
                .filter(n -> n.get("variable").asText().equals("score") && n.get("wave").asText().equals("w2"))
                .findFirst().orElseThrow();
        assertEquals(2, score.get("facets").size(), score.toString());

        long alertRows = count("SELECT count(*) FROM ev_results.alert");
        long outboxRows = count("SELECT count(*) FROM ev_results.outbox");
        new WaveJudge(session, Clock.systemUTC()).judgeWithOutputs(config.dataset("ev"), "w2", null,
                new OutboxStore.Outputs(null, null, List.of(SINK)), null);
        deliveries.deliver("ev");
        assertEquals(alertRows, count("SELECT count(*) FROM ev_results.alert"));
        assertEquals(outboxRows, count("SELECT count(*) FROM ev_results.outbox"));
        assertEquals(lines, Files.readAllLines(file));
    }

    @Test
    @Order(6)
    void theMarkdownDigestHasOneRowPerEventNamingItsOtherFindings() {
        String md = MarkdownDigest.render(List.of(judged.report()));
        long rows = md.lines().filter(l -> l.startsWith("| ") && !l.startsWith("| verdict")).count();
        assertEquals(judged.alerts().size(), rows, md);
        String scoreRow = md.lines().filter(l -> l.contains("| score |")).findFirst().orElseThrow();
        Finding other = alertOf("score").facets().get(1);
        assertTrue(scoreRow.contains("Also " + other.verdict() + " " + other.kind() + ": "), scoreRow);
    }

    @Test
    @Order(7)
    void aRerunOverAlertsStoredOneFindingEachSupersedesTheFacetsOwnAlertAndWhatItStillOwed() throws Exception {
        Alert score = alertOf("score");
        String other = score.otherKinds().get(0).name();
        long run = judged.runId();
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // The event as a run before grouping stored it: two alerts, the second one still owed to the sink.
            st.execute("UPDATE ev_results.alert SET facet_kinds = '{}' WHERE run_id = " + run
                    + " AND variable = 'score' AND superseded_at IS NULL");
            st.execute("INSERT INTO ev_results.alert (run_id, dataset, wave, against_wave, variable, kind, verdict,"
                    + " sentence) VALUES (" + run + ", 'ev', 'w2', 'w1', 'score', '" + other + "', 'MATERIAL', 'x')");
            st.execute("INSERT INTO ev_results.outbox (dataset, sink, product, item, run_ids, alert_id) SELECT 'ev', '"
                    + SINK + "', 'alert', 'stored before grouping', ARRAY[" + run + "]::bigint[], alert_id FROM"
                    + " ev_results.alert WHERE variable = 'score' AND kind = '" + other + "'");
        }
        new WaveJudge(session, Clock.systemUTC()).judgeWithOutputs(config.dataset("ev"), "w2", null,
                new OutboxStore.Outputs(null, null, List.of(SINK)), null);
        assertEquals(1, count("SELECT count(*) FROM ev_results.alert WHERE variable = 'score' AND kind = '" + other
                + "' AND superseded_at IS NOT NULL"));
        assertEquals("superseded", session.store().jdbi().withHandle(h -> h.createQuery("SELECT state FROM"
                + " ev_results.outbox WHERE item = 'stored before grouping'").mapTo(String.class).one()));
        assertEquals(List.of(other), session.store().openAlerts("ev").stream()
                .filter(a -> a.wave().equals("w2") && a.variable().equals("score")).findFirst().orElseThrow()
                .otherKinds(), "the lead's alert takes its facets again");
    }
}
