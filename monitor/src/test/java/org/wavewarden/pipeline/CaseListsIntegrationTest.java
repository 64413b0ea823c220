package org.wavewarden.pipeline;

import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.bench.StatementCounter;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.compare.interviewer.InterviewerFlag;
import org.wavewarden.config.Breakdowns;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.ConsoleApp;
import org.wavewarden.daemon.Router;
import org.wavewarden.review.Role;
import org.wavewarden.daemon.StatusServer;
import org.wavewarden.deliver.CaseListCsv;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.missing.CaseSelection;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.CaseSource;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.store.CaseLists;
import org.wavewarden.testing.ConsolePeople;
import org.wavewarden.testing.TestDatabase;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.time.Clock;
import java.util.List;
import java.util.Map;
import java.util.stream.IntStream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Case lists on a real PostgreSQL server. Each wave of the survey has 1,000 respondents R0001..R1000 with the hours
 * they work: respondents R0901..R0940 refused (the declared code -9) and R0971..R1000 carry 999, which nobody
 * declared. In the second wave the town of R0986..R1000 is one of three new codes written to be hostile to a CSV
 * reader (a formula, a comma with quotes, a line break). Interviewer I{g mod 10} interviewed respondent g.
 * The lists hold exactly those respondents with the offending values, capped and counted, read from the wave in one
 * statement, written as CSV files through the outbox and served by the console.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class CaseListsIntegrationTest {

    static final String WAVES = """
            CREATE SCHEMA cs;
            CREATE TABLE cs.answers (wave text, respondent_id text, interviewer_id text, hours integer, town text);
            INSERT INTO cs.answers
            SELECT w, 'R' || lpad(g::text, 4, '0'), 'I' || (g % 10),
                   CASE WHEN g BETWEEN 901 AND 940 THEN -9 WHEN g > 970 THEN 999 ELSE 10 + (g * 7) % 51 END,
                   CASE WHEN w = 'w2' AND g BETWEEN 986 AND 990 THEN '=HYPERLINK("http://x")'
                        WHEN w = 'w2' AND g BETWEEN 991 AND 995 THEN 'Lee, "Ann"'
                        WHEN w = 'w2' AND g > 995 THEN E'two\\nlines'
                        WHEN g % 2 = 0 THEN 'North' ELSE 'South' END
            FROM unnest(ARRAY['w1', 'w2']) w, generate_series(1, 1000) g;
            """;

    static final String DATASET = """
              - name: %s
                table: cs.answers
                waveColumn: wave
                %s
                exclude: [interviewer_id]
                variables:
                  - {name: hours, kind: continuous, missingCodes: [{value: -9, reason: refused}]}
                  - {name: town, kind: categorical}
            """;

    @TempDir
    static Path dir;
    String url;
    WardenConfig config;
    Session session;
    StatusServer server;
    String base;

    @BeforeAll
    void judgeBothWaves() throws Exception {
        url = TestDatabase.freshDatabase("case_lists");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(WAVES);
        }
        String yaml = "source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults: {schema: cs_results}\n"
                + "datasets:\n" + DATASET.formatted("hh", "respondentKey: respondent_id")
                + DATASET.formatted("hh-capped", "respondentKey: respondent_id")
                + DATASET.formatted("hh-nokey", "breakdowns: {columns: [town]}")
                + DATASET.formatted("hh-plain", "");
        WardenConfig loaded = ConfigLoader.parse(yaml);
        config = loaded;
        session = Session.open(config, null, Map.of());
        session.migrate();
        ConsoleConfig console = new ConsoleConfig(true, List.of(new ConsoleConfig.User("Ada Quillfield",
                Role.VIEWER, ConsolePeople.hash("lantern-moss-4417"))),
                new ConsoleConfig.Proxy(PROXY_HEADER, List.of("127.0.0.1", "::1")),
                ConsoleConfig.DISABLED.sessionLength(), ConsoleConfig.DISABLED.idleTimeout(), true,
                ConsoleConfig.DISABLED.loginFailures(), ConsoleConfig.DISABLED.lockout());
        WardenConfig withConsole = new WardenConfig(loaded.source(), loaded.results(), loaded.alpha(), loaded.fdr(),
                loaded.datasets(), loaded.daemon(), console);
        server = StatusServer.start("127.0.0.1", 0, new ConsoleApp(withConsole, Jdbi.create(url, "postgres", ""),
                Clock.systemUTC(), null).install(new Router()));
        base = "http://127.0.0.1:" + server.port();
    }

    @AfterAll
    void stop() {
        if (server != null) {
            server.stop();
        }
        if (session != null) {
            session.close();
        }
    }

    static final String PROXY_HEADER = "X-Remote-Person";

    /** The same dataset with at most {@code maxCases} keys per list. */
    static DatasetConfig capped(DatasetConfig d, int maxCases) {
        Breakdowns b = d.breakdowns();
        return new DatasetConfig(d.name(), d.table(), d.waveColumn(), d.tablePattern(), d.waveOrder(),
                d.compareWith(), d.schedule(), d.exclude(), d.variables(), d.quietPeriod(), d.alerts(),
                d.readyTable(), d.readyColumn(), d.weightColumn(), d.respondentKey(), d.releases(), d.design(),
                d.relationships(), d.codebook(), d.population(), d.alertRules(), new Breakdowns(b.columns(),
                b.maxDomains(), b.interviewer(), b.minInterviews(), b.keyVariables(), b.iccThreshold(), maxCases));
    }

    /** The statements a judged wave sends that read case lists: those selecting the respondent key as text. */
    record Judged(JudgedWave wave, StatementCounter.SourceStatements caseReads, Path out) {
    }

    Judged judge(DatasetConfig d, String wave) {
        StatementCounter counter = new StatementCounter("format('%s', \"respondent_id\")");
        Path out = dir.resolve(d.name()).resolve(wave);
        session.source().setSqlLogger(counter);
        try {
            JudgedWave j = new WaveJudge(session, Clock.systemUTC())
                    .useScanner(counter.counting(new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan))
                    .judge(d, wave, null, out, null);
            return new Judged(j, counter.snapshot(), out);
        } finally {
            session.source().setSqlLogger(org.jdbi.v3.core.statement.SqlLogger.NOP_SQL_LOGGER);
        }
    }

    static List<String> keys(int from, int to) {
        return IntStream.rangeClosed(from, to).mapToObj(g -> String.format("R%04d", g)).toList();
    }

    static CaseLists.CaseList list(List<CaseLists.CaseList> lists, String variable, String kind) {
        return lists.stream().filter(l -> l.variable().equals(variable) && l.kind().equals(kind)).findFirst()
                .orElseThrow(() -> new AssertionError("no " + kind + " list of " + variable + " in " + lists));
    }

    Judged hh;

    @Test
    @Order(1)
    void theSentinelCodeAndNewCodeListsHoldExactlyThePlantedRespondentsAndValues() {
        judge(config.dataset("hh"), "w1");
        hh = judge(config.dataset("hh"), "w2");
        List<CaseLists.CaseList> lists = session.store().caseLists().forRun(hh.wave().runId());

        CaseLists.CaseList sentinel = list(lists, "hours", "NUMERIC_SENTINEL");
        assertEquals(30, sentinel.total());
        assertEquals(keys(971, 1000), sentinel.rows().stream().map(CaseLists.CaseRow::respondentKey).toList());
        assertTrue(sentinel.rows().stream().allMatch(r -> r.value().equals("999")), sentinel.rows().toString());

        CaseLists.CaseList refused = list(lists, "hours", "MISSING_CODE");
        assertEquals(40, refused.total());
        assertEquals(keys(901, 940), refused.rows().stream().map(CaseLists.CaseRow::respondentKey).toList());
        assertTrue(refused.rows().stream().allMatch(r -> r.value().equals("-9")), refused.rows().toString());

        CaseLists.CaseList town = list(lists, "town", "CODE_APPEARED");
        assertEquals(15, town.total());
        assertEquals(keys(986, 1000), town.rows().stream().map(CaseLists.CaseRow::respondentKey).toList());
        assertEquals("=HYPERLINK(\"http://x\")", town.rows().get(0).value());
        assertEquals("Lee, \"Ann\"", town.rows().get(5).value());
        assertEquals("two\nlines", town.rows().get(14).value());
        assertFalse(lists.stream().anyMatch(l -> l.rows().stream().anyMatch(r -> r.value().equals("North"))),
                "no valid answer is listed");
    }

    @Test
    @Order(2)
    void oneStatementReadsEveryListOfTheRunAndTheWaveIsScannedOnce() {
        assertEquals(1, hh.caseReads().tableQueries(), "one read for all lists: " + hh.caseReads());
        assertEquals(1, hh.caseReads().copies(), "the judged wave's one scan: " + hh.caseReads());
    }

    @Test
    @Order(3)
    void theFilesAreWrittenOnceThroughTheOutboxWithHostileValuesInertAndQuoted() throws Exception {
        List<CaseLists.CaseList> lists = session.store().caseLists().forRun(hh.wave().runId());
        assertEquals(List.of(), session.store().outbox().pendingWaveFiles(hh.wave().runId()),
                "the run's files were carried out");
        try (var files = Files.list(hh.out().resolve("cases"))) {
            assertEquals(lists.stream().map(l -> l.fileName().substring("cases/".length())).sorted().toList(),
                    files.map(p -> p.getFileName().toString()).sorted().toList());
        }
        CaseLists.CaseList refused = list(lists, "hours", "MISSING_CODE");
        String hours = Files.readString(hh.out().resolve(refused.fileName()));
        assertTrue(hours.startsWith("respondent_key,hours\r\nR0901,-9\r\nR0902,-9\r\n"), hours);
        assertEquals(41, hours.split("\r\n").length, "the header and 40 cases");

        String town = Files.readString(hh.out().resolve(list(lists, "town", "CODE_APPEARED").fileName()));
        assertTrue(town.contains("\r\nR0986,\"'=HYPERLINK(\"\"http://x\"\")\"\r\n"), town);
        assertTrue(town.contains("\r\nR0991,\"Lee, \"\"Ann\"\"\"\r\n"), town);
        assertTrue(town.contains("\r\nR0996,\"two\nlines\"\r\n"), town);

        String digest = Files.readString(hh.out().resolve("digest.md"));
        assertTrue(digest.contains("[40 cases](" + refused.fileName() + ")"), digest);
        assertTrue(digest.contains("[15 cases](" + list(lists, "town", "CODE_APPEARED").fileName() + ")"), digest);
        String html = new DigestAssembler(session).html(config.dataset("hh"), List.of(hh.wave().report()),
                java.time.Instant.now());
        // The daemon's digest lies in a folder of its own beside the waves' folders: its link leads up and into the
        // wave's folder, where the file is.
        String link = "../" + org.wavewarden.deliver.OutputPaths.name(hh.wave().report().wave()) + "/"
                + refused.fileName();
        assertTrue(html.contains("hours MISSING_CODE: <a href=\"" + link + "\" download>40 cases</a>"), html);
    }

    @Test
    @Order(4)
    void aCappedListKeepsTheFirstKeysCountsEveryCaseAndTheDigestSaysSo() throws Exception {
        DatasetConfig d = capped(config.dataset("hh-capped"), 10);
        judge(d, "w1");
        Judged j = judge(d, "w2");
        CaseLists.CaseList sentinel = list(session.store().caseLists().forRun(j.wave().runId()), "hours",
                "NUMERIC_SENTINEL");
        assertEquals(30, sentinel.total());
        assertTrue(sentinel.capped());
        assertEquals(keys(971, 980), sentinel.rows().stream().map(CaseLists.CaseRow::respondentKey).toList());
        String csv = Files.readString(j.out().resolve(sentinel.fileName()));
        assertTrue(csv.endsWith("R0980,999\r\n"), "the file ends with its last kept case: " + csv);
        assertEquals(11, csv.split("\r\n").length);
        assertTrue(Files.readString(j.out().resolve("digest.md")).contains("[first 10 of 30 cases]("
                + sentinel.fileName() + ")"));

        // Another cap is another configuration and so another run, with new findings: the earlier run's files go.
        Judged again = judge(capped(config.dataset("hh-capped"), 5), "w2");
        assertTrue(again.wave().runId() != j.wave().runId());
        CaseLists.CaseList now = list(session.store().caseLists().forRun(again.wave().runId()), "hours",
                "NUMERIC_SENTINEL");
        assertEquals(keys(971, 975), now.rows().stream().map(CaseLists.CaseRow::respondentKey).toList());
        assertFalse(Files.exists(j.out().resolve(sentinel.fileName())), "the earlier run's list is removed");
        assertTrue(Files.exists(again.out().resolve(now.fileName())));
    }

    /** Judges w2 of a dataset against w1: no case list is stored and no row is read for one. */
    private Judged judgedWithoutCaseLists(String dataset) {
        judge(config.dataset(dataset), "w1");
        Judged j = judge(config.dataset(dataset), "w2");
        assertEquals(List.of(), session.store().caseLists().forRun(j.wave().runId()));
        assertEquals(0, j.caseReads().tableQueries(), j.caseReads().toString());
        return j;
    }

    @Test
    @Order(5)
    void withoutARespondentKeyThereIsNoListNoReadAndTheNotesSaySoOnce() {
        Judged j = judgedWithoutCaseLists("hh-nokey");
        List<String> notes = j.wave().report().inference().stream().filter(n -> n.startsWith("No case lists"))
                .toList();
        assertEquals(1, notes.size(), j.wave().report().inference().toString());
        assertTrue(notes.get(0).contains("names no respondentKey"), notes.get(0));
        assertFalse(Files.exists(j.out().resolve("cases")));
    }

    @Test
    @Order(5)
    void aDatasetThatConfiguresNoBreakdownsIsNotToldAboutCaseLists() {
        Judged j = judgedWithoutCaseLists("hh-plain");
        assertFalse(j.wave().report().findings().isEmpty(), "the wave still has its findings");
        assertEquals(List.of(), j.wave().report().inference().stream().filter(n -> n.startsWith("No case lists"))
                .toList());
        assertFalse(Files.exists(j.out().resolve("cases")));
    }

    @Test
    @Order(6)
    void aFlaggedInterviewersListHoldsTheirRowsWithTheOffendingValueOrEveryAnswer() {
        Finding sentinels = Finding.dataQuality("hours", FindingKind.INTERVIEWER_OUTLIER, 1000L, 1000L, "I1 keys 999",
                new InterviewerFlag("interviewer_id", "I1", "hours", "share of 999", "z", 100, 0.03, 0.03, 0.5, 0.5,
                        List.of("999"), 20));
        Finding all = Finding.dataQuality("hours", FindingKind.INTERVIEWER_OUTLIER, 1000L, 1000L, "I1's mean",
                new InterviewerFlag("interviewer_id", "I1", "hours", "mean", "t", 100, 30, 30, 0.5, 0.5, List.of(),
                        20));
        Finding refusedOrNull = Finding.dataQuality("hours", FindingKind.INTERVIEWER_OUTLIER, 1000L, 1000L, "I2",
                new InterviewerFlag("interviewer_id", "I2", "hours", "missing share", "z", 100, 0.1, 0.04, 0.5, 0.5,
                        List.of("-9", DomainMeasure.NULL), 20));
        List<CaseSelection.Selection> selections = List.of(sentinels, all, refusedOrNull).stream()
                .map(f -> CaseSelection.of(f, null).orElseThrow()).toList();
        WaveSource source = WaveSource.of(config.dataset("hh"), "dataset");
        List<CaseSource.Gathered> got = session.source().withHandle(h -> CaseSource.read(h, source, "w2",
                "respondent_id", selections, 1_000));
        assertEquals(List.of("R0971", "R0981", "R0991"), got.get(0).rows().stream()
                .map(CaseLists.CaseRow::respondentKey).toList());
        assertEquals(100, got.get(1).total(), "every interview of I1 with an answer to hours");
        assertEquals(List.of("R0902", "R0912", "R0922", "R0932"), got.get(2).rows().stream()
                .map(CaseLists.CaseRow::respondentKey).toList());

        CaseLists.CaseList asStored = new CaseLists.CaseList(7, 1, "hours", "INTERVIEWER_OUTLIER",
                selections.get(0).description(), got.get(0).total(), got.get(0).rows(), "interviewer_id", "I1", 0);
        assertEquals("respondent_key,hours,interviewer_id\r\nR0971,999,I1\r\nR0981,999,I1\r\nR0991,999,I1\r\n",
                CaseListCsv.render(asStored));
        assertEquals("cases/7-hours-I1.csv", asStored.fileName());
    }

    HttpResponse<String> get(String pathQuery, String person) throws Exception {
        HttpRequest.Builder r = HttpRequest.newBuilder(URI.create(base + pathQuery)).GET();
        if (person != null) {
            r.header(PROXY_HEADER, person);
        }
        return HttpClient.newBuilder().followRedirects(HttpClient.Redirect.NEVER).build().send(r.build(),
                HttpResponse.BodyHandlers.ofString());
    }

    @Test
    @Order(7)
    void theConsoleLinksTheListAndServesItAsTheFileTheRunWrote() throws Exception {
        CaseLists.CaseList refused = list(session.store().caseLists().forRun(hh.wave().runId()), "hours",
                "MISSING_CODE");
        HttpResponse<String> page = get("/console/finding?id=" + refused.findingId(), "Ada Quillfield");
        assertEquals(200, page.statusCode(), page.body());
        assertTrue(page.body().contains("href=\"/console/cases?finding=" + refused.findingId() + "\">40 cases (CSV)"),
                page.body());

        HttpResponse<String> csv = get("/console/cases?finding=" + refused.findingId(), "Ada Quillfield");
        assertEquals(200, csv.statusCode(), csv.body());
        assertTrue(csv.headers().firstValue("Content-Type").orElse("").startsWith("text/csv"));
        assertEquals("attachment; filename=\"" + refused.fileName().substring("cases/".length()) + "\"",
                csv.headers().firstValue("Content-Disposition").orElse(null));
        assertEquals("DENY", csv.headers().firstValue("X-Frame-Options").orElse(null));
        assertTrue(csv.headers().firstValue("Content-Security-Policy").isPresent());
        assertEquals(Files.readString(hh.out().resolve(refused.fileName())), csv.body());

        long withoutList = session.store().jdbi().withHandle(h -> h.createQuery("SELECT min(finding_id) FROM"
                + " cs_results.finding WHERE finding_id NOT IN (SELECT finding_id FROM cs_results.case_list)")
                .mapTo(Long.class).one());
        assertEquals(404, get("/console/cases?finding=" + withoutList, "Ada Quillfield").statusCode());
        HttpResponse<String> anonymous = get("/console/cases?finding=" + refused.findingId(), null);
        assertEquals(303, anonymous.statusCode());
        assertTrue(anonymous.headers().firstValue("Location").orElse("").startsWith("/console/login"));
    }

    @Test
    @Order(8)
    void theSameDataJudgedAgainKeepsTheRunWithItsListsAndReadsNoCases() {
        List<CaseLists.CaseList> before = session.store().caseLists().forRun(hh.wave().runId());
        Judged again = judge(config.dataset("hh"), "w2");
        assertEquals(hh.wave().runId(), again.wave().runId(), "the same run, kept");
        assertEquals(0, again.caseReads().tableQueries(), again.caseReads().toString());
        assertEquals(before, session.store().caseLists().forRun(again.wave().runId()));
    }
}
