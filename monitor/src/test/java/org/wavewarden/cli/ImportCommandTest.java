package org.wavewarden.cli;

import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.DdiCodebook;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.deliver.Json;
import org.wavewarden.load.TableShape;
import org.wavewarden.load.spss.SavFiles;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.store.WaveCodebooks;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * The {@code import} command on a real server: an SPSS file creates its dataset's table ({@code --create}) and its
 * dictionary is saved as the wave's codebook; a CSV file's codebook ({@code --codebook}) is saved likewise; rows
 * committed before a failed save are said to be so. The .sav files are written by R 4.2.2 with haven 2.5.1
 * ({@code import/household-waves.R} beside them); the values expected are those R reads back with
 * {@code haven::read_sav(user_na = TRUE)}, printed by that script.
 */
class ImportCommandTest {

    @TempDir
    Path dir;
    String url;
    Path config;

    @BeforeEach
    void database() throws Exception {
        url = TestDatabase.freshDatabase("importcmd");
        config = dir.resolve("household.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results:
                  schema: ww_results
                datasets:
                  - name: household
                    table: survey.household
                    waveColumn: wave
                    weightColumn: weight
                """.formatted(url));
    }

    Path fixture(String name) throws Exception {
        Path p = dir.resolve(name);
        try (InputStream in = ImportCommandTest.class.getResourceAsStream("/import/" + name)) {
            Files.copy(in, p);
        }
        return p;
    }

    CliRun importWave(Path cfg, String wave, Path file, String... options) {
        List<String> args = new java.util.ArrayList<>(List.of("import", "--config", cfg.toString(), "--wave", wave));
        args.addAll(List.of(options));
        args.add(file.toString());
        return CliRun.of(args.toArray(String[]::new));
    }

    long count(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); ResultSet rs = c.createStatement().executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }

    double number(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); ResultSet rs = c.createStatement().executeQuery(sql)) {
            rs.next();
            return rs.getDouble(1);
        }
    }

    void execute(String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(sql);
        }
    }

    WaveCodebooks codebooks() {
        return new WaveCodebooks(Jdbi.create(url, "postgres", ""), "ww_results");
    }

    /** The SPSS reader is written beside this command; these tests run once it reads files. */
    void assumeSavReader(Path sav) throws Exception {
        boolean reads;
        try (var cases = SavFiles.open(sav)) {
            reads = cases != null;
        } catch (UnsupportedOperationException e) {
            reads = false;
        }
        assumeTrue(reads, "the SPSS system file reader is not written yet");
    }

    @Test
    void aSavFileWithCreateMakesTheTableLoadsEveryCaseAndSavesItsDictionary() throws Exception {
        Path q1 = fixture("household-q1.sav");
        assumeSavReader(q1);
        CliRun r = importWave(config, "2025-Q1", q1, "--create");
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("created table survey.household with 11 columns and an index on wave"), r.out());
        assertTrue(r.out().contains("age bigint (SPSS format F3.0, every value an integer)"), r.out());
        assertTrue(r.out().contains("rooms double precision (SPSS format F1.0, but 2.5 is not an integer)"), r.out());
        assertTrue(r.out().contains("imported 6 rows into survey.household as wave 2025-Q1"), r.out());
        assertTrue(r.out().contains("saved the codebook of wave 2025-Q1: 10 variables, 3 with value labels, 2 with"
                + " missing values"), r.out());
        Map<String, String> types = new LinkedHashMap<>();
        try (Connection c = TestDatabase.connect(url)) {
            types.putAll(TableShape.existing(c, new org.wavewarden.config.Identifiers.TableName("survey",
                    "household")));
        }
        assertEquals(List.of("wave", "id", "region", "age", "income", "tenure", "rooms", "note", "interviewed",
                "started", "weight"), List.copyOf(types.keySet()));
        assertEquals(List.of("text", "bigint", "bigint", "bigint", "double precision", "text", "double precision",
                "text", "date", "timestamp without time zone", "double precision"), List.copyOf(types.values()));
        assertEquals(1, count("SELECT count(*) FROM pg_indexes WHERE schemaname = 'survey'"
                + " AND tablename = 'household' AND indexdef LIKE '%(wave)%'"));
        // haven::read_sav("household-q1.sav", user_na = TRUE): age 34 51 -99 27 68 -92; income NA in case 3.
        assertEquals(34 + 51 - 99 + 27 + 68 - 92, count("SELECT sum(age) FROM survey.household"));
        assertEquals(1, count("SELECT count(*) FROM survey.household WHERE income IS NULL AND id = 3"));
        assertEquals(300, count("SELECT min(length(note)) FROM survey.household"));
        assertEquals(1, count("SELECT count(*) FROM survey.household WHERE started = '2025-01-07 18:40:30'"
                + " AND interviewed = '2025-01-07' AND tenure = 'RENT' AND weight = 1.25"));
        DatasetCodebook saved = codebooks().load("household", "2025-Q1").orElseThrow();
        VariableMeta region = saved.variable("region").orElseThrow();
        assertEquals("Region of the home", region.label());
        assertEquals(List.of("1", "2", "3", "9"), List.copyOf(region.valueLabels().keySet()));
        assertEquals(List.of(new MissingCodeSpec("9", "Refused")), region.missingCodes());
        assertEquals(List.of(new MissingRangeSpec(-99.0, -91.0, org.wavewarden.load.spss.SavReader.DECLARED_MISSING)),
                saved.variable("age").orElseThrow().missingRanges());
        assertEquals("Council tenant", saved.variable("tenure").orElseThrow().valueLabels().get("COUN"));
    }

    @Test
    void aPsppFileWithDiscreteMissingCodesARangeAndALongStringIsCreatedAndLoaded() throws Exception {
        // Written by GNU PSPP 1.6.2 from household-pspp.sps; what haven::read_sav(user_na = TRUE) reads back (R 4.2.2,
        // haven 2.5.1): hhid 101..105, satisf 1 5 8 9 2 (8 and 9 user-missing), income 1200.5 NA -1 2400 -7
        // (LO THRU -1 user-missing), remark of 360 or 361 characters, visited 2025-01-03 to 2025-01-07.
        Path sav = fixture("household-pspp.sav");
        assumeSavReader(sav);
        CliRun r = importWave(config, "2025-Q1", sav, "--create");
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("hhid bigint (SPSS format F5.0, every value an integer)"), r.out());
        assertTrue(r.out().contains("satisf bigint (SPSS format F1.0, every value an integer)"), r.out());
        assertTrue(r.out().contains("remark text"), r.out());
        assertTrue(r.out().contains("visited date"), r.out());
        assertTrue(r.out().contains("saved the codebook of wave 2025-Q1: 7 variables, 2 with value labels, 2 with"
                + " missing values"), r.out());
        assertEquals(101 + 102 + 103 + 104 + 105, count("SELECT sum(hhid) FROM survey.household"));
        assertEquals(1 + 5 + 8 + 9 + 2, count("SELECT sum(satisf) FROM survey.household"));
        assertEquals(1200.5 - 1 + 2400 - 7, number("SELECT sum(income) FROM survey.household"), 1e-9);
        assertEquals(360 + 361 + 361 + 360 + 361, count("SELECT sum(length(remark)) FROM survey.household"));
        assertEquals(1, count("SELECT count(*) FROM survey.household WHERE visited = '2025-01-05' AND tenure = 'COUN'"
                + " AND weight = 1"));
        DatasetCodebook saved = codebooks().load("household", "2025-Q1").orElseThrow();
        assertEquals(List.of("8", "9"), saved.variable("satisf").orElseThrow().missingCodes().stream()
                .map(MissingCodeSpec::value).toList());
        assertEquals("Don't know", saved.variable("satisf").orElseThrow().valueLabels().get("8"));
        MissingRangeSpec below = saved.variable("income").orElseThrow().missingRanges().get(0);
        assertEquals(null, below.low());
        assertEquals(-1.0, below.high());
    }

    /** Whether a program runs here (CI installs R with haven and PSPP; a developer's machine may lack them). */
    static boolean runs(String... command) {
        try {
            Process p = new ProcessBuilder(command).redirectErrorStream(true).redirectOutput(
                    ProcessBuilder.Redirect.DISCARD).start();
            return p.waitFor() == 0;
        } catch (java.io.IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    static void run(Path folder, String... command) throws Exception {
        Process p = new ProcessBuilder(command).directory(folder.toFile()).redirectErrorStream(true).start();
        String output = new String(p.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        assertEquals(0, p.waitFor(), String.join(" ", command) + ": " + output);
    }

    @Test
    void filesWrittenNowByHavenAndPsppLoadTheSameRowsAsTheCommittedOnes() throws Exception {
        assumeTrue(runs("Rscript", "-e", "stopifnot(packageVersion('haven') == '2.5.1')"), "R with haven 2.5.1");
        assumeTrue(runs("pspp", "--version"), "GNU PSPP");
        Path committed = Files.createDirectory(dir.resolve("committed"));
        Path fresh = Files.createDirectory(dir.resolve("fresh"));
        for (String name : List.of("household-q1.sav", "household-pspp.sav")) {
            Files.move(fixture(name), committed.resolve(name));
        }
        assumeSavReader(committed.resolve("household-q1.sav"));
        for (String script : List.of("household-waves.R", "household-pspp.sps")) {
            Files.move(fixture(script), fresh.resolve(script));
        }
        run(fresh, "Rscript", "household-waves.R");
        run(fresh, "pspp", "household-pspp.sps");
        for (String name : List.of("household-q1.sav", "household-pspp.sav")) {
            Path cfg = dir.resolve(name + ".yaml");
            String table = name.startsWith("household-q1") ? "survey.haven" : "survey.pspp";
            Files.writeString(cfg, Files.readString(config).replace("survey.household", table));
            CliRun a = importWave(cfg, "committed", committed.resolve(name), "--create");
            assertEquals(0, a.exitCode(), a.err());
            CliRun b = importWave(cfg, "fresh", fresh.resolve(name));
            assertEquals(0, b.exitCode(), b.err());
            String rows = "SELECT to_jsonb(t) - 'wave' FROM " + table + " t WHERE wave = ";
            assertEquals(count("SELECT count(*) FROM " + table + " WHERE wave = 'committed'"),
                    count("SELECT count(*) FROM " + table + " WHERE wave = 'fresh'"), name);
            assertEquals(0, count("SELECT count(*) FROM (" + rows + "'committed' EXCEPT ALL " + rows + "'fresh') d"),
                    name);
            assertEquals(Json.write(codebooks().load("household", "committed").orElseThrow().variables()),
                    Json.write(codebooks().load("household", "fresh").orElseThrow().variables()), name);
        }
    }

    @Test
    void aZsavWaveGoesIntoTheCreatedTableMatchingCapitalisedNames() throws Exception {
        Path q1 = fixture("household-q1.sav");
        Path q2 = fixture("household-q2.zsav");
        assumeSavReader(q2);
        assertEquals(0, importWave(config, "2025-Q1", q1, "--create").exitCode());
        CliRun r = importWave(config, "2025-Q2", q2);
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("variable REGION -> column region"), r.out());
        assertTrue(r.out().contains("imported 5 rows"), r.out());
        // haven::read_sav("household-q2.zsav", user_na = TRUE): Age 45 19 77 -99 38.
        assertEquals(45 + 19 + 77 - 99 + 38, count("SELECT sum(age) FROM survey.household WHERE wave = '2025-Q2'"));
        assertTrue(codebooks().load("household", "2025-Q2").orElseThrow().variable("region").isPresent());
    }

    @Test
    void aSavFileWithAVariableTheTableLacksIsRefusedAndNothingIsImported() throws Exception {
        Path q1 = fixture("household-q1.sav");
        Path q3 = fixture("household-q3.sav");
        assumeSavReader(q3);
        assertEquals(0, importWave(config, "2025-Q1", q1, "--create").exitCode());
        CliRun r = importWave(config, "2025-Q3", q3);
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at table") && r.err().contains("Pets"), r.err());
        assertEquals(0, count("SELECT count(*) FROM survey.household WHERE wave = '2025-Q3'"));
        assertTrue(codebooks().load("household", "2025-Q3").isEmpty());
    }

    @Test
    void aSavFileIntoAMissingTableWithoutCreateIsRefusedSuggestingIt() throws Exception {
        Path q1 = fixture("household-q1.sav");
        assumeSavReader(q1);
        CliRun r = importWave(config, "2025-Q1", q1);
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("--create"), r.err());
        assertEquals(0, count("SELECT count(*) FROM pg_class WHERE relname = 'household'"));
    }

    /** The offset a refusal names, checked to lie inside the file it names. */
    static long byteOffset(String message, long fileLength) {
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("byte offset (\\d+)").matcher(message);
        assertTrue(m.find(), message);
        long offset = Long.parseLong(m.group(1));
        assertTrue(offset >= 0 && offset <= fileLength, message);
        return offset;
    }

    @Test
    void aSavFileCutShortIsRefusedAsBadInputNamingFileAndByteOffsetAndCreatesNoTable() throws Exception {
        byte[] whole = Files.readAllBytes(fixture("household-q1.sav"));
        // Cut inside the last case: the dictionary reads, so the import is under way when the cases stop short.
        Path cut = Files.write(dir.resolve("household-cut.sav"), java.util.Arrays.copyOf(whole, whole.length - 5));
        CliRun r = importWave(config, "2025-Q1", cut, "--create");
        assertEquals(Main.USAGE, r.exitCode(), r.err());
        assertTrue(r.err().contains("import refused: ") && r.err().contains("household-cut.sav"), r.err());
        assertTrue(byteOffset(r.err(), whole.length - 5) > 0, r.err());
        assertTrue(r.err().contains("nothing was imported"), r.err());
        assertEquals(0, count("SELECT count(*) FROM pg_class WHERE relname = 'household'"));
        assertTrue(codebooks().load("household", "2025-Q1").isEmpty());
    }

    @Test
    void aSavFileCutShortAddsNoRowsToAnExistingTable() throws Exception {
        Path q1 = fixture("household-q1.sav");
        assertEquals(0, importWave(config, "2025-Q1", q1, "--create").exitCode());
        byte[] whole = Files.readAllBytes(q1);
        Path cut = Files.write(dir.resolve("household-cut.sav"), java.util.Arrays.copyOf(whole, whole.length - 5));
        CliRun r = importWave(config, "2025-Q2", cut);
        assertEquals(Main.USAGE, r.exitCode(), r.err());
        assertEquals(0, count("SELECT count(*) FROM survey.household WHERE wave = '2025-Q2'"));
        assertEquals(6, count("SELECT count(*) FROM survey.household"));
        assertTrue(codebooks().load("household", "2025-Q2").isEmpty());
    }

    @Test
    void aFileNamedSavThatIsNoSystemFileIsRefusedAsBadInputAndCreatesNoTable() throws Exception {
        Path notSav = Files.writeString(dir.resolve("wave-q1.sav"), "id,region\n1,2\n2,5\n");
        CliRun r = importWave(config, "2025-Q1", notSav, "--create");
        assertEquals(Main.USAGE, r.exitCode(), r.err());
        assertTrue(r.err().contains("import refused: ") && r.err().contains("wave-q1.sav"), r.err());
        byteOffset(r.err(), Files.size(notSav));
        assertEquals(0, count("SELECT count(*) FROM pg_class WHERE relname = 'household'"));
    }

    @Test
    void aSavWaveLoadedAgainNeedsReplaceWhichReplacesRowsAndCodebook() throws Exception {
        Path q1 = fixture("household-q1.sav");
        assumeSavReader(q1);
        assertEquals(0, importWave(config, "2025-Q1", q1, "--create").exitCode());
        Instant first = Instant.now();
        CliRun again = importWave(config, "2025-Q1", q1);
        assertEquals(2, again.exitCode(), again.err());
        assertTrue(again.err().contains("--replace"), again.err());
        CliRun replaced = importWave(config, "2025-Q1", q1, "--replace");
        assertEquals(0, replaced.exitCode(), replaced.err());
        assertEquals(6, count("SELECT count(*) FROM survey.household WHERE wave = '2025-Q1'"));
        assertEquals(1, count("SELECT count(*) FROM ww_results.wave_codebook WHERE wave = '2025-Q1'"
                + " AND imported_at >= '" + first + "'"));
    }

    @Test
    void rowsCommittedBeforeTheCodebookCouldBeSavedAreSaidToBeSoAndReplaceMendsBoth() throws Exception {
        Path q1 = fixture("household-q1.sav");
        assumeSavReader(q1);
        // With the results schema in place, a trigger makes the server refuse the codebook's row.
        org.postgresql.ds.PGSimpleDataSource ds = new org.postgresql.ds.PGSimpleDataSource();
        ds.setURL(url);
        ds.setUser("postgres");
        ResultsSchema.migrate(ds, "ww_results");
        execute("CREATE FUNCTION ww_results.refuse() RETURNS trigger LANGUAGE plpgsql AS"
                + " $$BEGIN RAISE EXCEPTION 'codebooks are refused today'; END$$;"
                + " CREATE TRIGGER refuse BEFORE INSERT ON ww_results.wave_codebook FOR EACH ROW"
                + " EXECUTE FUNCTION ww_results.refuse()");
        CliRun r = importWave(config, "2025-Q1", q1, "--create");
        assertEquals(Main.FAILED, r.exitCode(), r.out() + r.err());
        assertTrue(r.out().contains("imported 6 rows"), r.out());
        assertTrue(r.err().contains("the rows of wave 2025-Q1 are committed, but saving its codebook failed")
                && r.err().contains("codebooks are refused today") && r.err().contains("--replace"), r.err());
        assertEquals(6, count("SELECT count(*) FROM survey.household"));
        execute("DROP TRIGGER refuse ON ww_results.wave_codebook");
        CliRun mended = importWave(config, "2025-Q1", q1, "--replace");
        assertEquals(0, mended.exitCode(), mended.err());
        assertTrue(codebooks().load("household", "2025-Q1").isPresent());
        assertEquals(6, count("SELECT count(*) FROM survey.household"));
    }

    @Test
    void aDdiCodebookGivenWithACsvImportIsSavedWithTheWave() throws Exception {
        Path ddi = fixture("small-survey-ddi.xml");
        try {
            DdiCodebook.read(ddi);
        } catch (UnsupportedOperationException e) {
            assumeTrue(false, "the DDI codebook reader is not written yet");
        }
        SmallSurvey.createTable(url);
        Path cfg = dir.resolve("small.yaml");
        Files.writeString(cfg, SmallSurvey.config(url, null));
        Path csv = SmallSurvey.writeWaves(dir)[0];
        CliRun r = importWave(cfg, "w1", csv, "--codebook", ddi.toString());
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("saved the codebook of wave w1: 3 variables, 1 with value labels, 1 with"
                + " missing values"), r.out());
        DatasetCodebook saved = codebooks().load("small-survey", "w1").orElseThrow();
        VariableMeta satisfied = saved.variable("satisfied").orElseThrow();
        assertEquals("Very satisfied", satisfied.valueLabels().get("1"));
        assertEquals("9", satisfied.missingCodes().get(0).value());
    }

    @Test
    void aCsvWaveLoadedAgainWithoutACodebookForgetsTheOneSavedWithItsOldRows() throws Exception {
        SmallSurvey.createTable(url);
        Path cfg = dir.resolve("small.yaml");
        Files.writeString(cfg, SmallSurvey.config(url, null));
        Path csv = SmallSurvey.writeWaves(dir)[0];
        CliRun first = importWave(cfg, "w1", csv);
        assertEquals(0, first.exitCode(), first.err());
        org.postgresql.ds.PGSimpleDataSource ds = new org.postgresql.ds.PGSimpleDataSource();
        ds.setURL(url);
        ds.setUser("postgres");
        ResultsSchema.migrate(ds, "ww_results");
        codebooks().save("small-survey", "w1", new DatasetCodebook("old.xml", null, List.of()), Instant.now());
        CliRun r = importWave(cfg, "w1", csv, "--replace");
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("removed the codebook saved with the earlier rows of wave w1"), r.out());
        assertTrue(codebooks().load("small-survey", "w1").isEmpty());
        assertEquals(600, count("SELECT count(*) FROM src.answers WHERE wave = 'w1'"));
    }

    @Test
    void aPlainCsvImportLeavesTheResultsSchemaAloneAndACodebookMakesItReady() throws Exception {
        SmallSurvey.createTable(url);
        Path cfg = dir.resolve("small.yaml");
        Files.writeString(cfg, SmallSurvey.config(url, null));
        Path[] waves = SmallSurvey.writeWaves(dir);
        CliRun r = importWave(cfg, "w1", waves[0]);
        assertEquals(0, r.exitCode(), r.err());
        assertEquals(0, count("SELECT count(*) FROM pg_namespace WHERE nspname = 'ww_results'"),
                "a CSV wave without a codebook has nothing to keep in the results schema");
        Path codebook = Files.writeString(dir.resolve("small.csv"), "variable,label\nregion,Region of the home\n");
        CliRun withCodebook = importWave(cfg, "w2", waves[1], "--codebook", codebook.toString());
        assertEquals(0, withCodebook.exitCode(), withCodebook.err());
        assertEquals(1, count("SELECT count(*) FROM pg_tables WHERE schemaname = 'ww_results'"
                + " AND tablename = 'wave_codebook'"));
        assertEquals("Region of the home", codebooks().load("small-survey", "w2").orElseThrow()
                .variable("region").orElseThrow().label());
    }

    @Test
    void aCodebookWithASavFileIsRefusedBeforeAnythingIsWritten() throws Exception {
        Path q1 = fixture("household-q1.sav");
        Path ddi = fixture("small-survey-ddi.xml");
        CliRun r = importWave(config, "2025-Q1", q1, "--codebook", ddi.toString());
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at --codebook") && r.err().contains("its own dictionary"),
                r.err());
        assertEquals(0, count("SELECT count(*) FROM pg_namespace WHERE nspname IN ('survey', 'ww_results')"));
    }

    @Test
    void aCodebookOfAnUnknownKindIsRefusedNamingTheOption() throws Exception {
        SmallSurvey.createTable(url);
        Path cfg = dir.resolve("small.yaml");
        Files.writeString(cfg, SmallSurvey.config(url, null));
        Path notes = Files.writeString(dir.resolve("codebook.txt"), "region: where they live\n");
        CliRun r = importWave(cfg, "w1", SmallSurvey.writeWaves(dir)[0], "--codebook", notes.toString());
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at --codebook") && r.err().contains(".xml"), r.err());
        assertEquals(0, count("SELECT count(*) FROM src.answers"));
    }

    @Test
    void aFileOfUnknownKindOrOneThatIsNotThereIsRefusedNamingIt() throws Exception {
        Path odd = Files.writeString(dir.resolve("wave.txt"), "id\n1\n");
        CliRun r = importWave(config, "2025-Q1", odd);
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("config error at FILE") && r.err().contains(".sav"), r.err());
        CliRun absent = importWave(config, "2025-Q1", dir.resolve("absent.sav"));
        assertEquals(2, absent.exitCode(), absent.err());
        assertTrue(absent.err().contains("no file") && absent.err().contains("absent.sav"), absent.err());
    }
}
