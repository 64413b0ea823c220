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
 * A categorical variable with 100,000 categories in each of two waves (a postcode or occupation code, say): it is
 * compared as categories, not capped, and the check completes with its HTML digest.
 */
class ManyCategoriesIntegrationTest {

    static final int CATEGORIES = Integer.getInteger("wavewarden.test.categories", 100_000);

    @TempDir
    static Path dir;
    static Path config;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("many_categories");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Every category twice per wave; wave 2 moves a tenth of the answers of the first categories.
            st.execute("CREATE SCHEMA codes; CREATE TABLE codes.answers (wave text, occupation text);"
                    + " INSERT INTO codes.answers SELECT '1', 'occ-' || (g % " + CATEGORIES + ")"
                    + " FROM generate_series(0, " + (2 * CATEGORIES - 1) + ") g;"
                    + " INSERT INTO codes.answers SELECT '2', 'occ-' || CASE WHEN g % 10 = 0 THEN g % 100"
                    + " ELSE g % " + CATEGORIES + " END FROM generate_series(0, " + (2 * CATEGORIES - 1) + ") g;");
        }
        config = dir.resolve("codes.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_codes}
                datasets:
                  - name: codes
                    table: codes.answers
                    waveColumn: wave
                    variables:
                      - {name: occupation, kind: categorical}
                """.formatted(url));
    }

    @Test
    void aWaveWithAHundredThousandCategoriesIsComparedAsCategories() throws Exception {
        Path out = dir.resolve("out");
        assertEquals(0, CliRun.of("check", "--config", config.toString(), "--wave", "1", "--out", out.toString())
                .exitCode());
        long started = System.nanoTime();
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", "2", "--out", out.toString());
        System.out.println("checked wave 2 of " + CATEGORIES + " categories in " + (System.nanoTime() - started) / 1_000_000
                + " ms");
        assertEquals(0, r.exitCode(), r.err() + r.out());
        JsonNode json = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
        boolean shift = false;
        for (JsonNode f : json.get("findings")) {
            if (f.get("variable").asText().equals("occupation")) {
                assertTrue(!f.get("kind").asText().equals("TOO_MANY_DISTINCT")
                        && !f.get("kind").asText().equals("SKIPPED"), f.toString());
                shift |= f.get("kind").asText().equals("SHIFT");
            }
        }
        assertTrue(shift, "the occupations are compared: " + json);
        assertTrue(Files.size(out.resolve("digest.html")) > 0, "the HTML digest is written");
    }
}
