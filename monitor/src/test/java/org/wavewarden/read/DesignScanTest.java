package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The PSU sums of one pass equal PostgreSQL's own GROUP BY (stratum, cluster, value) sums on the same rows. */
class DesignScanTest {

    private static final SourceColumn WEIGHT = new SourceColumn("w", ColumnType.DECIMAL, "numeric");
    private static final WaveScanner.Design DESIGN = new WaveScanner.Design(
            new SourceColumn("stratum", ColumnType.TEXT, "text"), new SourceColumn("psu", ColumnType.INTEGER, "integer"));

    @Test
    void psuSumsEqualTheDatabasesGroupBy() throws Exception {
        String url = TestDatabase.freshDatabase("design");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE TABLE answers AS
                    SELECT 'w1'::text AS wave, (ARRAY['north', 'south', 'east'])[1 + g % 3] AS stratum, g % 7 AS psu,
                           CASE WHEN g % 41 = 0 THEN NULL ELSE 0.5 + (g % 13) * 0.37 END AS w,
                           (ARRAY['a', 'b', 'c', 'd'])[1 + (g * 7) % 4] AS code,
                           CASE WHEN g % 31 = 0 THEN -9 WHEN g % 17 = 0 THEN NULL ELSE g % 23 END AS score,
                           g * 1.001::float8 AS amount
                    FROM generate_series(1, 4000) g;
                    """);
        }
        Jdbi jdbi = Jdbi.create(url, "postgres", "");
        try (Handle h = jdbi.open()) {
            WaveSource source = new WaveSource(new Identifiers.TableName("public", "answers"), "wave", null);
            List<SourceColumn> cols = List.of(new SourceColumn("code", ColumnType.TEXT, "text"),
                    new SourceColumn("score", ColumnType.INTEGER, "integer"),
                    new SourceColumn("amount", ColumnType.DECIMAL, "double precision"));
            WaveScanner.WaveScan scan = new BinaryWaveScanner(1000, 1000).scan(h, source, "w1", cols, WEIGHT, DESIGN,
                    null);
            DesignSummary d = scan.design();
            assertNotNull(d);
            assertEquals(21, d.psuCount(), "3 strata x 7 clusters, each pair a PSU of its own");
            assertEquals(0, d.rowsWithoutPsu());
            for (String col : List.of("code", "score")) {
                DesignSummary.ColumnDesign cd = d.columns().get(col);
                assertTrue(cd.complete(), col + " has few values");
                List<Map<String, Object>> db = h.createQuery("SELECT stratum, psu::text AS psu, " + col
                        + "::text AS v, coalesce(sum(w), 0) AS s FROM answers WHERE " + col + " IS NOT NULL"
                        + " GROUP BY 1, 2, 3").mapToMap().list();
                for (Map<String, Object> row : db) {
                    int p = psu(d, (String) row.get("stratum"), (String) row.get("psu"));
                    assertEquals(((Number) row.get("s")).doubleValue(), cd.cells().get((String) row.get("v"))[p], 1e-9,
                            col + " " + row);
                }
            }
            DesignSummary.ColumnDesign score = d.columns().get("score");
            List<Map<String, Object>> totals = h.createQuery("SELECT stratum, psu::text AS psu, coalesce(sum(w), 0) AS w,"
                    + " coalesce(sum(w * score), 0) AS wy, coalesce(sum(w * score * score), 0) AS wyy FROM answers"
                    + " WHERE score IS NOT NULL GROUP BY 1, 2").mapToMap().list();
            for (Map<String, Object> row : totals) {
                int p = psu(d, (String) row.get("stratum"), (String) row.get("psu"));
                assertEquals(((Number) row.get("w")).doubleValue(), score.weight()[p], 1e-9);
                assertEquals(((Number) row.get("wy")).doubleValue(), score.weightedSum()[p], 1e-9);
                assertEquals(((Number) row.get("wyy")).doubleValue(), score.weightedSquares()[p], 1e-9);
            }
            assertNull(d.columns().get("code").weight(), "a text column has no numeric totals");

            // 4,000 distinct amounts go to bins: the PSU totals stay exact, cells are kept for code-like values only.
            DesignSummary.ColumnDesign amount = d.columns().get("amount");
            assertFalse(amount.complete());
            double all = h.createQuery("SELECT sum(w * amount) FROM answers").mapTo(Double.class).one();
            assertEquals(all, java.util.Arrays.stream(amount.weightedSum()).sum(), 1e-6 * all);
            assertTrue(amount.cells().isEmpty(), "no amount is code-like");
        }
    }

    @Test
    void rowsWithoutAStratumOrClusterAreCountedApart() throws Exception {
        String url = TestDatabase.freshDatabase("design_nulls");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE TABLE answers AS
                    SELECT 'w1'::text AS wave, CASE WHEN g % 10 = 0 THEN NULL ELSE 's' || g % 2 END AS stratum,
                           g % 5 AS psu, 1.0 AS w, g % 3 AS score
                    FROM generate_series(1, 100) g;
                    """);
        }
        try (Handle h = Jdbi.create(url, "postgres", "").open()) {
            WaveSource source = new WaveSource(new Identifiers.TableName("public", "answers"), "wave", null);
            var scan = new BinaryWaveScanner(1000).scan(h, source, "w1",
                    List.of(new SourceColumn("score", ColumnType.INTEGER, "integer")), WEIGHT, DESIGN, null);
            assertEquals(10, scan.design().rowsWithoutPsu());
            assertEquals(100, scan.rows(), "their answers are still tallied");
            assertEquals(90.0, java.util.Arrays.stream(scan.design().columns().get("score").weight()).sum(), 1e-12);
        }
    }

    private static int psu(DesignSummary d, String stratum, String label) {
        for (int p = 0; p < d.psuCount(); p++) {
            if (d.psuStratum().get(p).equals(stratum) && d.psuLabel().get(p).equals(label)) {
                return p;
            }
        }
        throw new AssertionError("no PSU " + stratum + "/" + label);
    }
}
