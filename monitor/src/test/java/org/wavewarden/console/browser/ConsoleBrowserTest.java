package org.wavewarden.console.browser;

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
import org.junit.jupiter.params.provider.ValueSource;
import org.openqa.selenium.By;
import org.openqa.selenium.Cookie;
import org.openqa.selenium.Dimension;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.Keys;
import org.openqa.selenium.OutputType;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.chrome.ChromeDriver;
import org.openqa.selenium.chrome.ChromeDriverService;
import org.openqa.selenium.chrome.ChromeOptions;
import org.openqa.selenium.interactions.Actions;
import org.openqa.selenium.logging.LogEntry;
import org.openqa.selenium.logging.LogType;
import org.openqa.selenium.logging.LoggingPreferences;
import org.openqa.selenium.support.ui.ExpectedConditions;
import org.openqa.selenium.support.ui.Select;
import org.openqa.selenium.support.ui.WebDriverWait;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.ConsoleApp;
import org.wavewarden.console.auth.ConsoleAuth;
import org.wavewarden.console.auth.PasswordHashes;
import org.wavewarden.daemon.Router;
import org.wavewarden.daemon.StatusServer;
import org.wavewarden.demo.DemoRun;
import org.wavewarden.pipeline.Session;
import org.wavewarden.review.Role;

import javax.imageio.ImageIO;
import java.awt.image.BufferedImage;
import java.io.File;
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
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.logging.Level;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

/**
 * The console as a person uses it, in a real headless Chromium driven over the WebDriver protocol by the system's
 * chromedriver, against the demo's judged Harrowmere waves in a real PostgreSQL server and the console on a real
 * Jetty on a free loopback port. A releaser logs in, opens the household survey's grid, filters it to MATERIAL,
 * opens a finding, explains its alert, signs the wave off and logs out; the rows this wrote are then read from the
 * results schema. A viewer's sign-off and a form without its token are refused and write nothing. Every page is
 * checked for browser console errors (a content security policy violation is one), and the keyboard reaches the
 * skip link first and opens a dataset with Enter. The steps build on each other, in order.
 *
 * <p>Without Chromium or its driver the test is skipped on a workstation; under continuous integration (variable
 * {@code CI} set) their absence is a failure, since the CI script installs both.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class ConsoleBrowserTest {

    static final String DATASET = "harrowmere-household";
    static final String VIEWER = "Ivo Brackwater";
    static final String STEWARD = "Nell Sedgecombe";
    static final String RELEASER = "Orla Fenwright";
    static final Map<String, String> PASSWORDS = Map.of(
            VIEWER, "reed-lantern-5531",
            STEWARD, "moor-copper-7702",
            RELEASER, "alder-quay-3149");
    static final String EXPLAIN_NOTE = "Harrowmere's new collection mode moved this; checked with the field team.";
    static final String FORCE_REASON = "Released for the county board with the open alerts listed in the release note.";
    /** Where the screenshots go, below the module's build folder (the tests run in the module's folder). */
    static final Path SHOTS = Path.of("target", "console-screenshots");

    @TempDir
    static Path dir;

    private final CountDownLatch finished = new CountDownLatch(1);
    private Thread demo;
    private Jdbi jdbi;
    private String schema;
    private StatusServer server;
    private String base;
    private ChromeDriver driver;

    /** What the steps find on the way and later steps check. */
    private String findingPath;
    private long alertId;
    private String wave;
    private boolean forced;
    private final List<String> pagesVisited = new ArrayList<>();

    // ---- the browser, the demo's results and the console ------------------------------------------------------

    /** The executable at {@code preferred}, else the first of {@code names} on the PATH. */
    static Optional<Path> executable(String preferred, String... names) {
        Path p = Path.of(preferred);
        if (Files.isExecutable(p)) {
            return Optional.of(p);
        }
        String path = Optional.ofNullable(System.getenv("PATH")).orElse("");
        return Stream.of(path.split(File.pathSeparator)).filter(s -> !s.isEmpty())
                .flatMap(d -> Stream.of(names).map(n -> Path.of(d, n)))
                .filter(Files::isExecutable).findFirst();
    }

    @BeforeAll
    void startTheDemoTheConsoleAndTheBrowser() throws Exception {
        Optional<Path> chromium = executable("/usr/bin/chromium", "chromium", "chromium-browser");
        Optional<Path> chromedriver = executable("/usr/bin/chromedriver", "chromedriver");
        if (chromium.isEmpty() || chromedriver.isEmpty()) {
            String missing = "the console's browser test needs Debian's chromium and chromium-driver"
                    + " (/usr/bin/chromium, /usr/bin/chromedriver); missing: "
                    + (chromium.isEmpty() ? "chromium " : "") + (chromedriver.isEmpty() ? "chromedriver" : "");
            String ci = System.getenv("CI");
            if (ci != null && !ci.isEmpty()) {
                fail(missing + "; under CI the CI script installs them, so their absence is a failure");
            }
            assumeTrue(false, missing);
        }

        // The demo's server lives as long as its run does: the run is held open at its inspection point (its
        // results schema migrated and filled) until the steps are done.
        CompletableFuture<Session> judged = new CompletableFuture<>();
        demo = new Thread(() -> {
            try {
                DemoRun.run(dir.resolve("demo"), new PrintWriter(new StringWriter(), true), s -> {
                    judged.complete(s);
                    try {
                        finished.await();
                    } catch (InterruptedException e) {
                        Thread.currentThread().interrupt();
                    }
                });
            } catch (Throwable e) {
                judged.completeExceptionally(e);
            }
        }, "demo-results");
        demo.setDaemon(true);
        demo.start();
        Session s = judged.get(10, TimeUnit.MINUTES);
        WardenConfig demoConfig = s.config();
        jdbi = s.store().jdbi();
        schema = demoConfig.results().schema();

        ConsoleConfig console = new ConsoleConfig(true, List.of(
                person(VIEWER, Role.VIEWER), person(STEWARD, Role.STEWARD), person(RELEASER, Role.RELEASER)),
                null, ConsoleConfig.DISABLED.sessionLength(), ConsoleConfig.DISABLED.idleTimeout(), true,
                ConsoleConfig.DISABLED.loginFailures(), ConsoleConfig.DISABLED.lockout());
        WardenConfig config = new WardenConfig(demoConfig.source(), demoConfig.results(), demoConfig.alpha(),
                demoConfig.fdr(), demoConfig.datasets(), demoConfig.daemon(), console);
        server = StatusServer.start("127.0.0.1", 0,
                new ConsoleApp(config, jdbi, Clock.systemUTC(), null).install(new Router()));
        base = "http://127.0.0.1:" + server.port();

        // The driver and the browser are named explicitly, so nothing is looked up or fetched over the network.
        System.setProperty(ChromeDriverService.CHROME_DRIVER_EXE_PROPERTY, chromedriver.get().toString());
        ChromeDriverService service = new ChromeDriverService.Builder()
                .usingDriverExecutable(chromedriver.get().toFile()).usingAnyFreePort().build();
        ChromeOptions options = new ChromeOptions();
        options.setBinary(chromium.get().toFile());
        options.addArguments("--headless=new", "--no-sandbox", "--disable-dev-shm-usage", "--window-size=1280,900",
                "--user-data-dir=" + Files.createDirectories(dir.resolve("profile")));
        LoggingPreferences logs = new LoggingPreferences();
        logs.enable(LogType.BROWSER, Level.ALL);
        options.setCapability("goog:loggingPrefs", logs);
        driver = new ChromeDriver(service, options);
        driver.manage().timeouts().pageLoadTimeout(Duration.ofSeconds(60));
    }

    static ConsoleConfig.User person(String name, Role role) {
        return new ConsoleConfig.User(name, role, PasswordHashes.encode(PASSWORDS.get(name).toCharArray()));
    }

    @AfterAll
    void stop() throws InterruptedException {
        try {
            if (driver != null) {
                driver.quit();
            }
        } finally {
            if (server != null) {
                server.stop();
            }
            finished.countDown();
            if (demo != null) {
                demo.join(TimeUnit.MINUTES.toMillis(2));
            }
        }
    }

    // ---- helpers: pages, their console, the database --------------------------------------------------------

    /** Opens a console page by its path and query. */
    void open(String pathQuery) {
        driver.get(base + pathQuery);
    }

    WebElement find(String css) {
        return driver.findElement(By.cssSelector(css));
    }

    /**
     * The notice of the page a form's submission led to, once that page has loaded (on a busy machine the click
     * returns before the next page is there); a refusal or problem page instead fails with its words.
     */
    String notice() {
        new WebDriverWait(driver, Duration.ofSeconds(30)).until(d -> present("#notice") || present("#refusal")
                || present("#problem"));
        if (!present("#notice")) {
            fail("the form was not carried out: " + driver.findElement(By.tagName("main")).getText());
        }
        return find("#notice").getText();
    }

    boolean present(String css) {
        return !driver.findElements(By.cssSelector(css)).isEmpty();
    }

    String path() {
        URI u = URI.create(driver.getCurrentUrl());
        return u.getRawPath() + (u.getRawQuery() == null ? "" : "?" + u.getRawQuery());
    }

    /**
     * The page now shown loaded without a single console error: the browser reports a refused inline style or
     * script, a failed resource and a script error as SEVERE. {@code expectedRefusal}, when given, is the one
     * failed load this page is about (a 403 the step asks for), which the browser reports as an error too.
     */
    void noConsoleErrors(String expectedRefusal) {
        pagesVisited.add(path());
        List<String> severe = new ArrayList<>();
        for (LogEntry e : driver.manage().logs().get(LogType.BROWSER).getAll()) {
            if (e.getLevel().intValue() < Level.SEVERE.intValue()) {
                continue;
            }
            String m = e.getMessage();
            if (expectedRefusal != null && m.startsWith(base + expectedRefusal + " ")
                    && m.contains("status of 403")) {
                continue;
            }
            severe.add(m);
        }
        assertTrue(severe.isEmpty(), "console errors on " + path() + ": " + severe);
    }

    void noConsoleErrors() {
        noConsoleErrors(null);
    }

    /**
     * Clicks a link or a form's button and waits until the page it leads to has replaced this one and finished
     * loading: the click returns as soon as the browser took it, and on a busy machine the next page may come
     * seconds later, so a look at the page straight after the click would still see the old one.
     */
    void follow(WebElement target) {
        WebElement page = driver.findElement(By.tagName("html"));
        target.click();
        awaitNewPage(page);
    }

    void awaitNewPage(WebElement oldPage) {
        WebDriverWait wait = new WebDriverWait(driver, Duration.ofSeconds(60));
        wait.until(ExpectedConditions.stalenessOf(oldPage));
        wait.until(d -> "complete".equals(((JavascriptExecutor) d).executeScript("return document.readyState")));
    }

    /** Logs in through the login form, from wherever the browser was sent to log in. */
    void logIn(String name) {
        assertTrue(path().startsWith("/console/login"), "expected the login page, at " + path());
        find("#login-name").sendKeys(name);
        find("#login-password").sendKeys(PASSWORDS.get(name));
        follow(find("#login-form button[type=submit]"));
        assertEquals(name, find("#user").getText());
    }

    void logOut() {
        follow(find("#logout"));
        assertTrue(path().startsWith("/console/login"), "the logout lands on the login page: " + path());
        noConsoleErrors();
    }

    int count(String sql, Map<String, Object> binds) {
        return jdbi.withHandle(h -> {
            var q = h.createQuery(sql.replace("${s}", schema));
            binds.forEach(q::bind);
            return q.mapTo(Integer.class).one();
        });
    }

    int signOffRows() {
        return count("SELECT count(*) FROM ${s}.sign_off", Map.of());
    }

    String wavePath() {
        return "/console/wave?dataset=" + enc(DATASET) + "&wave=" + enc(wave);
    }

    static String enc(String s) {
        return URLEncoder.encode(s, StandardCharsets.UTF_8);
    }

    // ---- the steps ----------------------------------------------------------------------------------------------

    @Test
    @Order(1)
    void aReleaserLogsInThroughTheFormAndLandsOnTheOverview() {
        open("/console");
        assertTrue(path().startsWith("/console/login?next="), "a logged-out visit is sent to log in: " + path());
        noConsoleErrors();
        logIn(RELEASER);
        assertEquals("/console", path());
        WebElement datasets = find("#datasets");
        assertFalse(datasets.findElements(By.linkText(DATASET)).isEmpty(), "the overview lists " + DATASET);
        noConsoleErrors();
    }

    @Test
    @Order(2)
    void theGridFilteredToMaterialLeadsToAMaterialFinding() {
        follow(find("#datasets").findElement(By.linkText(DATASET)));
        assertTrue(present("#grid"), "the dataset's grid");
        assertTrue(present("#legend"), "the grid's legend");
        noConsoleErrors();

        new Select(find("#filter-verdict")).selectByValue("MATERIAL");
        follow(find("#grid-filter button[type=submit]"));
        assertTrue(path().contains("verdict=MATERIAL"), "the filter is in the address: " + path());
        List<WebElement> cells = driver.findElements(By.cssSelector("#grid td a[href^='/console/finding']"));
        assertFalse(cells.isEmpty(), "the demo's household survey has MATERIAL findings");
        for (WebElement c : cells) {
            assertTrue(c.getAttribute("aria-label").contains("MATERIAL"),
                    "the filtered grid shows MATERIAL cells only: " + c.getAttribute("aria-label"));
        }
        noConsoleErrors();

        // A cell whose alert is still open, so that it can be explained.
        List<WebElement> open = driver.findElements(By.cssSelector("#grid td.c-material.a-open a"));
        assertFalse(open.isEmpty(), "a MATERIAL finding with an open alert");
        follow(open.get(0));
        assertTrue(path().startsWith("/console/finding?id="), "the cell opens its finding: " + path());
        findingPath = path();
        assertTrue(find("p.meta").getText().contains("MATERIAL"), find("p.meta").getText());
        noConsoleErrors();
    }

    @Test
    @Order(3)
    void theFindingShowsItsSentenceItsPlotItsTrendAndTheCautions() {
        assertFalse(find("#sentence").getText().isBlank(), "the finding's sentence");
        assertFalse(find("#plot").findElements(By.tagName("svg")).isEmpty(), "the digest's plot, drawn in SVG");
        assertTrue(present("#trend"), "the variable across waves");
        assertTrue(find("#cautions").getText().contains("screening aids, not findings"), find("#cautions").getText());
        // The SVG is laid out, not only present: a plot the style sheet hid or squashed would have no area.
        Dimension size = find("#plot svg").getSize();
        assertTrue(size.getWidth() > 100 && size.getHeight() > 50, "the plot's drawn size " + size);
        noConsoleErrors();
    }

    @Test
    @Order(4)
    void theReleaserExplainsTheAlertWithAReasonAndANote() {
        alertId = Long.parseLong(find("#explain-form input[name=alert]").getAttribute("value"));
        new Select(find("#explain-reason")).selectByValue("real-change");
        find("#explain-note").sendKeys(EXPLAIN_NOTE);
        follow(find("#explain-form button[type=submit]"));

        assertEquals("The alert was explained.", notice());
        String history = find("#history").getText();
        assertTrue(history.contains(RELEASER) && history.contains(EXPLAIN_NOTE), "the history shows the entry: "
                + history);
        noConsoleErrors();
    }

    @Test
    @Order(5)
    void theReleaserSignsTheWaveOffDecidingFromTheWavePage() {
        WebElement waveLink = find("p.meta a[href^='/console/wave']");
        wave = waveLink.getText();
        follow(waveLink);
        assertTrue(path().startsWith("/console/wave?"), path());
        assertTrue(present("#signoff-form"), "a releaser has the sign-off form");
        noConsoleErrors();

        // An open MATERIAL alert blocks a plain sign-off: the page says whether one is left.
        long openMaterial = driver.findElements(By.cssSelector("#alerts-open li.alert-item .verdict")).stream()
                .filter(v -> v.getText().equals("MATERIAL")).count();
        forced = openMaterial > 0;
        if (forced) {
            find("#signoff-force").click();
            find("#signoff-reason").sendKeys(FORCE_REASON);
        }
        follow(find("#signoff-form button[type=submit]"));
        System.out.println("signed off wave " + wave + " of " + DATASET + (forced ? " by force: a MATERIAL alert"
                + " was still open" : " without force: no MATERIAL alert was left open"));

        assertEquals("The wave was signed off.", notice());
        String record = find("#signoff-record tbody").getText();
        assertTrue(record.contains(RELEASER), record);
        assertTrue(forced ? record.contains("forced: " + FORCE_REASON) : record.contains(" no "), record);
        noConsoleErrors();
    }

    @Test
    @Order(6)
    void afterLoggingOutAPageSendsToTheLogin() {
        logOut();
        assertNull(driver.manage().getCookieNamed(ConsoleAuth.COOKIE), "the session cookie is cleared");
        open(findingPath);
        assertTrue(path().startsWith("/console/login?next="), "logged out, a page sends to log in: " + path());
        assertTrue(present("#login-form"));
        noConsoleErrors();
    }

    @Test
    @Order(7)
    void theDatabaseHoldsTheExplanationAndTheSignOffAsDone() {
        Map<String, Object> action = jdbi.withHandle(h -> h.createQuery("SELECT actor, source, action, reason, note"
                        + " FROM " + schema + ".alert_action WHERE alert_id = :a AND action = 'EXPLAINED'")
                .bind("a", alertId).mapToMap().one());
        assertEquals(RELEASER, action.get("actor"));
        assertEquals(ConsoleApp.SOURCE, action.get("source"));
        assertEquals("real-change", action.get("reason"));
        assertEquals(EXPLAIN_NOTE, action.get("note"));

        Map<String, Object> signOff = jdbi.withHandle(h -> h.createQuery("SELECT actor, source, wave, release,"
                        + " forced, force_reason FROM " + schema + ".sign_off WHERE dataset = :d")
                .bind("d", DATASET).mapToMap().one());
        assertEquals(RELEASER, signOff.get("actor"));
        assertEquals(ConsoleApp.SOURCE, signOff.get("source"));
        assertEquals(wave, signOff.get("wave"));
        assertEquals("", signOff.get("release"));
        assertEquals(forced, signOff.get("forced"));
        assertEquals(forced ? FORCE_REASON : null, signOff.get("force_reason"));
    }

    @Test
    @Order(8)
    void aViewerHasNoSignOffFormAndItsSignOffIsRefused() throws Exception {
        open(wavePath());
        logIn(VIEWER);
        assertTrue(path().startsWith("/console/wave?"), "the login goes on to the page asked for: " + path());
        assertFalse(present("#signoff-form"), "a viewer's wave page has no sign-off form");
        assertFalse(present("#explain-form") || present("#mute-form"), "nor any action form");
        noConsoleErrors();
        int before = signOffRows();
        String csrf = find("#logout-form input[name=csrf]").getAttribute("value");

        // The form the page does not offer, built in the page with the viewer's valid token and posted by the browser.
        WebElement page = driver.findElement(By.tagName("html"));
        ((JavascriptExecutor) driver).executeScript(
                "const f = document.createElement('form'); f.method = 'post'; f.action = '/console/signoff';"
                        + "for (const [k, v] of Object.entries(arguments[0])) {"
                        + "  const i = document.createElement('input'); i.type = 'hidden'; i.name = k; i.value = v;"
                        + "  f.appendChild(i); }"
                        + "document.body.appendChild(f); f.submit();",
                Map.of("dataset", DATASET, "wave", wave, "release", "viewer-try", "force", "true",
                        "reason", "a viewer tries", "csrf", csrf));
        awaitNewPage(page);
        waitForPath("/console/signoff");
        assertTrue(find("h1").getText().startsWith("403"), find("h1").getText());
        assertTrue(find("#problem").getText().contains("releaser"), find("#problem").getText());
        noConsoleErrors("/console/signoff");

        // The same post with the viewer's cookie from the browser, for the status code itself.
        Cookie session = driver.manage().getCookieNamed(ConsoleAuth.COOKIE);
        assertNotNull(session);
        String body = "dataset=" + enc(DATASET) + "&wave=" + enc(wave) + "&release=viewer-try&force=true"
                + "&reason=" + enc("a viewer tries") + "&csrf=" + enc(csrf);
        HttpResponse<String> r = HttpClient.newHttpClient().send(HttpRequest.newBuilder(URI.create(base
                        + "/console/signoff"))
                .header("Cookie", ConsoleAuth.COOKIE + "=" + session.getValue())
                .header("Content-Type", "application/x-www-form-urlencoded")
                .POST(HttpRequest.BodyPublishers.ofString(body)).build(), HttpResponse.BodyHandlers.ofString());
        assertEquals(403, r.statusCode(), r.body());
        assertEquals(before, signOffRows(), "a refused sign-off writes nothing");
        assertEquals(0, count("SELECT count(*) FROM ${s}.sign_off WHERE release = 'viewer-try'", Map.of()));
    }

    @Test
    @Order(9)
    void aFormPostedWithoutItsTokenIsRefusedAndWritesNothing() {
        open("/console");
        logOut();
        open(findingPath);
        logIn(STEWARD);
        assertEquals(findingPath, path());
        assertTrue(present("#explain-form"), "a steward may explain");
        assertFalse(present("#signoff-form"));
        noConsoleErrors();
        int before = count("SELECT count(*) FROM ${s}.alert_action WHERE alert_id = :a", Map.of("a", alertId));

        ((JavascriptExecutor) driver).executeScript(
                "document.querySelector('#explain-form input[name=csrf]').remove();");
        assertFalse(present("#explain-form input[name=csrf]"));
        new Select(find("#explain-reason")).selectByValue("no-problem");
        find("#explain-note").sendKeys("posted without its token");
        follow(find("#explain-form button[type=submit]"));
        waitForPath("/console/alert/explain");

        assertTrue(find("h1").getText().startsWith("403"), find("h1").getText());
        assertEquals(ConsoleApp.CSRF_REFUSAL, find("#problem").getText());
        noConsoleErrors("/console/alert/explain");
        assertEquals(before, count("SELECT count(*) FROM ${s}.alert_action WHERE alert_id = :a",
                Map.of("a", alertId)), "a refused form writes nothing");
    }

    @Test
    @Order(10)
    void fromTheOverviewTabReachesTheSkipLinkFirstAndEnterOpensADataset() {
        open("/console");
        noConsoleErrors();
        Actions keys = new Actions(driver);
        keys.sendKeys(Keys.TAB).perform();
        WebElement first = driver.switchTo().activeElement();
        assertEquals("Skip to content", first.getText().strip());
        assertTrue(first.getAttribute("href").endsWith("#main"), first.getAttribute("href"));
        // Focused, the skip link comes on screen and shows where the focus is.
        assertTrue(first.getLocation().getX() >= 0 && first.getLocation().getY() >= 0, "on screen at "
                + first.getLocation());
        assertEquals("solid", first.getCssValue("outline-style"), "the focus is visible");

        String datasetLink = "/console/dataset?name=" + enc(DATASET);
        int tabs = 0;
        while (!String.valueOf(driver.switchTo().activeElement().getAttribute("href")).endsWith(datasetLink)) {
            assertTrue(++tabs < 60, "Tab never reached the link to " + DATASET);
            keys.sendKeys(Keys.TAB).perform();
        }
        keys.sendKeys(Keys.ENTER).perform();
        waitForPath("/console/dataset");
        assertEquals(datasetLink, path());
        assertTrue(present("#grid"));
        noConsoleErrors();
    }

    @Test
    @Order(11)
    void screenshotsOfTheOverviewTheGridAndAFindingAt1280Pixels() throws Exception {
        Files.createDirectories(SHOTS);
        shoot("/console", "console-overview.png");
        shoot("/console/dataset?name=" + enc(DATASET), "console-grid.png");
        shoot(findingPath, "console-finding.png");
    }

    /**
     * The page at 1280 CSS pixels wide and as tall as its content (up to a limit that keeps a long grid readable),
     * as a PNG: the browser is told the viewport's size outright, since a window's outer size in headless mode
     * includes a frame whose height the page does not get.
     */
    void shoot(String pathQuery, String name) throws Exception {
        open(pathQuery);
        noConsoleErrors();
        long height = (Long) ((JavascriptExecutor) driver).executeScript(
                "return Math.ceil(document.documentElement.scrollHeight);");
        driver.executeCdpCommand("Emulation.setDeviceMetricsOverride", Map.of("width", 1280,
                "height", (int) Math.min(height, 3000), "deviceScaleFactor", 1, "mobile", false));
        try {
            byte[] png = driver.getScreenshotAs(OutputType.BYTES);
            Path file = SHOTS.resolve(name);
            Files.write(file, png);
            BufferedImage image = ImageIO.read(file.toFile());
            assertNotNull(image, name + " is a PNG");
            assertEquals(1280, image.getWidth(), name + " is 1280 px wide");
            assertEquals(Math.min(height, 3000), image.getHeight(), name + " holds the whole page");
        } finally {
            driver.executeCdpCommand("Emulation.clearDeviceMetricsOverride", Map.of());
        }
        noConsoleErrors();
    }

    /**
     * At 1280 px and on a narrow laptop's 1024 px no page scrolls sideways as a whole: the page keeps to its width
     * and only a wide table scrolls inside its own box.
     */
    @ParameterizedTest(name = "{0} px wide")
    @ValueSource(ints = {1280, 1024})
    @Order(12)
    void noPageScrollsSidewaysAtALaptopsWidth(int width) {
        try {
            driver.executeCdpCommand("Emulation.setDeviceMetricsOverride", Map.of("width", width, "height", 800,
                    "deviceScaleFactor", 1, "mobile", false));
            for (String p : List.of("/console", "/console/dataset?name=" + enc(DATASET), findingPath, wavePath(),
                    "/console/search?q=income")) {
                open(p);
                noConsoleErrors();
                long scrollWidth = (Long) ((JavascriptExecutor) driver).executeScript(
                        "return document.documentElement.scrollWidth;");
                assertTrue(scrollWidth <= width, p + " is " + scrollWidth + " px wide in a " + width + " px window");
            }
        } finally {
            driver.executeCdpCommand("Emulation.clearDeviceMetricsOverride", Map.of());
        }
    }

    @Test
    @Order(13)
    void theConsoleCheckSeesAPolicyViolationWhenThereIsOne() {
        // The check above would pass vacuously if the browser's log never reached it: an inline style attribute,
        // which the console's policy refuses, must show up in the log as SEVERE.
        open("/console");
        noConsoleErrors();
        ((JavascriptExecutor) driver).executeScript(
                "document.querySelector('main').insertAdjacentHTML('beforeend', '<p style=\\'color: red\\'>x</p>');");
        List<String> severe = new ArrayList<>();
        long until = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        while (severe.isEmpty() && System.nanoTime() < until) {
            driver.manage().logs().get(LogType.BROWSER).getAll().stream()
                    .filter(e -> e.getLevel().intValue() >= Level.SEVERE.intValue())
                    .forEach(e -> severe.add(e.getMessage()));
        }
        assertTrue(severe.stream().anyMatch(m -> m.contains("Content Security Policy")),
                "an inline style is reported as a policy violation: " + severe);
    }

    @Test
    @Order(14)
    void everyPageVisitedWasChecked() {
        // Each kind of page the steps pass through was loaded and checked for console errors at least once.
        for (String p : List.of("/console/login", "/console?", "/console/dataset", "/console/finding",
                "/console/wave", "/console/search", "/console/signoff", "/console/alert/explain")) {
            assertTrue(pagesVisited.stream().anyMatch(v -> (v + "?").startsWith(p)), p + " in " + pagesVisited);
        }
    }

    /** Waits (bounded) until a form's post has loaded its answer at {@code path}. */
    void waitForPath(String path) {
        long until = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
        while (!path().startsWith(path)) {
            assertTrue(System.nanoTime() < until, "the browser never reached " + path + ", at " + path());
            try {
                Thread.sleep(50);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                fail("interrupted");
            }
        }
    }
}
