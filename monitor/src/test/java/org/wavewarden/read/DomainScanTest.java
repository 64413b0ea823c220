package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A breakdown column's domains, tallied in the wave's one pass, equal PostgreSQL's own GROUP BY on the same rows:
 * per domain and value the counts, NULLs and weight sums, and per domain, PSU and value the PSU sums.
 */
public class DomainScanTest {

    static final SourceColumn WEIGHT = new SourceColumn("w", ColumnType.DECIMAL, "numeric");
    static final WaveScanner.Design DESIGN = new WaveScanner.Design(
            new SourceColumn("stratum", ColumnType.TEXT, "text"), new SourceColumn("psu", ColumnType.INTEGER, "integer"));
    static final SourceColumn DISTRICT = new SourceColumn("district", ColumnType.TEXT, "text");
    static final SourceColumn MODE = new SourceColumn("mode", ColumnType.INTEGER, "integer");
    static final List<SourceColumn> COLUMNS = List.of(new SourceColumn("code", ColumnType.TEXT, "text"),
            new SourceColumn("score", ColumnType.INTEGER, "integer"),
            new SourceColumn("amount", ColumnType.DECIMAL, "numeric"),
            new SourceColumn("height", ColumnType.DECIMAL, "double precision"));

    static Handle h;
    static WaveScanner.WaveScan scan;

    /**
     * Two waves of 3,000 rows over 3 strata x 7 clusters, with NULL weights, NULL districts and NULL answers; the
     * district KES is interviewed in cluster 0 only, so its PSU sums are zero elsewhere.
     */
    public static final String ANSWERS = """
            CREATE TABLE answers AS
            SELECT CASE WHEN g <= 3000 THEN 'w1' ELSE 'w2' END AS wave,
                   (ARRAY['north', 'south', 'east'])[1 + g % 3] AS stratum, g % 7 AS psu,
                   CASE WHEN g % 41 = 0 THEN NULL ELSE 0.5 + (g % 13) * 0.37 END AS w,
                   CASE WHEN g % 29 = 0 THEN NULL WHEN g % 7 = 0 AND g % 2 = 0 THEN 'KES'
                        ELSE (ARRAY['GUL', 'SAL', 'BRN', 'TID'])[1 + (g * 11) % 4] END AS district,
                   1 + (g * 5) % 3 AS mode,
                   (ARRAY['a', 'b', 'c', 'd'])[1 + (g * 7) % 4 + CASE WHEN g > 3000 AND g % 5 = 0 THEN -1 ELSE 0 END
                        + CASE WHEN (g * 7) % 4 = 0 AND g > 3000 AND g % 5 = 0 THEN 1 ELSE 0 END] AS code,
                   CASE WHEN g % 31 = 0 THEN -9 WHEN g % 17 = 0 THEN NULL
                        ELSE g % 23 + CASE WHEN g > 3000 THEN g % 3 ELSE 0 END END AS score,
                   ((g % 40) * 0.25)::numeric(6, 2) AS amount,
                   CASE WHEN g % 19 = 0 THEN NULL ELSE 150 + (g % 37) * 0.5 END::float8 AS height
            FROM generate_series(1, 6000) g
            """;

    @BeforeAll
    static void setUp() throws Exception {
        String url = TestDatabase.freshDatabase("domains");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(ANSWERS);
        }
        h = Jdbi.create(url, "postgres", "").open();
        scan = new BinaryWaveScanner(1000, 1000).scan(h, source("answers"), "w1", COLUMNS, WEIGHT, DESIGN,
                List.of(), new WaveScanner.Domains(List.of(DISTRICT, MODE), 50), null);
    }

    @AfterAll
    static void tearDown() {
        h.close();
    }

    static WaveSource source(String table) {
        return new WaveSource(new Identifiers.TableName("public", table), "wave", null);
    }

    static DomainTally domains(String breakdown) {
        return scan.domains().stream().filter(t -> t.column().equals(breakdown)).findFirst().orElseThrow();
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({"district", "mode"})
    void domainRowsAndNullDomainsAreTheDatabasesCounts(String breakdown) {
        DomainTally t = domains(breakdown);
        Map<String, Long> expected = new HashMap<>();
        h.createQuery("SELECT " + breakdown + "::text AS dom, count(*) AS n FROM answers WHERE wave = 'w1' AND "
                + breakdown + " IS NOT NULL GROUP BY 1").mapToMap()
                .forEach(r -> expected.put((String) r.get("dom"), ((Number) r.get("n")).longValue()));
        assertEquals(expected.keySet(), java.util.Set.copyOf(t.domains()));
        for (int d = 0; d < t.domains().size(); d++) {
            assertEquals(expected.get(t.domains().get(d)), t.rows()[d], t.domains().get(d));
        }
        long nulls = h.createQuery("SELECT count(*) FROM answers WHERE wave = 'w1' AND " + breakdown + " IS NULL")
                .mapTo(Long.class).one();
        assertEquals(nulls, t.nullRows());
        assertEquals(0, t.overflowDomains());
        assertEquals(0, t.overflowRows());
    }

    @ParameterizedTest(name = "{0} by {1}")
    @CsvSource({
            "district, code", "district, score", "district, amount", "district, height",
            "mode,     code", "mode,     score", "mode,     amount", "mode,     height"})
    void countsNullsAndWeightSumsPerDomainAndValueAreTheDatabasesGroupBy(String breakdown, String column) {
        DomainTally t = domains(breakdown);
        Map<String, Map<String, long[]>> counts = new HashMap<>();
        Map<String, Map<String, double[]>> sums = new HashMap<>();
        h.createQuery("SELECT " + breakdown + "::text AS dom, " + column + "::text AS v, count(*) AS n,"
                        + " coalesce(sum(w), 0) AS sw, coalesce(sum(w * w), 0) AS sw2 FROM answers"
                        + " WHERE wave = 'w1' AND " + breakdown + " IS NOT NULL GROUP BY 1, 2").mapToMap()
                .forEach(r -> {
                    String v = r.get("v") == null ? "(null)" : (String) r.get("v");
                    counts.computeIfAbsent((String) r.get("dom"), k -> new HashMap<>())
                            .put(v, new long[] {((Number) r.get("n")).longValue()});
                    sums.computeIfAbsent((String) r.get("dom"), k -> new HashMap<>()).put(v, new double[] {
                            ((Number) r.get("sw")).doubleValue(), ((Number) r.get("sw2")).doubleValue()});
                });
        for (int d = 0; d < t.domains().size(); d++) {
            String dom = t.domains().get(d);
            ColumnTally tally = t.tallies().get(column).get(d);
            Map<String, long[]> db = counts.get(dom);
            long[] nulls = db.remove("(null)");
            assertEquals(nulls == null ? 0 : nulls[0], tally.nullCount(), dom + " NULLs");
            assertEquals(t.rows()[d], tally.rowCount(), dom + " rows");
            assertTrue(tally.binning().isExact(), dom);
            assertEquals(db.keySet(), tally.valueCounts().keySet(), dom + " values");
            db.forEach((v, n) -> assertEquals(n[0], tally.valueCounts().get(v), dom + " " + v));
            Map<String, double[]> w = t.weights().get(column).get(d);
            sums.get(dom).remove("(null)");
            assertEquals(sums.get(dom).keySet(), w.keySet(), dom + " weighted values");
            sums.get(dom).forEach((v, s) -> assertArrayEquals(s, w.get(v), 1e-9, dom + " " + v));
        }
    }

    @ParameterizedTest(name = "{0} by {1}")
    @CsvSource({
            "district, code", "district, score", "district, amount", "district, height",
            "mode,     code", "mode,     score", "mode,     amount", "mode,     height"})
    void psuSumsPerDomainCoverEveryPsuOfTheWave(String breakdown, String column) {
        DomainTally t = domains(breakdown);
        DesignSummary wave = scan.design();
        int psus = wave.psuCount();
        assertEquals(21, psus);
        Map<String, Map<String, double[]>> cells = new HashMap<>();
        h.createQuery("SELECT " + breakdown + "::text AS dom, stratum, psu::text AS psu, " + column + "::text AS v,"
                        + " coalesce(sum(w), 0) AS s FROM answers WHERE wave = 'w1' AND " + breakdown + " IS NOT NULL"
                        + " AND " + column + " IS NOT NULL GROUP BY 1, 2, 3, 4").mapToMap()
                .forEach(r -> cells.computeIfAbsent((String) r.get("dom"), k -> new HashMap<>())
                        .computeIfAbsent((String) r.get("v"), k -> new double[psus])[
                        psu(wave, (String) r.get("stratum"), (String) r.get("psu"))] += ((Number) r.get("s")).doubleValue());
        boolean numeric = !column.equals("code");
        Map<String, double[][]> totals = new HashMap<>();
        if (numeric) {
            h.createQuery("SELECT " + breakdown + "::text AS dom, stratum, psu::text AS psu, coalesce(sum(w), 0) AS w,"
                            + " coalesce(sum(w * " + column + "), 0) AS wy, coalesce(sum(w * " + column + " * " + column
                            + "), 0) AS wyy FROM answers WHERE wave = 'w1' AND " + breakdown + " IS NOT NULL AND "
                            + column + " IS NOT NULL GROUP BY 1, 2, 3").mapToMap()
                    .forEach(r -> {
                        double[][] s = totals.computeIfAbsent((String) r.get("dom"), k -> new double[3][psus]);
                        int p = psu(wave, (String) r.get("stratum"), (String) r.get("psu"));
                        s[0][p] = ((Number) r.get("w")).doubleValue();
                        s[1][p] = ((Number) r.get("wy")).doubleValue();
                        s[2][p] = ((Number) r.get("wyy")).doubleValue();
                    });
        }
        for (int d = 0; d < t.domains().size(); d++) {
            String dom = t.domains().get(d);
            DesignSummary.ColumnDesign cd = t.designs().get(column).get(d);
            assertTrue(cd.complete(), dom + " has few values");
            assertEquals(cells.get(dom).keySet(), cd.cells().keySet(), dom);
            cells.get(dom).forEach((v, s) -> assertArrayEquals(s, cd.cells().get(v), 1e-9, dom + " " + v));
            if (numeric) {
                assertArrayEquals(totals.get(dom)[0], cd.weight(), 1e-9, dom + " sum w");
                assertArrayEquals(totals.get(dom)[1], cd.weightedSum(), 1e-9, dom + " sum w y");
                assertArrayEquals(totals.get(dom)[2], cd.weightedSquares(), 1e-6, dom + " sum w y^2");
            }
        }
    }

    @Test
    void aDomainInOneClusterHasZeroSumsInEveryOtherPsu() {
        DomainTally t = domains("district");
        DesignSummary.ColumnDesign kes = t.designs().get("score").get(t.indexOf("KES"));
        DesignSummary wave = scan.design();
        for (int p = 0; p < wave.psuCount(); p++) {
            if (!wave.psuLabel().get(p).equals("0")) {
                assertEquals(0.0, kes.weight()[p], "PSU " + wave.psuStratum().get(p) + "/" + wave.psuLabel().get(p));
            } else {
                assertTrue(kes.weight()[p] > 0);
            }
        }
    }

    @Test
    void beyondMaxDomainsRowsAreCountedAsOverflowAndComparedNowhere() throws Exception {
        try (Connection c = TestDatabase.connect(TestDatabase.freshDatabase("domains_overflow"));
             var st = c.createStatement()) {
            // A x10, B x20, C x30, D x40, E x50 in that order, then 5 rows without a domain.
            st.execute("""
                    CREATE TABLE five AS
                    SELECT 'w1'::text AS wave, d AS domain, g % 4 AS score
                    FROM (VALUES ('A', 10, 1), ('B', 20, 2), ('C', 30, 3), ('D', 40, 4), ('E', 50, 5), (NULL, 5, 6))
                         AS x(d, n, o), generate_series(1, n) g
                    ORDER BY o, g
                    """);
            try (Handle fh = Jdbi.create(c.getMetaData().getURL(), "postgres", "").open()) {
                SourceColumn score = new SourceColumn("score", ColumnType.INTEGER, "integer");
                var s = new BinaryWaveScanner(1000).scan(fh, source("five"), "w1", List.of(score), null, null,
                        List.of(), new WaveScanner.Domains(
                                List.of(new SourceColumn("domain", ColumnType.TEXT, "text")), 3), null);
                DomainTally t = s.domains().get(0);
                assertEquals(List.of("A", "B", "C"), t.domains(), "the first three to appear are kept");
                assertArrayEquals(new long[] {10, 20, 30}, t.rows());
                assertEquals(2, t.overflowDomains());
                assertEquals(90, t.overflowRows());
                assertEquals(5, t.nullRows());
                assertEquals(155, s.rows(), "the whole wave still has every row");
                long kept = t.tallies().get("score").stream().mapToLong(x -> x.rowCount()).sum();
                assertEquals(60, kept);
            }
        }
    }

    @Test
    void aDomainWithManyNumbersIsSummarisedInBinsKeepingCodesExact() throws Exception {
        try (Connection c = TestDatabase.connect(TestDatabase.freshDatabase("domains_bins"));
             var st = c.createStatement()) {
            // P: 600 distinct amounts and 20 codes -9; Q: 30 distinct integers. 631 distinct values in the wave.
            st.execute("""
                    CREATE TABLE amounts AS
                    SELECT 'w1'::text AS wave, 'P' AS domain, g * 1.37::float8 AS x FROM generate_series(1, 600) g
                    UNION ALL SELECT 'w1', 'P', -9 FROM generate_series(1, 20)
                    UNION ALL SELECT 'w1', 'Q', (g % 30 + 1)::float8 FROM generate_series(1, 300) g
                    """);
            try (Handle fh = Jdbi.create(c.getMetaData().getURL(), "postgres", "").open()) {
                SourceColumn x = new SourceColumn("x", ColumnType.DECIMAL, "double precision");
                WaveScanner.Domains byDomain = new WaveScanner.Domains(
                        List.of(new SourceColumn("domain", ColumnType.TEXT, "text")), 10);
                // The wave keeps 1,000 numbers exactly, a domain 64 (a 50th of that, at least 64).
                var exactWave = new BinaryWaveScanner(1000, 1000).scan(fh, source("amounts"), "w1", List.of(x), null,
                        null, List.of(), byDomain, null);
                assertTrue(exactWave.columns().get("x").binning().isExact());
                DomainTally t = exactWave.domains().get(0);
                ColumnTally p = t.tallies().get("x").get(t.indexOf("P"));
                ColumnTally q = t.tallies().get("x").get(t.indexOf("Q"));
                assertFalse(p.binning().isExact(), "600 distinct numbers exceed a domain's 64");
                assertEquals(620, p.valueCounts().values().stream().mapToLong(Long::longValue).sum());
                assertEquals(20L, p.valueCounts().get("-9"), "a code keeps its exact count");
                assertTrue(q.binning().isExact(), "30 distinct numbers are counted exactly");
                Map<String, Long> db = new HashMap<>();
                fh.createQuery("SELECT x::text AS v, count(*) AS n FROM amounts WHERE domain = 'Q' GROUP BY 1")
                        .mapToMap().forEach(r -> db.put((String) r.get("v"), ((Number) r.get("n")).longValue()));
                assertEquals(db, q.valueCounts());

                // When the whole wave's column goes to bins, so does every domain, with its counts kept.
                var binnedWave = new BinaryWaveScanner(1000, 200).scan(fh, source("amounts"), "w1", List.of(x), null,
                        null, List.of(), byDomain, null);
                assertFalse(binnedWave.columns().get("x").binning().isExact());
                DomainTally b = binnedWave.domains().get(0);
                for (String dom : List.of("P", "Q")) {
                    ColumnTally bt = b.tallies().get("x").get(b.indexOf(dom));
                    assertFalse(bt.binning().isExact(), dom);
                    assertEquals(dom.equals("P") ? 620 : 300,
                            bt.valueCounts().values().stream().mapToLong(Long::longValue).sum(), dom);
                }
                assertEquals(20L, b.tallies().get("x").get(b.indexOf("P")).valueCounts().get("-9"));
            }
        }
    }

    static int psu(DesignSummary d, String stratum, String label) {
        for (int p = 0; p < d.psuCount(); p++) {
            if (d.psuStratum().get(p).equals(stratum) && d.psuLabel().get(p).equals(label)) {
                return p;
            }
        }
        throw new AssertionError("no PSU " + stratum + "/" + label);
    }

    @Test
    void theScanHoldsTheWholeWaveUnchanged() throws Exception {
        // The same scan without breakdowns gives the same whole-wave tallies, weights and design.
        var plain = new BinaryWaveScanner(1000, 1000).scan(h, source("answers"), "w1", COLUMNS, WEIGHT, DESIGN,
                List.of(), null);
        assertNotNull(plain.design());
        assertEquals(plain, new WaveScanner.WaveScan(scan.rows(), scan.columns(), scan.weights(), scan.badWeights(),
                scan.design(), scan.pairs()));
    }
}
