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
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A wave without a quiet period is judged on the first firing that sees it, whatever the clock's precision: the
 * server stores times to the microsecond, rounding, so a reading with nanoseconds must not come back later than
 * itself and make the wave wait a firing (a whole day on the default schedule).
 */
class FiringClockPrecisionTest {

    @TempDir
    Path dir;

    @Test
    void aWaveWithoutQuietPeriodIsJudgedAtOnceWhenTheClockHasNanoseconds() throws Exception {
        String url = TestDatabase.freshDatabase("clock_precision");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
        assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w1", csv[0].toString())
                .exitCode());
        WardenConfig c = ConfigLoader.parse(Files.readString(config));
        // 600 ns past the microsecond: the server rounds it up to the next microsecond.
        Clock clock = Clock.fixed(Instant.parse("2026-03-01T02:15:00.000000600Z"), ZoneOffset.UTC);
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            DatasetFiring.Result r = new DatasetFiring(s, clock, dir.resolve("out")).fire(c.datasets().get(0));
            assertEquals(List.of(), r.waiting());
            assertEquals(List.of("w1"), r.judged().stream().map(j -> j.report().wave()).toList());
        }
    }
}
