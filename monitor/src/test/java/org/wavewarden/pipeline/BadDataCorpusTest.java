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
import java.util.HashSet;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Data no survey should have, in one table per wave so that columns can change between waves: each oddity becomes
 * a finding or a clear skip, and no run fails.
 */
class BadDataCorpusTest {

    @TempDir
    static Path dir;
    static Path config;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("bad_data");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA bad;
                    -- wave 1: every oddity at once, 2,000 rows (plus 100,000 distinct codes in many_codes)
                    CREATE TABLE bad.w_1 AS
                    SELECT g AS id,
                           CASE WHEN g % 50 = 0 THEN 'seven' WHEN g % 77 = 0 THEN 'n/a' ELSE (g % 40 + 10)::text END
                               AS num_text,
                           CASE WHEN g % 97 = 0 THEN 'NaN'::float8 WHEN g % 89 = 0 THEN 'Infinity'::float8
                                WHEN g % 83 = 0 THEN '-Infinity'::float8 ELSE (g % 37) * 1.5 END AS floaty,
                           NULL::integer AS all_null,
                           5 AS constant,
                           CASE g % 9 WHEN 0 THEN '' WHEN 1 THEN '   ' WHEN 2 THEN E'\\u00A0' WHEN 3 THEN E'\\u200B'
                                WHEN 4 THEN E'\\t' WHEN 5 THEN E'\\u2003' ELSE 'answer ' || (g % 13) END AS blanks,
                           CASE WHEN g % 10 = 0 THEN repeat('long answer ', 9000) || g ELSE 'short ' || (g % 7) END
                               AS very_long,
                           g % 5 AS dropped_later,
                           g % 4 AS retyped
                    FROM generate_series(1, 2000) g;
                    -- wave 2: dropped_later is gone, retyped became text
                    CREATE TABLE bad.w_2 AS
                    SELECT id, num_text, floaty, all_null, constant, blanks, very_long,
                           CASE retyped WHEN 0 THEN 'zero' ELSE retyped::text END AS retyped
                    FROM bad.w_1;
                    -- wave 3: a single respondent
                    CREATE TABLE bad.w_3 AS SELECT * FROM bad.w_2 WHERE id = 1;
                    -- wave 4: no rows at all
                    CREATE TABLE bad.w_4 AS SELECT * FROM bad.w_2 WHERE false;
                    """);
            st.execute("ALTER TABLE bad.w_1 ADD COLUMN many_codes text");
            st.execute("UPDATE bad.w_1 SET many_codes = 'code-' || id");
            st.execute("INSERT INTO bad.w_1 (id, many_codes) SELECT 100000 + g, 'code-x' || g FROM"
                    + " generate_series(1, 100500) g");
        }
        config = dir.resolve("bad.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_bad}
                datasets:
                  - name: bad-data
                    tablePattern: bad.w_{wave}
                    exclude: [id]
                    variables:
                      - {name: num_text, kind: continuous}
                      - {name: floaty, kind: continuous}
                      - {name: blanks, kind: text}
                      - {name: very_long, kind: text}
                      - {name: constant, kind: continuous}
                """.formatted(url));
    }

    static Set<String> kinds(Path out, String variable) throws Exception {
        JsonNode json = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
        Set<String> kinds = new HashSet<>();
        for (JsonNode f : json.get("findings")) {
            if (f.get("variable").asText().equals(variable)) {
                kinds.add(f.get("kind").asText());
            }
        }
        return kinds;
    }

    static Path check(String wave) {
        Path out = dir.resolve("out-" + wave);
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out", out.toString());
        assertEquals(0, r.exitCode(), "wave " + wave + ": " + r.err() + r.out());
        return out;
    }

    @Test
    void everyOddityOfTheFirstWaveIsAFinding() throws Exception {
        Path out = check("1");
        assertTrue(kinds(out, "num_text").contains("TEXT_IN_NUMERIC"), "text in a numeric variable");
        // NaN and infinities are flagged (as placeholders for no answer) and kept out of the comparison.
        Set<String> floaty = kinds(out, "floaty");
        assertTrue(floaty.contains("PLACEHOLDER") || floaty.contains("TEXT_IN_NUMERIC"), "NaN, Infinity: " + floaty);
        assertTrue(kinds(out, "all_null").contains("ALL_NULL"));
        assertTrue(kinds(out, "constant").contains("CONSTANT"));
        Set<String> blanks = kinds(out, "blanks");
        assertTrue(blanks.contains("BLANK") && blanks.contains("INVISIBLE"), "blanks in several Unicode forms: " + blanks);
        assertTrue(kinds(out, "many_codes").contains("TOO_MANY_DISTINCT"), "100,000 distinct codes are capped");
        JsonNode json = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
        for (JsonNode f : json.get("findings")) {
            assertTrue(f.get("sentence").asText().length() < 2000, "a sentence stays readable: " + f.get("variable"));
        }
    }

    @Test
    void aDroppedAndARetypedColumnAreFindingsOfTheNextWave() throws Exception {
        check("1");
        Path out = check("2");
        assertTrue(kinds(out, "dropped_later").contains("COLUMN_DROPPED"));
        assertTrue(kinds(out, "retyped").contains("COLUMN_RETYPED"));
        assertTrue(kinds(out, "many_codes").contains("COLUMN_DROPPED"));
    }

    @Test
    void aOneRowWaveAndAnEmptyWaveAreSkippedNotFailed() throws Exception {
        check("2");
        Path one = check("3");
        assertTrue(kinds(one, "floaty").contains("SKIPPED"), "one row cannot be compared");
        Path empty = check("4");
        JsonNode json = Json.mapper().readTree(Files.readString(empty.resolve("findings.json")));
        assertEquals("4", json.get("wave").asText());
        assertTrue(kinds(empty, "floaty").contains("SKIPPED"));
    }
}
