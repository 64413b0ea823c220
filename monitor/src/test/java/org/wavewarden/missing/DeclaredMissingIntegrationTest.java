package org.wavewarden.missing;

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
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * On a real PostgreSQL server: the codebook declares -9 (refused) and the range -99..-90 (not asked) for the weekly
 * hours worked, and the data also carry 999, which nobody declared. The declared values are left out and counted by
 * reason, never reported as disguised; the detector still runs on the rest and reports the 999.
 */
class DeclaredMissingIntegrationTest {

    @TempDir
    static Path dir;
    static String url;
    static Path config;

    static final String CONFIG = """
            source:
              jdbcUrl: "%s"
              user: postgres
            results: {schema: ww_declared}
            datasets:
              - name: labour
                table: survey.labour
                waveColumn: wave
                variables:
                  - name: hours
                    kind: continuous
                    unit: hours
                    missingCodes: [{value: -9, reason: refused}]
                    missingRanges: [{min: -99, max: -90, reason: "not asked"}]
                  %s
            """;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("declared_missing");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Per wave 1,000 rows: 900 answers 10..60 hours, 40 refused (-9), 20 at -95 and 10 at -90 (not asked),
            // and 30 at the undeclared 999.
            st.execute("""
                    CREATE SCHEMA survey;
                    CREATE TABLE survey.labour (wave text, hours integer, remark text);
                    INSERT INTO survey.labour
                    SELECT w, CASE WHEN g <= 900 THEN 10 + (g * 7) % 51
                                   WHEN g <= 940 THEN -9
                                   WHEN g <= 960 THEN -95
                                   WHEN g <= 970 THEN -90
                                   ELSE 999 END,
                           'ok'
                    FROM unnest(ARRAY['2025-Q1', '2025-Q2']) w, generate_series(1, 1000) g;
                    """);
        }
        config = dir.resolve("labour.yaml");
        Files.writeString(config, CONFIG.formatted(url, ""));
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

    @Test
    void theUndeclaredSentinelIsReportedAndTheDeclaredCodesAndRangeAreNot() throws Exception {
        Path out = dir.resolve("out");
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", "2025-Q2", "--out", out.toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        List<JsonNode> hours = findings(out, "hours");

        JsonNode sentinel = hours.stream().filter(f -> f.get("kind").asText().equals("NUMERIC_SENTINEL")).findFirst()
                .orElseThrow(() -> new AssertionError("999 not reported: " + hours));
        List<String> suspects = new ArrayList<>();
        sentinel.get("detail").get("candidates").forEach(c -> suspects.add(c.get("value").asText()));
        assertEquals(List.of("999"), suspects, sentinel.toString());

        for (JsonNode f : hours) {
            boolean disguised = f.get("detail") != null && f.get("detail").has("candidates");
            if (disguised) {
                f.get("detail").get("candidates").forEach(c -> assertTrue(!List.of("-9", "-95", "-90")
                        .contains(c.get("value").asText()), "a declared value reported as disguised: " + f));
            }
        }
        JsonNode coded = hours.stream().filter(f -> f.get("kind").asText().equals("MISSING_CODE")).findFirst()
                .orElseThrow(() -> new AssertionError(hours.toString()));
        assertEquals(40, coded.get("detail").get("counts").get("refused").asLong());
        assertEquals(30, coded.get("detail").get("counts").get("not asked").asLong());
    }

    @Test
    void aMissingRangeOnATextColumnIsRefusedWithItsKeyBeforeAnythingIsRead() throws Exception {
        Path bad = dir.resolve("bad.yaml");
        Files.writeString(bad, CONFIG.formatted(url, "- {name: remark, kind: categorical, missingRanges: [{max: -1}]}"));
        CliRun r = CliRun.of("check", "--config", bad.toString(), "--wave", "2025-Q2", "--out",
                dir.resolve("bad-out").toString());
        assertEquals(2, r.exitCode(), r.err() + r.out());
        assertTrue(r.err().contains("datasets[0].variables[1].missingRanges"), r.err());
        assertTrue(r.err().contains("ranges of numbers"), r.err());
    }
}
