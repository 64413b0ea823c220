package org.wavewarden.store;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.FindingsSchema;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.review.SignOff;
import org.wavewarden.testing.HouseholdWaves;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.sql.SQLException;
import java.time.Clock;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Releasing a wave, on a real PostgreSQL server: a survey of 400 households where {@code score} rises in wave w2 (a
 * MATERIAL shift). The wave cannot be signed off while that alert is open, unless forced with a reason; once it is
 * explained it can; a rerun on changed data of the signed wave says loudly that the release rests on other numbers,
 * a rerun on the same data says nothing.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class SignOffIntegrationTest {

    static String url;
    static WardenConfig config;
    static Session session;
    static SignOffs signOffs;
    static AlertReviews reviews;
    static JudgedWave w2;
    static long scoreAlert;

    static HouseholdWaves households;

    @BeforeAll
    static void setUp() throws Exception {
        households = HouseholdWaves.judged("signoff", "so_results", false);
        url = households.url();
        config = households.config();
        session = households.session();
        reviews = households.reviews();
        w2 = households.w2();
        signOffs = new SignOffs(session.store().jdbi(), "so_results");
        scoreAlert = reviews.list(new AlertReviews.Filter("hh", "w2", AlertState.OPEN, "MATERIAL", null)).stream()
                .filter(a -> a.variable().equals("score")).findFirst().orElseThrow().alertId();
    }

    @AfterAll
    static void tearDown() {
        households.close();
    }

    static SignOffs.Request request(String wave, String actor, boolean force, String reason) {
        return new SignOffs.Request("hh", wave, "2024.1", actor, force, reason);
    }

    static long count(String sql) throws SQLException {
        return households.count(sql);
    }

    @Test
    @Order(1)
    void aWaveWithAnOpenMaterialAlertIsNotSignedOffAndTheRefusalNamesIt() throws SQLException {
        ReviewException e = assertThrows(ReviewException.class,
                () -> signOffs.signOff(request("w2", "Ines Calloway", false, null)));
        AlertView score = reviews.get(scoreAlert).orElseThrow();
        assertTrue(e.getMessage().contains("alert " + scoreAlert + ", score, " + score.kind()), e.getMessage());
        assertTrue(e.getMessage().startsWith("Wave w2 of hh cannot be signed off"), e.getMessage());
        assertEquals(0, count("SELECT count(*) FROM so_results.sign_off"));
    }

    @ParameterizedTest(name = "{0}")
    @Order(2)
    @CsvSource(nullValues = "null", value = {
            "forced without a reason,    w2, Ines Calloway, true,  null, forcing a sign-off needs a reason",
            "forced with a blank reason, w2, Ines Calloway, true,  '  ', forcing a sign-off needs a reason",
            "nobody signing,             w2, '',            false, null, names the person releasing the wave",
            "a wave never judged,        w3, Ines Calloway, false, null, it has not been judged",
    })
    void aSignOffIsRefusedInWordsAPersonCanActOn(String what, String wave, String actor, boolean force,
                                                 String reason, String message) throws SQLException {
        ReviewException e = assertThrows(ReviewException.class,
                () -> signOffs.signOff(request(wave, actor, force, reason)));
        assertTrue(e.getMessage().contains(message), e.getMessage());
        assertEquals(0, count("SELECT count(*) FROM so_results.sign_off"));
    }

    @Test
    @Order(3)
    void forcedWithAReasonTheSignOffRecordsTheReasonTheRunAndTheOpenAlert() {
        SignOff s = signOffs.signOff(request("w2", "Ines Calloway", true,
                "Board meeting tomorrow; the score shift is reviewed next week."));
        assertTrue(s.forced());
        assertEquals("Board meeting tomorrow; the score shift is reviewed next week.", s.forceReason());
        ResultsStore.RunRecord run = session.store().currentRun("hh", "w2").orElseThrow();
        assertEquals(run.runId(), s.runId());
        assertEquals(w2.report().configFingerprint(), s.configFingerprint());
        assertEquals(w2.report().toolVersion(), s.toolVersion());
        assertEquals("2024.1", s.release());
        AlertView recorded = s.alertsAtSignOff().stream().filter(a -> a.alertId() == scoreAlert).findFirst()
                .orElseThrow();
        assertEquals(AlertState.OPEN, recorded.state());
        assertEquals(w2.alerts().size(), s.alertsAtSignOff().size());
        assertEquals(s, signOffs.latest("hh", "w2").orElseThrow());
    }

    @Test
    @Order(4)
    void onceTheMaterialAlertIsExplainedTheWaveIsSignedOffWithoutForce() {
        reviews.explain(scoreAlert, "Maren Holt", ReviewReason.REAL_CHANGE, "Confirmed with the field team.",
                "command");
        SignOff s = signOffs.signOff(request("w2", "Ines Calloway", false, null));
        assertFalse(s.forced());
        assertNull(s.forceReason());
        AlertView recorded = s.alertsAtSignOff().stream().filter(a -> a.alertId() == scoreAlert).findFirst()
                .orElseThrow();
        assertEquals(AlertState.EXPLAINED, recorded.state());
        assertEquals(ReviewReason.REAL_CHANGE, recorded.last().reason());
        assertEquals("Confirmed with the field team.", recorded.last().note());
        assertEquals(s, signOffs.latest("hh", "w2").orElseThrow());
        List<SignOff> all = signOffs.all("hh");
        assertEquals(2, all.size());
        assertTrue(all.get(0).forced() && !all.get(1).forced(), "oldest first");
        assertEquals(all, signOffs.all(null));
        assertEquals(List.of(), signOffs.all("another"));
    }

    @Test
    @Order(5)
    void aRerunOnTheSameDataOfASignedWaveRaisesNothing() throws SQLException {
        long runs = count("SELECT count(*) FROM so_results.run");
        JudgedWave again = new WaveJudge(session, Clock.systemUTC()).judge(config.dataset("hh"), "w2", null, null,
                null);
        assertEquals(runs, count("SELECT count(*) FROM so_results.run"));
        assertFalse(again.report().findings().stream().anyMatch(f -> f.kind() == FindingKind.SIGNED_WAVE_CHANGED),
                again.report().findings().toString());
        assertEquals(AlertState.EXPLAINED, reviews.get(scoreAlert).orElseThrow().state());
    }

    @Test
    @Order(6)
    void aRerunOnChangedDataOfASignedWaveSaysTheReleaseRestsOnOtherNumbers() throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // A late correction of the delivered wave: the rise in score was a processing error.
            st.executeUpdate("UPDATE src.hh SET score = score - 6 WHERE wave = 'w2'");
        }
        SignOff signed = signOffs.latest("hh", "w2").orElseThrow();
        JudgedWave rerun = new WaveJudge(session, Clock.systemUTC()).judge(config.dataset("hh"), "w2", null, null,
                null);
        assertNotEquals(signed.runId(), rerun.runId());
        Finding changed = rerun.report().findings().stream()
                .filter(f -> f.kind() == FindingKind.SIGNED_WAVE_CHANGED).findFirst()
                .orElseThrow(() -> new AssertionError(rerun.report().findings().toString()));
        assertEquals(WaveJudge.EMPTY_WAVE_SUBJECT, changed.variable());
        assertTrue(changed.sentence().startsWith("Wave w2 was signed off by Ines Calloway on "), changed.sentence());
        assertTrue(changed.sentence().contains(" on other numbers: ")
                && changed.sentence().contains("score SHIFT MATERIAL -> STABLE"), changed.sentence());
        assertTrue(changed.sentence().endsWith("The release rests on findings that no longer hold."));
        Alert alert = rerun.alerts().stream().filter(a -> a.kind() == FindingKind.SIGNED_WAVE_CHANGED).findFirst()
                .orElseThrow(() -> new AssertionError("it is alerted: " + rerun.alerts()));
        assertEquals(changed, alert.lead());
        // Stored with the run and written to findings.json like any finding, within the published schema.
        var report = session.store().storedReport(rerun.runId()).orElseThrow();
        assertTrue(report.findings().stream().anyMatch(f -> f.kind() == FindingKind.SIGNED_WAVE_CHANGED
                && f.sentence().equals(changed.sentence())));
        assertEquals(List.of(), FindingsSchema.problems(Json.mapper().valueToTree(report)));
        AlertView stored = reviews.list(new AlertReviews.Filter("hh", "w2", AlertState.OPEN, null,
                "SIGNED_WAVE_CHANGED")).get(0);
        assertEquals(List.of(ReviewAction.OPENED), reviews.history(stored.alertId()).stream()
                .map(ReviewEntry::action).toList());

        // The explained alert of the signed run is superseded, its history kept; the sign-off still names its run.
        assertEquals(AlertState.SUPERSEDED, reviews.get(scoreAlert).orElseThrow().state());
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.EXPLAINED, ReviewAction.SUPERSEDED),
                reviews.history(scoreAlert).stream().map(ReviewEntry::action).toList());
        assertEquals(signed, signOffs.latest("hh", "w2").orElseThrow());
        assertEquals(1, count("SELECT count(*) FROM so_results.run WHERE run_id = " + signed.runId()
                + " AND superseded_at IS NOT NULL"));
    }

    @ParameterizedTest(name = "{0}")
    @Order(7)
    @CsvSource(delimiter = '|', value = {
            "UPDATE so_results.sign_off SET actor = 'Somebody Else'",
            "UPDATE so_results.sign_off SET forced = false, force_reason = NULL",
            "DELETE FROM so_results.sign_off",
            "TRUNCATE so_results.sign_off",
    })
    void aSignOffIsNeverChangedOrDeleted(String statement) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            SQLException e = assertThrows(SQLException.class, () -> st.execute(statement));
            assertTrue(e.getMessage().contains("table sign_off is an audit trail"), e.getMessage());
        }
        assertEquals(2, count("SELECT count(*) FROM so_results.sign_off"));
    }

    @Test
    @Order(8)
    void theDatabaseRefusesAForcedSignOffWithoutAReasonWhateverWritesIt() {
        long run = session.store().currentRun("hh", "w2").orElseThrow().runId();
        SQLException e = assertThrows(SQLException.class, () -> {
            try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
                st.execute("INSERT INTO so_results.sign_off (dataset, wave, actor, run_id, forced) VALUES ('hh',"
                        + " 'w2', 'Ines Calloway', " + run + ", true)");
            }
        });
        assertTrue(e.getMessage().contains("sign_off_forced_with_reason"), e.getMessage());
    }
}
