package org.wavewarden.bench;

import org.junit.jupiter.api.Test;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The console bench runs end to end on a small history without any configuration: it writes the history, measures
 * the reads, logs in over HTTP as its own viewer and measures every page kind. Times are printed, never asserted;
 * what is asserted is that every page was asked for and answered, with the statements it sent.
 */
class ConsoleBenchRunTest {

    static final List<String> PAGES = List.of("overview", "grid", "grid filtered", "finding", "wave", "search");

    @Test
    void aSmallHistoryIsMeasuredByItsReadsAndOverHttpWithTheBenchsOwnLogin() {
        StringWriter log = new StringWriter();
        List<ConsoleBench.Report> reports = ConsoleBench.run(new ConsoleBench.Options(
                new ConsoleHistory.Size(2, 3, 5), 3, null, null, null), new PrintWriter(log));
        assertEquals(2, reports.size(), log.toString());
        assertTrue(reports.get(1).via().startsWith("pages over HTTP"), reports.get(1).via());
        for (ConsoleBench.Report r : reports) {
            assertEquals(2 * 3, r.history().runs() - 2, "every wave judged, wave 2 twice: " + r.history());
            assertEquals(PAGES, r.rows().stream().map(ConsoleBench.Row::page).toList(), r.via());
            for (ConsoleBench.Row row : r.rows()) {
                assertTrue(row.statements() >= 1, row + " sent its statements");
                assertTrue(row.medianMs() > 0 && row.maxMs() >= row.medianMs(), row.toString());
            }
        }
        assertTrue(log.toString().contains("pages over HTTP"), log.toString());
    }
}
