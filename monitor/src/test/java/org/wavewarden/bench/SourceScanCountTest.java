package org.wavewarden.bench;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.TextWaveScanner;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.testing.SyntheticDatasets;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A check reads the source a fixed number of times: the passes over source rows (COPY plus queries naming the
 * table) do not grow with the number of variables nor with the number of earlier waves, whose summaries are
 * stored. Counted, not timed.
 */
class SourceScanCountTest {

    static Session session;
    static WardenConfig config;

    @BeforeAll
    static void setUp() throws Exception {
        String url = TestDatabase.freshDatabase("scancount");
        try (Connection c = TestDatabase.connect(url)) {
            table(c, "narrow_few", 10, 3);
            table(c, "wide_few", 40, 3);
            table(c, "narrow_many", 10, 11);
            table(c, "wide_many", 40, 11);
        }
        config = SyntheticDatasets.config(url, "scan_results", "narrow_few", "wide_few", "narrow_many", "wide_many");
        session = Session.open(config, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    private static void table(Connection c, String name, int vars, int waves) throws Exception {
        SyntheticSurvey.createTable(c, "gen", name, vars);
        for (int w = 1; w <= waves; w++) {
            SyntheticSurvey.insertWave(c, "gen", name, vars, Integer.toString(w), 150, w == waves ? 1 : 0, w / 100.0);
        }
    }

    /** The statements of a check of the last wave, once every earlier wave has a stored summary. */
    private static StatementCounter.SourceStatements counted(String dataset, int waves, WaveJudge.Scanner scanner) {
        var d = config.dataset(dataset);
        Bench.seedHistory(session, d, waves - 2);
        Bench.Target t = new Bench.Target(dataset, d, Integer.toString(waves),
                new StatementCounter(Identifiers.quote("gen") + "." + Identifiers.quote(dataset)));
        Bench.check(session, t, scanner); // reads the one earlier wave never stored, and stores it
        Bench.check(session, t, scanner);
        return t.counter().snapshot();
    }

    @Test
    void scansPerCheckDoNotGrowWithVariablesNorWithEarlierWaves() {
        WaveJudge.Scanner binary = new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan;
        var narrowFew = counted("narrow_few", 3, binary);
        var wideFew = counted("wide_few", 3, binary);
        var narrowMany = counted("narrow_many", 11, binary);
        var wideMany = counted("wide_many", 11, binary);
        assertEquals(1, narrowFew.copies(), "one COPY of the judged wave: " + narrowFew);
        assertTrue(narrowFew.tableQueries() >= 1, "the wave listing reads the table: " + narrowFew);
        assertEquals(narrowFew.scans(), wideFew.scans(), "10 versus 40 variables");
        assertEquals(narrowFew.scans(), narrowMany.scans(), "2 versus 10 earlier waves stored");
        assertEquals(narrowFew.scans(), wideMany.scans(), "40 variables and 10 earlier waves");
        assertEquals(narrowFew.total(), wideMany.total(), "every statement, catalog queries included");
    }

    @Test
    void theBinaryScannerSendsWhatTheTextScannerSends() {
        WaveJudge.Scanner binary = new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan;
        WaveJudge.Scanner text = new TextWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan;
        assertEquals(counted("wide_many", 11, text), counted("wide_many", 11, binary));
    }

    @Test
    void anEarlierWaveWithoutStoredSummaryCostsOneMoreCopy() {
        // The counter sees the extra pass: a check that cannot count it would pass the test above vacuously.
        var d = config.dataset("narrow_few");
        Bench.Target t = new Bench.Target("narrow_few", d, "2",
                new StatementCounter(Identifiers.quote("gen") + "." + Identifiers.quote("narrow_few")));
        session.store().jdbi().useHandle(h -> h.execute(
                "DELETE FROM scan_results.wave_summary WHERE dataset = 'narrow_few' AND wave = '1'"));
        Bench.check(session, t, new TextWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan);
        assertEquals(2, t.counter().snapshot().copies());
    }
}
