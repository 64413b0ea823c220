package org.wavewarden.bench;

import org.eclipse.jetty.server.Server;
import org.eclipse.jetty.server.ServerConnector;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.ConsoleApp;
import org.wavewarden.daemon.Router;
import org.wavewarden.db.EmbeddedServer;
import org.wavewarden.store.ConsoleReads;
import org.wavewarden.store.ResultsSchema;

import java.io.PrintWriter;
import java.net.CookieManager;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.time.Clock;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.function.IntSupplier;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * How long the console's pages take on a long history: generates {@link ConsoleHistory} into a fresh results schema
 * on an embedded server, then times each page kind many times, reporting median, 95th percentile and maximum, the
 * statements each page sent, and the ratio of the median to a floor measured in the same run.
 *
 * <p>Two ways of asking: the reads alone ({@link ConsoleReads} through Jdbi, the floor a {@code SELECT 1}), always;
 * and the pages over HTTP (the real console on Jetty on a loopback port, logged in, the floor a route answering a
 * constant through the same router), when a configuration with a console login is given. Only time is measured, never
 * asserted: the figures are for a reader to compare with the goal of a page under 300 ms.
 */
public final class ConsoleBench {

    /**
     * @param config   a configuration whose console lets {@code user} log in (its results schema receives the
     *                 history), or null for the reads alone
     * @param password the user's password, or null
     */
    public record Options(ConsoleHistory.Size size, int requests, WardenConfig config, String user, String password) {
        public Options {
            if (requests < 1) {
                throw new IllegalArgumentException("--requests must be at least 1, not " + requests);
            }
        }
    }

    /** One page kind's figures. */
    public record Row(String page, double medianMs, double p95Ms, double maxMs, double statements, double ratio) {
    }

    /** Everything measured. */
    public record Report(ConsoleHistory.Written history, String via, double floorMedianMs, List<Row> rows,
                         int cores, long maxHeap) {

        public void print(PrintWriter out) {
            out.printf(Locale.ROOT, "%s: floor median %.2f ms; %d cores, max heap %d MiB%n", via, floorMedianMs, cores,
                    maxHeap / (1024 * 1024));
            out.printf(Locale.ROOT, "%-14s %10s %10s %10s %12s %10s%n", "page", "median ms", "p95 ms", "max ms",
                    "statements", "x floor");
            for (Row r : rows) {
                out.printf(Locale.ROOT, "%-14s %10.2f %10.2f %10.2f %12.1f %10.1f%n", r.page(), r.medianMs(),
                        r.p95Ms(), r.maxMs(), r.statements(), r.ratio());
            }
            out.flush();
        }
    }

    private static final String SCHEMA = "wavewarden_console_bench";

    private ConsoleBench() {
    }

    public static List<Report> run(Options o, PrintWriter log) {
        String schema = o.config() == null ? SCHEMA : o.config().results().schema();
        try (EmbeddedServer server = EmbeddedServer.start()) {
            String url = server.jdbcUrl();
            try (Connection c = DriverManager.getConnection(url); var st = c.createStatement()) {
                st.execute("DROP SCHEMA IF EXISTS " + org.wavewarden.config.Identifiers.quote(schema) + " CASCADE");
            }
            org.postgresql.ds.PGSimpleDataSource ds = new org.postgresql.ds.PGSimpleDataSource();
            ds.setURL(url);
            ResultsSchema.migrate(ds, schema);
            // Pooled as the daemon's connections are: a page pays for its statements, not for a new connection.
            com.zaxxer.hikari.HikariConfig pool = new com.zaxxer.hikari.HikariConfig();
            pool.setDataSource(ds);
            pool.setMaximumPoolSize(4);
            pool.setPoolName("console-bench");
            try (com.zaxxer.hikari.HikariDataSource pooled = new com.zaxxer.hikari.HikariDataSource(pool)) {
                return measureAll(o, log, schema, ds, Jdbi.create(pooled));
            }
        } catch (SQLException e) {
            throw new IllegalStateException("console bench database step failed: " + e.getMessage(), e);
        }
    }

    private static List<Report> measureAll(Options o, PrintWriter log, String schema,
                                           org.postgresql.ds.PGSimpleDataSource ds, Jdbi jdbi) {
        {
            log.printf(Locale.ROOT, "writing %d datasets x %d waves x %d variables of findings%n",
                    o.size().datasets(), o.size().waves(), o.size().variables());
            log.flush();
            ConsoleHistory.Written w = ConsoleHistory.write(jdbi, schema, o.size());
            log.printf(Locale.ROOT, "written in %.1f s: %,d runs, %,d findings, %,d alerts, %,d actions, %,d sign-offs%n",
                    w.millis() / 1000.0, w.runs(), w.findings(), w.alerts(), w.actions(), w.signOffs());
            StatementCounter counter = new StatementCounter("\"" + schema + "\".\"finding\"");
            jdbi.setSqlLogger(counter);
            IntSupplier statements = () -> counter.snapshot().total();
            Samples pick = Samples.of(jdbi, schema, o.size());
            List<Report> reports = new ArrayList<>();
            Report reads = reads(w, jdbi, schema, o, pick, statements);
            reads.print(log);
            reports.add(reads);
            Report http = http(w, jdbi, withLogin(o, schema), pick, statements, log);
            if (http != null) {
                http.print(log);
                reports.add(http);
            }
            return reports;
        }
    }

    /** What the pages are asked about: drawn once, the same for both ways of asking. */
    record Samples(List<String> datasets, List<Long> findings, List<String> waves, List<String> searches) {
        static Samples of(Jdbi jdbi, String schema, ConsoleHistory.Size size) {
            Random random = new Random(20240101L);
            List<String> datasets = new ArrayList<>();
            List<String> waves = new ArrayList<>();
            List<String> searches = new ArrayList<>();
            for (int i = 0; i < 64; i++) {
                datasets.add(ConsoleHistory.dataset(1 + random.nextInt(size.datasets())));
                waves.add(ConsoleHistory.wave(1 + random.nextInt(size.waves())));
                searches.add(ConsoleHistory.variable(1 + random.nextInt(size.variables())).substring(0, 3));
            }
            List<Long> findings = jdbi.withHandle(h -> h.createQuery("SELECT finding_id FROM "
                    + org.wavewarden.config.Identifiers.quote(schema) + ".finding TABLESAMPLE SYSTEM (1) LIMIT 64")
                    .mapTo(Long.class).list());
            return new Samples(datasets, findings.isEmpty() ? List.of(1L) : findings, waves, searches);
        }
    }

    /** A page kind: what to ask for its i-th request. */
    private interface Page {
        void request(int i) throws Exception;
    }

    private static Report reads(ConsoleHistory.Written w, Jdbi jdbi, String schema, Options o, Samples s,
                                IntSupplier statements) {
        ConsoleReads reads = new ConsoleReads(jdbi, schema, Clock.systemUTC());
        Comparator<String> order = Comparator.naturalOrder();
        Map<String, Page> pages = new LinkedHashMap<>();
        pages.put("overview", i -> reads.datasets());
        pages.put("grid", i -> reads.grid(pick(s.datasets(), i), ConsoleReads.GridFilter.ANY, order));
        pages.put("grid filtered", i -> reads.grid(pick(s.datasets(), i),
                new ConsoleReads.GridFilter("SHIFT", "MATERIAL"), order));
        pages.put("finding", i -> reads.finding(pick(s.findings(), i), order));
        pages.put("wave", i -> reads.wave(pick(s.datasets(), i), pick(s.waves(), i)));
        pages.put("search", i -> reads.search(pick(s.searches(), i), 50));
        return measure(w, "reads (ConsoleReads)",
                i -> jdbi.withHandle(h -> h.createQuery("SELECT 1").mapTo(Integer.class).one()),
                pages, o.requests(), statements);
    }

    /** The bench's own reader, when no configuration names one. */
    static final String BENCH_READER = "Bench Reader";

    /**
     * The options with a console login the bench can use over plain HTTP on loopback: the configuration's when one
     * is given, else a viewer of the bench's own with a random password hashed as a configured one is. The session
     * cookie goes without its Secure flag here only: an HTTP client keeps Secure cookies for HTTPS.
     */
    static Options withLogin(Options o, String schema) {
        WardenConfig base = o.config();
        String user = o.user();
        String password = o.password();
        ConsoleConfig console;
        if (base == null) {
            byte[] random = new byte[18];
            new java.security.SecureRandom().nextBytes(random);
            password = java.util.Base64.getUrlEncoder().withoutPadding().encodeToString(random);
            user = BENCH_READER;
            console = new ConsoleConfig(true, List.of(new ConsoleConfig.User(user, org.wavewarden.review.Role.VIEWER,
                    org.wavewarden.console.auth.PasswordHashes.encode(password.toCharArray()))), null,
                    ConsoleConfig.DISABLED.sessionLength(), ConsoleConfig.DISABLED.idleTimeout(), false,
                    ConsoleConfig.DISABLED.loginFailures(), ConsoleConfig.DISABLED.lockout());
            base = new WardenConfig(null, new WardenConfig.ResultsConfig(null, schema), 0.05,
                    WardenConfig.FdrMethod.BENJAMINI_HOCHBERG, List.of(), null, console);
        } else {
            ConsoleConfig c = base.console();
            console = new ConsoleConfig(true, c.users(), c.proxy(), c.sessionLength(), c.idleTimeout(), false,
                    c.loginFailures(), c.lockout());
            base = new WardenConfig(base.source(), base.results(), base.alpha(), base.fdr(), base.datasets(),
                    base.daemon(), console);
        }
        return new Options(o.size(), o.requests(), base, user, password);
    }

    private static Report http(ConsoleHistory.Written w, Jdbi jdbi, Options o, Samples s, IntSupplier statements,
                               PrintWriter log) {
        Router router = new Router();
        router.get("/console-bench/floor", req -> Router.Reply.text(200, "ok"));
        new ConsoleApp(o.config(), jdbi, Clock.systemUTC(), null).install(router);
        Server jetty = new Server();
        ServerConnector connector = new ServerConnector(jetty);
        connector.setHost("127.0.0.1");
        connector.setPort(0);
        jetty.addConnector(connector);
        jetty.setHandler(router);
        try {
            jetty.start();
            String base = "http://127.0.0.1:" + connector.getLocalPort();
            HttpClient client = HttpClient.newBuilder().cookieHandler(new CookieManager())
                    .followRedirects(HttpClient.Redirect.NEVER).build();
            login(client, base, o.user(), o.password());
            Map<String, Page> pages = new LinkedHashMap<>();
            pages.put("overview", i -> get(client, base + "/console"));
            pages.put("grid", i -> get(client, base + "/console/dataset?name=" + q(pick(s.datasets(), i))));
            pages.put("grid filtered", i -> get(client, base + "/console/dataset?name=" + q(pick(s.datasets(), i))
                    + "&kind=SHIFT&verdict=MATERIAL"));
            pages.put("finding", i -> get(client, base + "/console/finding?id=" + pick(s.findings(), i)));
            pages.put("wave", i -> get(client, base + "/console/wave?dataset=" + q(pick(s.datasets(), i)) + "&wave="
                    + q(pick(s.waves(), i))));
            pages.put("search", i -> get(client, base + "/console/search?q=" + q(pick(s.searches(), i))));
            return measure(w, "pages over HTTP (Jetty, " + base + ")",
                    i -> get(client, base + "/console-bench/floor"), pages, o.requests(), statements);
        } catch (Exception e) {
            throw new IllegalStateException("console bench over HTTP failed: " + e.getMessage(), e);
        } finally {
            try {
                jetty.stop();
            } catch (Exception e) {
                log.println("the bench's web server did not stop cleanly: " + e.getMessage());
            }
        }
    }

    private static final Pattern CSRF = Pattern.compile("name=\"csrf\"[^>]*value=\"([^\"]*)\"|value=\"([^\"]*)\"[^>]*name=\"csrf\"");

    private static void login(HttpClient client, String base, String user, String password) throws Exception {
        String form = get(client, base + "/console/login");
        Matcher m = CSRF.matcher(form);
        String csrf = m.find() ? (m.group(1) != null ? m.group(1) : m.group(2)) : "";
        HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create(base + "/console/login"))
                .header("Content-Type", "application/x-www-form-urlencoded")
                .POST(HttpRequest.BodyPublishers.ofString("name=" + q(user) + "&password=" + q(password) + "&csrf="
                        + q(csrf) + "&next=" + q("/console")))
                .build(), HttpResponse.BodyHandlers.ofString());
        if (r.statusCode() != 303 || r.headers().firstValue("Location").orElse("").contains("/console/login")) {
            throw new IllegalStateException("the bench could not log in as " + user + " (status " + r.statusCode()
                    + ")");
        }
    }

    private static String get(HttpClient client, String url) throws Exception {
        HttpResponse<String> r = client.send(HttpRequest.newBuilder(URI.create(url)).GET().build(),
                HttpResponse.BodyHandlers.ofString());
        if (r.statusCode() != 200) {
            throw new IllegalStateException("GET " + url + " answered " + r.statusCode());
        }
        return r.body();
    }

    private static String q(String s) {
        return org.wavewarden.console.page.Pages.q(s);
    }

    private static <T> T pick(List<T> list, int i) {
        return list.get(i % list.size());
    }

    private static Report measure(ConsoleHistory.Written w, String via, Page floor, Map<String, Page> pages,
                                  int requests, IntSupplier statements) {
        try {
            // A first pass warms the JIT, the connection and PostgreSQL's caches; only the second is reported.
            for (int pass = 0; pass < 2; pass++) {
                boolean report = pass == 1;
                int n = report ? requests : Math.max(5, requests / 5);
                double[] floorMs = time(floor, n, statements, null);
                List<Row> rows = new ArrayList<>();
                double floorMedian = percentile(floorMs, 50);
                for (var e : pages.entrySet()) {
                    double[] perPage = new double[1];
                    double[] ms = time(e.getValue(), n, statements, perPage);
                    double median = percentile(ms, 50);
                    rows.add(new Row(e.getKey(), median, percentile(ms, 95), percentile(ms, 100), perPage[0],
                            median / floorMedian));
                }
                if (report) {
                    return new Report(w, via, floorMedian, rows, Runtime.getRuntime().availableProcessors(),
                            Runtime.getRuntime().maxMemory());
                }
            }
            throw new IllegalStateException("unreachable");
        } catch (Exception e) {
            throw new IllegalStateException("console bench step failed: " + e.getMessage(), e);
        }
    }

    private static double[] time(Page page, int n, IntSupplier statements, double[] statementsPerRequest)
            throws Exception {
        double[] ms = new double[n];
        int before = statements.getAsInt();
        for (int i = 0; i < n; i++) {
            long t0 = System.nanoTime();
            page.request(i);
            ms[i] = (System.nanoTime() - t0) / 1e6;
        }
        if (statementsPerRequest != null) {
            statementsPerRequest[0] = (statements.getAsInt() - before) / (double) n;
        }
        return ms;
    }

    /** Nearest-rank percentile (p in 0..100) of the samples. */
    static double percentile(double[] samples, double p) {
        double[] sorted = samples.clone();
        Arrays.sort(sorted);
        int rank = (int) Math.ceil(p / 100.0 * sorted.length);
        return sorted[Math.max(0, Math.min(sorted.length - 1, rank - 1))];
    }
}
