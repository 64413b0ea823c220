package org.wavewarden.load;

import org.junit.jupiter.api.Test;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.sql.Connection;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Importing a wave: the file's mistakes come back with file, line and column; a wave is loaded once. */
class CsvImportTest extends SmallSurveyImportTest {

    static final String HEADER = "respondent_id,score,region,satisfied,has_car,remark,spread\n";

    CsvImportTest() {
        super("import");
    }

    @Test
    void twoConcurrentImportsOfOneWaveLoadItOnceAndTheSecondIsRefused() throws Exception {
        Path csv = SmallSurvey.writeWaves(dir)[0];
        List<Future<CliRun>> runs = new ArrayList<>();
        ExecutorService pool = Executors.newFixedThreadPool(2);
        try (Connection gate = TestDatabase.connect(url); var st = gate.createStatement()) {
            // The gate lets both imports count the wave's rows but holds their inserts, so both are inside
            // their transactions at once, whatever the scheduling.
            gate.setAutoCommit(false);
            st.execute("LOCK TABLE src.answers IN SHARE MODE");
            runs.add(pool.submit(() -> importWave("w1", csv)));
            runs.add(pool.submit(() -> importWave("w1", csv)));
            awaitWaiting(url, 2, null, runs);
            gate.commit();
        }
        List<CliRun> done = new ArrayList<>();
        for (Future<CliRun> f : runs) {
            done.add(f.get());
        }
        pool.shutdown();
        List<Integer> codes = done.stream().map(CliRun::exitCode).sorted().toList();
        assertEquals(List.of(0, 2), codes, done.toString());
        CliRun refused = done.stream().filter(r -> r.exitCode() == 2).findFirst().orElseThrow();
        assertTrue(refused.err().contains("already has 600 rows"), refused.err());
        assertEquals(600, count("SELECT count(*) FROM src.answers WHERE wave = 'w1'"));
        assertEquals(600, count("SELECT count(DISTINCT respondent_id) FROM src.answers WHERE wave = 'w1'"));
    }

    @Test
    void aHeaderOnlyFileIsRefusedAndCreatesNoWave() throws Exception {
        CliRun r = importWave("w1", write("empty-wave.csv", HEADER));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("empty-wave.csv") && r.err().contains("no data rows"), r.err());
        assertFalse(r.out().contains("imported"), r.out());
        assertEquals(0, count("SELECT count(*) FROM src.answers"));
    }

    @Test
    void latin1BytesInAFileDeclaredUtf8AreRefusedNamingFileLineAndColumn() throws Exception {
        byte[] head = (HEADER + "1,50.5,north,2,true,fine,50\n").getBytes(StandardCharsets.UTF_8);
        byte[] bad = "2,51.5,south,3,false,caf\u00e9,49\n".getBytes(StandardCharsets.ISO_8859_1);
        byte[] file = new byte[head.length + bad.length];
        System.arraycopy(head, 0, file, 0, head.length);
        System.arraycopy(bad, 0, file, head.length, bad.length);
        CliRun r = CliRun.of("import", "--config", config.toString(), "--wave", "w1", "--encoding", "UTF-8",
                write("latin1.csv", file).toString());
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("latin1.csv line 3, column 6 (remark): bytes 0xE9 at byte offset "
                + String.format(Locale.ROOT, "%,d", head.length + 24)
                + " are not valid UTF-8 (the encoding given)"), r.err());
        assertTrue(r.err().contains("--encoding windows-1252"), r.err());
        assertFalse(r.err().contains("PSQLException"), r.err());
        assertEquals(0, count("SELECT count(*) FROM src.answers"));
    }

    @Test
    void aRaggedRowIsRefusedNamingFileAndLine() throws Exception {
        CliRun r = importWave("w1", write("ragged.csv", HEADER + "1,50.5,north,2,true,fine,50\n"
                + "2,51.5,south,3,false,ok,49\n3,52.5,east,1,true,ok,48,one too many\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("ragged.csv line 4, column 8: the row has 8 fields but the header has 7"),
                r.err());
        CliRun shortRow = importWave("w1", write("short.csv", HEADER + "1,50.5,north\n"));
        assertEquals(2, shortRow.exitCode(), shortRow.err());
        assertTrue(shortRow.err().contains("short.csv line 2, column 4 (satisfied): the row ends after 3 fields"),
                shortRow.err());
        assertEquals(0, count("SELECT count(*) FROM src.answers"));
    }

    @Test
    void aValueOfTheWrongTypeIsRefusedNamingFileLineAndColumn() throws Exception {
        CliRun r = importWave("w1", write("typed.csv", HEADER + "1,50.5,north,2,true,fine,50\n"
                + "2,51.5,south,3,false,ok,49\n3,52.5,east,1,true,ok,48\n4,abc,west,2,false,ok,47\n"));
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().contains("typed.csv line 5, column 2 (score)"), r.err());
        assertTrue(r.err().contains("double precision"), r.err());
        assertEquals(0, count("SELECT count(*) FROM src.answers"));
    }
}
