package org.wavewarden.console;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.auth.ConsoleAuth;
import org.wavewarden.daemon.Router;
import org.wavewarden.daemon.StatusServer;
import org.wavewarden.demo.DemoRun;
import org.wavewarden.demo.PanelScenarioGenerator;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.pipeline.Session;
import org.wavewarden.review.Role;
import org.wavewarden.store.ReleaseComparisons;
import org.wavewarden.testing.ConsolePeople;

import javax.xml.parsers.DocumentBuilderFactory;
import java.io.ByteArrayInputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.URI;
import java.net.URLEncoder;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Clock;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Collectors;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo's panel publishes wave 2025-Q2 twice; the demo compares the two releases. That comparison is kept in the
 * results schema with the counts its {@code releases.json} gives, the console's wave page shows it in
 * {@code #release-comparison}, its downloads hand out the very {@code releases.md} the demo wrote and the same
 * JSON, and the stored row can be neither changed nor removed: all on the demo's real PostgreSQL server, the console
 * on a real Jetty on a free loopback port, logged in as a viewer.
 */
class ReleaseComparisonConsoleIntegrationTest {

    static final String VIEWER = "Ada Quillfield";
    static final String PASSWORD = "lantern-moss-4417";
    static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    static Path dir;
    static Path releaseDir;
    static List<ReleaseComparisons.Stored> stored;
    static String wavePage;
    static Map<String, byte[]> downloads = new HashMap<>();
    static Map<String, String> contentDisposition = new HashMap<>();
    static Map<String, SQLException> refusals = new HashMap<>();
    static long rowsAfterRefusals;
    static int onceStatus;
    static String oncePage;

    @BeforeAll
    static void runTheDemoAndReadItsReleaseComparisonThroughTheConsole() throws Exception {
        String hash = ConsolePeople.hash(PASSWORD);
        Path out = dir.resolve("demo");
        DemoRun.run(out, new PrintWriter(new StringWriter()), s -> {
            try {
                read(s, hash);
            } catch (Exception e) {
                throw new IllegalStateException(e);
            }
        });
        releaseDir = OutputPaths.under(out.resolve(DemoRun.PANEL_FOLDER).resolve("releases"),
                PanelScenarioGenerator.REVISED_WAVE);
    }

    /** Everything that needs the demo's server, which stops when the demo returns. */
    static void read(Session s, String hash) throws Exception {
        WardenConfig demo = s.config();
        String panel = demo.datasets().get(1).name();
        String wave = PanelScenarioGenerator.REVISED_WAVE;
        stored = new ReleaseComparisons(s.store().jdbi(), demo.results().schema()).all(panel, wave);

        ConsoleConfig console = new ConsoleConfig(true, List.of(new ConsoleConfig.User(VIEWER, Role.VIEWER, hash)),
                null, ConsoleConfig.DISABLED.sessionLength(), ConsoleConfig.DISABLED.idleTimeout(), true,
                ConsoleConfig.DISABLED.loginFailures(), ConsoleConfig.DISABLED.lockout());
        WardenConfig config = new WardenConfig(demo.source(), demo.results(), demo.alpha(), demo.fdr(),
                demo.datasets(), demo.daemon(), console);
        StatusServer server = StatusServer.start("127.0.0.1", 0,
                new ConsoleApp(config, s.store().jdbi(), Clock.systemUTC(), null).install(new Router()));
        try {
            Browser b = new Browser("http://127.0.0.1:" + server.port());
            b.login();
            String where = "dataset=" + enc(panel) + "&wave=" + enc(wave);
            HttpResponse<byte[]> page = b.get("/console/wave?" + where);
            assertEquals(200, page.statusCode());
            wavePage = new String(page.body(), StandardCharsets.UTF_8);
            for (String file : List.of("releases.md", "releases.json")) {
                HttpResponse<byte[]> r = b.get("/console/download?" + where + "&file=" + file);
                assertEquals(200, r.statusCode(), file);
                downloads.put(file, r.body());
                contentDisposition.put(file, r.headers().firstValue("Content-Disposition").orElse(""));
            }
            // A wave of the same panel published once: nothing to hand out.
            String once = s.store().jdbi().withHandle(h -> h.createQuery("SELECT wave FROM "
                            + Identifiers.quote(demo.results().schema()) + ".run WHERE dataset = :d AND wave <> :w"
                            + " ORDER BY wave LIMIT 1")
                    .bind("d", panel).bind("w", wave).mapTo(String.class).one());
            onceStatus = b.get("/console/download?dataset=" + enc(panel) + "&wave=" + enc(once)
                    + "&file=releases.md").statusCode();
            oncePage = new String(b.get("/console/wave?dataset=" + enc(panel) + "&wave=" + enc(once)).body(),
                    StandardCharsets.UTF_8);
        } finally {
            server.stop();
        }

        String table = demo.results().schema() + ".release_comparison";
        try (Connection c = s.resultsDataSource().getConnection(); Statement st = c.createStatement()) {
            for (String statement : List.of("UPDATE " + table + " SET cells_changed = 0",
                    "UPDATE " + table + " SET markdown = 'nothing changed'", "DELETE FROM " + table,
                    "TRUNCATE " + table)) {
                try {
                    st.execute(statement);
                } catch (SQLException e) {
                    refusals.put(statement.split(" ")[0] + (statement.contains("markdown") ? " markdown" : ""), e);
                }
            }
            try (var rs = st.executeQuery("SELECT count(*) FROM " + table)) {
                rs.next();
                rowsAfterRefusals = rs.getLong(1);
            }
        }
    }

    @Test
    void theDemosComparisonIsStoredOnceWithTheCountsOfItsReleasesJson() throws Exception {
        assertEquals(1, stored.size(), "the demo compares the revised wave once");
        ReleaseComparisons.Stored c = stored.get(0);
        JsonNode file = JSON.readTree(Files.readString(releaseDir.resolve("releases.json")));
        JsonNode revision = file.get("revision");
        assertEquals(file.get("after").asText(), c.release());
        assertEquals(file.get("before").asText(), c.againstRelease());
        assertEquals(revision.get("rowsBefore").asLong(), c.rowsBefore());
        assertEquals(revision.get("rowsAfter").asLong(), c.rowsAfter());
        assertEquals(revision.get("matched").asLong(), c.matched());
        assertEquals(revision.get("added").asLong(), c.rowsAdded());
        assertEquals(revision.get("removed").asLong(), c.rowsRemoved());
        long compared = 0;
        long changed = 0;
        int variablesChanged = 0;
        for (JsonNode v : revision.get("variables")) {
            compared += v.get("comparedCells").asLong();
            changed += v.get("changedCells").asLong();
            variablesChanged += v.get("changedCells").asLong() > 0 ? 1 : 0;
        }
        assertEquals(compared, c.cellsCompared());
        assertEquals(changed, c.cellsChanged());
        assertEquals(variablesChanged, c.variablesChanged());
        assertTrue(c.cellsChanged() > 0, "the demo's second release revises cells");
        assertEquals(file, JSON.readTree(c.reportJson()), "the stored report is releases.json");
        assertEquals(Files.readString(releaseDir.resolve("releases.md")), c.markdown());
    }

    @Test
    void theWavePageShowsTheComparisonWithItsCounts() throws Exception {
        ReleaseComparisons.Stored c = stored.get(0);
        Document d = parse(wavePage);
        List<Element> sections = select(d, "section", "release-comparison");
        assertEquals(1, sections.size(), "one #release-comparison section");
        NodeList cells = sections.get(0).getElementsByTagName("td");
        List<String> row = new ArrayList<>();
        for (int i = 0; i < cells.getLength(); i++) {
            row.add(cells.item(i).getTextContent());
        }
        assertEquals(List.of(c.release(), c.againstRelease()), row.subList(0, 2));
        assertEquals(List.of(c.rowsBefore(), c.rowsAfter(), c.matched(), c.rowsAdded(), c.rowsRemoved(),
                        c.cellsCompared(), c.cellsChanged(), (long) c.variablesChanged()).stream()
                .map(String::valueOf).toList(), row.subList(3, 11));
        Element pre = select(d, "pre", "release-markdown").get(0);
        assertEquals(c.markdown(), pre.getTextContent(), "the Markdown shown as written");
    }

    @Test
    void theMarkdownDownloadIsTheFileTheDemoWroteByteForByte() throws Exception {
        assertArrayEquals(Files.readAllBytes(releaseDir.resolve("releases.md")), downloads.get("releases.md"));
        assertEquals("attachment; filename=\"" + OutputPaths.name(stored.get(0).dataset()) + "_"
                + OutputPaths.name(stored.get(0).wave()) + "_releases.md\"", contentDisposition.get("releases.md"));
    }

    @Test
    void theJsonDownloadHasTheContentOfTheFileTheDemoWrote() throws Exception {
        assertEquals(JSON.readTree(Files.readAllBytes(releaseDir.resolve("releases.json"))),
                JSON.readTree(downloads.get("releases.json")));
    }

    @Test
    void aWavePublishedOnceHasNoComparisonToShowOrDownload() throws Exception {
        assertEquals(404, onceStatus);
        assertTrue(select(parse(oncePage), "section", "release-comparison").isEmpty());
    }

    @ParameterizedTest(name = "{0} is refused")
    @ValueSource(strings = {"UPDATE", "UPDATE markdown", "DELETE", "TRUNCATE"})
    void aStoredComparisonIsNeverChangedOrRemoved(String statement) {
        SQLException refused = refusals.get(statement);
        assertNotNull(refused, statement + " went through");
        assertTrue(refused.getMessage().contains("table release_comparison is an audit trail"), refused.getMessage());
        assertEquals(stored.size(), rowsAfterRefusals);
    }

    // ---- a reader of the pages and a viewer's browser ------------------------------------------------------

    static Document parse(String html) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", false);
        f.setExpandEntityReferences(false);
        return f.newDocumentBuilder().parse(new ByteArrayInputStream(html.getBytes(StandardCharsets.UTF_8)));
    }

    static List<Element> select(Document d, String tag, String id) {
        NodeList nodes = d.getElementsByTagName(tag);
        List<Element> out = new ArrayList<>();
        for (int i = 0; i < nodes.getLength(); i++) {
            Element e = (Element) nodes.item(i);
            if (e.getAttribute("id").equals(id)) {
                out.add(e);
            }
        }
        return out;
    }

    static String enc(String value) {
        return URLEncoder.encode(value, StandardCharsets.UTF_8);
    }

    private static final Pattern CSRF_INPUT = Pattern.compile("<input[^>]*name=\"csrf\"[^>]*>");
    private static final Pattern VALUE = Pattern.compile("value=\"([^\"]*)\"");

    /** Keeps the cookies the console sets, as a browser on loopback does (Secure ones included). */
    static final class Browser {
        final HttpClient http = HttpClient.newBuilder().followRedirects(HttpClient.Redirect.NEVER).build();
        final Map<String, String> jar = new LinkedHashMap<>();
        final String base;

        Browser(String base) {
            this.base = base;
        }

        HttpResponse<byte[]> get(String pathQuery) throws Exception {
            return send(HttpRequest.newBuilder(URI.create(base + pathQuery)).GET());
        }

        void login() throws Exception {
            String form = new String(get("/console/login").body(), StandardCharsets.UTF_8);
            Matcher input = CSRF_INPUT.matcher(form);
            assertTrue(input.find(), form);
            Matcher value = VALUE.matcher(input.group());
            assertTrue(value.find(), input.group());
            String body = Map.of("name", VIEWER, "password", PASSWORD, "csrf", value.group(1)).entrySet().stream()
                    .map(e -> enc(e.getKey()) + "=" + enc(e.getValue())).collect(Collectors.joining("&"));
            HttpResponse<byte[]> r = send(HttpRequest.newBuilder(URI.create(base + "/console/login"))
                    .header("Content-Type", "application/x-www-form-urlencoded")
                    .POST(HttpRequest.BodyPublishers.ofString(body)));
            assertEquals(303, r.statusCode());
            assertTrue(jar.containsKey(ConsoleAuth.COOKIE), "logged in: " + jar.keySet());
        }

        private HttpResponse<byte[]> send(HttpRequest.Builder request) throws Exception {
            if (!jar.isEmpty()) {
                request.header("Cookie", jar.entrySet().stream().map(e -> e.getKey() + "=" + e.getValue())
                        .collect(Collectors.joining("; ")));
            }
            HttpResponse<byte[]> r = http.send(request.build(), HttpResponse.BodyHandlers.ofByteArray());
            for (String set : r.headers().allValues("Set-Cookie")) {
                String pair = set.split(";", 2)[0];
                int eq = pair.indexOf('=');
                String value = pair.substring(eq + 1).strip();
                if (value.isEmpty() || set.toLowerCase().contains("max-age=0")) {
                    jar.remove(pair.substring(0, eq).strip());
                } else {
                    jar.put(pair.substring(0, eq).strip(), value);
                }
            }
            return r;
        }
    }
}
