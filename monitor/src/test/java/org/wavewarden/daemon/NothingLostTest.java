package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.WebhookSink;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.ChildDaemon;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;
import org.wavewarden.testing.WebhookReceiver;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Everything a committed run owes is delivered exactly once, whatever fails after the commit: a receiver that is
 * down, a JSON Lines path that cannot be written, an output folder that cannot be written, an HTML digest that
 * throws, a process killed in the middle of delivering. Real PostgreSQL, a real receiver on loopback, real files.
 */
class NothingLostTest {

    static final String DATASET = "small-survey";
    static final String SECRET = "a-shared-secret-for-the-test";
    static final Daemon.Retry FAST = new Daemon.Retry(2, Duration.ofMillis(50), Duration.ofMillis(100));
    /** Two quick attempts per alert and firing: an outage of seconds outlasts them. */
    static final RetryPolicy QUICK = RetryPolicy.of(2, Duration.ofMillis(10), Duration.ofMillis(50));

    @TempDir
    Path dir;
    String url;

    /** Three waves of the small survey in a fresh database; the third moves enough to raise several alerts. */
    void load(String prefix) throws Exception {
        url = TestDatabase.freshDatabase(prefix);
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("import.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
        for (int w = 1; w <= 3; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
    }

    String yaml(Path jsonLines, String hookUrl) {
        StringBuilder alerts = new StringBuilder("    alerts:\n");
        if (jsonLines != null) {
            alerts.append("      jsonLines: {path: \"").append(slashes(jsonLines)).append("\"}\n");
        }
        if (hookUrl != null) {
            alerts.append("      webhook: {url: \"").append(hookUrl).append("\", secretEnv: HOOK_SECRET}\n");
        }
        return SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n" + alerts.toString().stripTrailing())
                + "daemon:\n  httpPort: -1\n  outputDir: \"" + slashes(outputDir()) + "\"\n";
    }

    Path outputDir() {
        return dir.resolve("digests");
    }

    static String slashes(Path p) {
        return p.toString().replace("\\", "/");
    }

    long count(String sql) {
        return DaemonIntegrationTest.count(url, sql);
    }

    long openAlerts() {
        return count("SELECT count(*) FROM ww_results.alert WHERE superseded_at IS NULL");
    }

    /** Every file of that name under the folder, wherever it landed. */
    static List<Path> found(Path root, String fileName) throws IOException {
        if (!Files.isDirectory(root)) {
            return List.of();
        }
        try (Stream<Path> all = Files.walk(root)) {
            return all.filter(p -> p.getFileName().toString().equals(fileName)).toList();
        }
    }

    /** The idempotency key of every line of a JSON Lines file. */
    static List<String> keys(Path jsonLines) throws IOException {
        return Files.readAllLines(jsonLines).stream()
                .map(l -> Json.read(l, Map.class).get("idempotencyKey").toString()).toList();
    }

    static void assertEachOnce(long expected, Map<String, Integer> byKey) {
        assertEquals(expected, byKey.size(), "alerts received: " + byKey);
        assertTrue(byKey.values().stream().allMatch(n -> n == 1), "each alert once: " + byKey);
    }

    @Test
    void alertsDeadLetteredWhileTheReceiverIsDownAreDeliveredExactlyOnceWhenItIsBack() throws Exception {
        load("outbox_outage");
        Path jsonl = dir.resolve("alerts.jsonl");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            hook.down();
            WardenConfig cfg = ConfigLoader.parse(yaml(jsonl, hook.url()));
            DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
            try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", SECRET));
                 Daemon d = new Daemon(s, clock, FAST, Sinks.fromConfig(s, QUICK))) {
                s.migrate();
                // The outage spans two firings: the first judges every wave, the second finds nothing new.
                assertTrue(d.fireWithRetries(DATASET), "a receiver that is down does not fail the firing");
                clock.now = clock.now.plusSeconds(2);
                assertTrue(d.fireWithRetries(DATASET));
                long open = openAlerts();
                // Three: the repeats of the second wave's data-quality findings are carried without a new alert. An
                // exact count, so that a delivery count below cannot agree with a store that wrote too few alerts.
                assertEquals(3, open, "the planted shifts raise three alerts");
                assertTrue(hook.received().isEmpty());
                assertEquals(open, keys(jsonl).size(), "the JSON Lines sink is not held up by the webhook");

                hook.up();
                // Dead letters wait out their backoff; a later firing sends them and everything still pending.
                clock.now = clock.now.plus(Duration.ofHours(2));
                assertTrue(d.fireWithRetries(DATASET));
                assertEachOnce(open, hook.received());
                assertEquals(0, hook.badRequests());
                assertEquals(open, keys(jsonl).stream().distinct().count());
                assertEquals(open, keys(jsonl).size());
                assertEquals(0, count("SELECT count(*) FROM ww_results.dead_letter"),
                        "a dead letter is removed once a later delivery succeeds");

                clock.now = clock.now.plus(Duration.ofHours(2));
                assertTrue(d.fireWithRetries(DATASET));
                assertEachOnce(open, hook.received());
            }
        }
    }

    @Test
    void deadLettersReachTheReceiverBetweenFiringsOnceItIsBackWithoutWaitingForTheNextScheduledFiring()
            throws Exception {
        load("outbox_redeliver");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            hook.down();
            // The schedule is the nightly default: no scheduled firing comes during the test; redelivery every 1 s.
            WardenConfig cfg = ConfigLoader.parse(yaml(null, hook.url()) + "  redeliverSeconds: 1\n");
            DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
            try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", SECRET));
                 Daemon d = new Daemon(s, clock, FAST, Sinks.fromConfig(s, QUICK))) {
                d.start("redeliver-test", 1000);
                assertTrue(d.fireWithRetries(DATASET));
                long open = openAlerts();
                assertEquals(3, open, "alerts, as in the outage test above");
                assertTrue(hook.received().isEmpty());

                hook.up();
                clock.now = clock.now.plus(Duration.ofHours(2)); // past every dead letter's backoff
                long end = System.nanoTime() + Duration.ofSeconds(60).toNanos();
                while (hook.received().size() < open && System.nanoTime() < end) {
                    Thread.sleep(100);
                }
                assertEachOnce(open, hook.received());
                assertEquals(1, d.metrics().firings(DATASET), "delivered by redelivery, not by another firing");
                assertEquals(0, count("SELECT count(*) FROM ww_results.dead_letter"));
            }
        }
    }

    @Test
    void aSlowReceiverTimesOutOnceAndHoldsUpNeitherTheFiringNorTheOtherSinks() throws Exception {
        load("outbox_slow");
        Path jsonl = dir.resolve("alerts.jsonl");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            hook.slow(WebhookSink.REQUEST_TIMEOUT.plusSeconds(3));
            WardenConfig cfg = ConfigLoader.parse(yaml(jsonl, hook.url()));
            DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
            try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", SECRET));
                 Daemon d = new Daemon(s, clock, FAST, Sinks.fromConfig(s, QUICK))) {
                s.migrate();
                assertTrue(d.fireWithRetries(DATASET));
                long open = openAlerts();
                assertEquals(3, count("SELECT count(*) FROM ww_results.run"), "every wave judged and committed");
                assertEquals(open, keys(jsonl).size(), "the JSON Lines sink got every alert");
                assertFalse(found(outputDir(), "digest.html").isEmpty(), "the digest is written");
                assertEquals(1, count("SELECT count(*) FROM ww_results.dead_letter"),
                        "the webhook stopped at its first timed-out alert instead of waiting on each");

                hook.slow(Duration.ZERO);
                clock.now = clock.now.plus(Duration.ofHours(2));
                assertTrue(d.fireWithRetries(DATASET));
                // The timed-out request may have reached the receiver late: its repeat carries the same key.
                assertEquals(open, hook.received().size());
                assertEquals(0, count("SELECT count(*) FROM ww_results.dead_letter"));
            }
        }
    }

    @Test
    void deadLettersAreListedAndAReplaySendsThemAtOnce() throws Exception {
        load("outbox_replay");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            hook.down();
            Path config = dir.resolve("c.yaml");
            Files.writeString(config, yaml(null, hook.url()));
            WardenConfig cfg = ConfigLoader.parse(Files.readString(config));
            try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", SECRET));
                 Daemon d = new Daemon(s, java.time.Clock.systemUTC(), FAST, Sinks.fromConfig(s, QUICK))) {
                s.migrate();
                d.fireWithRetries(DATASET);
            }
            long open = openAlerts();
            CliRun listed = CliRun.of("outbox", "list", "--config", config.toString());
            assertEquals(0, listed.exitCode(), listed.err());
            assertTrue(listed.out().contains("1 dead letter(s)"), listed.out());
            assertTrue(listed.out().contains("webhook:" + hook.url()), listed.out());
            assertFalse(listed.out().contains(SECRET));

            hook.up();
            try (ChildDaemon replay = ChildDaemon.start(dir, "replay", List.of(), Map.of("HOOK_SECRET", SECRET),
                    "outbox", "replay", "--config", config.toString(), "--dataset", DATASET)) {
                assertEquals(0, replay.waitFor(Duration.ofSeconds(120)), replay.output());
                assertTrue(replay.output().contains("1 dead letter(s) due again"), replay.output());
            }
            assertEachOnce(open, hook.received());
            CliRun after = CliRun.of("outbox", "list", "--config", config.toString());
            assertTrue(after.out().contains("0 dead letter(s)"), after.out());
            assertEquals(0, count("SELECT count(*) FROM ww_results.dead_letter"));
        }
    }

    @Test
    void theBacklogCountsPendingAndDeadLetteredAlertsPerSinkAndEmptiesWhenDelivered() throws Exception {
        load("outbox_backlog");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            hook.down();
            WardenConfig cfg = ConfigLoader.parse(yaml(null, hook.url()));
            DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
            try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", SECRET));
                 Daemon d = new Daemon(s, clock, FAST, Sinks.fromConfig(s, QUICK))) {
                s.migrate();
                d.fireWithRetries(DATASET);
                long open = openAlerts();
                DeliveryBacklog hookBacklog = d.backlog().stream().filter(b -> b.sink().startsWith("webhook:"))
                        .findFirst().orElseThrow();
                assertEquals(DATASET, hookBacklog.dataset());
                assertEquals(1, hookBacklog.deadLetters(), "the sink stopped at its first failure: " + hookBacklog);
                assertEquals(open - 1, hookBacklog.pending());
                assertEquals(1, hookBacklog.failedAttempts());
                assertFalse(hookBacklog.sink().contains(SECRET));
                DeliveryBacklog files = d.backlog().stream().filter(b -> b.sink().equals("files")).findFirst()
                        .orElseThrow();
                assertEquals(0, files.pending() + files.deadLetters(), "files do not wait for the webhook");

                hook.up();
                clock.now = clock.now.plus(Duration.ofHours(2));
                d.fireWithRetries(DATASET);
                for (DeliveryBacklog b : d.backlog()) {
                    assertEquals(0, b.pending() + b.deadLetters(), b.toString());
                }
            }
        }
    }

    @Test
    void healthTurnsDegradedNamingTheSinkWhileAlertsAreDeadLetteredAndRecoversOnceTheyAreDelivered() throws Exception {
        load("outbox_health");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            hook.down();
            WardenConfig cfg = ConfigLoader.parse(yaml(null, hook.url()).replace("httpPort: -1", "httpPort: 0"));
            DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
            try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", SECRET));
                 Daemon d = new Daemon(s, clock, FAST, Sinks.fromConfig(s, QUICK))) {
                d.start("health-test", 1000);
                d.fireWithRetries(DATASET);
                java.net.http.HttpClient http = java.net.http.HttpClient.newHttpClient();
                java.net.URI base = java.net.URI.create("http://127.0.0.1:" + d.statusPort());
                java.net.http.HttpResponse<String> health = http.send(java.net.http.HttpRequest.newBuilder(
                        base.resolve("/health")).build(), java.net.http.HttpResponse.BodyHandlers.ofString());
                assertEquals(503, health.statusCode(), health.body());
                assertTrue(health.body().contains("webhook:"), "the problem names the sink: " + health.body());
                assertFalse(health.body().contains(SECRET));
                String metrics = http.send(java.net.http.HttpRequest.newBuilder(base.resolve("/metrics")).build(),
                        java.net.http.HttpResponse.BodyHandlers.ofString()).body();
                assertTrue(metrics.contains("wavewarden_delivery_dead_letters{dataset=\"" + DATASET + "\""),
                        metrics);
                assertTrue(metrics.contains("wavewarden_degraded 1"), metrics);

                hook.up();
                clock.now = clock.now.plus(Duration.ofHours(2));
                d.fireWithRetries(DATASET);
                health = http.send(java.net.http.HttpRequest.newBuilder(base.resolve("/health")).build(),
                        java.net.http.HttpResponse.BodyHandlers.ofString());
                assertEquals(200, health.statusCode(), health.body());
            }
        }
    }

    @Test
    void anUnwritableJsonLinesPathDelaysOnlyItselfAndRunOnceExitsFiveUntilItIsFixed() throws Exception {
        load("outbox_jsonl");
        Path blocker = dir.resolve("not-a-folder");
        Files.writeString(blocker, "a file where the sink wants a folder");
        Path jsonl = blocker.resolve("alerts.jsonl");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            Path config = dir.resolve("c.yaml");
            Files.writeString(config, yaml(jsonl, hook.url()));
            int first;
            String out;
            try (ChildDaemon once = ChildDaemon.start(dir, "first", List.of(), Map.of("HOOK_SECRET", SECRET), "run",
                    "--once", "--config", config.toString())) {
                first = once.waitFor(Duration.ofSeconds(120));
                out = once.output();
            }
            assertEquals(5, first, "a delivery is left failing: " + out);
            assertTrue(out.contains("3 judged"), out);
            long open = openAlerts();
            assertEachOnce(open, hook.received());
            assertFalse(found(outputDir(), "digest.html").isEmpty(), "the digest is written");
            assertEquals(3, found(outputDir(), "findings.json").size());
            assertEquals(3, count("SELECT count(*) FROM ww_results.run"), "the firing was not repeated");

            Files.delete(blocker);
            try (ChildDaemon again = ChildDaemon.start(dir, "again", List.of(), Map.of("HOOK_SECRET", SECRET), "run",
                    "--once", "--config", config.toString())) {
                assertEquals(0, again.waitFor(Duration.ofSeconds(120)), again.output());
            }
            assertEquals(open, keys(jsonl).size());
            assertEquals(open, keys(jsonl).stream().distinct().count());
            assertEachOnce(open, hook.received());
        }
    }

    @Test
    void anUnwritableOutputFolderLeavesTheWavesJudgedAndTheirFilesAreWrittenByTheNextFiring() throws Exception {
        load("outbox_folder");
        Files.writeString(outputDir(), "a file where the daemon wants its output folder");
        WardenConfig cfg = ConfigLoader.parse(yaml(null, null).replace("    alerts:\n", ""));
        DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
        try (Session s = Session.open(cfg, null, Map.of());
             Daemon d = new Daemon(s, clock, FAST, Map.of())) {
            s.migrate();
            d.fireWithRetries(DATASET);
            assertEquals(3, count("SELECT count(*) FROM ww_results.run"));

            Files.delete(outputDir());
            clock.now = clock.now.plusSeconds(60);
            assertTrue(d.fireWithRetries(DATASET));
            assertEquals(3, count("SELECT count(*) FROM ww_results.run"), "no wave is judged twice");
            assertEquals(3, found(outputDir(), "findings.json").size());
            assertEquals(5, found(outputDir(), "digest.md").size(), "three waves', the firing's and latest");
            assertFalse(found(outputDir(), "digest.html").isEmpty());
        }
    }

    @Test
    void anHtmlDigestThatThrowsLeavesTheFindingsWrittenAndTheNextFiringWritesTheDigest() throws Exception {
        load("outbox_html");
        WardenConfig cfg = ConfigLoader.parse(yaml(null, null).replace("    alerts:\n", ""));
        DatasetFiringTest.ManualClock clock = new DatasetFiringTest.ManualClock();
        try (Session s = Session.open(cfg, null, Map.of());
             Daemon d = new Daemon(s, clock, FAST, Map.of())) {
            s.migrate();
            System.setProperty("wavewarden.fault.fail", Deliveries.RENDER_HTML_DIGEST);
            try {
                assertTrue(d.fireWithRetries(DATASET), "a digest that cannot be rendered does not fail the firing");
            } finally {
                System.clearProperty("wavewarden.fault.fail");
            }
            assertEquals(3, found(outputDir(), "findings.json").size());
            assertTrue(found(outputDir(), "digest.html").isEmpty());
            assertEquals(1, count("SELECT count(*) FROM ww_results.outbox WHERE product = 'firing-digest'"
                    + " AND state = 'pending' AND failed_attempts = 1"));

            clock.now = clock.now.plusSeconds(60);
            assertTrue(d.fireWithRetries(DATASET));
            List<Path> html = found(outputDir(), "digest.html");
            assertEquals(2, html.size(), "the firing's folder and latest: " + html);
            assertTrue(Files.readString(html.get(0)).contains("w3"));
            assertEquals(3, count("SELECT count(*) FROM ww_results.run"));
        }
    }

    @Test
    void aProcessKilledWhileDeliveringLosesNothingAndTheRestartDeliversEachAlertOnce() throws Exception {
        load("outbox_kill");
        Path jsonl = dir.resolve("alerts.jsonl");
        try (WebhookReceiver hook = WebhookReceiver.start(SECRET)) {
            Path config = dir.resolve("c.yaml");
            Files.writeString(config, yaml(jsonl, hook.url()));
            try (ChildDaemon killed = ChildDaemon.start(dir, "killed",
                    List.of("-Dwavewarden.fault.pause=" + Deliveries.AFTER_SEND), Map.of("HOOK_SECRET", SECRET),
                    "run", "--once", "--config", config.toString())) {
                killed.awaitOutput("paused at fault point " + Deliveries.AFTER_SEND, Duration.ofSeconds(120));
                killed.kill();
            }
            long open = openAlerts();
            assertEquals(1, keys(jsonl).size(), "killed after the first line was written, before it was recorded");
            assertTrue(hook.received().isEmpty());
            try (ChildDaemon again = ChildDaemon.start(dir, "restart", List.of(), Map.of("HOOK_SECRET", SECRET),
                    "run", "--once", "--config", config.toString())) {
                assertEquals(0, again.waitFor(Duration.ofSeconds(120)), again.output());
            }
            assertEquals(open, keys(jsonl).size());
            assertEquals(open, keys(jsonl).stream().distinct().count());
            assertEachOnce(open, hook.received());
            assertEquals(3, count("SELECT count(*) FROM ww_results.run"));
        }
    }
}
