package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The per-value weight sums of one pass equal PostgreSQL's own GROUP BY sums on the same rows. */
class WeightSumsTest {

    @Test
    void weightSumsPerValueEqualTheDatabasesGroupBy() throws Exception {
        String url = TestDatabase.freshDatabase("weights");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE TABLE answers AS
                    SELECT 'w1'::text AS wave, g % 7 AS size, (ARRAY['a', 'b', 'c'])[1 + g % 3] AS code,
                           CASE WHEN g % 50 = 0 THEN NULL ELSE 0.5 + (g % 13) * 0.37 END AS w
                    FROM generate_series(1, 3000) g;
                    """);
        }
        Jdbi jdbi = Jdbi.create(url, "postgres", "");
        try (Handle h = jdbi.open()) {
            WaveSource source = new WaveSource(new Identifiers.TableName("public", "answers"), "wave", null);
            List<SourceColumn> cols = List.of(new SourceColumn("size", ColumnType.INTEGER, "integer"),
                    new SourceColumn("code", ColumnType.TEXT, "text"));
            WaveScanner.WaveScan scan = new WaveScanner(1000, "w").scan(h, source, "w1", cols, null);
            assertEquals(60, scan.badWeights(), "rows with a NULL weight");
            for (String col : List.of("size", "code")) {
                Map<String, double[]> mine = scan.weights().get(col);
                List<Map<String, Object>> db = h.createQuery("SELECT " + col + "::text AS v, sum(w) AS s, sum(w * w) AS q"
                        + " FROM answers WHERE w IS NOT NULL GROUP BY 1").mapToMap().list();
                assertEquals(db.size(), mine.size());
                for (Map<String, Object> row : db) {
                    double[] ws = mine.get((String) row.get("v"));
                    assertEquals(((Number) row.get("s")).doubleValue(), ws[0], 1e-9, col + " " + row.get("v"));
                    assertEquals(((Number) row.get("q")).doubleValue(), ws[1], 1e-9, col + " " + row.get("v"));
                }
            }
            // Counts are unaffected by the weight column, and unweighted scans carry no weights.
            WaveScanner.WaveScan plain = new WaveScanner(1000).scan(h, source, "w1", cols, null);
            assertEquals(plain.columns(), scan.columns());
            assertTrue(plain.weights().isEmpty());
        }
    }
}
