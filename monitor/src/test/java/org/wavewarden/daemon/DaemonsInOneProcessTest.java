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
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Two daemons in one process (as in the cluster tests): closing one must leave the other's job store on its own
 * pool, so that a firing of the other that is under way when the first closes still completes and records its end.
 */
class DaemonsInOneProcessTest {

    @TempDir
    Path dir;

    @Test
    void aFiringUnderWayWhenAnotherDaemonInTheProcessClosesStillCompletes() throws Exception {
        String url = TestDatabase.freshDatabase("two_in_one");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        String yaml = SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"")
                + "daemon:\n  httpPort: -1\n  outputDir: \"" + dir.resolve("digests").toString().replace("\\", "/")
                + "\"\n";
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, yaml);
        assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w1", csv[0].toString())
                .exitCode());
        WardenConfig cfg = ConfigLoader.parse(yaml);
        CountDownLatch firingHeld = new CountDownLatch(1);
        CountDownLatch otherClosed = new CountDownLatch(1);
        try (Session s1 = Session.open(cfg, null, Map.of()); Session s2 = Session.open(cfg, null, Map.of())) {
            Daemon a = new Daemon(s1, Clock.systemUTC(), DaemonIntegrationTest.FAST, Map.of());
            a.firingListener(new Daemon.FiringListener() {
                @Override
                public void started(String dataset) {
                    firingHeld.countDown();
                    try {
                        otherClosed.await(30, TimeUnit.SECONDS);
                    } catch (InterruptedException e) {
                        Thread.currentThread().interrupt();
                    }
                }
            });
            a.start("instance-a", 1000);
            assertTrue(firingHeld.await(30, TimeUnit.SECONDS), "a firing of instance a began");
            // Started after a, and closed while a's firing is held.
            try (Daemon b = new Daemon(s2, Clock.systemUTC(), DaemonIntegrationTest.FAST, Map.of())) {
                b.start("instance-b", 1000);
            }
            otherClosed.countDown();
            Thread closer = new Thread(a::close, "close-instance-a");
            closer.setDaemon(true);
            closer.start();
            closer.join(TimeUnit.SECONDS.toMillis(30));
            assertTrue(!closer.isAlive(), "instance a closed, its firing completed and recorded");
        }
        assertEquals(1, DaemonIntegrationTest.runs(url, "w1"));
    }
}
