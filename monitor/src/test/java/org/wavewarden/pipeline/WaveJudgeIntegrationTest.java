package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The commands end to end on a real PostgreSQL server: import three waves with COPY, list them, judge them, and
 * check what lands in the results schema and in findings.json.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class WaveJudgeIntegrationTest {

    @TempDir
    static Path dir;
    static String url;
    static Path config;
    static Path[] csv;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("judge");
        SmallSurvey.createTable(url);
        csv = SmallSurvey.writeWaves(dir);
        config = dir.resolve("survey.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
    }

    @Test
    @Order(1)
    void importLoadsEachWaveWithCopy() throws Exception {
        for (int w = 1; w <= 3; w++) {
            CliRun r = CliRun.of("import", "--config", config.toString(), "--wave", "w" + w, csv[w - 1].toString());
            assertEquals(0, r.exitCode(), r.err());
            assertTrue(r.out().contains("imported 600 rows"), r.out());
        }
        assertEquals(1800, count("SELECT count(*) FROM src.answers"));
        // An unquoted empty CSV field is NULL, a quoted one an empty string.
        assertTrue(count("SELECT count(*) FROM src.answers WHERE remark IS NULL") > 0);
        assertTrue(count("SELECT count(*) FROM src.answers WHERE remark = ''") > 0);
    }

    @Test
    @Order(2)
    void importRefusesToLoadAWaveTwice() {
        CliRun r = CliRun.of("import", "--config", config.toString(), "--wave", "w1", csv[0].toString());
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("config error at --wave: wave 'w1' already has 600 rows"), r.err());
    }

    @Test
    @Order(3)
    void initDbIsIdempotent() {
        CliRun first = CliRun.of("init-db", "--config", config.toString());
        CliRun second = CliRun.of("init-db", "--config", config.toString());
        assertEquals(0, first.exitCode(), first.err());
        assertEquals(0, second.exitCode(), second.err());
        assertTrue(second.out().contains("(0 migration(s) applied now)"), second.out());
    }

    @Test
    @Order(4)
    void wavesListsEveryWaveInOrderBeforeJudging() {
        CliRun r = CliRun.of("waves", "--config", config.toString());
        assertEquals(0, r.exitCode(), r.err());
        String[] lines = r.out().strip().split("\n");
        assertEquals(4, lines.length, r.out());
        assertTrue(lines[1].startsWith("w1") && lines[1].contains("600") && lines[1].contains("no"), lines[1]);
        assertTrue(lines[3].startsWith("w3"), lines[3]);
    }

    @Test
    @Order(5)
    void checkFindsThePlantedShiftAndWritesTheContract() throws Exception {
        Path out = dir.resolve("out-w3");
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", "w3", "--out", out.toString(),
                "--fail-on", "MATERIAL");
        assertEquals(1, r.exitCode(), r.out() + r.err());
        JsonNode json = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
        assertEquals("small-survey", json.get("dataset").asText());
        assertEquals("w3", json.get("wave").asText());
        assertEquals("w2", json.get("againstWave").asText());
        JsonNode score = null;
        for (JsonNode f : json.get("findings")) {
            for (String field : new String[] {"variable", "kind", "test", "statistic", "pValue", "qValue", "effect",
                    "verdict", "nBaseline", "nCurrent", "sentence", "detail"}) {
                assertTrue(f.has(field), "finding lacks " + field + ": " + f);
            }
            if (f.get("variable").asText().equals("score") && f.get("kind").asText().equals("SHIFT")) {
                score = f;
            }
        }
        assertTrue(score != null, "no SHIFT finding for score");
        assertEquals("MATERIAL", score.get("verdict").asText());
        assertEquals(600, score.get("nCurrent").asLong());
        // The planted shift is well beyond the threshold of whichever effect the variable's location test uses.
        assertTrue(score.get("effect").get("estimate").asDouble() > 2 * score.get("effect").get("threshold")
                .asDouble(), score.toString());
        assertTrue(Files.readString(out.resolve("digest.md")).contains("screening aids, not findings"));
        assertTrue(Files.readString(out.resolve("digest.html")).contains("data-variable=\"score\""));
        // Same mean, three times the spread: the location test is quiet, the shape check is not.
        JsonNode shape = null;
        for (JsonNode f : json.get("findings")) {
            if (f.get("variable").asText().equals("spread") && f.get("kind").asText().equals("SHAPE_CHANGE")) {
                shape = f;
            }
        }
        assertTrue(shape != null, "no SHAPE_CHANGE for spread");
        assertEquals("MATERIAL", shape.get("verdict").asText());
        assertEquals("KS distance", shape.get("effect").get("name").asText());
        assertTrue(shape.get("effect").get("ciLow").asDouble() > 0.1, shape.toString());
        // Unlisted columns were inferred and the inference reported.
        assertTrue(r.out().contains("inferred has_car: binary"), r.out());
        assertTrue(r.out().contains("inferred satisfied: ordinal"), r.out());
    }

    @Test
    @Order(6)
    void aRerunOnTheSameDataDuplicatesNothing() throws Exception {
        long alertsBefore = count("SELECT count(*) FROM ww_results.alert WHERE superseded_at IS NULL");
        long findingsBefore = count("SELECT count(*) FROM ww_results.finding");
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", "w3", "--out",
                dir.resolve("again").toString());
        assertEquals(0, r.exitCode(), r.err());
        assertEquals(alertsBefore, count("SELECT count(*) FROM ww_results.alert WHERE superseded_at IS NULL"));
        assertEquals(findingsBefore, count("SELECT count(*) FROM ww_results.finding"));
        assertEquals(1, count("SELECT count(*) FROM ww_results.run WHERE wave = 'w3'"));
        assertTrue(alertsBefore >= 1);
    }

    @Test
    @Order(7)
    void judgingEarlierWavesStoresTheirSummariesOnce() throws Exception {
        assertEquals(0, CliRun.of("check", "--config", config.toString(), "--wave", "w2", "--out",
                dir.resolve("w2").toString()).exitCode());
        assertEquals(0, CliRun.of("check", "--config", config.toString(), "--wave", "w1", "--out",
                dir.resolve("w1").toString()).exitCode());
        assertEquals(3, count("SELECT count(*) FROM ww_results.wave_summary"));
        CliRun waves = CliRun.of("waves", "--config", config.toString());
        assertEquals(3, waves.out().lines().filter(l -> l.contains(" yes ")).count(), waves.out());
        JsonNode first = Json.mapper().readTree(Files.readString(dir.resolve("w1").resolve("findings.json")));
        assertTrue(first.get("againstWave").isNull(), "the first wave has nothing to be compared with");
    }

    @Test
    @Order(8)
    void aWaveWithChangedDataIsJudgedAfreshAndItsOldAlertsSuperseded() throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.executeUpdate("UPDATE src.answers SET score = score - 8 WHERE wave = 'w3'");
        }
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", "w3", "--out",
                dir.resolve("w3-revised").toString());
        assertEquals(0, r.exitCode(), r.err());
        assertEquals(2, count("SELECT count(*) FROM ww_results.run WHERE wave = 'w3'"));
        assertEquals(1, count("SELECT count(*) FROM ww_results.run WHERE wave = 'w3' AND superseded_at IS NULL"));
        assertEquals(0, count("SELECT count(*) FROM ww_results.alert WHERE wave = 'w3' AND variable = 'score'"
                + " AND kind = 'SHIFT' AND superseded_at IS NULL"));
        assertEquals(1, count("SELECT count(*) FROM ww_results.alert WHERE wave = 'w3' AND variable = 'score'"
                + " AND kind = 'SHIFT' AND superseded_at IS NOT NULL"));
    }

    @Test
    @Order(9)
    void theSourceSessionCannotWrite() {
        var cfg = org.wavewarden.config.ConfigLoader.parse(SmallSurvey.config(url, null));
        try (Session s = Session.open(cfg, null, java.util.Map.of())) {
            var e = org.junit.jupiter.api.Assertions.assertThrows(Exception.class, () -> s.source().useHandle(h ->
                    h.execute("DELETE FROM src.answers")));
            assertTrue(String.valueOf(e.getMessage()).contains("read-only transaction"), e.getMessage());
        }
    }

    @Test
    @Order(10)
    void unknownTableAndColumnExitTwoNamingTheKey() throws Exception {
        Path badTable = dir.resolve("bad-table.yaml");
        Files.writeString(badTable, SmallSurvey.config(url, null).replace("src.answers", "src.answerz"));
        CliRun r = CliRun.of("check", "--config", badTable.toString(), "--wave", "w1");
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("config error at datasets[0].table: table src.answerz does not exist"), r.err());

        Path badColumn = dir.resolve("bad-column.yaml");
        Files.writeString(badColumn, SmallSurvey.config(url, "      - name: scroe\n        kind: continuous"));
        r = CliRun.of("waves", "--config", badColumn.toString());
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("config error at datasets[0].variables[3].name: column scroe does not exist"),
                r.err());
    }

    @Test
    @Order(11)
    void anUnreachableServerExitsThree() throws Exception {
        Path cfg = dir.resolve("down.yaml");
        Files.writeString(cfg, SmallSurvey.config("jdbc:postgresql://127.0.0.1:1/nothing", null));
        CliRun r = CliRun.of("waves", "--config", cfg.toString());
        assertEquals(3, r.exitCode(), r.err());
        assertTrue(r.err().startsWith("database unreachable"), r.err());
    }

    static long count(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement(); ResultSet rs = st.executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }
}
