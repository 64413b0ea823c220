package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterEach;
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
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * An unexpected error while one variable is judged, or while one alert's chart is prepared (injected at the named
 * fault points), costs that variable or that chart only: the run, the other variables and the digest go on.
 */
class VariableContainmentIntegrationTest {

    @TempDir
    static Path dir;
    static Path config;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("containment");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Both variables move a lot in wave 2.
            st.execute("""
                    CREATE SCHEMA s;
                    CREATE TABLE s.answers AS
                    SELECT w::text AS wave, 1000 + (g % 50) * 20 + 400 * w AS income,
                           (ARRAY['north', 'east', 'south', 'west'])[1 + (g * w) % (2 + w)] AS region
                    FROM generate_series(1, 2) w, generate_series(1, 1000) g;
                    """);
        }
        config = dir.resolve("c.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_contained}
                datasets:
                  - name: contained
                    table: s.answers
                    waveColumn: wave
                    variables:
                      - {name: income, kind: continuous}
                      - {name: region, kind: categorical}
                """.formatted(url));
        assertEquals(0, CliRun.of("check", "--config", config.toString(), "--wave", "1", "--out",
                dir.resolve("out-1").toString()).exitCode());
    }

    @AfterEach
    void noFault() {
        System.clearProperty("wavewarden.fault.fail");
    }

    static Path check(String out) {
        Path o = dir.resolve(out);
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", "2", "--out", o.toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        return o;
    }

    static String kinds(Path out, String variable) throws Exception {
        StringBuilder sb = new StringBuilder();
        for (JsonNode f : Json.mapper().readTree(Files.readString(out.resolve("findings.json"))).get("findings")) {
            if (f.get("variable").asText().equals(variable)) {
                sb.append(f.get("kind").asText()).append(": ").append(f.get("sentence").asText()).append('\n');
            }
        }
        return sb.toString();
    }

    static String article(String html, String variable) {
        int at = html.indexOf("<article class=\"alert");
        while (at >= 0) {
            int end = html.indexOf("</article>", at);
            String a = html.substring(at, end);
            if (a.contains("data-variable=\"" + variable + "\"")) {
                return a;
            }
            at = html.indexOf("<article class=\"alert", end);
        }
        throw new AssertionError("no alert of " + variable + " in the digest");
    }

    @Test
    void aVariableWhoseJudgingThrowsIsSkippedNamingTheErrorAndTheOthersAreJudged() throws Exception {
        System.setProperty("wavewarden.fault.fail", FaultPoints.JUDGE_VARIABLE + "income");
        Path out = check("judge-fault");
        String income = kinds(out, "income");
        assertTrue(income.startsWith("SKIPPED: Not compared: the answers could not be analysed (InjectedFault"),
                income);
        assertTrue(kinds(out, "region").contains("SHIFT"), kinds(out, "region"));
        String html = Files.readString(out.resolve("digest.html"));
        assertTrue(article(html, "region").contains("<svg"), "the other alerts keep their charts");
    }

    @Test
    void anAlertWhoseChartThrowsIsShownWithANoteAndTheDigestGoesOn() throws Exception {
        System.setProperty("wavewarden.fault.fail", FaultPoints.PLOT_VARIABLE + "region");
        Path out = check("plot-fault");
        String html = Files.readString(out.resolve("digest.html"));
        String region = article(html, "region");
        assertTrue(region.contains("could not be drawn (InjectedFault)"), region);
        assertFalse(region.contains("<svg"), region);
        assertTrue(article(html, "income").contains("<svg"), "the other alerts keep their charts");
    }
}
