package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.time.Clock;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Four waves on a real PostgreSQL server, the fourth a copy of the third: a free-text answer left blank by one
 * household in five in every wave, a fee asked of one household in sixty (too few answers to resolve its
 * threshold) and a score that moves materially in the third wave. The blanks alert in the first wave and are then
 * still present, the fee alerts at its first comparison and is then still too few answers to judge, the repeats are
 * stored and read back so a later wave names the wave the run of repeats began, and the fourth wave raises no
 * alert at all.
 */
class RepeatedWavesIntegrationTest {

    static Session session;
    static DatasetConfig dataset;
    static final Map<String, JudgedWave> JUDGED = new LinkedHashMap<>();

    @BeforeAll
    static void judgeFourWaves() throws Exception {
        String url = TestDatabase.freshDatabase("repeated_waves");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA r;
                    CREATE TABLE r.w_1 AS SELECT g AS household,
                        CASE WHEN g % 10 = 0 THEN '' WHEN g % 10 = 5 THEN '   '
                             ELSE (ARRAY['nurse', 'farmer', 'teacher', 'driver', 'clerk', 'welder', 'baker'])[1 + g % 7]
                                  || ' at ' || (ARRAY['Saltmarsh', 'Gullhaven', 'Harrow Cross'])[1 + g % 3] END AS job,
                        CASE WHEN g % 60 = 0 THEN 400 + (g * 37) % 90 END AS fee,
                        50 + ((g * 7919) % 100) / 5.0 AS score
                    FROM generate_series(1, 2000) g;
                    CREATE TABLE r.w_2 AS SELECT * FROM r.w_1;
                    CREATE TABLE r.w_3 AS SELECT household, job, fee, score + 6 AS score FROM r.w_2;
                    CREATE TABLE r.w_4 AS SELECT * FROM r.w_3;
                    """);
        }
        var config = ConfigLoader.parse("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_repeated}
                datasets:
                  - name: repeated
                    tablePattern: r.w_{wave}
                    variables:
                      - {name: job, kind: text}
                      - {name: fee, kind: continuous}
                      - {name: score, kind: continuous}
                """.formatted(url));
        session = Session.open(config, null, Map.of());
        session.migrate();
        dataset = config.datasets().get(0);
        WaveJudge judge = new WaveJudge(session, Clock.systemUTC());
        for (String wave : List.of("1", "2", "3", "4")) {
            JUDGED.put(wave, judge.judge(dataset, wave, null, null, null));
        }
    }

    @AfterAll
    static void close() {
        session.close();
    }

    static Finding finding(String wave, String variable, FindingKind kind) {
        return JUDGED.get(wave).report().findings().stream().filter(f -> f.variable().equals(variable)
                && f.kind() == kind).findFirst().orElseThrow(() -> new AssertionError("no " + kind + " of "
                + variable + " in wave " + wave + ": " + JUDGED.get(wave).report().findings()));
    }

    static long alertRows(String wave) {
        long run = JUDGED.get(wave).runId();
        return session.store().jdbi().withHandle(h -> h.createQuery("SELECT count(*) FROM "
                + session.config().results().schema() + ".alert WHERE run_id = :run").bind("run", run)
                .mapTo(Long.class).one());
    }

    @Test
    void blankAnswersAlertInTheFirstWaveAndAreThenStillPresentSinceIt() {
        Finding first = finding("1", "job", FindingKind.BLANK);
        assertNull(first.repeat());
        assertTrue(Alerts.worthAPerson(first), first.sentence());
        for (String wave : List.of("2", "3", "4")) {
            Finding blank = finding(wave, "job", FindingKind.BLANK);
            String previous = String.valueOf(Integer.parseInt(wave) - 1);
            assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, previous, "1"), blank.repeat(),
                    blank.sentence());
            assertTrue(blank.sentence().endsWith(" Still present since wave 1: unchanged from wave " + previous
                    + " (its rate has not moved beyond sampling error); no new alert."), blank.sentence());
        }
    }

    @Test
    void aRepeatIsStoredAndReadBackSoTheThirdWaveNamesTheFirst() {
        for (String wave : List.of("2", "3")) {
            FindingsReport stored = session.store().storedReport(JUDGED.get(wave).runId()).orElseThrow();
            Optional<Finding> blank = stored.findings().stream().filter(f -> f.variable().equals("job")
                    && f.kind() == FindingKind.BLANK).findFirst();
            assertEquals(finding(wave, "job", FindingKind.BLANK).repeat(), blank.orElseThrow().repeat());
            assertEquals(finding(wave, "job", FindingKind.BLANK).sentence(), blank.get().sentence());
        }
        // wave 3's firstWave "1" can only come from wave 2's stored repeat: wave 3 reads nothing of wave 1
        assertEquals("1", finding("3", "job", FindingKind.BLANK).repeat().firstWave());
        assertEquals("2", finding("3", "job", FindingKind.BLANK).repeat().previousWave());
    }

    @Test
    void aFeeTooFewAnswersToJudgeAlertsAtItsFirstComparisonOnly() {
        Finding first = finding("2", "fee", FindingKind.SHIFT);
        assertEquals(Verdict.UNCERTAIN, first.verdict(), first.sentence());
        assertTrue(!first.effect().resolvable(), "about 33 answers a wave cannot resolve g 0.2: " + first.effect());
        assertNull(first.repeat());
        assertTrue(JUDGED.get("2").alerts().stream().anyMatch(a -> a.variable().equals("fee")));
        for (String wave : List.of("3", "4")) {
            Finding fee = finding(wave, "fee", FindingKind.SHIFT);
            assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_UNRESOLVABLE, String.valueOf(
                    Integer.parseInt(wave) - 1), "2"), fee.repeat(), fee.sentence());
            assertTrue(JUDGED.get(wave).alerts().stream().noneMatch(a -> a.variable().equals("fee")));
        }
    }

    /**
     * The score's move in the third wave is news, and the only news: the blanks and the fee are repeats. Its alert is
     * a row of the results schema, read back the way the fourth wave's count of none is read.
     */
    @Test
    void theScoreMovesMateriallyInTheThirdWave() {
        Finding moved = finding("3", "score", FindingKind.SHIFT);
        assertEquals(Verdict.MATERIAL, moved.verdict(), moved.sentence());
        assertEquals(List.of("score"), JUDGED.get("3").alerts().stream().map(a -> a.variable()).toList());
        assertEquals(1, alertRows("3"));
    }

    /** The first wave's alert rows: the blanks, alone, since a first wave has nothing to be compared with. */
    @Test
    void theFirstWavesBlanksAreAnAlertRow() {
        assertEquals(List.of("job"), JUDGED.get("1").alerts().stream().map(a -> a.variable()).toList());
        assertEquals(1, alertRows("1"));
    }

    /**
     * The fourth wave is the third again: every finding is STABLE, a repeat, or not worth a person (the score that
     * moved in the third wave has not moved since), and no alert row is written.
     */
    @Test
    void aFourthWaveIdenticalToTheThirdRaisesNoAlert() {
        StringBuilder remaining = new StringBuilder();
        for (Finding f : JUDGED.get("4").report().findings()) {
            boolean quiet = f.verdict() == Verdict.STABLE || f.repeat() != null || !Alerts.worthAPerson(f);
            if (!quiet) {
                remaining.append(f.variable()).append(' ').append(f.kind()).append(": ").append(f.sentence())
                        .append('\n');
            }
            if (f.repeat() == null && Alerts.worthAPerson(f)) {
                remaining.append("alert-worthy: ").append(f.variable()).append(' ').append(f.kind()).append('\n');
            }
        }
        System.out.println("wave 4, a copy of wave 3: " + JUDGED.get("4").report().findings().size()
                + " findings, alert-worthy ones left: " + (remaining.length() == 0 ? "none" : "\n" + remaining));
        assertEquals("", remaining.toString());
        assertEquals(Verdict.STABLE, finding("4", "score", FindingKind.SHIFT).verdict());
        assertEquals(List.of(), JUDGED.get("4").alerts());
        assertEquals(0, alertRows("4"));
        assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, "3", "1"),
                finding("4", "job", FindingKind.BLANK).repeat());
    }
}
