package org.wavewarden.store;

import org.jdbi.v3.core.statement.SqlLogger;
import org.jdbi.v3.core.statement.StatementContext;
import org.junit.jupiter.api.Test;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A wave's summary is stored once per content: a run of a wave whose summary (by its checksum) is stored already
 * neither stores nor sends it again, and a summary of other content is stored beside the first.
 */
class StoredSummaryTest {

    @Test
    void aSummaryStoredAlreadyIsNotSentAgainAndOtherContentIsStoredBesideIt() throws Exception {
        String url = TestDatabase.freshDatabase("stored_summary");
        WardenConfig cfg = ConfigLoader.parse(SmallSurvey.config(url, ""));
        WaveProfile first = profile(3, Map.of("yes", 2L, "no", 1L));
        try (Session s = Session.open(cfg, null, Map.of())) {
            s.migrate();
            AtomicInteger summaryInserts = new AtomicInteger();
            s.store().jdbi().setSqlLogger(new SqlLogger() {
                @Override
                public void logBeforeExecution(StatementContext ctx) {
                    String sql = ctx.getRenderedSql();
                    if (sql.contains("INSERT INTO") && sql.contains("wave_summary")) {
                        summaryInserts.incrementAndGet();
                    }
                }
            });
            Instant now = Instant.parse("2026-03-02T09:15:00Z");
            s.store().writeRun(run("checksum-a", "fingerprint-1", now), first, List.of(), List.of());
            assertEquals(1, summaryInserts.get(), "the first run stores the summary");

            // The same data judged under another configuration: a new run, the same summary.
            s.store().writeRun(run("checksum-a", "fingerprint-2", now.plusSeconds(60)), first, List.of(), List.of());
            assertEquals(1, summaryInserts.get(), "a summary stored already is not sent again");
            assertEquals(1, rows(s, cfg, "checksum-a"));
            assertEquals(first, s.store().latestSummary("small-survey", "w2").orElseThrow().profile());

            // Other content of the same wave (a corrected wave) is stored beside it and becomes the latest.
            WaveProfile corrected = profile(4, Map.of("yes", 3L, "no", 1L));
            s.store().writeRun(run("checksum-b", "fingerprint-2", now.plusSeconds(120)), corrected, List.of(),
                    List.of());
            assertEquals(2, summaryInserts.get());
            assertEquals(1, rows(s, cfg, "checksum-b"));
            assertEquals(corrected, s.store().latestSummary("small-survey", "w2").orElseThrow().profile());
        }
    }

    private static ResultsStore.RunWrite run(String checksum, String fingerprint, Instant at) {
        return new ResultsStore.RunWrite("small-survey", "w2", "w1", checksum, at, at, 0.05, "BENJAMINI_HOCHBERG",
                "test", fingerprint);
    }

    private static WaveProfile profile(long rows, Map<String, Long> counts) {
        return new WaveProfile("w2", rows, Map.of("owns_car", ColumnType.TEXT), Map.of("owns_car",
                new ColumnTally("owns_car", ColumnType.TEXT, rows, 0, counts, false, Binning.EXACT)));
    }

    private static int rows(Session s, WardenConfig cfg, String checksum) {
        return s.store().jdbi().withHandle(h -> h.createQuery("SELECT count(*) FROM " + cfg.results().schema()
                        + ".wave_summary WHERE dataset = 'small-survey' AND wave = 'w2' AND checksum = :c")
                .bind("c", checksum).mapTo(Integer.class).one());
    }
}
