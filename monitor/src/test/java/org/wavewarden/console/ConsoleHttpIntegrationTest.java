package org.wavewarden.console;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.auth.ConsoleAuth;
import org.wavewarden.daemon.Router;
import org.wavewarden.daemon.StatusServer;
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
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The console over HTTP as its three kinds of people use it, on a real PostgreSQL server with the small survey's
 * judged waves and a real Jetty on a free loopback port: the third wave has an open MATERIAL alert on {@code score}.
 * A viewer reads every page and changes nothing; a steward explains, mutes and unmutes; a releaser signs the wave
 * off once nothing blocks it. Each action is checked in the results schema (actor, source {@code console}); each
 * refusal is checked to have written nothing. The steps build on each other, in order.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class ConsoleHttpIntegrationTest {

    static final String VIEWER = "Ada Quillfield";
    static final String STEWARD = "Sam Harrowby";
    static final String RELEASER = "Rho Mereton";
    static final Map<String, String> PASSWORDS = Map.of(
            VIEWER, "lantern-moss-4417",
            STEWARD, "heron-slate-9023",
            RELEASER, "copper-fen-2281");
    static final String S = "ww_results";

    @TempDir
    static Path dir;
    Jdbi jdbi;
    StatusServer server;
    String base;
    long scoreAlert;
    long spreadAlert;
    long scoreFinding;
    final ListAppender<ILoggingEvent> log = new ListAppender<>();
    final Logger root = (Logger) LoggerFactory.getLogger(org.slf4j.Logger.ROOT_LOGGER_NAME);
    final Logger ours = (Logger) LoggerFactory.getLogger("org.wavewarden");
    ch.qos.logback.classic.Level oursBefore;
    /** Every page body and every session cookie seen, for the last check: no secret in a page or a log line. */
    final List<String> bodies = new ArrayList<>();
    final List<String> sessionIds = new ArrayList<>();

    @BeforeAll
    void judgeThreeWavesAndServeTheConsole() throws Exception {
        log.start();
        root.addAppender(log);
        // Every line the console and its sign-in write, whatever the default level hides.
        oursBefore = ours.getLevel();
        ours.setLevel(ch.qos.logback.classic.Level.DEBUG);
        String url = TestDatabase.freshDatabase("console_http");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path file = dir.resolve("c.yaml");
        Files.writeString(file, SmallSurvey.config(url, null));
        for (int w = 1; w <= 3; w++) {
            CliRun imported = CliRun.of("import", "--config", file.toString(), "--wave", "w" + w,
                    csv[w - 1].toString());
            assertEquals(0, imported.exitCode(), imported.err());
        }
        for (String w : List.of("w2", "w3")) {
            CliRun checked = CliRun.of("check", "--config", file.toString(), "--wave", w, "--out",
                    dir.resolve(w).toString());
            assertEquals(0, checked.exitCode(), checked.err());
        }
        WardenConfig loaded = ConfigLoader.load(file);
        ConsoleConfig console = new ConsoleConfig(true, List.of(
                new ConsoleConfig.User(VIEWER, Role.VIEWER, ConsolePeople.hash(PASSWORDS.get(VIEWER))),
                new ConsoleConfig.User(STEWARD, Role.STEWARD, ConsolePeople.hash(PASSWORDS.get(STEWARD))),
                new ConsoleConfig.User(RELEASER, Role.RELEASER, ConsolePeople.hash(PASSWORDS.get(RELEASER)))),
                new ConsoleConfig.Proxy(PROXY_HEADER, List.of("127.0.0.1", "::1")), ConsoleConfig.DISABLED.sessionLength(), ConsoleConfig.DISABLED.idleTimeout(), true,
                ConsoleConfig.DISABLED.loginFailures(), ConsoleConfig.DISABLED.lockout());
        WardenConfig config = new WardenConfig(loaded.source(), loaded.results(), loaded.alpha(), loaded.fdr(),
                loaded.datasets(), loaded.daemon(), console);
        jdbi = Jdbi.create(url, "postgres", "");
        scoreAlert = alertOf("score");
        spreadAlert = alertOf("spread");
        scoreFinding = jdbi.withHandle(h -> h.createQuery("SELECT f.finding_id FROM " + S + ".finding f JOIN " + S
                        + ".alert a ON a.run_id = f.run_id AND a.variable = f.variable AND a.kind = f.kind"
                        + " WHERE a.alert_id = :a")
                .bind("a", scoreAlert).mapTo(Long.class).one());
        server = StatusServer.start("127.0.0.1", 0,
                new ConsoleApp(config, jdbi, Clock.systemUTC(), null).install(new Router()));
        base = "http://127.0.0.1:" + server.port();
    }

    @AfterAll
    void stop() {
        if (server != null) {
            server.stop();
        }
        root.detachAppender(log);
        ours.setLevel(oursBefore);
    }

    long alertOf(String variable) {
        return jdbi.withHandle(h -> h.createQuery("SELECT alert_id FROM " + S + ".alert WHERE dataset ="
                        + " 'small-survey' AND wave = 'w3' AND variable = :v AND superseded_at IS NULL")
                .bind("v", variable).mapTo(Long.class).one());
    }

    // ---- a browser of our own: a cookie jar that, like a browser on loopback, sends Secure cookies over http ----

    final class Browser {
        final HttpClient http = HttpClient.newBuilder().followRedirects(HttpClient.Redirect.NEVER).build();
        final Map<String, String> jar = new LinkedHashMap<>();

        HttpResponse<String> get(String pathQuery) throws Exception {
            return send(HttpRequest.newBuilder(URI.create(base + pathQuery)).GET());
        }

        HttpResponse<String> post(String path, Map<String, String> form) throws Exception {
            String body = form.entrySet().stream().map(e -> enc(e.getKey()) + "=" + enc(e.getValue()))
                    .collect(Collectors.joining("&"));
            return send(HttpRequest.newBuilder(URI.create(base + path))
                    .header("Content-Type", "application/x-www-form-urlencoded")
                    .POST(HttpRequest.BodyPublishers.ofString(body)));
        }

        private HttpResponse<String> send(HttpRequest.Builder request) throws Exception {
            if (!jar.isEmpty()) {
                request.header("Cookie", jar.entrySet().stream().map(e -> e.getKey() + "=" + e.getValue())
                        .collect(Collectors.joining("; ")));
            }
            HttpResponse<String> r = http.send(request.build(), HttpResponse.BodyHandlers.ofString());
            for (String set : r.headers().allValues("Set-Cookie")) {
                String pair = set.split(";", 2)[0];
                int eq = pair.indexOf('=');
                String name = pair.substring(0, eq).strip();
                String value = pair.substring(eq + 1).strip();
                boolean gone = value.isEmpty() || set.toLowerCase().contains("max-age=0");
                if (gone) {
                    jar.remove(name);
                } else {
                    jar.put(name, value);
                    if (name.equals(ConsoleAuth.COOKIE)) {
                        sessionIds.add(value);
                    }
                }
            }
            bodies.add(r.body());
            return r;
        }

        /** Logs in through the form; the browser holds the session cookie afterwards. */
        HttpResponse<String> login(String name, String password, String next) throws Exception {
            HttpResponse<String> form = get("/console/login");
            assertEquals(200, form.statusCode(), form.body());
            Map<String, String> fields = new LinkedHashMap<>();
            fields.put("name", name);
            fields.put("password", password);
            fields.put("csrf", csrf(form.body()));
            if (next != null) {
                fields.put("next", next);
            }
            return post("/console/login", fields);
        }

        Browser as(String name) throws Exception {
            HttpResponse<String> in = login(name, PASSWORDS.get(name), null);
            assertEquals(303, in.statusCode(), in.body());
            assertTrue(jar.containsKey(ConsoleAuth.COOKIE), "the session cookie is set");
            return this;
        }

        /** The token of the page's forms, as a browser would send it back. */
        String token() throws Exception {
            return csrf(get("/console").body());
        }
    }

    private static final Pattern CSRF_INPUT = Pattern.compile("<input[^>]*name=\"csrf\"[^>]*>");
    private static final Pattern VALUE = Pattern.compile("value=\"([^\"]*)\"");

    static String csrf(String html) {
        Matcher input = CSRF_INPUT.matcher(html);
        assertTrue(input.find(), "the page has a csrf field:\n" + html);
        Matcher value = VALUE.matcher(input.group());
        assertTrue(value.find(), input.group());
        return value.group(1);
    }

    static String enc(String s) {
        return URLEncoder.encode(s, StandardCharsets.UTF_8);
    }

    int actions(String source) {
        return jdbi.withHandle(h -> h.createQuery("SELECT count(*) FROM " + S + ".alert_action WHERE source = :s")
                .bind("s", source).mapTo(Integer.class).one());
    }

    int signOffs() {
        return jdbi.withHandle(h -> h.createQuery("SELECT count(*) FROM " + S + ".sign_off").mapTo(Integer.class)
                .one());
    }

    static void assertSecurityHeaders(HttpResponse<String> r) {
        assertEquals(ConsoleApp.CONTENT_SECURITY_POLICY, r.headers().firstValue("Content-Security-Policy")
                .orElse(null), r.uri().toString());
        assertEquals("DENY", r.headers().firstValue("X-Frame-Options").orElse(null));
        assertEquals("same-origin", r.headers().firstValue("Referrer-Policy").orElse(null));
    }

    // ---- the steps ------------------------------------------------------------------------------------------

    @ParameterizedTest(name = "GET {0} without a session goes to the login page")
    @Order(1)
    @CsvSource({
            "/console, /console/login?next=%2Fconsole",
            "/console/dataset?name=small-survey, /console/login?next=%2Fconsole%2Fdataset%3Fname%3Dsmall-survey",
            "/console/wave?dataset=small-survey&wave=w3,"
                    + " /console/login?next=%2Fconsole%2Fwave%3Fdataset%3Dsmall-survey%26wave%3Dw3"})
    void aPageWithoutASessionRedirectsToTheLoginWithTheWayBack(String path, String location) throws Exception {
        HttpResponse<String> r = new Browser().get(path);
        assertEquals(303, r.statusCode());
        assertEquals(location, r.headers().firstValue("Location").orElse(null));
        assertSecurityHeaders(r);
    }

    @Test
    @Order(2)
    void aLoginGoesOnToWhereThePersonWasGoingAndNeverToAnotherSite() throws Exception {
        HttpResponse<String> back = new Browser().login(VIEWER, PASSWORDS.get(VIEWER), "/console/wave?dataset=s&wave=w3");
        assertEquals(303, back.statusCode(), back.body());
        assertEquals("/console/wave?dataset=s&wave=w3", back.headers().firstValue("Location").orElse(null));
        String cookie = back.headers().allValues("Set-Cookie").stream()
                .filter(c -> c.startsWith(ConsoleAuth.COOKIE + "=")).findFirst().orElse("");
        assertTrue(cookie.contains("HttpOnly") && cookie.contains("SameSite=Strict") && cookie.contains("Secure")
                && cookie.contains("Path=/console"), cookie);
        for (String elsewhere : List.of("//evil.example/console", "https://evil.example/console", "/console//x")) {
            HttpResponse<String> r = new Browser().login(VIEWER, PASSWORDS.get(VIEWER), elsewhere);
            assertEquals(303, r.statusCode());
            assertEquals("/console", r.headers().firstValue("Location").orElse(null), elsewhere);
        }
    }

    @Test
    @Order(3)
    void aWrongPasswordIsRefusedWithoutSayingWhichPartWasWrong() throws Exception {
        Browser b = new Browser();
        HttpResponse<String> r = b.login(STEWARD, "not-the-password", null);
        assertEquals(401, r.statusCode());
        assertTrue(r.body().contains(ConsoleApp.LOGIN_REFUSAL), r.body());
        assertFalse(b.jar.containsKey(ConsoleAuth.COOKIE));
        HttpResponse<String> unknown = b.login("Nobody Atall", "whatever", null);
        assertEquals(401, unknown.statusCode());
        assertTrue(unknown.body().contains(ConsoleApp.LOGIN_REFUSAL), unknown.body());
    }

    @Test
    @Order(4)
    void aLoginFormPostedWithoutItsTokenIsRefused() throws Exception {
        Browser b = new Browser();
        b.get("/console/login");
        HttpResponse<String> r = b.post("/console/login", Map.of("name", VIEWER, "password", PASSWORDS.get(VIEWER),
                "csrf", "forged"));
        assertEquals(403, r.statusCode());
        assertFalse(b.jar.containsKey(ConsoleAuth.COOKIE));
    }

    @Test
    @Order(5)
    void aViewerReadsEveryPage() throws Exception {
        Browser viewer = new Browser().as(VIEWER);
        for (String page : List.of("/console", "/console/dataset?name=small-survey",
                "/console/dataset?name=small-survey&kind=SHIFT&verdict=MATERIAL", "/console/finding?id=" + scoreFinding,
                "/console/wave?dataset=small-survey&wave=w3", "/console/search?q=score", "/console/search")) {
            HttpResponse<String> r = viewer.get(page);
            assertEquals(200, r.statusCode(), page + "\n" + r.body());
            assertTrue(r.headers().firstValue("Content-Type").orElse("").startsWith("text/html"), page);
            assertSecurityHeaders(r);
        }
        HttpResponse<String> css = viewer.get("/console/static/console.css");
        assertEquals(200, css.statusCode());
        assertTrue(css.headers().firstValue("Content-Type").orElse("").startsWith("text/css"));
    }

    @Test
    @Order(5)
    void whatARequestCarriesIsShownAsTextOrNotAtAll() throws Exception {
        Browser viewer = new Browser().as(VIEWER);
        HttpResponse<String> search = viewer.get("/console/search?q=" + enc("<script>alert(1)</script>"));
        assertEquals(200, search.statusCode());
        assertFalse(search.body().contains("<script>alert(1)"), search.body());
        // A notice is a code mapped to fixed text: an unknown code shows nothing of itself.
        HttpResponse<String> notice = viewer.get("/console?done=" + enc("<b>signed off by the director</b>"));
        assertEquals(200, notice.statusCode());
        assertFalse(notice.body().contains("signed off by the director"), notice.body());
    }

    @Test
    @Order(5)
    void aPostWithoutASessionGoesToTheLoginAndAnOversizedFormIsRefused() throws Exception {
        HttpResponse<String> away = new Browser().post("/console/alert/explain", Map.of("alert",
                String.valueOf(scoreAlert), "reason", "no-problem", "csrf", "x"));
        assertEquals(303, away.statusCode());
        assertEquals("/console/login", away.headers().firstValue("Location").orElse(null));
        Browser steward = new Browser().as(STEWARD);
        HttpResponse<String> huge = steward.post("/console/alert/explain", Map.of("alert", String.valueOf(scoreAlert),
                "reason", "no-problem", "padding", "x".repeat(70 * 1024), "csrf", steward.token()));
        // The padding is in a field no handler reads: only the form's size refuses it.
        assertEquals(400, huge.statusCode(), huge.body());
        assertTrue(huge.body().startsWith("the form could not be read"), huge.body());
        assertEquals(0, actions("console"));
    }

    @ParameterizedTest(name = "{0} downloads as an attachment")
    @Order(6)
    @CsvSource({"findings.json, application/json, \"wave\" : \"w3\"",
            "digest.md, text/markdown, # Wavewarden change digest"})
    void aWavesFilesDownloadAsTheRunWroteThem(String file, String type, String inside) throws Exception {
        HttpResponse<String> r = new Browser().as(VIEWER).get("/console/download?dataset=small-survey&wave=w3&file="
                + file);
        assertEquals(200, r.statusCode(), r.body());
        assertTrue(r.headers().firstValue("Content-Type").orElse("").startsWith(type));
        String disposition = r.headers().firstValue("Content-Disposition").orElse("");
        assertTrue(disposition.matches("attachment; filename=\"small-survey-[0-9a-f]{8}_w3-[0-9a-f]{8}_"
                + Pattern.quote(file) + "\""), disposition);
        assertTrue(r.body().contains(inside), r.body());
        // The same bytes as the file the check command wrote beside its findings (the run's time is the same).
        Path written = Files.walk(dir.resolve("w3")).filter(p -> p.getFileName().toString().equals(file))
                .findFirst().orElseThrow();
        assertEquals(Files.readString(written), r.body());
    }

    @ParameterizedTest(name = "{0} is a 400 with a plain message")
    @Order(7)
    @ValueSource(strings = {"/console/finding?id=abc", "/console/finding?id=-4", "/console/finding?id=1e3",
            "/console/finding?id=", "/console/finding?id=99999999999999999999",
            "/console/dataset?name=small-survey&verdict=ALARMING",
            "/console/download?dataset=small-survey&wave=w3&file=..%2Fsecrets",
            "/console/wave?dataset=small-survey%00&wave=w3", "/console/wave?dataset=small-survey&wave=w3%01",
            "/console/search?q=%C3%28", "/console/wave?dataset=small-survey&wave=%e0%80"})
    void aRequestTheConsoleCannotReadIsA400WithoutDetail(String path) throws Exception {
        HttpResponse<String> r = new Browser().as(VIEWER).get(path);
        assertEquals(400, r.statusCode(), r.body());
        assertTrue(r.headers().firstValue("Content-Type").orElse("").startsWith("text/plain"));
        assertFalse(r.body().contains("Exception") || r.body().contains("at org."), r.body());
    }

    /** The header a trusted reverse proxy names the person in (the test's requests come from 127.0.0.1). */
    static final String PROXY_HEADER = "X-Remote-Person";

    @Test
    @Order(7)
    void aTrustedProxysHeaderIsBelievedOnlyWhenItNamesExactlyOnePerson() throws Exception {
        HttpClient client = HttpClient.newBuilder().followRedirects(HttpClient.Redirect.NEVER).build();
        HttpResponse<String> one = client.send(HttpRequest.newBuilder(URI.create(base + "/console"))
                .header(PROXY_HEADER, VIEWER).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(200, one.statusCode(), one.body());
        assertTrue(one.body().contains(VIEWER), "the page names the person the proxy named");
        // A proxy that appends its header to the client's own would pass on two names: neither is believed.
        HttpResponse<String> two = client.send(HttpRequest.newBuilder(URI.create(base + "/console"))
                .header(PROXY_HEADER, RELEASER).header(PROXY_HEADER, VIEWER).build(),
                HttpResponse.BodyHandlers.ofString());
        assertEquals(303, two.statusCode(), two.body());
        assertTrue(two.headers().firstValue("Location").orElse("").startsWith("/console/login"));
    }

    @Test
    @Order(7)
    void aQueryThatCannotBeDecodedIsTheClientsErrorEvenBeforeLoggingIn() throws Exception {
        // Not UTF-8 once decoded (a lone continuation byte): java.net.URI lets it through, the console cannot read it.
        HttpResponse<String> r = new Browser().get("/console/login?next=%80");
        assertEquals(400, r.statusCode(), r.body());
        assertEquals("the request could not be read\n", r.body());
    }

    @Test
    @Order(8)
    void aViewerMayNotActAndNothingIsWritten() throws Exception {
        Browser viewer = new Browser().as(VIEWER);
        String token = viewer.token();
        int before = actions("console");
        HttpResponse<String> explain = viewer.post("/console/alert/explain", Map.of("alert",
                String.valueOf(scoreAlert), "reason", "real-change", "note", "looked fine", "csrf", token));
        assertEquals(403, explain.statusCode());
        assertTrue(explain.body().contains("steward"), explain.body());
        HttpResponse<String> sign = viewer.post("/console/signoff", Map.of("dataset", "small-survey", "wave", "w3",
                "csrf", token));
        assertEquals(403, sign.statusCode());
        assertTrue(sign.body().contains("releaser"), sign.body());
        assertEquals(before, actions("console"));
        assertEquals(0, signOffs());
    }

    @Test
    @Order(9)
    void aFormWithoutItsTokenOrWithAnotherIsRefusedAndNothingIsWritten() throws Exception {
        Browser steward = new Browser().as(STEWARD);
        Map<String, String> form = new LinkedHashMap<>(Map.of("alert", String.valueOf(scoreAlert), "reason",
                "real-change", "note", "checked"));
        HttpResponse<String> none = steward.post("/console/alert/explain", form);
        assertEquals(403, none.statusCode());
        assertTrue(none.body().contains("security token is missing or has expired"), none.body());
        form.put("csrf", new Browser().as(VIEWER).token());
        HttpResponse<String> other = steward.post("/console/alert/explain", form);
        assertEquals(403, other.statusCode());
        assertEquals(0, actions("console"));
    }

    @Test
    @Order(10)
    void aStewardMayNotSignOff() throws Exception {
        Browser steward = new Browser().as(STEWARD);
        HttpResponse<String> r = steward.post("/console/signoff", Map.of("dataset", "small-survey", "wave", "w3",
                "csrf", steward.token()));
        assertEquals(403, r.statusCode());
        assertEquals(0, signOffs());
    }

    @Test
    @Order(11)
    void signingOffWhileTheMaterialAlertIsOpenIsRefusedOnTheWavePage() throws Exception {
        Browser releaser = new Browser().as(RELEASER);
        HttpResponse<String> r = releaser.post("/console/signoff", Map.of("dataset", "small-survey", "wave", "w3",
                "csrf", releaser.token()));
        assertEquals(409, r.statusCode(), r.body());
        assertTrue(r.body().contains("id=\"refusal\""), r.body());
        String refusal = r.body().substring(r.body().indexOf("id=\"refusal\""));
        refusal = refusal.substring(0, refusal.indexOf("</p>"));
        assertTrue(refusal.contains("2 MATERIAL alerts are open") && refusal.contains("score")
                && refusal.contains("spread"), refusal);
        assertEquals(0, signOffs());
    }

    @Test
    @Order(12)
    void aStewardMutesAndUnmutesTheAlertEachStepRecordedWithTheirName() throws Exception {
        Browser steward = new Browser().as(STEWARD);
        HttpResponse<String> muted = steward.post("/console/alert/mute", Map.of("alert", String.valueOf(scoreAlert),
                "reason", "fix-upstream", "note", "weights are being redone", "untilWave", "w5",
                "csrf", steward.token()));
        assertEquals(303, muted.statusCode(), muted.body());
        assertEquals("/console/wave?dataset=small-survey&wave=w3&done=muted",
                muted.headers().firstValue("Location").orElse(null));
        HttpResponse<String> unmuted = steward.post("/console/alert/unmute", Map.of("alert",
                String.valueOf(scoreAlert), "note", "weights are back", "csrf", steward.token()));
        assertEquals(303, unmuted.statusCode(), unmuted.body());
        List<Map<String, Object>> rows = jdbi.withHandle(h -> h.createQuery("SELECT action, actor, source, reason,"
                        + " note, until_wave FROM " + S + ".alert_action WHERE alert_id = :a AND source = 'console'"
                        + " ORDER BY entry_id")
                .bind("a", scoreAlert).mapToMap().list());
        assertEquals(2, rows.size(), rows.toString());
        assertEquals(List.of("MUTED", STEWARD, "console", "fix-upstream", "weights are being redone", "w5"),
                List.copyOf(rows.get(0).values()));
        assertEquals("UNMUTED", rows.get(1).get("action"));
        assertEquals(STEWARD, rows.get(1).get("actor"));
        // The notice comes from the code in the redirect, as fixed text.
        HttpResponse<String> page = steward.get("/console/wave?dataset=small-survey&wave=w3&done=unmuted");
        assertTrue(page.body().contains(ConsoleApp.NOTICES.get("unmuted")), page.body());
        assertTrue(page.body().contains("href=\"/console/finding?id=" + scoreFinding + "\""),
                "the alert links to its lead finding's page: " + page.body());
    }

    @Test
    @Order(13)
    void aStewardExplainsTheAlertFromItsFindingPage() throws Exception {
        Browser steward = new Browser().as(STEWARD);
        String finding = base + "/console/finding?id=" + scoreFinding;
        HttpResponse<String> r = steward.send(HttpRequest.newBuilder(URI.create(base + "/console/alert/explain"))
                .header("Content-Type", "application/x-www-form-urlencoded")
                .header("Referer", finding)
                .POST(HttpRequest.BodyPublishers.ofString("alert=" + scoreAlert + "&reason=real-change&note="
                        + enc("fewer hours in the harvest month, confirmed with the field team") + "&csrf="
                        + enc(steward.token()))));
        assertEquals(303, r.statusCode(), r.body());
        assertEquals("/console/finding?id=" + scoreFinding + "&done=explained",
                r.headers().firstValue("Location").orElse(null));
        Map<String, Object> row = jdbi.withHandle(h -> h.createQuery("SELECT action, actor, source, reason, note FROM "
                        + S + ".alert_action WHERE alert_id = :a ORDER BY entry_id DESC LIMIT 1")
                .bind("a", scoreAlert).mapToMap().one());
        assertEquals(List.of("EXPLAINED", STEWARD, "console", "real-change",
                "fewer hours in the harvest month, confirmed with the field team"), List.copyOf(row.values()));
        // Without a page to return to (no Referer), the action returns to the alert's wave.
        HttpResponse<String> spread = steward.post("/console/alert/explain", Map.of("alert",
                String.valueOf(spreadAlert), "reason", "planned-change", "note", "the item moved to a slider",
                "csrf", steward.token()));
        assertEquals(303, spread.statusCode(), spread.body());
        assertEquals("/console/wave?dataset=small-survey&wave=w3&done=explained",
                spread.headers().firstValue("Location").orElse(null));
    }

    @Test
    @Order(14)
    void anActionTheLifecycleRefusesIsA409WithItsReason() throws Exception {
        Browser steward = new Browser().as(STEWARD);
        int before = actions("console");
        HttpResponse<String> r = steward.post("/console/alert/unmute", Map.of("alert", String.valueOf(scoreAlert),
                "csrf", steward.token()));
        assertEquals(409, r.statusCode(), r.body());
        assertTrue(r.body().contains("is not muted"), r.body());
        assertEquals(before, actions("console"));
    }

    @Test
    @Order(15)
    void aReleaserSignsTheWaveOffOnceNothingBlocksIt() throws Exception {
        Browser releaser = new Browser().as(RELEASER);
        long current = jdbi.withHandle(h -> h.createQuery("SELECT run_id FROM " + S + ".alert WHERE alert_id = :a")
                .bind("a", scoreAlert).mapTo(Long.class).one());
        // A page shown before the wave was judged again names another run: refused, nothing written.
        HttpResponse<String> stale = releaser.post("/console/signoff", Map.of("dataset", "small-survey", "wave", "w3",
                "release", "", "run", String.valueOf(current - 1), "csrf", releaser.token()));
        assertEquals(409, stale.statusCode(), stale.body());
        assertTrue(stale.body().contains("it has been judged again since the page was shown (run " + current
                + ", not run " + (current - 1) + ")"), stale.body());
        assertEquals(0, signOffs());
        HttpResponse<String> r = releaser.post("/console/signoff", Map.of("dataset", "small-survey", "wave", "w3",
                "release", "", "run", String.valueOf(current), "csrf", releaser.token()));
        assertEquals(303, r.statusCode(), r.body());
        assertEquals("/console/wave?dataset=small-survey&wave=w3&done=signedoff",
                r.headers().firstValue("Location").orElse(null));
        Map<String, Object> row = jdbi.withHandle(h -> h.createQuery("SELECT dataset, wave, actor, forced, source FROM "
                + S + ".sign_off").mapToMap().one());
        assertEquals(List.of("small-survey", "w3", RELEASER, false, "console"), List.copyOf(row.values()));
    }

    @Test
    @Order(16)
    void loggingOutEndsTheSession() throws Exception {
        Browser b = new Browser().as(VIEWER);
        HttpResponse<String> out = b.post("/console/logout", Map.of("csrf", b.token()));
        assertEquals(303, out.statusCode());
        assertEquals("/console/login", out.headers().firstValue("Location").orElse(null));
        assertFalse(b.jar.containsKey(ConsoleAuth.COOKIE), "the cookie is cleared");
        HttpResponse<String> after = b.get("/console");
        assertEquals(303, after.statusCode());
    }

    @Test
    @Order(17)
    void repeatedFailedLoginsArePausedWithRetryAfter() throws Exception {
        Browser b = new Browser();
        int limit = ConsoleConfig.DISABLED.loginFailures();
        // Failures from this address earlier in the class count too: at most the limit more are answered 401.
        int tries = 0;
        HttpResponse<String> r;
        do {
            r = b.login(VIEWER, "wrong-" + tries, null);
            tries++;
        } while (r.statusCode() == 401 && tries <= limit);
        assertEquals(429, r.statusCode(), "paused after at most " + limit + " failures");
        // Even the right password is not checked while the pause lasts.
        HttpResponse<String> paused = b.login(VIEWER, PASSWORDS.get(VIEWER), null);
        assertEquals(429, paused.statusCode(), paused.body());
        long retryAfter = Long.parseLong(paused.headers().firstValue("Retry-After").orElse("0"));
        assertTrue(retryAfter > 0 && retryAfter <= ConsoleConfig.DISABLED.lockout().toSeconds(), "" + retryAfter);
        assertFalse(b.jar.containsKey(ConsoleAuth.COOKIE));
    }

    @Test
    @Order(18)
    void noPasswordOrSessionIdIsInAnyPageOrLogLine() {
        assertFalse(sessionIds.isEmpty());
        List<String> lines = log.list.stream().map(e -> e.getFormattedMessage()
                + (e.getThrowableProxy() == null ? "" : " " + e.getThrowableProxy().getMessage())).toList();
        assertTrue(lines.stream().anyMatch(l -> l.contains(STEWARD + " explained alert " + scoreAlert)), lines
                .toString());
        List<String> secrets = new ArrayList<>(PASSWORDS.values());
        secrets.addAll(sessionIds);
        for (String secret : secrets) {
            assertTrue(lines.stream().noneMatch(l -> l.contains(secret)), "a log line holds a secret");
            assertTrue(bodies.stream().noneMatch(b -> b.contains(secret)), "a page holds a secret");
        }
    }
}
