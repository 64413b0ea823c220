package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Cautions;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.ReleaseReport;
import org.wavewarden.store.ReleaseComparisons;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The release comparison end to end on a real PostgreSQL server, on the committed scenario
 * {@code releases/revised-wave.sql}: wave w1 published twice, every change of the second release spelt out there.
 * Both layouts (a release column; a previous table) must find exactly those changes, and with a release column the
 * ordinary check must read only each wave's latest release.
 */
class ReleaseJudgeIntegrationTest {

    @TempDir
    static Path dir;
    static String url;
    static Path config;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("releases");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             InputStream sql = ReleaseJudgeIntegrationTest.class.getResourceAsStream("/releases/revised-wave.sql")) {
            st.execute(new String(sql.readAllBytes(), StandardCharsets.UTF_8));
            // The same publications with key trouble: respondent 5 three times in the earlier one, respondent 4
            // twice and one row without a key in the later one.
            st.execute("""
                    CREATE TABLE src.dup_v1 AS SELECT * FROM src.pub_v1;
                    INSERT INTO src.dup_v1 SELECT * FROM src.pub_v1 WHERE wave = 'w1' AND respondent_id = 5;
                    INSERT INTO src.dup_v1 SELECT * FROM src.pub_v1 WHERE wave = 'w1' AND respondent_id = 5;
                    CREATE TABLE src.dup_v2 AS SELECT * FROM src.pub_v2;
                    INSERT INTO src.dup_v2 SELECT wave, respondent_id, age, region, hours - 1, employed, remark, weight
                        FROM src.pub_v2 WHERE wave = 'w1' AND respondent_id = 4;
                    INSERT INTO src.dup_v2 SELECT wave, NULL, age, region, hours, employed, remark, weight
                        FROM src.pub_v2 WHERE wave = 'w1' AND respondent_id = 1;
                    CREATE TABLE src.pub_nokey AS SELECT wave, age, region, hours FROM src.pub_v1;
                    """);
        }
        config = write("releases.yaml", dataset("pub", "src.pub", "respondent_id", "{column: release}")
                + dataset("pub-tables", "src.pub_v2", "respondent_id", "{previousTable: src.pub_v1}")
                + dataset("dup", "src.dup_v2", "respondent_id", "{previousTable: src.dup_v1}"));
    }

    /** One dataset of the scenario, its variables declared alike. */
    static String dataset(String name, String table, String key, String releases) {
        return """
                  - name: %s
                    table: %s
                    waveColumn: wave
                    respondentKey: %s
                    releases: %s
                    weightColumn: weight
                    variables:
                      - {name: hours, kind: continuous, unit: hours}
                      - {name: region, kind: categorical}
                      - {name: remark, kind: text}
                """.formatted(name, table, key, releases);
    }

    static Path write(String name, String datasets) throws Exception {
        Path p = dir.resolve(name);
        Files.writeString(p, "source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n  schema: rel_results\n"
                + "alpha: 0.05\ndatasets:\n" + datasets);
        return p;
    }

    static JsonNode releases(String dataset, String wave, String... more) throws Exception {
        Path out = dir.resolve(dataset + "-" + wave + more.length);
        List<String> args = new ArrayList<>(List.of("releases", "--config", config.toString(), "--dataset", dataset,
                "--wave", wave, "--out", out.toString()));
        args.addAll(List.of(more));
        CliRun r = CliRun.of(args.toArray(String[]::new));
        assertEquals(0, r.exitCode(), r.out() + r.err());
        return Json.mapper().readTree(Files.readString(out.resolve("releases.json")));
    }

    /** What release 2 of w1 changed, as revised-wave.sql spells it out; the same in both layouts. */
    static void assertTheRevisionOfW1(JsonNode v) {
        assertEquals(24, v.get("rowsBefore").asLong());
        assertEquals(25, v.get("rowsAfter").asLong());
        assertEquals(22, v.get("matched").asLong());
        assertEquals(3, v.get("added").asLong());
        assertEquals(2, v.get("removed").asLong());
        assertEquals(List.of("25", "26", "27"), texts(v.get("addedExamples")));
        assertEquals(List.of("7", "19"), texts(v.get("removedExamples")));
        for (String side : new String[] {"keysBefore", "keysAfter"}) {
            assertEquals(0, v.get(side).get("nullKeyRows").asLong(), side);
            assertEquals(0, v.get(side).get("duplicateKeys").asLong(), side);
        }
        assertEquals(List.of("age", "region", "hours", "employed", "remark", "weight"),
                texts(v.get("variables"), "variable"));
        assertChanges(v, "age", 22, 3, 0, 1, "3:34>35", "12:41>14", "20:NULL>52");
        assertChanges(v, "region", 22, 2, 1, 0, "5:north>south", "11:east>NULL");
        // Seven changed cells, the five smallest keys as examples: 2 before 10, as numbers, not as text.
        assertChanges(v, "hours", 22, 7, 0, 0, "2:37.2>47.2", "4:38.2>48.2", "6:37.3>47.3", "8:40.7>50.7",
                "10:29.4>39.4");
        assertChanges(v, "employed", 22, 0, 0, 0);
        assertChanges(v, "remark", 22, 1, 0, 0, "9:late\tshift>late shift");
        assertChanges(v, "weight", 22, 11, 0, 0, "1:1.25>1.5", "2:0.75>1", "3:2>2.25", "4:0.75>1", "5:1.25>1.5");
        assertTrue(v.get("notes").isEmpty(), v.get("notes").toString());
        assertTrue(v.get("inference").toString().contains("age: continuous"), v.get("inference").toString());
        assertTrue(v.get("inference").toString().contains("employed: binary"), v.get("inference").toString());

        // The distributions of the two releases, judged as two waves are. Reference, R 4.2.2:
        //   h1 <- c(34.5,37.2,32.1,38.2,40.0,37.3,42.2,40.7,37.1,29.4,23.9,34.1,40.0,41.7,38.4,37.1,40.2,32.4,25.3,
        //           44.0,45.1,35.2,36.0,36.5)
        //   h2 <- c(34.5,47.2,32.1,48.2,40.0,47.3,50.7,37.1,39.4,23.9,34.1,40.0,51.7,38.4,47.1,40.2,32.4,44.0,45.1,
        //           35.2,36.0,36.5,39.5,33.8,41.6)
        //   shapiro.test(h1)$p.value  # 0.2200   shapiro.test(h2)$p.value  # 0.6382: both normal, so Welch
        //   t.test(h2, h1)            # t = 1.88940431492227, p-value = 0.065241536804394
        JsonNode hours = finding(v, "hours", "SHIFT");
        assertEquals("Welch t", hours.get("test").asText());
        assertEquals(1.88940431492227, hours.get("statistic").asDouble(), 1e-9);
        assertEquals(0.065241536804394, hours.get("pValue").asDouble(), 1e-9);
        assertEquals(24, hours.get("nBaseline").asLong());
        assertEquals(25, hours.get("nCurrent").asLong());
        assertEquals("UNCERTAIN", hours.get("verdict").asText()); // q >= p > 0.05, and 24 against 25 rows say little
        for (JsonNode f : v.get("findings")) {
            String var = f.get("variable").asText();
            assertFalse(List.of("weight", "respondent_id", "release", "wave").contains(var), f.toString());
        }
    }

    static void assertChanges(JsonNode v, String variable, long compared, long changed, long becameNull,
                              long becameValue, String... examples) {
        JsonNode c = null;
        for (JsonNode x : v.get("variables")) {
            if (x.get("variable").asText().equals(variable)) {
                c = x;
            }
        }
        assertTrue(c != null, variable);
        assertEquals(compared, c.get("comparedCells").asLong(), variable);
        assertEquals(changed, c.get("changedCells").asLong(), variable);
        assertEquals(becameNull, c.get("becameNull").asLong(), variable);
        assertEquals(becameValue, c.get("becameValue").asLong(), variable);
        assertEquals((double) changed / compared, c.get("shareChanged").asDouble(), 1e-12, variable);
        List<String> shown = new ArrayList<>();
        for (JsonNode e : c.get("examples")) {
            shown.add(e.get("key").asText() + ":" + (e.get("before").isNull() ? "NULL" : e.get("before").asText())
                    + ">" + (e.get("after").isNull() ? "NULL" : e.get("after").asText()));
        }
        assertEquals(List.of(examples), shown, variable);
    }

    static JsonNode finding(JsonNode revision, String variable, String kind) {
        for (JsonNode f : revision.get("findings")) {
            if (f.get("variable").asText().equals(variable) && f.get("kind").asText().equals(kind)) {
                return f;
            }
        }
        throw new AssertionError("no " + kind + " finding for " + variable + " in " + revision.get("findings"));
    }

    static List<String> texts(JsonNode array) {
        List<String> out = new ArrayList<>();
        array.forEach(n -> out.add(n.asText()));
        return out;
    }

    static List<String> texts(JsonNode array, String field) {
        List<String> out = new ArrayList<>();
        array.forEach(n -> out.add(n.get(field).asText()));
        return out;
    }

    @Test
    void aReleaseColumnComparesTheLatestReleaseWithTheOneBefore() throws Exception {
        JsonNode report = releases("pub", "w1");
        assertEquals("release column release", report.get("layout").asText());
        assertEquals("release 1", report.get("before").asText());
        assertEquals("release 2", report.get("after").asText());
        assertEquals("respondent_id", report.get("respondentKey").asText());
        assertEquals(Cautions.LINES, texts(report.get("cautions")));
        assertTrue(report.get("columnsAdded").isEmpty() && report.get("columnsDropped").isEmpty());
        assertTheRevisionOfW1(report.get("revision"));
        // Named releases give the same comparison.
        assertEquals(report.get("revision").get("variables"),
                releases("pub", "w1", "--release", "2", "--against", "1").get("revision").get("variables"));
    }

    @Test
    void aPreviousTableFindsTheSameRevision() throws Exception {
        JsonNode report = releases("pub-tables", "w1");
        assertEquals("previous table", report.get("layout").asText());
        assertEquals("previous table src.pub_v1", report.get("before").asText());
        assertEquals("table src.pub_v2", report.get("after").asText());
        assertTheRevisionOfW1(report.get("revision"));
    }

    @Test
    void theCommandPrintsTheCountsAndWritesMarkdownWithTheCautions() throws Exception {
        Path out = dir.resolve("printed");
        CliRun r = CliRun.of("releases", "--config", config.toString(), "--dataset", "pub", "--wave", "w1", "--out",
                out.toString());
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("pub wave w1: release 2 against release 1"), r.out());
        assertTrue(r.out().contains("Rows: 24 in release 1, 25 in release 2; 22 respondent(s) in both, 3 added (for"
                + " example 25, 26, 27), 2 removed (for example 7, 19)."), r.out());
        assertTrue(r.out().lines().anyMatch(l -> l.matches("\\s+hours\\s+7 of 22 \\(31\\.8%\\), e\\.g\\. 2: '37\\.2'"
                + " → '47\\.2'")), r.out());
        assertFalse(r.out().lines().anyMatch(l -> l.strip().startsWith("employed ")), "no changed cells: " + r.out());
        assertTrue(r.out().contains("wrote " + out.resolve("releases.json") + " and releases.md"), r.out());
        String md = Files.readString(out.resolve("releases.md"));
        Cautions.LINES.forEach(l -> assertTrue(md.contains(l), l));
        assertTrue(md.contains("| remark | 1 | 22 | 4.5% | 0 | 0 | 9: 'late\\tshift' → 'late shift' |"), md);
        assertTrue(md.contains("| region | 2 | 22 | 9.1% | 1 | 0 | 5: 'north' → 'south'; 11: 'east' → NULL |"),
                md);
    }

    @Test
    void everyComparisonIsKeptInTheResultsSchemaTheLatestReadFirst() throws Exception {
        WardenConfig cfg = ConfigLoader.load(config);
        try (Session s = Session.open(cfg, null, Map.of())) {
            s.migrate();
            ReleaseComparisons kept = new ReleaseComparisons(s.store().jdbi(), "rel_results");
            int before = kept.all("pub", "w1").size();
            JsonNode first = releases("pub", "w1");
            JsonNode second = releases("pub", "w1", "--release", "2", "--against", "1");
            List<ReleaseComparisons.Stored> all = kept.all("pub", "w1");
            // Comparing the same releases again is another comparison, kept beside the first.
            assertEquals(before + 2, all.size());
            ReleaseComparisons.Stored latest = kept.latest("pub", "w1").orElseThrow();
            assertEquals(all.get(0), latest);
            assertTrue(latest.comparisonId() > all.get(1).comparisonId());
            assertEquals(first.get("after").asText(), all.get(1).release());
            assertEquals(List.of("release 2", "release 1", 24L, 25L, 22L, 3L, 2L),
                    List.of(latest.release(), latest.againstRelease(), latest.rowsBefore(), latest.rowsAfter(),
                            latest.matched(), latest.rowsAdded(), latest.rowsRemoved()));
            assertEquals(second, Json.mapper().readTree(latest.reportJson()));
        }
    }

    @Test
    void theSourceIsReadInOneCopyBesideTwoListings() {
        WardenConfig cfg = ConfigLoader.load(config);
        try (Session s = Session.open(cfg, null, Map.of())) {
            StatementCounter pub = new StatementCounter(Identifiers.quote("src") + "." + Identifiers.quote("pub"));
            s.source().setSqlLogger(pub);
            ReleaseReport r = new ReleaseJudge(s, Clock.systemUTC()).compare(cfg.dataset("pub"), "w1", null, null,
                    null, null);
            assertEquals(22, r.revision().matched());
            // The wave listing and the release listing name the table; one catalog look-up for the columns. The rows
            // themselves come in one COPY on the raw connection, which Jdbi's logger does not see.
            assertEquals(new StatementCounter.SourceStatements(2, 1, 0, 0), pub.snapshot());

            StatementCounter tables = new StatementCounter(Identifiers.quote("src") + "."
                    + Identifiers.quote("pub_v2"));
            s.source().setSqlLogger(tables);
            new ReleaseJudge(s, Clock.systemUTC()).compare(cfg.dataset("pub-tables"), "w1", null, null, null, null);
            assertEquals(new StatementCounter.SourceStatements(1, 2, 0, 0), tables.snapshot());
        }
    }

    @Test
    void duplicateAndMissingKeysAreReportedAndTheirRowsMatchedToNoOne() throws Exception {
        JsonNode v = releases("dup", "w1").get("revision");
        assertEquals(26, v.get("rowsBefore").asLong());
        assertEquals(27, v.get("rowsAfter").asLong());
        assertEquals(20, v.get("matched").asLong()); // 22 less respondents 4 and 5, whose keys are ambiguous
        assertEquals(3, v.get("added").asLong());
        assertEquals(2, v.get("removed").asLong());
        JsonNode before = v.get("keysBefore");
        assertEquals(1, before.get("duplicateKeys").asLong());
        assertEquals(3, before.get("duplicateKeyRows").asLong());
        assertEquals(List.of("5"), texts(before.get("duplicateExamples")));
        assertEquals(0, before.get("nullKeyRows").asLong());
        JsonNode after = v.get("keysAfter");
        assertEquals(1, after.get("duplicateKeys").asLong());
        assertEquals(2, after.get("duplicateKeyRows").asLong());
        assertEquals(List.of("4"), texts(after.get("duplicateExamples")));
        assertEquals(1, after.get("nullKeyRows").asLong());
        assertChanges(v, "hours", 20, 6, 0, 0, "2:37.2>47.2", "6:37.3>47.3", "8:40.7>50.7", "10:29.4>39.4",
                "14:41.7>51.7");
        assertChanges(v, "region", 20, 1, 1, 0, "11:east>NULL");
        assertChanges(v, "age", 20, 3, 0, 1, "3:34>35", "12:41>14", "20:NULL>52");
        assertChanges(v, "employed", 20, 0, 0, 0);
        assertChanges(v, "remark", 20, 1, 0, 0, "9:late\tshift>late shift");
        assertChanges(v, "weight", 20, 9, 0, 0, "1:1.25>1.5", "2:0.75>1", "3:2>2.25", "6:1.25>1.5", "8:1>1.25");
        assertEquals(List.of("1 respondent key(s) occur more than once in previous table src.dup_v1 (3 rows), for"
                        + " example 5: those rows count in the distributions but are matched to no one.",
                "1 respondent key(s) occur more than once in table src.dup_v2 (2 rows), for example 4: those rows"
                        + " count in the distributions but are matched to no one.",
                "1 row(s) of table src.dup_v2 have no respondent key (NULL): they count in the distributions but are"
                        + " matched to no one."), texts(v.get("notes")));
        // Unmatched rows still belong to their release's distribution.
        assertEquals(26, finding(v, "hours", "SHIFT").get("nBaseline").asLong());
        assertEquals(27, finding(v, "hours", "SHIFT").get("nCurrent").asLong());
    }

    @Test
    void aKeyMissingFromATableIsAConfigErrorNamingTheKey() throws Exception {
        refused("releases", dataset("pub", "src.pub", "person_id", "{column: release}"), "datasets[0].respondentKey:"
                + " column person_id does not exist in the source table; it has [wave, release, respondent_id,");
        refused("releases", dataset("pub", "src.pub_v2", "respondent_id", "{previousTable: src.pub_nokey}"),
                "datasets[0].releases.previousTable: table src.pub_nokey has no column respondent_id");
        refused("check", dataset("pub", "src.pub_v2", "respondent_id", "{column: revision}"),
                "datasets[0].releases.column: column revision does not exist");
    }

    /** The command exits 2 with one line naming the key, before reading anything. */
    static void refused(String command, String dataset, String expected) throws Exception {
        Path cfg = write("refused.yaml", dataset);
        CliRun r = CliRun.of(command, "--config", cfg.toString(), "--wave", "w1");
        assertEquals(2, r.exitCode(), r.out() + r.err());
        assertTrue(r.err().startsWith("config error at " + expected), r.err());
        assertEquals(1, r.err().strip().lines().count(), r.err());
    }

    @Test
    void badReleaseChoicesExitTwoNamingTheOption() throws Exception {
        CliRun one = CliRun.of("releases", "--config", config.toString(), "--dataset", "pub", "--wave", "w2");
        assertEquals(2, one.exitCode(), one.err());
        assertTrue(one.err().startsWith("config error at --wave: release 1 is the first of wave w2 (releases: [1]);"
                + " there is no earlier one to compare it with"), one.err());
        CliRun same = CliRun.of("releases", "--config", config.toString(), "--dataset", "pub", "--wave", "w1",
                "--against", "2");
        assertEquals(2, same.exitCode(), same.err());
        assertTrue(same.err().startsWith("config error at --against: expected another release of wave w1 but got"
                + " '2'; releases: [1, 2]"), same.err());
        CliRun tables = CliRun.of("releases", "--config", config.toString(), "--dataset", "pub-tables", "--wave",
                "w1", "--release", "2");
        assertEquals(2, tables.exitCode(), tables.err());
        assertTrue(tables.err().startsWith("config error at --release: only for releases kept in a release column"),
                tables.err());
        CliRun wave = CliRun.of("releases", "--config", config.toString(), "--dataset", "pub", "--wave", "w9");
        assertEquals(2, wave.exitCode(), wave.err());
        assertTrue(wave.err().startsWith("config error at --wave: no wave 'w9' in pub; waves: [w1, w2]"), wave.err());

        Path plain = write("plain.yaml", "  - name: pub\n    table: src.pub_v2\n    waveColumn: wave\n");
        CliRun none = CliRun.of("releases", "--config", plain.toString(), "--wave", "w1");
        assertEquals(2, none.exitCode(), none.err());
        assertTrue(none.err().startsWith("config error at datasets[0].releases: missing: comparing releases needs"
                + " respondentKey"), none.err());
    }

    @Test
    void theCheckOfAWaveWithAReleaseColumnReadsOnlyItsLatestRelease() throws Exception {
        Path out1 = dir.resolve("check-w1");
        CliRun w1 = CliRun.of("check", "--config", config.toString(), "--dataset", "pub", "--wave", "w1", "--out",
                out1.toString());
        assertEquals(0, w1.exitCode(), w1.out() + w1.err());
        assertEquals(25, count("SELECT row_count FROM rel_results.wave_summary WHERE dataset = 'pub' AND wave = 'w1'"));
        Path out2 = dir.resolve("check-w2");
        CliRun w2 = CliRun.of("check", "--config", config.toString(), "--dataset", "pub", "--wave", "w2", "--out",
                out2.toString(), "--all");
        assertEquals(0, w2.exitCode(), w2.out() + w2.err());
        assertEquals(20, count("SELECT row_count FROM rel_results.wave_summary WHERE dataset = 'pub' AND wave = 'w2'"));
        JsonNode json = Json.mapper().readTree(Files.readString(out2.resolve("findings.json")));
        assertEquals("w1", json.get("againstWave").asText());
        JsonNode hours = null;
        for (JsonNode f : json.get("findings")) {
            // The release column and the respondent key are bookkeeping, never judged.
            assertFalse(List.of("release", "respondent_id", "weight").contains(f.get("variable").asText()),
                    f.toString());
            if (f.get("variable").asText().equals("hours") && f.get("kind").asText().equals("SHIFT")) {
                hours = f;
            }
        }
        assertTrue(hours != null, json.toString());
        assertEquals(25, hours.get("nBaseline").asLong()); // release 2 of w1, not 24 + 25 rows
        assertEquals(20, hours.get("nCurrent").asLong());
        assertFalse(json.get("inference").toString().contains("release:"), json.get("inference").toString());
    }

    static long count(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery(sql)) {
            assertTrue(rs.next(), sql);
            return rs.getLong(1);
        }
    }
}
