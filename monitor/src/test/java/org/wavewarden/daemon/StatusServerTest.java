package org.wavewarden.daemon;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.deliver.Json;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.io.OutputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.util.HashSet;
import java.util.Map;
import java.util.Set;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The status endpoint of a real daemon on PostgreSQL, over real sockets: a stalled client holds only its own
 * connection, paths and methods are exact, and {@code /metrics} is well-formed Prometheus text.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class StatusServerTest {

    @TempDir
    static Path dir;

    Session session;
    Daemon daemon;
    String base;
    /** Generous: the requests must complete, not be fast. */
    final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(20)).build();

    @BeforeAll
    void startDaemon() throws Exception {
        String url = TestDatabase.freshDatabase("status_server");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        String yaml = SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"")
                + "daemon:\n  httpPort: 0\n  outputDir: \"" + dir.resolve("digests").toString().replace("\\", "/")
                + "\"\n";
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, yaml);
        for (int w = 1; w <= 2; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        session = Session.open(ConfigLoader.parse(yaml), null, Map.of());
        daemon = new Daemon(session, Clock.systemUTC(), DaemonIntegrationTest.FAST, Map.of());
        daemon.start("status", 1000);
        base = "http://127.0.0.1:" + daemon.statusPort();
        DaemonIntegrationTest.await(() -> daemon.metrics().firings("small-survey") >= 1, "a firing completed");
    }

    @AfterAll
    void stopDaemon() {
        if (daemon != null) {
            daemon.close();
        }
        if (session != null) {
            session.close();
        }
    }

    HttpResponse<String> send(String method, String path) throws Exception {
        return http.send(HttpRequest.newBuilder(URI.create(base + path)).timeout(Duration.ofSeconds(30))
                .method(method, HttpRequest.BodyPublishers.noBody()).build(), HttpResponse.BodyHandlers.ofString());
    }

    @Test
    void aClientThatSendsHalfARequestAndWaitsDoesNotHoldUpOtherClients() throws Exception {
        try (Socket stalled = new Socket(InetAddress.getLoopbackAddress(), daemon.statusPort())) {
            OutputStream out = stalled.getOutputStream();
            out.write("GET /health HTTP/1.1\r\nHost: 127.0".getBytes(StandardCharsets.US_ASCII));
            out.flush();
            assertEquals(200, send("GET", "/health").statusCode());
            assertEquals(200, send("GET", "/metrics").statusCode());
            assertEquals(200, send("GET", "/digest").statusCode());
            assertFalse(stalled.isClosed(), "the stalled client was still connected throughout");
        }
    }

    @Test
    void manyStalledClientsStillLeaveHealthAnswering() throws Exception {
        Socket[] stalled = new Socket[3 * StatusServer.MAX_THREADS];
        try {
            for (int i = 0; i < stalled.length; i++) {
                stalled[i] = new Socket(InetAddress.getLoopbackAddress(), daemon.statusPort());
                stalled[i].getOutputStream().write("GET /metr".getBytes(StandardCharsets.US_ASCII));
                stalled[i].getOutputStream().flush();
            }
            assertEquals(200, send("GET", "/health").statusCode());
        } finally {
            for (Socket s : stalled) {
                if (s != null) {
                    s.close();
                }
            }
        }
    }

    @Test
    void oversizedRequestHeadersAreRefused() throws Exception {
        try (Socket client = new Socket(InetAddress.getLoopbackAddress(), daemon.statusPort())) {
            client.setSoTimeout(30_000);
            String request = "GET /health HTTP/1.1\r\nHost: 127.0.0.1\r\nX-Filler: "
                    + "x".repeat(2 * StatusServer.MAX_REQUEST_HEADER_BYTES) + "\r\nConnection: close\r\n\r\n";
            client.getOutputStream().write(request.getBytes(StandardCharsets.US_ASCII));
            client.getOutputStream().flush();
            String statusLine = new java.io.BufferedReader(new java.io.InputStreamReader(client.getInputStream(),
                    StandardCharsets.US_ASCII)).readLine();
            assertEquals("HTTP/1.1 431 Request Header Fields Too Large", statusLine);
        }
    }

    @Test
    void anUnknownPathIsNotFound() throws Exception {
        assertEquals(404, send("GET", "/nope").statusCode());
        assertEquals(404, send("GET", "/health/extra").statusCode(), "paths are exact, not prefixes");
        assertEquals(404, send("GET", "/").statusCode());
    }

    @Test
    void aWrongMethodIsNotAllowedAndSaysWhichAre() throws Exception {
        for (String path : new String[] {"/health", "/metrics", "/digest"}) {
            HttpResponse<String> post = send("POST", path);
            assertEquals(405, post.statusCode(), path);
            Set<String> allowed = new HashSet<>();
            for (String m : post.headers().firstValue("Allow").orElse("").split(",")) {
                allowed.add(m.trim());
            }
            assertEquals(Set.of("GET", "HEAD"), allowed, path);
        }
        assertEquals(405, send("DELETE", "/health").statusCode());
    }

    @Test
    void headAnswersLikeGetWithoutABody() throws Exception {
        HttpResponse<String> head = send("HEAD", "/health");
        assertEquals(200, head.statusCode());
        assertEquals("", head.body());
        assertTrue(head.headers().firstValue("Content-Type").orElse("").startsWith("application/json"));
    }

    @Test
    void healthIsJsonWithStatusAndBacklog() throws Exception {
        HttpResponse<String> health = send("GET", "/health");
        assertEquals(200, health.statusCode(), health.body());
        JsonNode body = Json.mapper().readTree(health.body());
        assertEquals("ok", body.get("status").asText());
        assertTrue(body.get("problems").isArray() && body.get("problems").isEmpty(), health.body());
        assertTrue(body.get("backlog").isArray(), health.body());
    }

    private static final Pattern SAMPLE = Pattern.compile(
            "[a-zA-Z_:][a-zA-Z0-9_:]*(\\{([a-zA-Z_][a-zA-Z0-9_]*=\"([^\"\\\\]|\\\\.)*\",?)*})? "
                    + "(-?[0-9.eE+-]+|NaN|[+-]Inf)( -?[0-9]+)?");

    @Test
    void metricsAreWellFormedPrometheusTextWithJvmProcessAndFiringMetrics() throws Exception {
        HttpResponse<String> r = send("GET", "/metrics");
        assertEquals(200, r.statusCode());
        assertTrue(r.headers().firstValue("Content-Type").orElse("").startsWith("text/plain; version=0.0.4"));
        Set<String> typed = new HashSet<>();
        for (String line : r.body().split("\n")) {
            if (line.startsWith("# TYPE ")) {
                String[] p = line.split(" ");
                assertEquals(4, p.length, line);
                assertTrue(Set.of("counter", "gauge", "histogram", "summary", "untyped", "info", "stateset",
                        "unknown").contains(p[3]), line);
                typed.add(p[2]);
            } else if (line.startsWith("# HELP ")) {
                assertTrue(line.split(" ", 4).length == 4, line);
            } else {
                assertTrue(SAMPLE.matcher(line).matches(), "not a Prometheus sample line: " + line);
                String name = line.split("[{ ]", 2)[0];
                assertTrue(typed.stream().anyMatch(name::startsWith), "sample before its TYPE: " + line);
            }
        }
        String body = r.body();
        assertTrue(body.contains("wavewarden_firings_total{dataset=\"small-survey\"}"), body);
        assertTrue(body.contains("# TYPE wavewarden_firing_duration_seconds histogram"), body);
        assertTrue(body.contains("wavewarden_firing_duration_seconds_count{dataset=\"small-survey\"}"), body);
        assertTrue(body.contains("wavewarden_degraded 0"), body);
        assertTrue(typed.stream().anyMatch(n -> n.startsWith("jvm_memory")), "JVM metrics");
        assertTrue(typed.stream().anyMatch(n -> n.startsWith("process_")), "process metrics");
    }

    @Test
    void aDaemonWhosePortIsInUseIsRefusedBeforeItWritesAnything() throws Exception {
        String url = TestDatabase.freshDatabase("status_busy");
        SmallSurvey.createTable(url);
        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getByName("127.0.0.1"))) {
            String yaml = SmallSurvey.config(url, null) + "daemon:\n  httpPort: " + taken.getLocalPort()
                    + "\n  outputDir: \"" + dir.resolve("busy").toString().replace("\\", "/") + "\"\n";
            try (Session s = Session.open(ConfigLoader.parse(yaml), null, Map.of());
                 Daemon d = new Daemon(s, Clock.systemUTC(), DaemonIntegrationTest.FAST, Map.of())) {
                ConfigException e = assertThrows(ConfigException.class, () -> d.start("busy", 1000));
                assertEquals("daemon.httpPort", e.key());
            }
        }
        assertEquals(0, DaemonIntegrationTest.count(url,
                "SELECT count(*) FROM information_schema.schemata WHERE schema_name = 'ww_results'"),
                "no results schema, no job stored");
    }

    @Test
    void aPortInUseIsAConfigErrorNamingTheKey() throws Exception {
        try (ServerSocket taken = new ServerSocket(0, 1, InetAddress.getByName("127.0.0.1"))) {
            ConfigException e = assertThrows(ConfigException.class,
                    () -> StatusServer.start("127.0.0.1", taken.getLocalPort(), new Router()));
            assertEquals("daemon.httpPort", e.key());
        }
    }
}
