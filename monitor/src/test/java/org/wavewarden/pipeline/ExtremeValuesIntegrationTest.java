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
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Numbers at the edges of double precision, on a real PostgreSQL server: the largest finite doubles, the smallest
 * subnormal, a numeric far below a double's normal range. They are answers like any other: compared, plotted in the
 * HTML digest, never a crash or a skip.
 */
class ExtremeValuesIntegrationTest {

    @TempDir
    static Path dir;
    static Path config;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("extreme_values");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA edge;
                    CREATE TABLE edge.answers (wave text, huge float8, two_huge float8, tiny numeric);
                    -- huge: only the extremes, more of them at 1e308 in wave 2; two_huge: 498 ordinary values and one at each end of the doubles
                    INSERT INTO edge.answers
                    SELECT w::text,
                           CASE (g + w) % (2 + w) WHEN 0 THEN -1e308 WHEN 1 THEN 5e-324 ELSE 1e308 END,
                           CASE WHEN g = 1 THEN 1e308 WHEN g = 2 THEN -1e308 ELSE 40 + (g % 20) + w END,
                           CASE WHEN g % 5 = 0 THEN -1e-300 ELSE (g % 7) * w END
                    FROM generate_series(1, 2) w, generate_series(1, 500) g;
                    """);
        }
        config = dir.resolve("edge.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_edge}
                datasets:
                  - name: edge
                    table: edge.answers
                    waveColumn: wave
                    variables:
                      - {name: huge, kind: continuous}
                      - {name: two_huge, kind: continuous}
                      - {name: tiny, kind: continuous}
                """.formatted(url));
    }

    static List<JsonNode> findings(Path out, String variable) throws Exception {
        JsonNode json = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
        List<JsonNode> mine = new ArrayList<>();
        json.get("findings").forEach(f -> {
            if (f.get("variable").asText().equals(variable)) {
                mine.add(f);
            }
        });
        return mine;
    }

    static Path check(String wave) {
        Path out = dir.resolve("out-" + wave);
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out", out.toString());
        assertEquals(0, r.exitCode(), "wave " + wave + ": " + r.err() + r.out());
        return out;
    }

    @Test
    void theLargestAndSmallestDoublesAreComparedAndDrawnInTheHtmlDigest() throws Exception {
        check("1");
        Path out = check("2");
        String html = Files.readString(out.resolve("digest.html"));
        assertFalse(html.contains("NaN") || html.contains("Infinity"), "every coordinate is a finite number");
        int alert = html.indexOf("data-variable=\"huge\"");
        assertTrue(alert > 0, "the shift of huge is an alert of the digest");
        String article = html.substring(alert, html.indexOf("</article>", alert));
        assertTrue(article.contains("<svg") && article.contains("1e308"), "drawn in units of 1e308: " + article);
        assertFalse(html.contains("could not be drawn"), "every chart is drawn");
        assertTrue(findings(out, "huge").stream().noneMatch(f -> f.get("kind").asText().equals("SKIPPED")),
                findings(out, "huge").toString());
    }

    @Test
    void twoValuesAtTheEndsOfTheDoublesAmongOrdinaryOnesLeaveTheVariableCompared() throws Exception {
        check("1");
        Path out = check("2");
        List<JsonNode> mine = findings(out, "two_huge");
        assertTrue(mine.stream().anyMatch(f -> f.get("kind").asText().equals("SHIFT")), mine.toString());
        assertTrue(mine.stream().noneMatch(f -> f.get("kind").asText().equals("SKIPPED")), mine.toString());
    }

    @Test
    void aNumericFarBelowTheNormalDoublesIsANumberNotText() throws Exception {
        Path out = check("1");
        List<JsonNode> mine = findings(out, "tiny");
        assertTrue(mine.stream().noneMatch(f -> f.get("sentence").asText().contains("not a finite number")
                || f.get("kind").asText().equals("TEXT_IN_NUMERIC")), mine.toString());
    }
}
