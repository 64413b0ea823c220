package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.compare.relation.RelationshipDetail;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.time.Clock;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Relationship drift end to end on a real PostgreSQL server: two waves in which x and y keep exactly the same
 * answers (the same multiset of values in each wave) while their Spearman correlation drops from about 0.6 to about
 * 0.2, and a pair a, b whose correlation stays about 0.72. Judging the second wave reads it with one COPY, takes the
 * first from its stored summary, and finds the drop MATERIAL and the other pair STABLE, with correlations equal to
 * R's on the same rows.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class RelationshipDriftIntegrationTest {

    /*
     * The waves are made from integers only (a 32-bit multiply-xorshift hash; no floating point, so every server
     * makes the same rows). Respondent i of n = 3000: x is 10 + 90 (i - 1) / n, with the missing code -9 for every
     * 37th respondent; y takes the value of rank r, 1000 + (50 (r - 1) / n)^2 (a skewed answer, NULL for every 53rd
     * rank), where the ranks order respondents by A i + 100 e_i with e_i the sum of three hashed uniforms on 0..999.
     * A = 45 in w1 and 12 in w2 moves the correlation and nothing else. a is a 1..7 scale, b = 20.0 .. 79.9 by the
     * rank of 60 i + 100 e_i, with another noise seed in each wave.
     */
    static final String WAVES = """
            CREATE SCHEMA rel;
            CREATE FUNCTION rel.mix(v bigint) RETURNS bigint IMMUTABLE LANGUAGE sql AS $$
              SELECT (((((v % 4294967296) # ((v % 4294967296) >> 16)) * 73244475 % 4294967296)
                      # ((((v % 4294967296) # ((v % 4294967296) >> 16)) * 73244475 % 4294967296) >> 16))
                      * 73244475 % 4294967296)
            $$;
            CREATE FUNCTION rel.noise(i bigint, s bigint) RETURNS bigint IMMUTABLE LANGUAGE sql AS $$
              SELECT rel.mix(3 * i + s) % 1000 + rel.mix(3 * i + 1 + s) % 1000 + rel.mix(3 * i + 2 + s) % 1000
            $$;
            CREATE TABLE rel.answers (wave text, respondent_id integer, x integer, y integer, a integer,
                                      b numeric(6,1), region text);
            CREATE FUNCTION rel.wave(w text, n int, ax int, sx bigint, ab int, sb bigint) RETURNS void
            LANGUAGE sql AS $$
              INSERT INTO rel.answers
              SELECT w, i,
                     CASE WHEN i % 37 = 0 THEN -9 ELSE 10 + ((i - 1) * 90) / n END,
                     CASE WHEN ry % 53 = 0 THEN NULL
                          ELSE 1000 + (((ry - 1) * 50) / n) * (((ry - 1) * 50) / n) END,
                     1 + ((i - 1) * 7) / n,
                     (200 + ((rb - 1) * 600) / n) / 10.0,
                     CASE WHEN i % 2 = 0 THEN 'north' ELSE 'south' END
              FROM (SELECT i,
                           row_number() OVER (ORDER BY ax * i + 100 * rel.noise(i, sx), i) AS ry,
                           row_number() OVER (ORDER BY ab * i + 100 * rel.noise(i, sb), i) AS rb
                    FROM generate_series(1, n) AS i) t
            $$;
            SELECT rel.wave('w1', 3000, 45, 7, 60, 11);
            SELECT rel.wave('w2', 3000, 12, 8, 60, 13);
            """;

    /*
     * R 4.2.2 (Debian r-base-core), psych 2.2.9, on the rows exported with
     * COPY (SELECT wave, x, y, a, b FROM rel.answers ORDER BY wave, respondent_id) TO STDOUT CSV HEADER:
     *   d <- read.csv("rel.csv"); e <- d[d$wave == W, ]; k <- e[e$x != -9 & !is.na(e$y), ]
     *   nrow(k); cor(k$x, k$y, method = "spearman"); cor(k$x, k$y); cor(e$a, e$b, method = "spearman"); cor(e$a, e$b)
     *   psych::r.test(n = 2865, r12 = cor(x, y) in w1, r34 = cor(x, y) in w2, n2 = 2864)$z
     */
    static final long N_XY_W1 = 2865;
    static final long N_XY_W2 = 2864;
    static final double SPEARMAN_XY_W1 = 0.610229153288968;
    static final double SPEARMAN_XY_W2 = 0.195747237246324;
    static final double PEARSON_XY_W1 = 0.585922463019195;
    static final double PEARSON_XY_W2 = 0.184080128012586;
    static final double SPEARMAN_AB_W1 = 0.721142001461943;
    static final double SPEARMAN_AB_W2 = 0.712982169332488;
    static final double PEARSON_AB_W1 = 0.721143596117739;
    static final double PEARSON_AB_W2 = 0.712983077722705;
    static final double PSYCH_R_TEST_Z_XY = 18.3540042357139;

    /*
     * Fisher's z with c = 1.06 and Zou's (2007) interval for rho_w2 - rho_w1, written out in the same R 4.2.2:
     *   zou <- function(r1, n1, r2, n2, c = 1.06, conf = 0.95) { q <- qnorm(0.5 + conf / 2); v1 <- c / (n1 - 3);
     *     v2 <- c / (n2 - 3); z1 <- atanh(r1); z2 <- atanh(r2); l1 <- tanh(z1 - q * sqrt(v1));
     *     u1 <- tanh(z1 + q * sqrt(v1)); l2 <- tanh(z2 - q * sqrt(v2)); u2 <- tanh(z2 + q * sqrt(v2)); d <- r2 - r1;
     *     c(d - sqrt((r2 - l2)^2 + (u1 - r1)^2), d + sqrt((u2 - r2)^2 + (r1 - l1)^2), (z2 - z1) / sqrt(v1 + v2)) }
     *   zou(0.610229153288968, 2865, 0.195747237246324, 2864); zou(0.721142001461943, 3000, 0.712982169332488, 3000)
     */
    static final double[] ZOU_XY = {-0.457721558937188, -0.371095088696108, -18.772960274250053};
    static final double[] ZOU_AB = {-0.033513164111662, 0.017168907832374, -0.631546713113309};

    static String url;
    static WardenConfig config;
    static Session session;

    static String yaml(String relationships) {
        return """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results:
                  schema: rel_results
                datasets:
                  - name: rel
                    table: rel.answers
                    waveColumn: wave
                    exclude: [respondent_id]
                    variables:
                      - {name: x, kind: continuous, missingCodes: [{value: -9, reason: refused}]}
                    relationships: %s
                  - name: rel-plain
                    table: rel.answers
                    waveColumn: wave
                    exclude: [respondent_id]
                    variables:
                      - {name: x, kind: continuous, missingCodes: [{value: -9, reason: refused}]}
                """.formatted(url, relationships);
    }

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("relation");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(WAVES);
        }
        config = ConfigLoader.parse(yaml("[{x: x, y: y, threshold: 0.15}, {x: a, y: b}]"));
        session = Session.open(config, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    /** Judges a wave with a counter on the source: every statement and every scan. */
    static StatementCounter.SourceStatements judged(String dataset, String wave, List<Finding> out) {
        StatementCounter counter = new StatementCounter(Identifiers.quote("rel") + "." + Identifiers.quote("answers"));
        session.source().setSqlLogger(counter);
        try {
            out.addAll(new WaveJudge(session, Clock.systemUTC())
                    .useScanner(counter.counting(new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan))
                    .judge(config.dataset(dataset), wave, null, null, null).report().findings());
        } finally {
            session.source().setSqlLogger(org.jdbi.v3.core.statement.SqlLogger.NOP_SQL_LOGGER);
        }
        return counter.snapshot();
    }

    static Finding finding(List<Finding> findings, String variable, FindingKind kind) {
        return findings.stream().filter(f -> f.variable().equals(variable) && f.kind() == kind).findFirst()
                .orElseThrow(() -> new AssertionError("no " + kind + " for " + variable + " in " + findings));
    }

    @Test
    @Order(1)
    void aFirstWaveStoresItsPairsAndHasNothingToCompareThemWith() {
        List<Finding> findings = new java.util.ArrayList<>();
        judged("rel", "w1", findings);
        assertTrue(findings.stream().noneMatch(f -> f.variable().contains("~")), findings.toString());
        WaveProfile stored = session.store().latestSummary("rel", "w1").orElseThrow().profile();
        assertEquals(2, stored.pairs().size());
        assertEquals(2944, stored.pair("x", "y").orElseThrow().pairCount(), "3000 rows less 56 with y NULL");
        assertTrue(stored.pair("x", "y").orElseThrow().binning().isExact());
    }

    @Test
    @Order(2)
    void aCorrelationThatDroppedIsMaterialAPairThatHeldIsStableAndTheWaveIsReadOnce() {
        List<Finding> findings = new java.util.ArrayList<>();
        StatementCounter.SourceStatements sent = judged("rel", "w2", findings);
        assertEquals(1, sent.copies(), "one COPY of the judged wave, the baseline from its summary: " + sent);

        Finding xy = finding(findings, "x ~ y", FindingKind.RELATIONSHIP_CHANGE);
        RelationshipDetail d = (RelationshipDetail) xy.detail();
        assertEquals(SPEARMAN_XY_W1, d.spearmanBaseline().estimate(), 1e-12);
        assertEquals(SPEARMAN_XY_W2, d.spearmanCurrent().estimate(), 1e-12);
        assertEquals(PEARSON_XY_W1, d.pearsonBaseline().estimate(), 1e-12);
        assertEquals(PEARSON_XY_W2, d.pearsonCurrent().estimate(), 1e-12);
        assertEquals(PSYCH_R_TEST_Z_XY, -d.pearsonDifference().z(), 1e-9, "psych reports |z|");
        assertEquals(N_XY_W1, xy.nBaseline());
        assertEquals(N_XY_W2, xy.nCurrent());
        assertEquals(79, d.screenedBaseline(), "pairs whose x is the missing code -9");
        assertEquals(SPEARMAN_XY_W2 - SPEARMAN_XY_W1, xy.effect().estimate(), 1e-12);
        assertEquals(ZOU_XY[0], xy.effect().ciLow(), 1e-12);
        assertEquals(ZOU_XY[1], xy.effect().ciHigh(), 1e-12);
        assertEquals(ZOU_XY[2], xy.statistic(), 1e-9);
        assertEquals(0.15, xy.effect().threshold());
        assertTrue(xy.effect().ciHigh() < -0.15, "the whole interval lies beyond the threshold: " + xy.effect());
        assertEquals(Verdict.MATERIAL, xy.verdict(), xy.sentence());
        assertTrue(xy.qValue() < 0.0001);
        assertTrue(xy.sentence().startsWith("The Spearman correlation of x and y fell from 0.610 to 0.196 (difference"
                + " -0.414, 95% CI "), xy.sentence());
        assertTrue(xy.sentence().contains("; Pearson r 0.586 to 0.184); p < 0.001: chance alone would give a gap"
                + " this large in fewer than 1 in 1,000 comparisons; after false-discovery control over the "),
                xy.sentence());
        assertTrue(xy.sentence().endsWith(" tests of this run, q < 0.0001; the difference is at or above the 0.15"
                + " threshold: MATERIAL."), xy.sentence());

        Finding ab = finding(findings, "a ~ b", FindingKind.RELATIONSHIP_CHANGE);
        RelationshipDetail e = (RelationshipDetail) ab.detail();
        assertEquals(SPEARMAN_AB_W1, e.spearmanBaseline().estimate(), 1e-12);
        assertEquals(SPEARMAN_AB_W2, e.spearmanCurrent().estimate(), 1e-12);
        assertEquals(PEARSON_AB_W1, e.pearsonBaseline().estimate(), 1e-12);
        assertEquals(PEARSON_AB_W2, e.pearsonCurrent().estimate(), 1e-12);
        assertEquals(3000, ab.nBaseline());
        assertEquals(ZOU_AB[0], ab.effect().ciLow(), 1e-12);
        assertEquals(ZOU_AB[1], ab.effect().ciHigh(), 1e-12);
        assertEquals(ZOU_AB[2], ab.statistic(), 1e-9);
        assertEquals(0.1, ab.effect().threshold(), "the default");
        assertEquals(Verdict.STABLE, ab.verdict(), ab.sentence());
        assertTrue(ab.sentence().contains("below the 0.100 threshold, and its interval rules out a change that large:"
                + " STABLE."), ab.sentence());

        for (String v : List.of("x", "y", "a", "b")) {
            assertEquals(Verdict.STABLE, finding(findings, v, FindingKind.SHIFT).verdict(),
                    v + "'s answers are the same in both waves");
        }
        List<String> alerts = session.store().openAlerts("rel").stream()
                .filter(a -> a.wave().equals("w2")).map(a -> a.variable() + "/" + a.kind() + "/" + a.verdict())
                .toList();
        assertTrue(alerts.contains("x ~ y/RELATIONSHIP_CHANGE/MATERIAL"), alerts.toString());
        assertTrue(alerts.stream().noneMatch(a -> a.startsWith("a ~ b")), alerts.toString());
    }

    @Test
    @Order(3)
    void thePairsCostNoStatementOfTheirOwn() {
        List<Finding> ignored = new java.util.ArrayList<>();
        judged("rel-plain", "w1", ignored);
        StatementCounter.SourceStatements plain = judged("rel-plain", "w2", ignored);
        StatementCounter.SourceStatements withPairs = judged("rel", "w2", ignored);
        assertEquals(plain, withPairs, "two relationships or none: the same statements to the source");
        assertEquals(1, withPairs.copies());
    }

    @Test
    @Order(4)
    void aSummaryStoredBeforeTheRelationshipsWereConfiguredIsReadAgainOnce() {
        WaveProfile p = session.store().latestSummary("rel", "w1").orElseThrow().profile();
        WaveProfile legacy = new WaveProfile(p.wave(), p.rows(), p.schema(), p.columns(), p.weights());
        String withEmptyPairs = Json.write(legacy);
        assertTrue(withEmptyPairs.contains(",\"pairs\":[]"), "the pairs field to strip, so that the stored"
                + " summary is one written before pairs existed: " + withEmptyPairs.substring(0, Math.min(200, withEmptyPairs.length())));
        session.store().jdbi().useHandle(h -> h.createUpdate("UPDATE rel_results.wave_summary SET checksum = :c,"
                        + " summary = CAST(:s AS jsonb) WHERE dataset = 'rel' AND wave = 'w1'")
                .bind("c", legacy.checksum()).bind("s", withEmptyPairs.replace(",\"pairs\":[]", "")).execute());
        assertTrue(session.store().latestSummary("rel", "w1").orElseThrow().profile().pairs().isEmpty());

        List<Finding> findings = new java.util.ArrayList<>();
        assertEquals(2, judged("rel", "w2", findings).copies(), "the old summary lacks the pairs: w1 is read again");
        assertEquals(Verdict.MATERIAL, finding(findings, "x ~ y", FindingKind.RELATIONSHIP_CHANGE).verdict());
        assertEquals(1, judged("rel", "w2", new java.util.ArrayList<>()).copies(), "and stored with them");
    }

    @Test
    @Order(5)
    void aRelationshipOfAColumnThatIsNotAMonitoredNumberIsRefusedNamingTheKey() {
        assertCatalogError("[{x: a, y: regoin}]", "datasets[0].relationships[0].y",
                "column regoin does not exist in the source table");
        assertCatalogError("[{x: a, y: b}, {x: region, y: x}]", "datasets[0].relationships[1].x",
                "expected a numeric column (an INTEGER or DECIMAL type such as integer, numeric or double"
                        + " precision), but region is text");
        assertCatalogError("[{x: respondent_id, y: x}]", "datasets[0].relationships[0].x",
                "expected a monitored numeric column, but respondent_id is not monitored: it is listed in exclude");
        assertCatalogError("[{x: x, y: wave}]", "datasets[0].relationships[0].y",
                "expected a monitored numeric column, but wave is not monitored: it is the wave column");
    }

    private static void assertCatalogError(String relationships, String key, String message) {
        WardenConfig c = ConfigLoader.parse(yaml(relationships));
        ConfigException e = assertThrows(ConfigException.class,
                () -> session.source().useHandle(h -> CatalogCheck.verify(h, c)));
        assertEquals(key, e.key(), e.getMessage());
        assertTrue(e.problem().startsWith(message), e.getMessage());
        assertNotNull(e.getMessage());
    }

    @Test
    @Order(6)
    void aDatasetWithoutRelationshipsJudgesAsBefore() {
        DatasetConfig plain = config.dataset("rel-plain");
        assertTrue(plain.relationships().isEmpty());
        WaveProfile p = session.store().latestSummary("rel-plain", "w2").orElseThrow().profile();
        assertTrue(p.pairs().isEmpty(), "no pairs asked, none stored");
    }
}
