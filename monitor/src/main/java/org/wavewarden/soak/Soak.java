package org.wavewarden.soak;

import org.postgresql.Driver;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.JdbcUrl;
import org.wavewarden.db.EmbeddedServer;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.judge.FindingKind;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.OverlappingFileLockException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.security.SecureRandom;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Properties;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.Collectors;

/**
 * Runs the daemon for a while under injected faults, then audits what it did (see {@link SoakAudit}).
 *
 * <p>The daemon is driven as an operator drives it: a config file, {@code wavewarden run} in a child JVM, its
 * database reached through a loopback {@link TcpProxy} the soak cuts, its alerts going to a JSON Lines file and to a
 * signed webhook at the soak's own {@link WebhookReceiver}. A producer adds a wave every few seconds; a
 * {@link FaultInjector} injects one fault at a time. After the fault phase everything is restored, the daemon is
 * given a bounded time to catch up, stopped with SIGTERM, and the results schema and the receivers' evidence are
 * audited. Nothing here reaches into the daemon, so the soak holds whatever the daemon does inside.
 */
public final class Soak {

    static final String DATASET = "harrowmere-soak";
    static final String SECRET_ENV = "WAVEWARDEN_SOAK_WEBHOOK_SECRET";
    static final String SCHEDULE = "0/3 * * * * ?";
    static final String QUIET_PERIOD = "PT2S";
    static final int CLUSTER_CHECKIN_MILLIS = 2_000;
    static final Duration MIN_WAVE_GAP = Duration.ofSeconds(3);
    static final Duration MAX_WAVE_GAP = Duration.ofSeconds(7);
    static final Duration FIRST_RUN_WAIT = Duration.ofMinutes(3);
    static final Duration CATCH_UP_LIMIT = Duration.ofMinutes(6);
    /**
     * The catch-up ends early when every wave is judged and nothing has changed for this long: a minute longer than
     * the longest wait of a dead letter ({@link org.wavewarden.daemon.Deliveries#DEAD_LETTER_BACKOFF}), so an alert
     * dead-lettered in the last outage gets its next try before the audit calls it lost.
     */
    static final Duration CATCH_UP_STALL = org.wavewarden.daemon.Deliveries.DEAD_LETTER_BACKOFF.maxDelay()
            .plusMinutes(1);
    static final Duration STOP_GRACE = Duration.ofSeconds(60);

    /** The files a soak writes into its output folder. */
    static final String CONFIG_FILE = "soak-config.yaml";
    static final String DAEMON_LOG = "daemon.log";
    static final String ALERTS_FILE = "alerts.jsonl";
    static final String WEBHOOK_LOG = "webhook-requests.jsonl";
    static final String FAULT_LOG = "faults.jsonl";
    static final String SUMMARY_FILE = "soak-summary.json";
    static final String DIGEST_DIR = "digests";
    static final String LOCK_FILE = ".soak.lock";

    /**
     * @param minutes       length of the fault phase
     * @param seed          seeds the waves, the fault schedule and the producer's pace
     * @param out           the output folder; created when missing
     * @param jdbcUrl       a PostgreSQL server to use, or null for an embedded one started for the soak
     * @param user          login role with {@code jdbcUrl}
     * @param passwordEnv   environment variable holding the password with {@code jdbcUrl}; may be null
     * @param sourceSchema  schema of the source table the soak creates
     * @param resultsSchema the daemon's results schema
     * @param replace       drop the two schemas when they exist, instead of refusing to start
     */
    public record Options(double minutes, long seed, Path out, String jdbcUrl, String user, String passwordEnv,
                          String sourceSchema, String resultsSchema, boolean replace) {
        public Options {
            if (!(minutes > 0 && minutes <= 24 * 60)) {
                throw new ConfigException("--minutes", "expected more than 0 and at most 1440 but got " + minutes);
            }
            if (jdbcUrl != null && (user == null || user.isBlank())) {
                throw new ConfigException("--user", "required with --jdbc-url");
            }
            if (jdbcUrl == null && (user != null || passwordEnv != null)) {
                throw new ConfigException(user != null ? "--user" : "--password-env", "only with --jdbc-url");
            }
            if (jdbcUrl != null) {
                // The daemon is given this URL's parameters and refuses what its config may not carry; refused
                // here, nothing is created first, and no password is taken from the URL.
                JdbcUrl.check("--jdbc-url", jdbcUrl);
            }
            Identifiers.require("--source-schema", sourceSchema);
            Identifiers.require("--results-schema", resultsSchema);
            if (sourceSchema.equals(resultsSchema)) {
                throw new ConfigException("--results-schema", "expected a schema other than --source-schema");
            }
        }
    }

    private Soak() {
    }

    public static SoakReport run(Options o, PrintWriter out) throws Exception {
        Path dir = o.out().toAbsolutePath().normalize();
        Files.createDirectories(dir);
        // Two soaks in one folder would overwrite each other's config, and a restarted daemon would then talk to
        // the other soak's receiver.
        try (FileChannel lockFile = FileChannel.open(dir.resolve(LOCK_FILE), StandardOpenOption.CREATE,
                StandardOpenOption.WRITE);
             FileLock lock = tryLock(lockFile)) {
            if (lock == null) {
                throw new ConfigException("--out", "another soak is writing to " + dir);
            }
            return run(o, out, dir);
        }
    }

    /** The lock, or null when another soak holds it, in another process or in this one. */
    private static FileLock tryLock(FileChannel c) throws IOException {
        try {
            return c.tryLock();
        } catch (OverlappingFileLockException e) {
            return null;
        }
    }

    private static SoakReport run(Options o, PrintWriter out, Path dir) throws Exception {
        Map<String, String> files = files(dir);
        for (String f : List.of(DAEMON_LOG, ALERTS_FILE, WEBHOOK_LOG, FAULT_LOG, SUMMARY_FILE)) {
            Files.deleteIfExists(dir.resolve(f));
        }
        String password = o.passwordEnv() == null ? null : System.getenv(o.passwordEnv());
        if (o.passwordEnv() != null && password == null) {
            throw new ConfigException("--password-env", "environment variable " + o.passwordEnv() + " is not set");
        }
        try (EmbeddedServer server = o.jdbcUrl() == null ? EmbeddedServer.start() : null) {
            String url = server != null ? server.jdbcUrl() : o.jdbcUrl();
            // The embedded server listens on 127.0.0.1 only, while its URL says localhost, which may resolve to ::1.
            Target target = server != null ? Target.of(url).onLoopback() : Target.of(url);
            try (Connection main = connect(url, o, password);
                 Connection producerDb = connect(url, o, password);
                 Connection watchDb = connect(url, o, password);
                 TcpProxy proxy = TcpProxy.start(target.host(), target.port())) {
                prepareSchemas(main, o);
                WaveProducer producer = new WaveProducer(o.sourceSchema(), o.seed());
                producer.createTable(main);
                String secret = HexFormat.of().formatHex(new SecureRandom().generateSeed(32));
                try (WebhookReceiver receiver = WebhookReceiver.start(secret, dir.resolve(WEBHOOK_LOG))) {
                    Files.writeString(dir.resolve(CONFIG_FILE), configYaml(o, target.proxied(proxy.port()),
                            producer.table(), receiver.url(), dir), StandardCharsets.UTF_8);
                    try (DaemonProcess daemon = new DaemonProcess(dir.resolve(CONFIG_FILE), dir.resolve(DAEMON_LOG),
                            Map.of(SECRET_ENV, secret))) {
                        Thread hook = new Thread(daemon::destroyNow, "soak-stop-daemon");
                        Runtime.getRuntime().addShutdownHook(hook);
                        try {
                            return soak(o, out, dir, files, server != null, main, producerDb, watchDb, proxy,
                                    producer, receiver, daemon);
                        } finally {
                            Runtime.getRuntime().removeShutdownHook(hook);
                        }
                    }
                }
            }
        }
    }

    private static SoakReport soak(Options o, PrintWriter out, Path dir, Map<String, String> files, boolean embedded,
                                   Connection main, Connection producerDb, Connection watchDb, TcpProxy proxy,
                                   WaveProducer producer, WebhookReceiver receiver, DaemonProcess daemon)
            throws Exception {
        Instant started = Instant.now();
        out.printf(Locale.ROOT, "soak: %s minutes, seed %d; writing %s%n", o.minutes(), o.seed(), dir);
        out.flush();
        AtomicLong wavesAdded = new AtomicLong();
        log(out, producer.addWave(producerDb));
        wavesAdded.incrementAndGet();
        daemon.start();
        awaitFirstRun(o, main, daemon);
        out.println("soak: the daemon judged the first wave; faults begin");
        out.flush();

        Instant faultStart = Instant.now();
        Instant deadline = faultStart.plusMillis(Math.round(o.minutes() * 60_000));
        FaultInjector faults = new FaultInjector(o.seed(), proxy, receiver, daemon, watchDb, o.resultsSchema(),
                wavesAdded::get, dir.resolve(FAULT_LOG), out, faultStart);
        AtomicReference<Throwable> failure = new AtomicReference<>();
        Thread producing = thread("soak-producer", failure, () -> {
            SplittableRandom pace = new SplittableRandom(o.seed() ^ 0x5EEDL);
            while (sleepUntil(Instant.now().plusMillis(pace.nextLong(MIN_WAVE_GAP.toMillis(),
                    MAX_WAVE_GAP.toMillis() + 1)), deadline)) {
                log(out, producer.addWave(producerDb));
                wavesAdded.incrementAndGet();
            }
        });
        Thread injecting = thread("soak-faults", failure, () -> faults.run(deadline));
        producing.start();
        injecting.start();
        while (producing.isAlive() || injecting.isAlive()) {
            daemon.superviseOnce();
            if (failure.get() != null) {
                producing.interrupt();
                injecting.interrupt();
            }
            Thread.sleep(250);
        }
        if (failure.get() != null) {
            throw new IllegalStateException("the soak failed: " + failure.get(), failure.get());
        }

        out.println("soak: faults over; waiting for the daemon to catch up");
        out.flush();
        List<String> produced = producer.labels(main);
        Instant catchUpStart = Instant.now();
        boolean caughtUp = catchUp(o, main, dir, receiver, daemon, produced);
        double catchUpSeconds = Duration.between(catchUpStart, Instant.now()).toMillis() / 1000.0;
        int stopCode = daemon.stop(STOP_GRACE);
        out.println("soak: daemon stopped (exit code " + stopCode + "); auditing");

        Audit a = audit(o, main, dir, receiver, produced);
        int lost = a.sinks().stream().mapToInt(SoakAudit.Sink::lost).sum();
        int duplicated = a.sinks().stream().mapToInt(SoakAudit.Sink::duplicated).sum();
        int repeats = a.sinks().stream().mapToInt(SoakAudit.Sink::repeats).sum();
        int unexpected = a.sinks().stream().mapToInt(SoakAudit.Sink::unexpected).sum();
        boolean clean = a.waves().clean() && lost == 0 && duplicated == 0 && unexpected == 0;
        SoakReport report = new SoakReport(started, Instant.now(), o.minutes(), o.seed(),
                embedded ? "embedded" : "external", o.resultsSchema(), producer.table(), a.waves(), a.alerts(),
                a.sinks(), faults.counts(), faults.faults().size(), daemon.starts(), daemon.exits(), caughtUp, catchUpSeconds, lost, duplicated,
                repeats, unexpected, clean, files);
        Files.writeString(dir.resolve(SUMMARY_FILE), Json.mapper().writerWithDefaultPrettyPrinter()
                .writeValueAsString(report), StandardCharsets.UTF_8);
        report.print(out);
        files.forEach((what, path) -> out.printf(Locale.ROOT, "  wrote %-18s %s%n", what, path));
        out.flush();
        return report;
    }

    /** The audit at one moment. */
    private record Audit(SoakAudit.Waves waves, int alerts, List<SoakAudit.Sink> sinks) {
        boolean complete() {
            return waves.clean() && sinks.stream().allMatch(s -> s.lost() == 0);
        }

        /** Changes whenever the daemon makes progress of any kind the audit can see. */
        List<Integer> progress() {
            List<Integer> p = new ArrayList<>(List.of((int) waves.runs(), waves.judged(), alerts));
            sinks.forEach(s -> {
                p.add(s.accepted());
                p.add(s.repeats());
            });
            return p;
        }
    }

    private static Audit audit(Options o, Connection c, Path dir, WebhookReceiver receiver, List<String> produced)
            throws SQLException {
        List<SoakAudit.AlertRow> alerts = SoakAudit.alerts(c, o.resultsSchema(), DATASET);
        // Every finding kind is listed in the config's sink filters, so the filter lets every alert through; the
        // audit applies it all the same, so that a narrower filter in the config would be audited right.
        SinkFilter filter = SinkFilter.of(null, allKinds());
        return new Audit(SoakAudit.waves(produced, SoakAudit.runs(c, o.resultsSchema(), DATASET)), alerts.size(),
                List.of(SoakAudit.sink("jsonLines", alerts, filter, SoakAudit.fromJsonLines(dir.resolve(ALERTS_FILE))),
                        SoakAudit.sink("webhook", alerts, filter, SoakAudit.fromWebhook(receiver.requests()))));
    }

    /**
     * Gives the daemon time to judge every wave and deliver every alert: until that is done, or every wave is
     * judged and nothing has moved for {@link #CATCH_UP_STALL} (an alert that is not delivered by then is taken
     * as lost), or {@link #CATCH_UP_LIMIT}. Returns whether everything was done.
     */
    private static boolean catchUp(Options o, Connection c, Path dir, WebhookReceiver receiver, DaemonProcess daemon,
                                   List<String> produced) throws Exception {
        Instant limit = Instant.now().plus(CATCH_UP_LIMIT);
        List<Integer> last = null;
        Instant lastChange = Instant.now();
        while (Instant.now().isBefore(limit)) {
            daemon.superviseOnce();
            Audit a = audit(o, c, dir, receiver, produced);
            if (a.complete()) {
                return true;
            }
            if (!a.progress().equals(last)) {
                last = a.progress();
                lastChange = Instant.now();
            } else if (a.waves().notJudged().isEmpty()
                    && Duration.between(lastChange, Instant.now()).compareTo(CATCH_UP_STALL) >= 0) {
                return false;
            }
            Thread.sleep(1_000);
        }
        return false;
    }

    private static void awaitFirstRun(Options o, Connection c, DaemonProcess daemon) throws Exception {
        Instant end = Instant.now().plus(FIRST_RUN_WAIT);
        while (Instant.now().isBefore(end)) {
            daemon.superviseOnce();
            if (hasRun(c, o.resultsSchema())) {
                return;
            }
            Thread.sleep(500);
        }
        throw new IllegalStateException("the daemon judged no wave within " + FIRST_RUN_WAIT.toSeconds()
                + " s of its start; the end of its log:\n" + daemon.tail(40));
    }

    private static boolean hasRun(Connection c, String schema) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT to_regclass(?) IS NOT NULL")) {
            ps.setString(1, Identifiers.quote(schema) + ".run");
            try (ResultSet rs = ps.executeQuery()) {
                rs.next();
                if (!rs.getBoolean(1)) {
                    return false;
                }
            }
        }
        return !SoakAudit.runs(c, schema, DATASET).isEmpty();
    }

    /** Refuses to touch existing schemas unless told to replace them; drops them when told. */
    private static void prepareSchemas(Connection c, Options o) throws SQLException {
        for (String[] s : new String[][] {{"--source-schema", o.sourceSchema()},
                {"--results-schema", o.resultsSchema()}}) {
            boolean exists;
            try (PreparedStatement ps = c.prepareStatement("SELECT count(*) FROM pg_namespace WHERE nspname = ?")) {
                ps.setString(1, s[1]);
                try (ResultSet rs = ps.executeQuery()) {
                    rs.next();
                    exists = rs.getLong(1) > 0;
                }
            }
            if (exists && !o.replace()) {
                throw new ConfigException(s[0], "schema " + s[1] + " already exists; pass --replace to drop it and"
                        + " start afresh, or name another");
            }
            if (exists) {
                try (Statement st = c.createStatement()) {
                    st.execute("DROP SCHEMA " + Identifiers.quote(s[1]) + " CASCADE");
                }
            }
        }
    }

    static String configYaml(Options o, String proxiedUrl, String table, String webhookUrl, Path dir) {
        String kinds = allKinds().stream().collect(Collectors.joining(", ", "[", "]"));
        String password = o.passwordEnv() == null ? "" : "  passwordEnv: " + quote(o.passwordEnv()) + "\n";
        return "# Written by wavewarden soak: the daemon under test reaches the database through the soak's\n"
                + "# forwarder and sends its alerts to the soak's receiver.\n"
                + "source:\n"
                + "  jdbcUrl: " + quote(proxiedUrl) + "\n"
                + "  user: " + quote(o.jdbcUrl() == null ? "postgres" : o.user()) + "\n"
                + password
                + "results:\n"
                + "  schema: " + quote(o.resultsSchema()) + "\n"
                + "alpha: 0.05\n"
                + "datasets:\n"
                + "  - name: " + DATASET + "\n"
                + "    table: " + quote(table) + "\n"
                + "    waveColumn: wave\n"
                + "    waveOrder: natural\n"
                + "    compareWith: previous\n"
                + "    schedule: " + quote(SCHEDULE) + "\n"
                + "    quietPeriod: " + QUIET_PERIOD + "\n"
                + "    exclude: [respondent_id]\n"
                + WaveProducer.variablesYaml()
                + "    alerts:\n"
                + "      jsonLines:\n"
                + "        path: " + quote(dir.resolve(ALERTS_FILE).toString()) + "\n"
                + "        kinds: " + kinds + "\n"
                + "      webhook:\n"
                + "        url: " + quote(webhookUrl) + "\n"
                + "        secretEnv: " + SECRET_ENV + "\n"
                + "        kinds: " + kinds + "\n"
                + "daemon:\n"
                + "  httpBind: 127.0.0.1\n"
                + "  httpPort: 0\n"
                + "  outputDir: " + quote(dir.resolve(DIGEST_DIR).toString()) + "\n"
                + "  clusterCheckinMillis: " + CLUSTER_CHECKIN_MILLIS + "\n";
    }

    private static List<String> allKinds() {
        return Arrays.stream(FindingKind.values()).map(Enum::name).toList();
    }

    /** A YAML string: JSON's quoting is valid YAML. */
    private static String quote(String s) {
        return Json.write(s);
    }

    private static Map<String, String> files(Path dir) {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("config", dir.resolve(CONFIG_FILE).toString());
        m.put("daemon log", dir.resolve(DAEMON_LOG).toString());
        m.put("JSON Lines alerts", dir.resolve(ALERTS_FILE).toString());
        m.put("webhook requests", dir.resolve(WEBHOOK_LOG).toString());
        m.put("faults", dir.resolve(FAULT_LOG).toString());
        m.put("digests", dir.resolve(DIGEST_DIR).toString());
        m.put("summary", dir.resolve(SUMMARY_FILE).toString());
        m.put("lock", dir.resolve(LOCK_FILE).toString());
        return m;
    }

    /** Where the server is (a null host is loopback), and the daemon's URL to it through the forwarder. */
    record Target(String host, int port, String database, String query) {
        static Target of(String url) {
            Properties p = Driver.parseURL(url, new Properties());
            if (p == null) {
                throw new ConfigException("--jdbc-url", "expected jdbc:postgresql://host[:port]/database");
            }
            String host = p.getProperty("PGHOST", "localhost");
            String port = p.getProperty("PGPORT", "5432");
            if (host.contains(",")) {
                throw new ConfigException("--jdbc-url", "expected one host; the soak forwards to a single server");
            }
            int q = url.indexOf('?');
            return new Target(host, Integer.parseInt(port), p.getProperty("PGDBNAME", ""),
                    q < 0 ? "" : url.substring(q));
        }

        /**
         * The embedded server on 127.0.0.1, without its URL's parameters: they carry its login, which the daemon's
         * config takes from {@code user} (and refuses in the URL).
         */
        Target onLoopback() {
            return new Target(null, port, database, "");
        }

        /** The same database through the forwarder, with the URL's parameters (TLS settings, say). */
        String proxied(int proxyPort) {
            return "jdbc:postgresql://127.0.0.1:" + proxyPort + "/" + database + query;
        }
    }

    private static Connection connect(String url, Options o, String password) throws SQLException {
        Connection c = o.jdbcUrl() == null ? DriverManager.getConnection(url)
                : DriverManager.getConnection(url, o.user(), password);
        c.setAutoCommit(true);
        return c;
    }

    private static void log(PrintWriter out, WaveProducer.Wave w) {
        out.printf(Locale.ROOT, "soak: added wave %s (%d rows%s)%n", w.label(), w.rows(),
                w.plant() == WaveProducer.Plant.NONE ? "" : ", " + w.plant().name().toLowerCase(Locale.ROOT)
                        .replace('_', ' '));
        out.flush();
    }

    /** Sleeps until {@code wake} or the deadline, whichever is first; false when the deadline has passed. */
    private static boolean sleepUntil(Instant wake, Instant deadline) throws InterruptedException {
        Instant until = wake.isAfter(deadline) ? deadline : wake;
        long ms = Duration.between(Instant.now(), until).toMillis();
        if (ms > 0) {
            Thread.sleep(ms);
        }
        return Instant.now().isBefore(deadline);
    }

    @FunctionalInterface
    private interface Body {
        void run() throws Exception;
    }

    private static Thread thread(String name, AtomicReference<Throwable> failure, Body body) {
        Thread t = new Thread(() -> {
            try {
                body.run();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            } catch (Throwable e) {
                failure.compareAndSet(null, e);
            }
        }, name);
        t.setDaemon(true);
        return t;
    }
}
