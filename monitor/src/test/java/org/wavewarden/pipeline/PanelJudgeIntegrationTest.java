package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.compare.panel.ChurnTable;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.compare.panel.PanelComparisons.CategoricalDetail;
import org.wavewarden.compare.panel.PanelComparisons.PanelDetail;
import org.wavewarden.compare.panel.PanelComparisons;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.KeyedPairReader;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A panel judged end to end on a real PostgreSQL server: two waves of the same 1,600 respondents (plus three who
 * answered only the first wave and two who answered only the second), built so that every paired statistic has a
 * reference from outside the project (values as in {@link PanelComparisonsTest}, where the R and statsmodels calls
 * are quoted):
 * <ul>
 *   <li>{@code extra_sleep} (continuous, hours) and {@code sleep_score} (ordinal): Student's sleep data for
 *       respondents 1 to 10, group 2 in w1 and group 1 in w2; respondent 11 refused in w1 (code -99) and so is left
 *       out of the pairs; respondents only in one wave answered too, so the two-sample comparison sees 13 and 13
 *       answers while the paired one sees 10 pairs;</li>
 *   <li>{@code approves} (binary): Agresti's approval table, 794 / 150 / 86 / 570; {@code approves_pts} the same
 *       answers with a threshold of 2 percentage points;</li>
 *   <li>{@code commute} (categorical): the churn table {@link PanelComparisonsTest#COMMUTE}.</li>
 * </ul>
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class PanelJudgeIntegrationTest {

    @TempDir
    static Path dir;
    static String url;
    static WardenConfig config;
    static Session session;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("panel");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.panel (wave text NOT NULL, person_id integer, extra_sleep numeric,
                        sleep_score numeric, approves integer, approves_pts integer, commute text);
                    -- approval: persons 1-794 yes/yes, 795-944 yes/no, 945-1030 no/yes, 1031-1600 no/no
                    CREATE TEMP TABLE approval AS SELECT p,
                        CASE WHEN p <= 944 THEN 1 ELSE 0 END AS a1,
                        CASE WHEN p <= 794 OR p BETWEEN 945 AND 1030 THEN 1 ELSE 0 END AS a2
                        FROM generate_series(1, 1600) p;
                    -- commute: the cells of the churn table in row-major order, persons numbered through them
                    CREATE TEMP TABLE cells (i int, b text, c text, n int);
                    INSERT INTO cells VALUES (1, 'car', 'car', 650), (2, 'car', 'bus', 90), (3, 'car', 'bike', 20),
                        (4, 'bus', 'car', 15), (5, 'bus', 'bus', 400), (6, 'bus', 'bike', 35),
                        (7, 'bike', 'car', 5), (8, 'bike', 'bus', 10), (9, 'bike', 'bike', 375);
                    CREATE TEMP TABLE commute AS
                        SELECT row_number() OVER (ORDER BY i) AS p, b, c
                        FROM cells, generate_series(1, n);
                    CREATE TEMP TABLE sleep (p int, s1 numeric, s2 numeric);
                    INSERT INTO sleep VALUES (1, 1.9, 0.7), (2, 0.8, -1.6), (3, 1.1, -0.2), (4, 0.1, -1.2),
                        (5, -0.1, -0.1), (6, 4.4, 3.4), (7, 5.5, 3.7), (8, 1.6, 0.8), (9, 4.6, 0.0), (10, 3.4, 2.0);
                    INSERT INTO src.panel
                        SELECT 'w1', a.p, s.s1, s.s1, a.a1, a.a1, m.b
                        FROM approval a JOIN commute m ON m.p = a.p LEFT JOIN sleep s ON s.p = a.p;
                    INSERT INTO src.panel
                        SELECT 'w2', a.p, s.s2, s.s2, a.a2, a.a2, m.c
                        FROM approval a JOIN commute m ON m.p = a.p LEFT JOIN sleep s ON s.p = a.p;
                    UPDATE src.panel SET extra_sleep = CASE wave WHEN 'w1' THEN -99 ELSE 1.5 END
                        WHERE person_id = 11;
                    INSERT INTO src.panel VALUES ('w1', 1601, 2.2, 2.2, 1, 1, 'car'),
                        ('w1', 1602, 2.6, 2.6, 1, 1, 'car'), ('w1', 1603, 3.1, 3.1, 1, 1, 'car'),
                        ('w2', 1604, 0.4, 0.4, 0, 0, 'bus'), ('w2', 1605, 1.1, 1.1, 0, 0, 'bus');
                    """);
        }
        String variables = """
                    variables:
                      - {name: extra_sleep, kind: continuous, unit: hours,
                         missingCodes: [{value: -99, reason: refused}]}
                      - {name: sleep_score, kind: ordinal}
                      - {name: approves, kind: binary, successValue: "1"}
                      - {name: approves_pts, kind: binary, successValue: "1", threshold: {points: 2}}
                      - {name: commute, kind: categorical}
                """;
        config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n"
                + "  schema: panel_results\nalpha: 0.05\ndatasets:\n"
                + "  - name: panel\n    table: src.panel\n    waveColumn: wave\n    respondentKey: person_id\n"
                + variables
                + "  - name: unkeyed\n    table: src.panel\n    waveColumn: wave\n    exclude: [person_id]\n"
                + variables);
        session = Session.open(config, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    static Finding finding(List<Finding> findings, String variable, FindingKind kind) {
        return findings.stream().filter(f -> f.variable().equals(variable) && f.kind() == kind).findFirst()
                .orElseThrow(() -> new AssertionError("no " + kind + " for " + variable + ": " + findings));
    }

    @Test
    @Order(1)
    void thePairedFindingsCarryTheReferenceStatisticsBesideTheTwoSampleOnes() throws Exception {
        JudgedWave judged = new WaveJudge(session, Clock.systemUTC()).judge(config.dataset("panel"), "w2", null,
                dir.resolve("w2"), null);
        List<Finding> f = judged.report().findings();

        // Student's sleep data, 10 pairs: paired t (the differences pass Shapiro-Wilk at 0.01), Cohen's d_z
        Finding sleep = finding(f, "extra_sleep", FindingKind.PANEL_SHIFT);
        assertEquals("paired t", sleep.test());
        assertEquals(-4.0621276833820366, sleep.statistic(), 1e-10);
        assertEquals(0.0028328901973842702, sleep.pValue(), 1e-12);
        assertEquals("Cohen's d_z", sleep.effect().name());
        assertEquals(-1.2845575625910546, sleep.effect().estimate(), 1e-12);
        assertEquals(-2.1180165139770666, sleep.effect().ciLow(), 1e-8);
        assertEquals(-0.41462775638014426, sleep.effect().ciHigh(), 1e-8);
        assertEquals(10, sleep.nBaseline());
        assertEquals(10, sleep.nCurrent());
        assertEquals("MATERIAL", sleep.verdict().name());
        assertTrue(sleep.qValue() < 0.05, sleep.toString());
        assertTrue(sleep.sentence().contains("10 respondents paired, 1,590 more in both waves left out for a missing"
                + " or excluded answer; 3 only in wave w1, 2 only in wave w2"), sleep.sentence());
        PanelDetail sd = (PanelDetail) sleep.detail();
        assertEquals(10, sd.pairs());
        assertEquals(1590, sd.pairsLeftOut());
        assertEquals(3, sd.onlyBaseline());
        assertEquals(2, sd.onlyCurrent());
        assertEquals(0, sd.unmatchedRows());
        // The two-sample comparison of the same variable sees every valid answer of each wave: 13 and 13.
        Finding welch = finding(f, "extra_sleep", FindingKind.SHIFT);
        assertEquals(13, welch.nBaseline());
        assertEquals(13, welch.nCurrent());

        // The same answers as an ordinal variable: signed rank, V = 0, p = 0.009091 (CHECK-SOURCES)
        Finding score = finding(f, "sleep_score", FindingKind.PANEL_SHIFT);
        assertEquals("Wilcoxon signed rank", score.test());
        assertEquals(0, score.statistic());
        assertEquals(0.0090906980159250559, score.pValue(), 1e-12);
        assertEquals(-1, score.effect().estimate(), 1e-12);
        assertEquals("MATERIAL", score.verdict().name());
        assertEquals(10, score.nCurrent());

        // Agresti's approval table: McNemar without continuity correction, X2 = 17.36; Cohen's h below 0.2: MINOR
        Finding approves = finding(f, "approves", FindingKind.PANEL_SHIFT);
        assertEquals("McNemar", approves.test());
        assertEquals(17.35593220338983, approves.statistic(), 1e-10);
        assertEquals(3.0992934410452182e-05, approves.pValue(), 1e-14);
        assertEquals(-0.080819030084987808, approves.effect().estimate(), 1e-12);
        assertEquals("MINOR", approves.verdict().name());
        assertEquals(1600, approves.nBaseline());
        // the same answers judged on the paired share difference, -4 points against 2: MATERIAL
        Finding points = finding(f, "approves_pts", FindingKind.PANEL_SHIFT);
        assertEquals(-0.04, points.effect().estimate(), 1e-12);
        assertEquals(-0.058703872895728836, points.effect().ciLow(), 1e-10);
        assertEquals(-0.021230423982877056, points.effect().ciHigh(), 1e-10);
        assertEquals(0.02, points.effect().threshold(), 1e-15);
        assertEquals("MATERIAL", points.verdict().name());

        // The commute churn: Stuart-Maxwell against statsmodels 0.13.5, car -5.625 points against 5: MATERIAL
        Finding commute = finding(f, "commute", FindingKind.PANEL_SHIFT);
        assertEquals("Stuart-Maxwell", commute.test());
        assertEquals(70.20648967551622, commute.statistic(), 1e-9);
        assertEquals(5.686623429689494e-16, commute.pValue(), 1e-25);
        assertEquals(-0.05625, commute.effect().estimate(), 1e-14);
        assertEquals("MATERIAL", commute.verdict().name());
        CategoricalDetail churn = (CategoricalDetail) ((PanelDetail) commute.detail()).paired();
        // The categories in the waves' sorted order; the statistic and the flows do not depend on the order.
        assertEquals(List.of("bike", "bus", "car"), churn.categories().stream()
                .map(PanelComparisons.ShareRow::category).toList());
        assertArrayEquals(new long[][] {{375, 10, 5}, {35, 400, 15}, {20, 90, 650}}, churn.churn());
        assertEquals(List.of(new ChurnTable.Flow("car", "bus", 90, 90 / 760.0),
                new ChurnTable.Flow("bus", "bike", 35, 35 / 450.0),
                new ChurnTable.Flow("car", "bike", 20, 20 / 760.0),
                new ChurnTable.Flow("bus", "car", 15, 15 / 450.0),
                new ChurnTable.Flow("bike", "bus", 10, 10 / 390.0),
                new ChurnTable.Flow("bike", "car", 5, 5 / 390.0)), churn.largestFlows());
        assertTrue(commute.sentence().contains("largest flow: 90 moved from 'car' to 'bus' (11.8% of 'car'); 1,600"
                + " respondents paired; 3 only in wave w1, 2 only in wave w2"), commute.sentence());

        // Paired findings are alerted like shifts (a facet of their variable's alert), written with the run and in
        // findings.json.
        assertTrue(judged.alerts().stream().anyMatch(a -> a.variable().equals("commute")
                && a.facets().stream().anyMatch(x -> x.kind() == FindingKind.PANEL_SHIFT)));
        assertTrue(judged.alerts().stream().noneMatch(a -> a.variable().equals("approves")
                && a.facets().stream().anyMatch(x -> x.kind() == FindingKind.PANEL_SHIFT)), "MINOR is not alerted");
        assertEquals(5, count("SELECT count(*) FROM panel_results.finding WHERE run_id = " + judged.runId()
                + " AND kind = 'PANEL_SHIFT'"));
        // Four variables' alerts have a paired facet, as lead or beside their variable's two-sample shift.
        assertEquals(4, count("SELECT count(*) FROM panel_results.alert WHERE 'PANEL_SHIFT' = ANY (ARRAY[kind]"
                + " || facet_kinds) AND dataset = 'panel' AND superseded_at IS NULL"));
        JsonNode json = Json.mapper().readTree(Files.readString(dir.resolve("w2").resolve("findings.json")));
        JsonNode flows = null;
        for (JsonNode x : json.get("findings")) {
            if (x.get("variable").asText().equals("commute") && x.get("kind").asText().equals("PANEL_SHIFT")) {
                flows = x.get("detail").get("paired").get("largestFlows");
            }
        }
        assertTrue(flows != null, json.toString());
        assertEquals("car", flows.get(0).get("from").asText());
        assertEquals("bus", flows.get(0).get("to").asText());
        assertEquals(90, flows.get(0).get("count").asLong());
        String digest = Files.readString(dir.resolve("w2").resolve("digest.md"));
        assertTrue(digest.contains("| **MATERIAL** PANEL_SHIFT | commute |"), digest);
    }

    /** What one check sends to the source, with the pair reads counted beside the wave scans. */
    record Sent(StatementCounter.SourceStatements statements, int pairReads) {
    }

    static Sent check(String dataset) {
        StatementCounter counter = new StatementCounter(Identifiers.quote("src") + "." + Identifiers.quote("panel"));
        AtomicInteger pairReads = new AtomicInteger();
        PanelPairs.Reader counting = (h, key, columns, before, after, visitor, progress) -> {
            pairReads.incrementAndGet();
            return KeyedPairReader.read(h, key, columns, before, after, visitor, progress);
        };
        WaveJudge judge = new WaveJudge(session, Clock.systemUTC())
                .useScanner(counter.counting(new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan))
                .usePairReader(counting);
        session.source().setSqlLogger(counter);
        try {
            judge.judge(config.dataset(dataset), "w2", null, null, null);
        } finally {
            session.source().setSqlLogger(org.jdbi.v3.core.statement.SqlLogger.NOP_SQL_LOGGER);
        }
        return new Sent(counter.snapshot(), pairReads.get());
    }

    @Test
    @Order(2)
    void thePanelCostsOneStatementMoreWhateverTheNumberOfVariables() {
        check("unkeyed"); // reads and stores the never-summarised w1 once
        Sent keyed = check("panel");
        Sent unkeyed = check("unkeyed");
        // Both read the judged wave in one COPY and every other wave from its stored summary; the panel adds the
        // one COPY of the two waves side by side, for its five variables together.
        assertEquals(1, keyed.statements().copies(), keyed.toString());
        assertEquals(1, keyed.pairReads(), keyed.toString());
        assertEquals(0, unkeyed.pairReads(), unkeyed.toString());
        assertEquals(unkeyed.statements(), keyed.statements());
    }

    static long count(String sql) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery(sql)) {
            assertTrue(rs.next(), sql);
            return rs.getLong(1);
        }
    }
}
