package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.testing.ChildDaemon;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Daemons in child JVMs killed with SIGKILL in the middle of a run: the results transaction leaves nothing
 * half-written, and the work is completed exactly once, by the surviving cluster member or by a restart.
 */
class DaemonFailoverTest {

    @TempDir
    Path dir;

    Path setUp(String prefix) throws Exception {
        String url = TestDatabase.freshDatabase(prefix);
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"")
                + "daemon:\n  httpPort: -1\n  clusterCheckinMillis: 1000\n  outputDir: \""
                + dir.resolve("digests").toString().replace("\\", "/") + "\"\n");
        for (int w = 1; w <= 3; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        this.url = url;
        return config;
    }

    String url;

    @Test
    void anInstanceKilledMidRunIsReplacedByTheOtherAndNoWaveIsJudgedTwice() throws Exception {
        Path config = setUp("failover");
        try (ChildDaemon a = ChildDaemon.start(dir, "a", List.of("-Dwavewarden.fault.pause=before-write"), "run",
                "--config", config.toString(), "--instance-id", "instance-a")) {
            a.awaitOutput("paused at fault point before-write", Duration.ofSeconds(60));
            try (ChildDaemon b = ChildDaemon.start(dir, "b", List.of(), "run", "--config", config.toString(),
                    "--instance-id", "instance-b")) {
                b.awaitOutput("daemon running", Duration.ofSeconds(60));
                a.kill();
                DaemonIntegrationTest.await(() -> DaemonIntegrationTest.runs(url, "w3") == 1, "instance b finished the"
                        + " work of instance a");
                Thread.sleep(2000);
            }
        }
        for (String w : List.of("w1", "w2", "w3")) {
            assertEquals(1, DaemonIntegrationTest.runs(url, w), w);
        }
    }

    @Test
    void aDaemonKilledInsideTheResultsTransactionLeavesNothingAndARestartRedoesTheRunOnce() throws Exception {
        Path config = setUp("crash");
        try (ChildDaemon a = ChildDaemon.start(dir, "crash", List.of("-Dwavewarden.fault.pause=inside-write"), "run",
                "--config", config.toString())) {
            a.awaitOutput("paused at fault point inside-write", Duration.ofSeconds(60));
            a.kill();
        }
        // The run row was inserted in the transaction that died with the process: nothing of it remains.
        assertEquals(0, DaemonIntegrationTest.count(url, "SELECT count(*) FROM ww_results.run"));
        assertEquals(0, DaemonIntegrationTest.count(url, "SELECT count(*) FROM ww_results.alert"));
        try (ChildDaemon again = ChildDaemon.start(dir, "again", List.of(), "run", "--once", "--config",
                config.toString())) {
            assertEquals(0, again.waitFor(Duration.ofSeconds(90)), again.output());
        }
        for (String w : List.of("w1", "w2", "w3")) {
            assertEquals(1, DaemonIntegrationTest.runs(url, w), w);
        }
    }
}
