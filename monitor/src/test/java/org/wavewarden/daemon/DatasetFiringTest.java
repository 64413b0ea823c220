package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** When a firing judges a wave: once it is ready, oldest first, and again only when its data changed. */
class DatasetFiringTest {

    @TempDir
    Path dir;

    /** A clock the test moves by hand. */
    static final class ManualClock extends Clock {
        Instant now = Instant.parse("2026-03-01T02:15:00Z");

        @Override
        public ZoneOffset getZone() {
            return ZoneOffset.UTC;
        }

        @Override
        public Clock withZone(java.time.ZoneId zone) {
            return this;
        }

        @Override
        public Instant instant() {
            return now;
        }
    }

    String load(String prefix, String extra) throws Exception {
        String url = TestDatabase.freshDatabase(prefix);
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("c.yaml");
        String yaml = SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n" + extra);
        Files.writeString(config, yaml);
        for (int w = 1; w <= 2; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        return yaml;
    }

    @Test
    void aWaveIsJudgedOnlyAfterItsRowCountHeldForTheQuietPeriod() throws Exception {
        String yaml = load("quiet", "    quietPeriod: PT10M");
        WardenConfig c = ConfigLoader.parse(yaml);
        ManualClock clock = new ManualClock();
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            DatasetFiring firing = new DatasetFiring(s, clock, dir.resolve("out"));
            var first = firing.fire(c.datasets().get(0));
            assertEquals(List.of(), first.judged());
            assertEquals(List.of("w1", "w2"), first.waiting(), "w1 waits, and w2 behind it");
            clock.now = clock.now.plus(Duration.ofMinutes(9));
            assertEquals(0, firing.fire(c.datasets().get(0)).judged().size());
            clock.now = clock.now.plus(Duration.ofMinutes(2));
            var ready = firing.fire(c.datasets().get(0));
            assertEquals(List.of("w1", "w2"), ready.judged().stream().map(j -> j.report().wave()).toList());
            assertEquals(0, firing.fire(c.datasets().get(0)).judged().size(), "nothing is judged twice");

            // Rows added to w2: its count changes, so it waits out a new quiet period and is judged again.
            try (Connection conn = TestDatabase.connect(c.source().jdbcUrl()); var st = conn.createStatement()) {
                st.executeUpdate("INSERT INTO src.answers SELECT 'w2', respondent_id + 10000, score, region, satisfied,"
                        + " has_car, remark, spread FROM src.answers WHERE wave = 'w2' AND respondent_id < 50");
            }
            assertEquals(List.of("w2"), firing.fire(c.datasets().get(0)).waiting());
            clock.now = clock.now.plus(Duration.ofMinutes(11));
            assertEquals(List.of("w2"), firing.fire(c.datasets().get(0)).judged().stream()
                    .map(j -> j.report().wave()).toList());
            assertEquals(1, DaemonIntegrationTest.count(c.source().jdbcUrl(),
                    "SELECT count(*) FROM ww_results.run WHERE wave = 'w2' AND superseded_at IS NULL"));
        }
    }

    @Test
    void rowsEditedInPlaceAreNoticedAndTheWaveJudgedAgain() throws Exception {
        String yaml = load("edited", "");
        WardenConfig c = ConfigLoader.parse(yaml);
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            DatasetFiring firing = new DatasetFiring(s, Clock.systemUTC(), dir.resolve("out"));
            assertEquals(2, firing.fire(c.datasets().get(0)).judged().size());
            assertEquals(0, firing.fire(c.datasets().get(0)).judged().size());
            // The same number of rows, one answer changed: only the content fingerprint can tell.
            try (Connection conn = TestDatabase.connect(c.source().jdbcUrl()); var st = conn.createStatement()) {
                assertEquals(1, st.executeUpdate("UPDATE src.answers SET score = score + 40 WHERE wave = 'w2'"
                        + " AND respondent_id = 7"));
            }
            assertEquals(List.of("w2"), firing.fire(c.datasets().get(0)).judged().stream()
                    .map(j -> j.report().wave()).toList());
            assertEquals(2, DaemonIntegrationTest.count(c.source().jdbcUrl(),
                    "SELECT count(*) FROM ww_results.run WHERE wave = 'w2'"));
            assertEquals(1, DaemonIntegrationTest.count(c.source().jdbcUrl(),
                    "SELECT count(*) FROM ww_results.run WHERE wave = 'w2' AND superseded_at IS NULL"));
            assertEquals(0, firing.fire(c.datasets().get(0)).judged().size(), "and then it is settled");
        }
    }

    @Test
    void withAReadinessTableOnlyReleasedWavesAreJudged() throws Exception {
        String yaml = load("ready", "    readyTable: src.released\n    readyColumn: wave");
        WardenConfig c = ConfigLoader.parse(yaml);
        try (Connection conn = TestDatabase.connect(c.source().jdbcUrl()); var st = conn.createStatement()) {
            st.execute("CREATE TABLE src.released (wave text PRIMARY KEY); INSERT INTO src.released VALUES ('w1')");
        }
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            DatasetFiring firing = new DatasetFiring(s, Clock.systemUTC(), dir.resolve("out"));
            var r = firing.fire(c.datasets().get(0));
            assertEquals(List.of("w1"), r.judged().stream().map(j -> j.report().wave()).toList());
            assertEquals(List.of("w2"), r.waiting());
        }
    }
}
