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

    private static final SourceColumn WEIGHT = new SourceColumn("w", ColumnType.DECIMAL, "numeric");

    @Test
    void weightSumsPerValueEqualTheDatabasesGroupByInBothScanners() throws Exception {
        String url = TestDatabase.freshDatabase("weights");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE TABLE answers AS
                    SELECT 'w1'::text AS wave, g % 7 AS size, (ARRAY['a', 'b', 'c'])[1 + g % 3] AS code,
                           CASE WHEN g % 50 = 0 THEN NULL ELSE 0.5 + (g % 13) * 0.37 END AS w,
                           g * 1.001::float8 AS amount
                    FROM generate_series(1, 3000) g;
                    """);
        }
        Jdbi jdbi = Jdbi.create(url, "postgres", "");
        try (Handle h = jdbi.open()) {
            WaveSource source = new WaveSource(new Identifiers.TableName("public", "answers"), "wave", null);
            List<SourceColumn> cols = List.of(new SourceColumn("size", ColumnType.INTEGER, "integer"),
                    new SourceColumn("code", ColumnType.TEXT, "text"));
            WaveScanner.WaveScan scan = new TextWaveScanner(1000).scan(h, source, "w1", cols, WEIGHT, null);
            assertEquals(scan, new BinaryWaveScanner(1000).scan(h, source, "w1", cols, WEIGHT, null),
                    "the binary scanner reads the same weights");
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
            WaveScanner.WaveScan plain = new TextWaveScanner(1000).scan(h, source, "w1", cols, null);
            assertEquals(plain.columns(), scan.columns());
            assertTrue(plain.weights().isEmpty());
        }
    }

    @Test
    void aSummarisedColumnKeepsEveryWeight() throws Exception {
        String url = TestDatabase.freshDatabase("weights_binned");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE TABLE answers AS
                    SELECT 'w1'::text AS wave, CASE WHEN g % 97 = 0 THEN -9 ELSE g * 1.001 END::float8 AS amount,
                           0.5 + (g % 13) * 0.37 AS w
                    FROM generate_series(1, 5000) g;
                    """);
        }
        Jdbi jdbi = Jdbi.create(url, "postgres", "");
        try (Handle h = jdbi.open()) {
            WaveSource source = new WaveSource(new Identifiers.TableName("public", "answers"), "wave", null);
            List<SourceColumn> cols = List.of(new SourceColumn("amount", ColumnType.DECIMAL, "double precision"));
            WaveScanner.WaveScan text = new TextWaveScanner(1000, 1000).scan(h, source, "w1", cols, WEIGHT, null);
            WaveScanner.WaveScan binary = new BinaryWaveScanner(1000, 1000).scan(h, source, "w1", cols, WEIGHT, null);
            assertEquals(text, binary, "both scanners summarise alike");
            assertTrue(!binary.columns().get("amount").binning().isExact(), "5,000 distinct values exceed 1,000");
            double total = h.createQuery("SELECT sum(w) FROM answers").mapTo(Double.class).one();
            double minusNine = h.createQuery("SELECT sum(w) FROM answers WHERE amount = -9").mapTo(Double.class).one();
            Map<String, double[]> ws = binary.weights().get("amount");
            assertEquals(total, ws.values().stream().mapToDouble(x -> x[0]).sum(), 1e-6);
            assertEquals(minusNine, ws.get("-9")[0], 1e-9, "the code -9 keeps its exact weight");
            assertEquals(51L, binary.columns().get("amount").valueCounts().get("-9"), "and its exact count");
        }
    }
}
