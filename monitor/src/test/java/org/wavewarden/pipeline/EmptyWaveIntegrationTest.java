package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A wave listed without rows (its table created, its rows never loaded or all deleted), between two waves with
 * rows, on a real PostgreSQL server: the empty wave is a finding on the dataset, and the next wave is compared
 * against the last wave with rows, saying so.
 */
class EmptyWaveIntegrationTest {

    @TempDir
    static Path dir;
    static Path config;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("empty_wave");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA e;
                    CREATE TABLE e.w_1 AS SELECT 30 + g % 20 AS age, (ARRAY['a', 'b', 'c'])[1 + g % 3] AS answer
                    FROM generate_series(1, 600) g;
                    CREATE TABLE e.w_2 AS SELECT * FROM e.w_1 WHERE false;
                    CREATE TABLE e.w_3 AS SELECT 30 + g % 20 AS age, (ARRAY['a', 'b', 'c'])[1 + g % 3] AS answer
                    FROM generate_series(1, 600) g;
                    """);
        }
        config = dir.resolve("e.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_empty}
                datasets:
                  - name: emptied
                    tablePattern: e.w_{wave}
                    variables:
                      - {name: age, kind: continuous}
                      - {name: answer, kind: categorical}
                """.formatted(url));
    }

    static JsonNode check(String wave) throws Exception {
        Path out = dir.resolve("out-" + wave);
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out", out.toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        return Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
    }

    static String kinds(JsonNode report) {
        StringBuilder sb = new StringBuilder();
        report.get("findings").forEach(f -> sb.append(f.get("variable").asText()).append(' ')
                .append(f.get("kind").asText()).append('\n'));
        return sb.toString();
    }

    @Test
    void anEmptyWaveIsAFindingAndNeverABaseline() throws Exception {
        check("1");
        JsonNode empty = check("2");
        assertTrue(kinds(empty).contains(WaveJudge.EMPTY_WAVE_SUBJECT + " EMPTY_WAVE"), kinds(empty));

        JsonNode next = check("3");
        assertEquals("1", next.get("againstWave").asText(), "compared against the last wave with rows");
        assertTrue(kinds(next).contains("age SHIFT") && kinds(next).contains("answer SHIFT"), kinds(next));
        assertTrue(!kinds(next).contains("SKIPPED"), kinds(next));
        assertTrue(next.get("inference").toString().contains("Wave 2 has no rows and is never a baseline: wave 3 is"
                + " compared against 1"), next.get("inference").toString());
    }
}
