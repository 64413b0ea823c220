package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A dataset checked without weights and then configured with its weight column, on a real PostgreSQL server: the
 * stored summary of the earlier wave holds no weights, so it is not reused; the earlier wave is read again, the
 * comparison is weighted, and the run says why it read the earlier wave again. Wave 2 keeps wave 1's answers but
 * doubles the home owners' weights (the table of {@link WeightedJudgeIntegrationTest}).
 */
class SummaryKeyIntegrationTest {

    @TempDir
    static Path dir;
    static String url;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("summary_key");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA survey;
                    CREATE TABLE survey.household AS
                    SELECT wave::text AS wave, g AS household_id,
                           (1 + (g % 7) * 0.25) * CASE WHEN wave = 2 AND g % 2 = 1 THEN 2 ELSE 1 END AS w,
                           g % 2 AS owns_home
                    FROM generate_series(1, 2) wave, generate_series(1, 2000) g;
                    """);
        }
    }

    static Path config(String name, String weight) throws Exception {
        Path p = dir.resolve(name + ".yaml");
        Files.writeString(p, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_keyed}
                datasets:
                  - name: households
                    table: survey.household
                    waveColumn: wave
                    exclude: [household_id%s]
                %s    variables:
                      - {name: owns_home, kind: binary, successValue: "1"}
                """.formatted(url, weight == null ? ", w" : "", weight == null ? "" : "    weightColumn: " + weight + "\n"));
        return p;
    }

    static JsonNode check(Path config, String wave, String out) throws Exception {
        Path dirOut = dir.resolve(out);
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out", dirOut.toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        return Json.mapper().readTree(Files.readString(dirOut.resolve("findings.json")));
    }

    static JsonNode shift(JsonNode report, String variable) {
        for (JsonNode f : report.get("findings")) {
            if (f.get("variable").asText().equals(variable) && f.get("kind").asText().equals("SHIFT")) {
                return f;
            }
        }
        throw new AssertionError("no SHIFT of " + variable + ": " + report);
    }

    static boolean recomputed(JsonNode report) {
        for (JsonNode line : report.get("inference")) {
            if (line.asText().contains("baseline summary was recomputed")) {
                return true;
            }
        }
        return false;
    }

    @Test
    void addingTheWeightColumnRereadsTheEarlierWaveAndWeighsTheComparison() throws Exception {
        Path plain = config("plain", null);
        check(plain, "1", "plain-1");
        JsonNode before = check(plain, "2", "plain-2");
        assertFalse(shift(before, "owns_home").get("test").asText().contains("weighted"));
        assertFalse(recomputed(before));

        Path weighted = config("weighted", "w");
        JsonNode after = check(weighted, "2", "weighted-2");
        JsonNode owns = shift(after, "owns_home");
        assertEquals(WeightedComparator.SHARES_TEST, owns.get("test").asText(), owns.toString());
        assertEquals("Cohen's h (weighted shares)", owns.get("effect").get("name").asText());
        assertTrue(recomputed(after), "the run says the baseline was read again: " + after.get("inference"));
        assertTrue(Files.readString(dir.resolve("weighted-2").resolve("digest.html"))
                .contains("baseline summary was recomputed"), "and so does the digest");

        JsonNode again = check(weighted, "2", "weighted-2-again");
        assertFalse(recomputed(again), "the summary read under the new configuration is reused");
        assertEquals(owns.get("statistic").asDouble(), shift(again, "owns_home").get("statistic").asDouble());
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT count(*) FROM ww_keyed.run WHERE wave = '2'"
                     + " AND superseded_at IS NULL")) {
            rs.next();
            assertEquals(1, rs.getInt(1), "a rerun replaces its run, it adds none");
        }
    }
}
