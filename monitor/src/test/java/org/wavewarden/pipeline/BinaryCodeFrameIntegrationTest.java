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
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A binary item whose codes are renamed between two waves (1/2 becomes yes/no), on a real PostgreSQL server: a
 * changed code frame, not a fall of the share of '1' to nothing; and a binary item that keeps its frame while one
 * answer disappears, which stays a change of the share.
 */
class BinaryCodeFrameIntegrationTest {

    @TempDir
    static Path dir;
    static Path config;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("binary_code_frame");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA b;
                    CREATE TABLE b.w_1 AS SELECT CASE WHEN g % 2 = 0 THEN '1' ELSE '2' END AS has_car,
                        CASE WHEN g % 5 < 3 THEN '1' ELSE '0' END AS owns_pet
                    FROM generate_series(1, 400) g;
                    CREATE TABLE b.w_2 AS SELECT CASE WHEN g % 2 = 0 THEN 'yes' ELSE 'no' END AS has_car,
                        '1'::text AS owns_pet
                    FROM generate_series(1, 400) g;
                    """);
        }
        config = dir.resolve("b.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_code_frame}
                datasets:
                  - name: recoded
                    tablePattern: b.w_{wave}
                    variables:
                      - {name: has_car, kind: binary}
                      - {name: owns_pet, kind: binary}
                """.formatted(url));
    }

    static JsonNode check(String wave) throws Exception {
        Path out = dir.resolve("out-" + wave);
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out", out.toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        return Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
    }

    static List<JsonNode> of(JsonNode report, String variable) {
        List<JsonNode> out = new ArrayList<>();
        report.get("findings").forEach(f -> {
            if (f.get("variable").asText().equals(variable)) {
                out.add(f);
            }
        });
        return out;
    }

    static List<String> kinds(List<JsonNode> findings) {
        return findings.stream().map(f -> f.get("kind").asText()).sorted().toList();
    }

    @Test
    void renamedCodesOfABinaryItemAreACodeFrameChangeAndItsShareIsNotCompared() throws Exception {
        check("1");
        List<JsonNode> hasCar = of(check("2"), "has_car");
        assertEquals(List.of("CODE_APPEARED", "CODE_VANISHED", "SKIPPED"), kinds(hasCar), hasCar.toString());
        JsonNode skipped = hasCar.stream().filter(f -> f.get("kind").asText().equals("SKIPPED")).findFirst()
                .orElseThrow();
        assertTrue(skipped.get("sentence").asText().contains("the code frame changed, so the share of one code is not"
                + " compared across the two frames (codes '1' (200), '2' (200) in the baseline, 'no' (200), 'yes'"
                + " (200) in this wave)"), skipped.get("sentence").asText());
        JsonNode appeared = hasCar.stream().filter(f -> f.get("kind").asText().equals("CODE_APPEARED")).findFirst()
                .orElseThrow();
        assertEquals("[\"no\",\"yes\"]", appeared.get("detail").get("codes").toString());
    }

    @Test
    void aBinaryItemLosingOneOfItsTwoAnswersKeepsItsFrameAndItsShareIsCompared() throws Exception {
        check("1");
        List<JsonNode> pet = of(check("2"), "owns_pet");
        JsonNode shift = pet.stream().filter(f -> f.get("kind").asText().equals("SHIFT")).findFirst()
                .orElseThrow(() -> new AssertionError(pet.toString()));
        assertEquals("MATERIAL", shift.get("verdict").asText(), shift.toString());
        assertTrue(pet.stream().noneMatch(f -> f.get("kind").asText().startsWith("CODE_")), pet.toString());
    }
}
