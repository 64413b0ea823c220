package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.SignOff;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.store.SignOffs;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Rerunning a signed-off wave of Harrowmere County's household survey on the same data and configuration, on a real
 * PostgreSQL server. A run is the data judged under a configuration by one version of the tool: the same version
 * keeps the stored run and says nothing new; another version writes a new run, compares it with the sign-off and
 * stores what it finds, so that a SIGNED_WAVE_CHANGED alert always has its finding in the store.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class SignedWaveRerunIntegrationTest {

    static final String SIGNED_VERSION = "3.1.0";

    static String url;
    static WardenConfig config;
    static Session session;
    static SignOffs signOffs;
    static AlertReviews reviews;
    static SignOff signed;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("signed_rerun");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // 500 households; the weekly fuel spend rises by 5 in the second wave (a MATERIAL shift).
            st.execute("""
                    CREATE SCHEMA harrowmere;
                    CREATE TABLE harrowmere.households (wave text NOT NULL, household_id integer NOT NULL,
                        fuel_spend double precision, district text);
                    INSERT INTO harrowmere.households SELECT 'h1', g, 30 + (g * 11) % 25,
                        (ARRAY['Gullhaven', 'Kestle Point', 'Saltmarsh'])[1 + g % 3] FROM generate_series(1, 500) g;
                    INSERT INTO harrowmere.households SELECT 'h2', g, 35 + (g * 11) % 25,
                        (ARRAY['Gullhaven', 'Kestle Point', 'Saltmarsh'])[1 + g % 3] FROM generate_series(1, 500) g;
                    """);
        }
        config = ConfigLoader.parse("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: rerun_results}
                datasets:
                  - name: households
                    table: harrowmere.households
                    waveColumn: wave
                    exclude: [household_id]
                    variables:
                      - {name: fuel_spend, kind: continuous, unit: pounds}
                      - {name: district, kind: categorical}
                """.formatted(url));
        session = Session.open(config, null, Map.of());
        session.migrate();
        signOffs = new SignOffs(session.store().jdbi(), "rerun_results");
        reviews = new AlertReviews(session.store().jdbi(), "rerun_results");
        judged(SIGNED_VERSION, "h1");
        judged(SIGNED_VERSION, "h2");
        signed = signOffs.signOff(new SignOffs.Request("households", "h2", "2026.2", "Odile Penhallow", true,
                "The fuel spend rise matches the county's tariff change."));
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    static JudgedWave judged(String version, String wave) {
        return new WaveJudge(session, Clock.systemUTC(), version).judge(config.dataset("households"), wave, null,
                null, null);
    }

    static long count(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    static long runs() throws SQLException {
        return count("SELECT count(*) FROM rerun_results.run WHERE wave = 'h2'");
    }

    static long storedDriftFindings(long runId) throws SQLException {
        return count("SELECT count(*) FROM rerun_results.finding WHERE kind = 'SIGNED_WAVE_CHANGED' AND run_id = "
                + runId);
    }

    static long openDriftAlerts() throws SQLException {
        return count("SELECT count(*) FROM rerun_results.alert WHERE kind = 'SIGNED_WAVE_CHANGED'"
                + " AND superseded_at IS NULL");
    }

    static List<Finding> drift(JudgedWave j) {
        return j.report().findings().stream().filter(f -> f.kind() == FindingKind.SIGNED_WAVE_CHANGED).toList();
    }

    @Test
    @Order(1)
    void theSameVersionOnTheSameDataKeepsTheSignedRunAndRaisesNothing() throws SQLException {
        long before = runs();
        JudgedWave again = judged(SIGNED_VERSION, "h2");
        assertEquals(before, runs(), "no new run");
        assertEquals(signed.runId(), again.runId(), "the signed run is kept");
        assertEquals(List.of(), drift(again));
        assertEquals(0, storedDriftFindings(again.runId()));
        assertEquals(0, openDriftAlerts());
    }

    @Test
    @Order(2)
    void anotherVersionWithTheSameFindingsWritesANewRunWithoutADriftFinding() throws SQLException {
        long before = runs();
        JudgedWave next = judged("3.2.0", "h2");
        assertEquals(before + 1, runs(), "another version is another run");
        assertNotEquals(signed.runId(), next.runId());
        assertEquals(1, count("SELECT count(*) FROM rerun_results.run WHERE run_id = " + next.runId()
                + " AND tool_version = '3.2.0' AND superseded_at IS NULL"));
        assertEquals(List.of(), drift(next), "the signed findings still hold");
        assertEquals(0, storedDriftFindings(next.runId()));
        assertEquals(0, openDriftAlerts());
    }

    @Test
    @Order(3)
    void anotherVersionThatChangesAFindingStoresTheDriftFindingWithItsAlert() throws SQLException {
        // The signed run's numbers as an earlier version might have computed them: the shift judged MINOR. One build
        // computes one set of numbers from these data, so the difference between versions is written into the
        // signed run's stored findings.
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            assertEquals(1, st.executeUpdate("UPDATE rerun_results.finding SET verdict = 'MINOR' WHERE run_id = "
                    + signed.runId() + " AND variable = 'fuel_spend' AND kind = 'SHIFT'"));
        }
        long before = runs();
        JudgedWave next = judged("3.3.0", "h2");
        assertEquals(before + 1, runs());
        List<Finding> changed = drift(next);
        assertEquals(1, changed.size(), next.report().findings().toString());
        assertTrue(changed.get(0).sentence().contains("fuel_spend SHIFT MINOR -> MATERIAL"),
                changed.get(0).sentence());
        assertEquals(1, storedDriftFindings(next.runId()), "stored with the run that found it");
        assertTrue(next.alerts().stream().anyMatch(a -> a.kind() == FindingKind.SIGNED_WAVE_CHANGED));
        assertEquals(1, openDriftAlerts());
        assertEquals(AlertState.OPEN, reviews.list(new AlertReviews.Filter("households", "h2", AlertState.OPEN, null,
                "SIGNED_WAVE_CHANGED")).get(0).state());
    }

    @Test
    @Order(4)
    void rerunningThatVersionKeepsItsRunWithItsOneDriftFindingAndAlert() throws SQLException {
        long before = runs();
        long run = session.store().currentRun("households", "h2").orElseThrow().runId();
        JudgedWave again = judged("3.3.0", "h2");
        assertEquals(before, runs());
        assertEquals(run, again.runId());
        assertEquals(1, drift(again).size(), "the kept run's drift finding, as stored");
        assertEquals(1, storedDriftFindings(run));
        assertEquals(1, openDriftAlerts(), "its alert stays open, and no second one is raised");
    }
}
