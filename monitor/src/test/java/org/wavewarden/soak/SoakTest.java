package org.wavewarden.soak;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The two-minute soak CI runs: the daemon in a child JVM for two minutes of seeded faults (database cuts, receiver
 * outages, 500s and slow answers, SIGKILL and restart), then the audit must be clean: every wave judged exactly
 * once, every alert delivered exactly once to the JSON Lines file and to the webhook (a retry the receiver
 * recognises by its idempotency key is a repeat, not a second delivery), nothing lost.
 */
class SoakTest {

    @TempDir
    Path dir;

    @Test
    void afterTwoMinutesOfFaultsEveryWaveIsJudgedOnceAndEveryAlertDeliveredOncePerSink() throws Exception {
        String url = TestDatabase.freshDatabase("soak");
        CliRun r = CliRun.of("soak", "--minutes", "2", "--seed", "1", "--jdbc-url", url, "--user", "postgres",
                "--results-schema", "soak_results", "--source-schema", "soak_source", "--out", dir.toString());
        System.out.println(r.out());
        JsonNode summary = Json.mapper().readTree(Files.readString(dir.resolve(Soak.SUMMARY_FILE)));
        String why = r.out() + r.err();
        assertTrue(summary.get("faultsInjected").asInt() > 0, why);
        assertTrue(summary.get("alerts").asInt() > 0, why);
        assertEquals(summary.at("/waves/produced").asInt(), summary.at("/waves/judged").asInt(), why);
        assertEquals(0, summary.get("lost").asInt(), why);
        assertEquals(0, summary.get("duplicated").asInt(), why);
        assertTrue(summary.has("repeats"), "the summary counts repeats recognised by key apart: " + why);
        assertEquals(0, summary.get("unexpected").asInt(), why);
        assertEquals(0, r.exitCode(), why);
    }
}
