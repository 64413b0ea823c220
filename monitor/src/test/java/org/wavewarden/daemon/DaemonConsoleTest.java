package org.wavewarden.daemon;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.review.Role;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.ConsolePeople;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.net.URI;
import java.net.URLEncoder;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A daemon whose configuration enables the console serves it beside {@code /health} on the same port, and its
 * overview shows each dataset's last firing as the daemon saw it.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class DaemonConsoleTest {

    static final String PERSON = "Tamsin Wrayfield";
    static final String PASSWORD = "marsh-lamp-5150";

    @TempDir
    static Path dir;
    Session session;
    Daemon daemon;
    String base;
    final HttpClient http = HttpClient.newBuilder().followRedirects(HttpClient.Redirect.NEVER)
            .connectTimeout(Duration.ofSeconds(20)).build();

    @BeforeAll
    void startDaemon() throws Exception {
        String url = TestDatabase.freshDatabase("daemon_console");
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
        WardenConfig parsed = ConfigLoader.parse(yaml);
        ConsoleConfig console = new ConsoleConfig(true, List.of(new ConsoleConfig.User(PERSON, Role.VIEWER,
                ConsolePeople.hash(PASSWORD))), null, ConsoleConfig.DISABLED.sessionLength(),
                ConsoleConfig.DISABLED.idleTimeout(), true, ConsoleConfig.DISABLED.loginFailures(),
                ConsoleConfig.DISABLED.lockout());
        session = Session.open(new WardenConfig(parsed.source(), parsed.results(), parsed.alpha(), parsed.fdr(),
                parsed.datasets(), parsed.daemon(), console), null, Map.of());
        daemon = new Daemon(session, Clock.systemUTC(), DaemonIntegrationTest.FAST, Map.of());
        daemon.start("console", 1000);
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

    HttpResponse<String> send(HttpRequest.Builder request) throws Exception {
        return http.send(request.timeout(Duration.ofSeconds(30)).build(), HttpResponse.BodyHandlers.ofString());
    }

    static String cookie(HttpResponse<String> r, String name) {
        return r.headers().allValues("Set-Cookie").stream().filter(c -> c.startsWith(name + "="))
                .map(c -> c.split(";", 2)[0]).findFirst().orElseThrow(() -> new AssertionError("no " + name));
    }

    @Test
    void theConsoleAnswersBesideHealthAndShowsTheLastFiring() throws Exception {
        assertEquals(200, send(HttpRequest.newBuilder(URI.create(base + "/health"))).statusCode());
        HttpResponse<String> away = send(HttpRequest.newBuilder(URI.create(base + "/console")));
        assertEquals(303, away.statusCode());

        HttpResponse<String> form = send(HttpRequest.newBuilder(URI.create(base + "/console/login")));
        assertEquals(200, form.statusCode(), form.body());
        Matcher token = Pattern.compile("name=\"csrf\" value=\"([^\"]+)\"").matcher(form.body());
        assertTrue(token.find(), form.body());
        String loginCookie = form.headers().allValues("Set-Cookie").get(0).split(";", 2)[0];
        HttpResponse<String> in = send(HttpRequest.newBuilder(URI.create(base + "/console/login"))
                .header("Content-Type", "application/x-www-form-urlencoded").header("Cookie", loginCookie)
                .POST(HttpRequest.BodyPublishers.ofString("name=" + URLEncoder.encode(PERSON, StandardCharsets.UTF_8)
                        + "&password=" + PASSWORD + "&csrf=" + URLEncoder.encode(token.group(1),
                        StandardCharsets.UTF_8))));
        assertEquals(303, in.statusCode(), in.body());

        HttpResponse<String> overview = send(HttpRequest.newBuilder(URI.create(base + "/console"))
                .header("Cookie", cookie(in, "ww_session")));
        assertEquals(200, overview.statusCode(), overview.body());
        assertTrue(overview.body().contains("small-survey"), overview.body());
        assertTrue(overview.body().contains("last firing succeeded 20"), "the daemon's firing went well and the"
                + " overview says so: " + overview.body());
    }
}
