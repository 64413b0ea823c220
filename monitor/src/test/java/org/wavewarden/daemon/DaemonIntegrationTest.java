package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import com.sun.net.httpserver.HttpServer;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.Signatures;
import org.wavewarden.deliver.sink.WebhookSink;

import java.net.InetSocketAddress;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.function.BooleanSupplier;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The daemon on a real PostgreSQL server with a fast cron: a wave added while it runs is judged exactly once, and
 * two instances sharing one clustered job store judge every wave exactly once between them.
 */
class DaemonIntegrationTest {

    @TempDir
    Path dir;

    static final Daemon.Retry FAST = new Daemon.Retry(3, Duration.ofMillis(100), Duration.ofMillis(400));

    String setUp(String prefix, int wavesToLoad) throws Exception {
        String url = TestDatabase.freshDatabase(prefix);
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, yaml(url));
        for (int w = 1; w <= wavesToLoad; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        return url;
    }

    String yaml(String url) {
        return SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"")
                + "daemon:\n  httpPort: 0\n  outputDir: \"" + dir.resolve("digests").toString().replace("\\", "/")
                + "\"\n";
    }

    @Test
    void aWaveAddedWhileTheDaemonRunsIsJudgedExactlyOnce() throws Exception {
        String url = setUp("daemon_one", 2);
        String secret = "a-shared-secret-for-the-test";
        Set<String> deliveries = ConcurrentHashMap.newKeySet();
        java.util.concurrent.atomic.AtomicInteger badSignatures = new java.util.concurrent.atomic.AtomicInteger();
        HttpServer hook = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        hook.createContext("/hook", ex -> {
            byte[] body = ex.getRequestBody().readAllBytes();
            if (Signatures.verify(body, secret, ex.getRequestHeaders().getFirst(WebhookSink.SIGNATURE_HEADER))) {
                deliveries.add(ex.getRequestHeaders().getFirst(WebhookSink.DELIVERY_HEADER));
            } else {
                badSignatures.incrementAndGet();
            }
            ex.sendResponseHeaders(204, -1);
            ex.close();
        });
        hook.start();
        Path jsonl = dir.resolve("alerts.jsonl");
        String withSinks = yaml(url).replace("    exclude: [respondent_id]", "    exclude: [respondent_id]\n"
                + "    alerts:\n"
                + "      jsonLines: {path: \"" + jsonl.toString().replace("\\", "/") + "\"}\n"
                + "      webhook: {url: \"http://127.0.0.1:" + hook.getAddress().getPort() + "/hook\","
                + " secretEnv: HOOK_SECRET}");
        WardenConfig cfg = ConfigLoader.parse(withSinks);
        try (Session s = Session.open(cfg, null, Map.of("HOOK_SECRET", secret));
             Daemon d = new Daemon(s, Clock.systemUTC(), FAST, Sinks.fromConfig(s,
                     RetryPolicy.of(3, Duration.ofMillis(10), Duration.ofMillis(50))))) {
            d.start("solo", 1000);
            await(() -> runs(url, "w2") == 1, "w1 and w2 judged");
            assertEquals(0, CliRun.of("import", "--config", dir.resolve("c.yaml").toString(), "--wave", "w3",
                    dir.resolve("w3.csv").toString()).exitCode());
            await(() -> runs(url, "w3") == 1, "w3 judged");
            Thread.sleep(2500); // a few more firings find nothing to do
            assertEquals(1, runs(url, "w1"));
            assertEquals(1, runs(url, "w2"));
            assertEquals(1, runs(url, "w3"));
            assertEquals(0, count(url, "SELECT count(*) - count(DISTINCT (wave, against_wave, variable, kind))"
                    + " FROM ww_results.alert WHERE superseded_at IS NULL"));
            Path latest = OutputPaths.under(dir.resolve("digests"), "small-survey").resolve("latest");
            assertTrue(Files.exists(latest.resolve("digest.md")));
            assertTrue(Files.readString(latest.resolve("digest.html")).contains("class=\"plot"),
                    "the HTML digest has its plots");
            assertTrue(Files.exists(OutputPaths.wave(dir.resolve("digests"), "small-survey", "w3")
                    .resolve("findings.json")));

            HttpClient http = HttpClient.newHttpClient();
            String base = "http://127.0.0.1:" + d.statusPort();
            HttpResponse<String> health = http.send(HttpRequest.newBuilder(URI.create(base + "/health")).build(),
                    HttpResponse.BodyHandlers.ofString());
            assertEquals(200, health.statusCode());
            assertTrue(health.body().contains("ok"));
            String metrics = http.send(HttpRequest.newBuilder(URI.create(base + "/metrics")).build(),
                    HttpResponse.BodyHandlers.ofString()).body();
            assertTrue(metrics.contains("wavewarden_waves_judged_total{dataset=\"small-survey\"} 3"), metrics);
            assertTrue(metrics.contains("# TYPE wavewarden_alerts_total counter"), metrics);
            assertEquals(200, http.send(HttpRequest.newBuilder(URI.create(base + "/digest")).build(),
                    HttpResponse.BodyHandlers.ofString()).statusCode());

            // Every open alert reached both sinks once, the webhook with a valid signature.
            long open = count(url, "SELECT count(*) FROM ww_results.alert WHERE superseded_at IS NULL");
            assertTrue(open >= 2, "alerts: " + open);
            await(() -> deliveries.size() == open, "webhook deliveries");
            assertEquals(0, badSignatures.get());
            assertEquals(open, Files.readAllLines(jsonl).size());
            assertEquals(2 * open, count(url, "SELECT count(*) FROM ww_results.outbox WHERE product = 'alert'"
                    + " AND state = 'delivered'"));
        } finally {
            hook.stop(0);
        }
    }

    @Test
    void twoInstancesOnOneDatabaseJudgeEveryWaveExactlyOnce() throws Exception {
        String url = setUp("daemon_two", 3);
        WardenConfig cfg = ConfigLoader.parse(yaml(url).replace("httpPort: 0", "httpPort: -1"));
        try (Session s1 = Session.open(cfg, null, Map.of()); Session s2 = Session.open(cfg, null, Map.of());
             Daemon a = new Daemon(s1, Clock.systemUTC(), FAST, Map.of());
             Daemon b = new Daemon(s2, Clock.systemUTC(), FAST, Map.of())) {
            a.start("instance-a", 1000);
            b.start("instance-b", 1000);
            await(() -> runs(url, "w3") == 1, "all waves judged");
            Thread.sleep(3000);
            for (String w : List.of("w1", "w2", "w3")) {
                assertEquals(1, runs(url, w), w);
            }
            assertEquals(2, count(url, "SELECT count(DISTINCT instance_name) FROM ww_results.qrtz_scheduler_state"));
        }
    }

    static long runs(String url, String wave) {
        return count(url, "SELECT count(*) FROM ww_results.run WHERE wave = '" + wave + "'");
    }

    static long count(String url, String sql) {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement(); ResultSet rs = st.executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        } catch (Exception e) {
            return -1;
        }
    }

    static void await(BooleanSupplier condition, String what) throws InterruptedException {
        long end = System.nanoTime() + Duration.ofSeconds(60).toNanos();
        while (System.nanoTime() < end) {
            if (condition.getAsBoolean()) {
                return;
            }
            Thread.sleep(200);
        }
        throw new AssertionError("timed out waiting for: " + what);
    }
}
