package org.wavewarden.store;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.MuteRule;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.CreationDecision;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.testing.HouseholdWaves;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.sql.SQLException;
import java.time.Clock;
import java.time.Instant;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * What people conclude about alerts, kept on a real PostgreSQL server: a survey of 400 households in three waves
 * where {@code score} rises in wave w2 (a MATERIAL shift) and {@code height_cm} gets the sentinel 999 for one
 * household in eight (a data-quality alert); w3 repeats w2 and is judged against w1. Alerts are explained, muted with an expiry, unmuted,
 * and their histories read back complete, in order and unchangeable.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class AlertLifecycleIntegrationTest {

    static String url;
    static WardenConfig config;
    static Session session;
    static AlertReviews reviews;
    static JudgedWave w2;
    static final LocalDate TODAY = LocalDate.now(ZoneOffset.UTC);

    /** State shared by the ordered steps. */
    static long scoreAlert;
    static long heightAlert;
    static long untilWaveRule;
    static JudgedWave w3;
    static long w3OtherRun;

    static HouseholdWaves households;

    @BeforeAll
    static void setUp() throws Exception {
        households = HouseholdWaves.judged("lifecycle", "lc_results", true);
        url = households.url();
        config = households.config();
        session = households.session();
        reviews = households.reviews();
        w2 = households.w2();
        scoreAlert = alertId("w2", "score");
        heightAlert = alertId("w2", "height_cm");
    }

    @AfterAll
    static void tearDown() {
        households.close();
    }

    static long alertId(String wave, String variable) {
        return reviews.list(new AlertReviews.Filter("hh", wave, null, null, null)).stream()
                .filter(a -> a.variable().equals(variable) && a.state() != AlertState.SUPERSEDED)
                .map(AlertView::alertId).findFirst()
                .orElseThrow(() -> new AssertionError("no alert of " + variable + " in " + wave + ": "
                        + reviews.list(AlertReviews.Filter.ANY)));
    }

    static AlertState state(long alertId) {
        return reviews.get(alertId).orElseThrow().state();
    }

    static List<ReviewAction> actions(long alertId) {
        return reviews.history(alertId).stream().map(ReviewEntry::action).toList();
    }

    static long count(String sql) throws SQLException {
        return households.count(sql);
    }

    @Test
    @Order(1)
    void everyNewAlertIsOpenedByTheMonitorAsItsFirstEntry() {
        assertFalse(w2.alerts().isEmpty());
        for (AlertView a : reviews.list(new AlertReviews.Filter("hh", "w2", null, null, null))) {
            assertEquals(AlertState.OPEN, a.state(), a.toString());
            List<ReviewEntry> h = reviews.history(a.alertId());
            assertEquals(1, h.size(), h.toString());
            assertEquals(ReviewAction.OPENED, h.get(0).action());
            assertEquals(AlertReviews.MONITOR, h.get(0).actor());
            assertEquals(h.get(0), a.last());
        }
        assertEquals("MATERIAL", reviews.get(scoreAlert).orElseThrow().verdict(), "the planted shift is MATERIAL");
    }

    @Test
    @Order(2)
    void anAlertIsExplainedWithAReasonCategoryAndANote() {
        ReviewEntry e = reviews.explain(scoreAlert, "Maren Holt", ReviewReason.PLANNED_CHANGE,
                "Scoring moved to the 2024 scale before fieldwork.", "command");
        assertEquals(ReviewAction.EXPLAINED, e.action());
        assertEquals("Maren Holt", e.actor());
        assertEquals(ReviewReason.PLANNED_CHANGE, e.reason());
        assertEquals("Scoring moved to the 2024 scale before fieldwork.", e.note());
        AlertView a = reviews.get(scoreAlert).orElseThrow();
        assertEquals(AlertState.EXPLAINED, a.state());
        assertEquals(e, a.last());
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.EXPLAINED), actions(scoreAlert));
    }

    @Test
    @Order(3)
    void anExplainedAlertIsReopenedWithItsExplanationKeptAndExplainedAgain() {
        ReviewException notExplained = assertThrows(ReviewException.class,
                () -> reviews.reopen(heightAlert, "Maren Holt", null, "command"));
        assertTrue(notExplained.getMessage().contains("is not explained (it is OPEN)"), notExplained.getMessage());
        ReviewEntry reopened = reviews.reopen(scoreAlert, "Tobias Wren", "The scale change came a wave later.",
                "command");
        assertEquals(ReviewAction.REOPENED, reopened.action());
        assertEquals(AlertState.OPEN, state(scoreAlert));
        reviews.explain(scoreAlert, "Maren Holt", ReviewReason.PLANNED_CHANGE, "Scale change confirmed for w2.",
                "command");
        assertEquals(AlertState.EXPLAINED, state(scoreAlert));
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.EXPLAINED, ReviewAction.REOPENED,
                ReviewAction.EXPLAINED), actions(scoreAlert));
    }

    @ParameterizedTest(name = "{0}")
    @Order(3)
    @CsvSource({
            "an alert that does not exist,  999999, Maren Holt, planned-change, there is no alert 999999",
            "no reason,                     0,      Maren Holt, '',             a reason is needed",
            "nobody acting,                 0,      '',         no-problem,     names the person taking it",
    })
    void anExplanationIsRefusedInWordsAPersonCanActOn(String what, long id, String actor, String reason,
                                                      String message) {
        long alert = id == 0 ? scoreAlert : id;
        ReviewException e = assertThrows(ReviewException.class, () -> reviews.explain(alert, actor,
                ReviewReason.parse(reason).orElse(null), null, "command"));
        assertTrue(e.getMessage().contains(message), e.getMessage());
    }

    @Test
    @Order(4)
    void theListFiltersByDatasetWaveStateVerdictAndKindOfTheLeadOrAFacet() {
        List<AlertView> w2Alerts = reviews.list(new AlertReviews.Filter("hh", "w2", null, null, null));
        assertEquals(List.of(scoreAlert), reviews.list(new AlertReviews.Filter("hh", "w2", AlertState.EXPLAINED,
                null, null)).stream().map(AlertView::alertId).toList());
        List<AlertView> material = reviews.list(new AlertReviews.Filter(null, null, null, "MATERIAL", null));
        List<AlertView> all = reviews.list(AlertReviews.Filter.ANY);
        assertEquals(all.stream().filter(a -> "MATERIAL".equals(a.verdict())).map(AlertView::alertId).toList(),
                material.stream().map(AlertView::alertId).toList());
        assertTrue(material.stream().anyMatch(a -> a.alertId() == scoreAlert), material.toString());
        assertEquals(List.of(), reviews.list(new AlertReviews.Filter(null, null, null, "UNCERTAIN", null)),
                "every alert of this survey is MATERIAL, so another verdict takes them all away");
        assertEquals(List.of(scoreAlert), reviews.list(new AlertReviews.Filter("hh", "w2", AlertState.EXPLAINED,
                "MATERIAL", "SHIFT")).stream().map(AlertView::alertId).toList());
        AlertView height = reviews.get(heightAlert).orElseThrow();
        assertEquals("MISSING_RATE_CHANGE", height.kind(), "the rise of the missing share leads the event");
        assertEquals(List.of("NUMERIC_SENTINEL"), height.otherKinds(),
                "the sentinel and its missing-rate change are one event");
        for (String kind : concat(height.kind(), height.otherKinds())) {
            assertTrue(reviews.list(new AlertReviews.Filter("hh", null, null, null, kind)).stream()
                    .anyMatch(a -> a.alertId() == heightAlert), kind);
        }
        assertEquals(List.of(), reviews.list(new AlertReviews.Filter("another", null, null, null, null)));
        assertEquals(w2Alerts.size(), reviews.list(new AlertReviews.Filter("hh", "w2", AlertState.OPEN, null, null))
                .size() + 1);
    }

    static List<String> concat(String first, List<String> rest) {
        List<String> out = new ArrayList<>(List.of(first));
        out.addAll(rest);
        return out;
    }

    @ParameterizedTest(name = "until wave {0}, until day +{1}: {2}")
    @Order(5)
    @CsvSource(nullValues = "null", value = {
            "null, null, a mute needs an end",
            "'',   null, a mute needs an end",
            "null, -1,   is already past",
    })
    void aMuteWithoutAnEndOrEndingInThePastIsRefused(String untilWave, Integer days, String message) {
        ReviewException e = assertThrows(ReviewException.class, () -> reviews.mute(heightAlert, "Maren Holt",
                untilWave, days == null ? null : TODAY.plusDays(days), null, null, "command"));
        assertTrue(e.getMessage().contains(message), e.getMessage());
        assertEquals(AlertState.OPEN, state(heightAlert));
    }

    @Test
    @Order(6)
    void aMuteByDateHoldsUntilItsLastDayAndTheAlertIsOpenAfterIt() throws SQLException {
        ReviewEntry e = reviews.mute(heightAlert, "Maren Holt", null, TODAY.plusDays(10), ReviewReason.FIX_UPSTREAM,
                "The coder's export writes 999 for refusals; fixed in the next delivery.", "command");
        assertEquals(ReviewAction.MUTED, e.action());
        assertEquals(TODAY.plusDays(10), e.untilDate());
        assertEquals(AlertState.MUTED, state(heightAlert));
        assertEquals(Map.of(heightAlert, AlertState.MUTED, scoreAlert, AlertState.EXPLAINED),
                reviews.states(List.of(heightAlert, scoreAlert)));

        AlertReviews onLastDay = at(TODAY.plusDays(10));
        AlertReviews dayAfter = at(TODAY.plusDays(11));
        assertEquals(AlertState.MUTED, onLastDay.get(heightAlert).orElseThrow().state());
        assertEquals(AlertState.OPEN, dayAfter.get(heightAlert).orElseThrow().state());
        assertEquals(Map.of(heightAlert, AlertState.OPEN), dayAfter.states(List.of(heightAlert)));

        // The rule stored with the mute mutes the same alert of later waves until the same day.
        List<MuteRule> active = reviews.activeMutes("hh", TODAY);
        assertEquals(1, active.size(), active.toString());
        MuteRule rule = active.get(0);
        assertEquals("height_cm", rule.variable());
        AlertView height = reviews.get(heightAlert).orElseThrow();
        assertEquals(FindingKind.valueOf(height.kind()), rule.kind());
        assertEquals(TODAY.plusDays(10), rule.untilDate());
        assertNull(rule.untilWave());
        assertEquals("Maren Holt", rule.who());
        assertTrue(rule.reason().contains("fix-upstream") && rule.reason().contains("fixed in the next delivery"),
                rule.reason());
        assertEquals(1, reviews.activeMutes("hh", TODAY.plusDays(10)).size());
        assertEquals(List.of(), reviews.activeMutes("hh", TODAY.plusDays(11)));
        assertEquals(List.of(), reviews.activeMutes("another", TODAY));
        assertEquals(heightAlert, count("SELECT alert_id FROM lc_results.mute_rule"));
    }

    static AlertReviews at(LocalDate day) {
        return new AlertReviews(session.store().jdbi(), "lc_results",
                Clock.fixed(day.atStartOfDay(ZoneOffset.UTC).toInstant().plusSeconds(3600), ZoneOffset.UTC));
    }

    @Test
    @Order(7)
    void unmutingOpensTheAlertAndLiftsItsRule() throws SQLException {
        ReviewEntry e = reviews.unmute(heightAlert, "Tobias Wren", "The fix arrived early.", "command");
        assertEquals(ReviewAction.UNMUTED, e.action());
        assertEquals(AlertState.OPEN, state(heightAlert));
        assertEquals(List.of(), reviews.activeMutes("hh", TODAY));
        assertEquals(1, count("SELECT count(*) FROM lc_results.mute_rule_lift WHERE lifted_by = 'Tobias Wren'"));
        ReviewException again = assertThrows(ReviewException.class,
                () -> reviews.unmute(heightAlert, "Tobias Wren", null, "command"));
        assertTrue(again.getMessage().contains("is not muted (it is OPEN)"), again.getMessage());
    }

    @Test
    @Order(8)
    void aMuteByWaveIsStoredAsARuleTheConfigurationReadsInWaveOrder() {
        reviews.mute(heightAlert, "Maren Holt", "w3", null, null, "Until the recoded wave arrives.", "command");
        assertEquals(AlertState.MUTED, state(heightAlert));
        // A wave ends no day: the rule is in force on any date until it is lifted.
        List<MuteRule> active = reviews.activeMutes("hh", TODAY.plusYears(5));
        assertEquals(1, active.size(), active.toString());
        assertEquals("w3", active.get(0).untilWave());
        assertNull(active.get(0).untilDate());
        assertTrue(active.get(0).reason().startsWith("mute rule "), "its words name the rule: " + active.get(0));
        untilWaveRule = Long.parseLong(active.get(0).reason().replaceAll("^mute rule (\\d+).*$", "$1"));
        assertEquals(AlertState.MUTED, at(TODAY.plusYears(5)).get(heightAlert).orElseThrow().state());
    }

    @Test
    @Order(9)
    void aRunUnderAnotherConfigurationIsANewRunThatSupersedesTheOldAlertsWithAnEntryEach() throws SQLException {
        // Against w1, so that w3 (a copy of w2) has the score shift as well as the sentinel.
        w3 = new WaveJudge(session, Clock.systemUTC()).judge(config.dataset("hh"), "w3", "w1", null, null);
        long w3Score = alertId("w3", "score");
        long w3Height = alertId("w3", "height_cm");
        ResultsStore.RunRecord current = session.store().currentRun("hh", "w3").orElseThrow();
        long findings = count("SELECT count(*) FROM lc_results.finding");

        // The same data judged under another configuration, with what the configuration decides at creation: the
        // declared change explains score, the stored rule (named as the configuration names it) mutes height_cm.
        w3OtherRun = write(w3, "another configuration", a -> switch (a.variable()) {
            case "score" -> Optional.of(new CreationDecision(ReviewAction.EXPLAINED, ReviewReason.PLANNED_CHANGE,
                    "Scale change declared before fieldwork.", "Maren Holt", "config: expectedChanges[0]"));
            case "height_cm" -> Optional.of(new CreationDecision(ReviewAction.MUTED, null,
                    "mute rule " + untilWaveRule + ": until the recoded wave arrives", "Maren Holt",
                    "mute rule " + untilWaveRule));
            default -> Optional.empty();
        });
        assertNotEquals(current.runId(), w3OtherRun);
        assertEquals(findings + w3.report().findings().size(), count("SELECT count(*) FROM lc_results.finding"));
        for (long old : List.of(w3Score, w3Height)) {
            assertEquals(AlertState.SUPERSEDED, state(old));
            ReviewEntry last = reviews.history(old).get(reviews.history(old).size() - 1);
            assertEquals(ReviewAction.SUPERSEDED, last.action());
            assertEquals(AlertReviews.MONITOR, last.actor());
            assertEquals("run " + w3OtherRun, last.source());
        }
        long newScore = alertId("w3", "score");
        long newHeight = alertId("w3", "height_cm");
        assertEquals(List.of(ReviewAction.EXPLAINED), actions(newScore));
        ReviewEntry explained = reviews.history(newScore).get(0);
        assertEquals("Maren Holt", explained.actor());
        assertEquals("config: expectedChanges[0]", explained.source());
        assertEquals(ReviewReason.PLANNED_CHANGE, explained.reason());
        assertEquals(List.of(ReviewAction.MUTED), actions(newHeight));
        assertEquals("w3", reviews.history(newHeight).get(0).untilWave(), "the entry carries its rule's expiry");
        assertEquals(AlertState.MUTED, state(newHeight));
    }

    static long write(JudgedWave judged, String fingerprint,
                      java.util.function.Function<Alert, Optional<CreationDecision>> decide) {
        ResultsStore.RunRecord current = session.store().currentRun("hh", judged.report().wave()).orElseThrow();
        var profile = session.store().latestSummary("hh", judged.report().wave()).orElseThrow().profile();
        Instant now = Instant.now();
        return session.store().writeRun(new ResultsStore.RunWrite("hh", judged.report().wave(),
                        judged.report().againstWave(), current.summaryChecksum(), now, now, 0.05, "BENJAMINI_HOCHBERG",
                        "test", fingerprint), profile, judged.report().findings(),
                Alerts.group(judged.report().findings()), List.of(), OutboxStore.Outputs.NONE, decide);
    }

    @Test
    @Order(10)
    void theSameDataUnderTheSameConfigurationKeepsItsRunFindingsAlertsAndHistories() throws SQLException {
        long runs = count("SELECT count(*) FROM lc_results.run");
        long findings = count("SELECT count(*) FROM lc_results.finding");
        long entries = count("SELECT count(*) FROM lc_results.alert_action");
        long alerts = count("SELECT count(*) FROM lc_results.alert");
        assertEquals(w3OtherRun, write(w3, "another configuration", a -> {
            throw new AssertionError("no alert is created, so nothing is decided: " + a);
        }));
        assertEquals(runs, count("SELECT count(*) FROM lc_results.run"));
        assertEquals(findings, count("SELECT count(*) FROM lc_results.finding"));
        assertEquals(entries, count("SELECT count(*) FROM lc_results.alert_action"));
        assertEquals(alerts, count("SELECT count(*) FROM lc_results.alert"));
    }

    @Test
    @Order(11)
    void liftingAStoredRuleOpensTheAlertsItMutedWhenTheyWereCreated() {
        long newHeight = alertId("w3", "height_cm");
        reviews.unmute(heightAlert, "Tobias Wren", "Recoded wave delivered.", "command");
        assertEquals(AlertState.OPEN, state(heightAlert));
        assertEquals(AlertState.OPEN, state(newHeight), "its rule was lifted");
        assertEquals(List.of(ReviewAction.MUTED), actions(newHeight), "reading the state writes nothing");
    }

    @Test
    @Order(12)
    void aSupersededAlertCannotBeExplainedOrMuted() {
        long superseded = reviews.list(new AlertReviews.Filter("hh", "w3", AlertState.SUPERSEDED, null, null))
                .get(0).alertId();
        ReviewException e = assertThrows(ReviewException.class, () -> reviews.explain(superseded, "Maren Holt",
                ReviewReason.NO_PROBLEM, null, "command"));
        assertTrue(e.getMessage().contains("superseded by a later run"), e.getMessage());
        assertThrows(ReviewException.class, () -> reviews.mute(superseded, "Maren Holt", "w3", null, null, null,
                "command"));
    }

    @Test
    @Order(13)
    void twoPeopleActingOnOneAlertAtOnceAreBothRecordedInOrder() throws Exception {
        long alert = alertId("w3", "height_cm");
        int before = reviews.history(alert).size();
        CountDownLatch start = new CountDownLatch(1);
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try {
            List<Future<ReviewEntry>> done = new ArrayList<>();
            for (String who : List.of("Maren Holt", "Tobias Wren")) {
                done.add(pool.submit(() -> {
                    start.await();
                    return reviews.explain(alert, who, ReviewReason.REAL_CHANGE, who + " looked", "command");
                }));
            }
            start.countDown();
            ReviewEntry a = done.get(0).get();
            ReviewEntry b = done.get(1).get();
            List<ReviewEntry> h = reviews.history(alert);
            assertEquals(before + 2, h.size());
            List<ReviewEntry> lastTwo = h.subList(before, before + 2);
            assertEquals(List.of(Math.min(a.entryId(), b.entryId()), Math.max(a.entryId(), b.entryId())),
                    lastTwo.stream().map(ReviewEntry::entryId).toList());
            assertEquals(lastTwo.get(1), reviews.get(alert).orElseThrow().last(), "the later one is the state");
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    @Order(14)
    void theHistoryIsCompleteOldestFirst() {
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.MUTED, ReviewAction.UNMUTED, ReviewAction.MUTED,
                ReviewAction.UNMUTED), actions(heightAlert));
        List<ReviewEntry> h = reviews.history(heightAlert);
        assertEquals(List.of("wavewarden", "Maren Holt", "Tobias Wren", "Maren Holt", "Tobias Wren"),
                h.stream().map(ReviewEntry::actor).toList());
        for (int i = 1; i < h.size(); i++) {
            assertTrue(h.get(i).entryId() > h.get(i - 1).entryId());
            assertFalse(h.get(i).at().isBefore(h.get(i - 1).at()));
        }
    }

    @ParameterizedTest(name = "{0}")
    @Order(15)
    @CsvSource(delimiter = '|', value = {
            "UPDATE lc_results.alert_action SET note = 'rewritten'",
            "DELETE FROM lc_results.alert_action",
            "TRUNCATE lc_results.alert_action",
            "UPDATE lc_results.mute_rule SET until_wave = 'w9'",
            "DELETE FROM lc_results.mute_rule",
            "TRUNCATE lc_results.mute_rule, lc_results.mute_rule_lift, lc_results.alert_action",
            "UPDATE lc_results.mute_rule_lift SET note = 'never happened'",
            "DELETE FROM lc_results.mute_rule_lift",
            "TRUNCATE lc_results.mute_rule_lift",
    })
    void theAuditTrailRefusesEveryUpdateAndDelete(String statement) throws SQLException {
        // The table the statement targets, and what it holds: row triggers fire only on rows, so the table must have
        // some for a refusal of UPDATE or DELETE to show anything (earlier steps muted and unmuted by stored rules).
        Matcher target = Pattern.compile("lc_results\\.(\\w+)").matcher(statement);
        assertTrue(target.find(), statement);
        String table = "lc_results." + target.group(1);
        String before = contents(table);
        assertTrue(count("SELECT count(*) FROM " + table) > 0, table + " has rows for the trigger to guard");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            SQLException e = assertThrows(SQLException.class, () -> st.execute(statement));
            assertTrue(e.getMessage().contains("is an audit trail: its rows are never updated or deleted"),
                    e.getMessage());
        }
        assertEquals(before, contents(table), "every row of " + table + " as it was");
    }

    /** Every row of {@code table} as text, in a stable order: the evidence that nothing changed. */
    private static String contents(String table) throws SQLException {
        List<String> rows = new ArrayList<>();
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             var rs = st.executeQuery("SELECT t::text FROM " + table + " t ORDER BY t::text")) {
            while (rs.next()) {
                rows.add(rs.getString(1));
            }
        }
        return rows.size() + " rows: " + String.join("\n", rows);
    }

    @ParameterizedTest(name = "{0}")
    @Order(16)
    @CsvSource(delimiter = '|', value = {
            "DELETE FROM lc_results.run",
            "DELETE FROM lc_results.alert",
    })
    void runsAndAlertsCannotBeDeletedWhileAnythingRefersToThem(String statement) throws SQLException {
        long runs = count("SELECT count(*) FROM lc_results.run");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            SQLException e = assertThrows(SQLException.class, () -> st.execute(statement));
            assertEquals("23503", e.getSQLState(), "a foreign key, no cascade: " + e.getMessage());
        }
        assertEquals(runs, count("SELECT count(*) FROM lc_results.run"));
    }
}
