package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Mute rules and expected changes end where they say, through the same judging the {@code check} command and the
 * daemon use, on a real PostgreSQL server. A Harrowmere County household survey of 400 households in waves 1 to 4,
 * in which five variables move materially in every wave, so that each of waves 2, 3 and 4 raises a new alert for
 * each of them (never a repeat of the wave before):
 * <ul>
 *     <li>{@code score}: muted by the configuration until wave 3;</li>
 *     <li>{@code income}: muted by a person with the {@code alerts mute} command on its wave 2 alert, until
 *     wave 3;</li>
 *     <li>{@code hours}: muted by the configuration until 31 March 2026, the waves judged on 30 March, 31 March and
 *     1 April;</li>
 *     <li>{@code commute}: under a rule for another kind of finding (a numeric sentinel), so never muted;</li>
 *     <li>{@code mode}: a change of interview mode expected in waves 2 to 3, so explained when raised there.</li>
 * </ul>
 */
class MuteExpiryIntegrationTest {

    static final String SURVEY_OFFICE = "Harrowmere County Survey Office";
    static final String REVIEWER = "Idris Fenwick";

    @TempDir
    static Path dir;
    static Path configFile;
    static String url;
    static Session session;
    static AlertReviews reviews;
    /** The stored rule the mute of income's wave 2 alert made. */
    static long incomeRule;

    /** The day each wave is judged: the date expiry of the hours rule is read against it. */
    static final Map<String, LocalDate> JUDGED_ON = Map.of("1", LocalDate.of(2026, 3, 29),
            "2", LocalDate.of(2026, 3, 30), "3", LocalDate.of(2026, 3, 31), "4", LocalDate.of(2026, 4, 1));

    @BeforeAll
    static void judgeFourWaves() throws Exception {
        url = TestDatabase.freshDatabase("mute_expiry");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Each variable's values are a fixed spread moved by a whole step per wave, a step of about one
            // standard deviation (R 4.2.2 sd() of the 400 values: score 5.72 for a step of 6, income 57.8 for 60,
            // hours 3.17 for 3, commute 8.93 for 9), far beyond the default thresholds (Hedges' g 0.2, Cliff's
            // delta 0.147); the interview mode's phone share rises by 20 points a wave (Cramer's V 0.20 to 0.22
            // between two waves, R 4.2.2 sqrt(chisq.test(correct = FALSE)$statistic / 800), against the default
            // threshold 0.1).
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.hh (wave text NOT NULL, pid integer NOT NULL, score double precision,
                        income double precision, hours double precision, commute double precision, mode text);
                    INSERT INTO src.hh SELECT w::text, p,
                        40 + (p * 7) % 21 + 6 * w,
                        1000 + (p * 13) % 200 + 60 * w,
                        30 + (p * 3) % 11 + 3 * w,
                        20 + (p * 17) % 31 + 9 * w,
                        CASE WHEN p % 10 < 2 * w THEN 'phone' ELSE 'web' END
                    FROM generate_series(1, 4) w, generate_series(1, 400) p;
                    """);
        }
        String yaml = """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: mute_results}
                alpha: 0.05
                datasets:
                  - name: household
                    table: src.hh
                    waveColumn: wave
                    exclude: [pid]
                    variables:
                      - {name: score, kind: continuous, unit: points}
                      - {name: income, kind: continuous, unit: currency per month}
                      - {name: hours, kind: continuous, unit: hours a week}
                      - {name: commute, kind: continuous, unit: minutes}
                      - {name: mode, kind: categorical}
                    expectedChanges:
                      - variable: mode
                        waves: {from: "2", to: "3"}
                        reason: planned-change
                        note: "Telephone interviewing phased in over waves 2 and 3."
                        by: %s
                    mutes:
                      - {variable: score, kind: SHIFT, untilWave: "3", reason: "Score rebased; known.", by: Edda Marsh}
                      - {variable: commute, kind: NUMERIC_SENTINEL, untilWave: "4", reason: "Keyed 999s.",
                         by: Edda Marsh}
                      - {variable: hours, untilDate: 2026-03-31, reason: "Hours question reworded.", by: Edda Marsh}
                """.formatted(url, SURVEY_OFFICE);
        configFile = dir.resolve("household.yaml");
        Files.writeString(configFile, yaml);
        WardenConfig config = ConfigLoader.parse(yaml);
        session = Session.open(config, null, Map.of());
        session.migrate();
        reviews = new AlertReviews(session.store().jdbi(), "mute_results", at(JUDGED_ON.get("2")));
        for (String wave : List.of("1", "2")) {
            judge(config, wave);
        }
        // A person mutes the income alert of wave 2 until wave 3 with the alerts command, before wave 3 arrives.
        CliRun muted = CliRun.of("alerts", "mute", "--config", configFile.toString(),
                String.valueOf(alertOf("income", "2").alertId()), "--until-wave", "3", "--reason", "fix-upstream",
                "--note", "Income bands recoded upstream from wave 4.", "--as", REVIEWER);
        assertEquals(0, muted.exitCode(), muted.err());
        for (String wave : List.of("3", "4")) {
            judge(config, wave);
        }
        incomeRule = ruleOf(alertOf("income", "2").alertId());
    }

    static void judge(WardenConfig config, String wave) {
        new WaveJudge(session, at(JUDGED_ON.get(wave))).judge(config.dataset("household"), wave, null, null, null);
    }

    static Clock at(LocalDate day) {
        return Clock.fixed(day.atTime(9, 0).toInstant(ZoneOffset.UTC), ZoneOffset.UTC);
    }

    @AfterAll
    static void close() {
        session.close();
    }

    static AlertView alertOf(String variable, String wave) {
        List<AlertView> of = reviews.list(new AlertReviews.Filter("household", wave, null, null, null)).stream()
                .filter(a -> a.variable().equals(variable)).toList();
        assertEquals(1, of.size(), "one alert of " + variable + " in wave " + wave + ": "
                + reviews.list(AlertReviews.Filter.ANY));
        return of.get(0);
    }

    static long ruleOf(long alertId) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.prepareStatement(
                "SELECT rule_id FROM mute_results.mute_rule WHERE alert_id = ?")) {
            st.setLong(1, alertId);
            try (ResultSet rs = st.executeQuery()) {
                assertTrue(rs.next(), "the mute stored a rule");
                return rs.getLong(1);
            }
        }
    }

    @ParameterizedTest(name = "{0} in wave {1}: {2}")
    @CsvSource({
            // variable, wave, state read after all four waves
            "score,   2, MUTED",
            "score,   3, MUTED",
            "score,   4, OPEN",
            "income,  2, MUTED",
            "income,  3, MUTED",
            "income,  4, OPEN",
            "hours,   2, MUTED",
            "hours,   3, MUTED",
            "hours,   4, OPEN",
            "commute, 2, OPEN",
            "commute, 3, OPEN",
            "commute, 4, OPEN",
            "mode,    2, EXPLAINED",
            "mode,    3, EXPLAINED",
            "mode,    4, OPEN",
    })
    void eachWaveRaisesANewAlertWhoseStateTheRulesInForceThatDayDecide(String variable, String wave,
                                                                       AlertState state) {
        AlertView a = alertOf(variable, wave);
        assertEquals("MATERIAL", a.verdict(), a.toString());
        assertEquals(state, a.state(), a.toString());
        // The state is what the history says, and the history was written when the alert was created.
        assertEquals(a.last(), reviews.history(a.alertId()).get(reviews.history(a.alertId()).size() - 1));
    }

    @ParameterizedTest(name = "{0} in wave {1}")
    @CsvSource(delimiter = '|', nullValues = "null", value = {
            // variable | wave | the rule as the entry names it | its words | last wave | last day
            "score | 2 | config mute rule \"score\" SHIFT until wave 3      | Score rebased; known.    | 3    | null",
            "score | 3 | config mute rule \"score\" SHIFT until wave 3      | Score rebased; known.    | 3    | null",
            "hours | 2 | config mute rule \"hours\" every kind until 2026-03-31 | Hours question reworded. | null"
                    + " | 2026-03-31",
            "hours | 3 | config mute rule \"hours\" every kind until 2026-03-31 | Hours question reworded. | null"
                    + " | 2026-03-31",
    })
    void anAlertAConfiguredRuleCoversIsRecordedMutedByTheRuleItNames(String variable, String wave, String rule,
                                                                     String reason, String untilWave,
                                                                     LocalDate untilDate) {
        List<ReviewEntry> h = reviews.history(alertOf(variable, wave).alertId());
        assertEquals(1, h.size(), "created muted, never opened: " + h);
        ReviewEntry e = h.get(0);
        assertEquals(ReviewAction.MUTED, e.action());
        assertEquals("Edda Marsh", e.actor());
        assertEquals(rule, e.source());
        assertEquals(reason, e.note());
        assertNull(e.reason(), "the rule names no reason category");
        assertEquals(untilWave, e.untilWave(), "the entry carries its rule's expiry");
        assertEquals(untilDate, e.untilDate(), "the entry carries its rule's expiry");
    }

    /**
     * A mute by date ends on its last day for the alerts it muted as well, whether the rule was declared in the
     * configuration or stored by a person: read the day after, they are open, while a mute by wave holds on any
     * day.
     */
    @ParameterizedTest(name = "{0} in wave {1}, read on {2}: {3}")
    @CsvSource({
            "hours,  2, 2026-03-31, MUTED",
            "hours,  3, 2026-03-31, MUTED",
            "hours,  2, 2026-04-01, OPEN",
            "hours,  3, 2026-04-01, OPEN",
            "score,  2, 2031-01-01, MUTED",
            "income, 3, 2031-01-01, MUTED",
    })
    void aMuteByDateEndsOnItsLastDayForTheAlertsItMuted(String variable, String wave, LocalDate readOn,
                                                       AlertState state) {
        AlertReviews then = new AlertReviews(session.store().jdbi(), "mute_results", at(readOn));
        assertEquals(state, then.get(alertOf(variable, wave).alertId()).orElseThrow().state());
    }

    @Test
    void theMutedAlertOfAPersonKeepsItsOpeningAndTheMuteThatFollowed() {
        List<ReviewEntry> h = reviews.history(alertOf("income", "2").alertId());
        assertEquals(List.of(ReviewAction.OPENED, ReviewAction.MUTED), h.stream().map(ReviewEntry::action).toList());
        ReviewEntry muted = h.get(1);
        assertEquals(REVIEWER, muted.actor());
        assertEquals(ReviewReason.FIX_UPSTREAM, muted.reason());
        assertEquals("3", muted.untilWave());
        assertEquals("command", muted.source());
    }

    @Test
    void theNextWavesAlertIsCreatedMutedByThePersonsStoredRuleUntilItsLastWave() {
        List<ReviewEntry> h = reviews.history(alertOf("income", "3").alertId());
        assertEquals(1, h.size(), h.toString());
        ReviewEntry e = h.get(0);
        assertEquals(ReviewAction.MUTED, e.action());
        assertEquals(REVIEWER, e.actor());
        assertEquals("stored mute rule \"income\" SHIFT until wave 3", e.source());
        assertEquals("mute rule " + incomeRule + " (fix-upstream): Income bands recoded upstream from wave 4.",
                e.note());
        assertEquals(ReviewReason.FIX_UPSTREAM, e.reason());
        assertEquals("3", e.untilWave(), "the entry carries its rule's expiry");
        // Wave 4 is past the rule's last wave: its alert is opened by the monitor like any other.
        assertEquals(List.of(ReviewAction.OPENED), reviews.history(alertOf("income", "4").alertId()).stream()
                .map(ReviewEntry::action).toList());
    }

    @ParameterizedTest(name = "wave {0}")
    @CsvSource({"2", "3"})
    void anExpectedChangeExplainsTheAlertsOfItsWavesWithItsReasonAndItsAuthor(String wave) {
        List<ReviewEntry> h = reviews.history(alertOf("mode", wave).alertId());
        assertEquals(1, h.size(), h.toString());
        ReviewEntry e = h.get(0);
        assertEquals(ReviewAction.EXPLAINED, e.action());
        assertEquals(ReviewReason.PLANNED_CHANGE, e.reason());
        assertEquals(SURVEY_OFFICE, e.actor());
        assertEquals("Telephone interviewing phased in over waves 2 and 3.", e.note());
        assertEquals("expected change \"mode\" 2..3", e.source());
    }

    @ParameterizedTest(name = "{0} in wave 4")
    @CsvSource({"score", "income", "hours", "mode"})
    void pastTheEndOfItsRuleAnAlertIsOpenedByTheMonitor(String variable) {
        List<ReviewEntry> h = reviews.history(alertOf(variable, "4").alertId());
        assertEquals(1, h.size(), h.toString());
        assertEquals(ReviewAction.OPENED, h.get(0).action());
        assertEquals(AlertReviews.MONITOR, h.get(0).actor());
    }

    @Test
    void aRuleForAnotherKindOfFindingLeavesTheVariablesShiftsOpen() {
        for (String wave : List.of("2", "3", "4")) {
            AlertView a = alertOf("commute", wave);
            assertEquals("SHIFT", a.kind());
            assertEquals(List.of(ReviewAction.OPENED), reviews.history(a.alertId()).stream()
                    .map(ReviewEntry::action).toList(), "wave " + wave);
        }
    }

    @Test
    void everyAlertOfTheThreeComparedWavesIsOneOfThePlannedOnes() {
        // Nothing else moves, so the rules' effects above are the whole story of each wave.
        for (String wave : List.of("2", "3", "4")) {
            assertEquals(List.of("commute", "hours", "income", "mode", "score"),
                    reviews.list(new AlertReviews.Filter("household", wave, null, null, null)).stream()
                            .map(AlertView::variable).sorted().toList(), "wave " + wave);
        }
    }
}
