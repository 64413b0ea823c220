package org.wavewarden.bench;

import org.postgresql.PGConnection;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.EmbeddedServer;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.BinaryWaveScanner;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;

import java.io.OutputStream;
import java.io.PrintWriter;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;

/**
 * Measures what a {@code check} costs against what reading the judged wave must cost at least.
 *
 * <p>It generates a {@link SyntheticSurvey} with two waves, and a second table where the same two waves follow
 * a history of earlier waves whose summaries are stored in the results schema, runs ANALYZE, then repeats, in
 * alternating order: (a1) one sequential scan counting every variable of the judged wave, (a2) a binary COPY of
 * the same columns read and discarded, (b) a full check of the newer wave through {@link WaveJudge} (listing,
 * catalog, scan, stored baseline, every comparison, the results write) with the text and the binary scanner, and
 * (c) the same check on the table with the history. A check's source statements are counted on the session's
 * source Jdbi and in the scanner. Timings are wall-clock medians; the ratios b/a1 and b/a2 say how far a check is
 * from the floor the database sets.
 *
 * <p>With breakdowns, the judged table also has generated breakdown columns (district of 6, interview mode of 3,
 * interviewer of 300), excluded from the checks above, and (d) the scan of the judged wave is measured once more
 * with the first {@code breakdowns} of them tallied by domain in the same pass, beside the plain scan; (e) is the
 * whole check (b) of the same wave with those breakdowns configured.
 */
public final class Bench {

    static final String SCHEMA = "wavewarden_bench";
    static final String RESULTS_SCHEMA = "wavewarden_bench_results";
    static final String TWO = "survey";
    static final String HISTORY = "survey_history";

    /**
     * The generated breakdown columns of the judged table and how each row's domain derives from its respondent id:
     * 6 districts, 3 interview modes, 300 interviewers (a large field force, so the per-domain tallies are many).
     */
    static final List<String> BREAKDOWN_COLUMNS = List.of("district", "interview_mode", "interviewer");
    private static final List<String> BREAKDOWN_EXPRESSIONS = List.of(
            "(ARRAY['GUL', 'SAL', 'BRN', 'TID', 'MOR', 'KES'])[1 + (respondent_id * 7 % 6)::int]",
            "(ARRAY['web', 'telephone', 'in_person'])[1 + (respondent_id * 13 % 3)::int]",
            "'iv' || lpad((respondent_id * 7919 % 300)::text, 3, '0')");

    private Bench() {
    }

    /**
     * @param jdbcUrl      server to use, or null for an embedded server started for the run
     * @param user         login role for {@code jdbcUrl}
     * @param passwordEnv  environment variable holding the password for {@code jdbcUrl}; may be null
     * @param rows         rows in each of the two judged waves
     * @param vars         variables (columns besides wave and respondent id)
     * @param repeat       measured repetitions of every figure
     * @param historyWaves earlier waves before the two in the history table
     * @param historyRows  rows in each earlier wave of the history table
     * @param breakdowns   breakdown columns tallied by domain in the breakdown case, 0 to 3 (0: no such case)
     */
    public record Options(String jdbcUrl, String user, String passwordEnv, long rows, int vars, int repeat,
                          int historyWaves, long historyRows, int breakdowns) {

        /** Options without the breakdown case. */
        public Options(String jdbcUrl, String user, String passwordEnv, long rows, int vars, int repeat,
                       int historyWaves, long historyRows) {
            this(jdbcUrl, user, passwordEnv, rows, vars, repeat, historyWaves, historyRows, 0);
        }

        public Options {
            if (breakdowns < 0 || breakdowns > BREAKDOWN_COLUMNS.size()) {
                throw new IllegalArgumentException("breakdowns must be in 0.." + BREAKDOWN_COLUMNS.size() + ", was "
                        + breakdowns);
            }
            if (rows < 10) {
                throw new IllegalArgumentException("rows must be at least 10, was " + rows);
            }
            if (vars < 1 || vars > 1000) {
                throw new IllegalArgumentException("vars must be in 1..1000, was " + vars);
            }
            if (repeat < 1) {
                throw new IllegalArgumentException("repeat must be at least 1, was " + repeat);
            }
            if (historyWaves < 0) {
                throw new IllegalArgumentException("historyWaves must not be negative, was " + historyWaves);
            }
            if (historyRows < 10) {
                throw new IllegalArgumentException("historyRows must be at least 10, was " + historyRows);
            }
            if (jdbcUrl != null && (user == null || user.isBlank())) {
                throw new IllegalArgumentException("user must be given with jdbcUrl");
            }
        }
    }

    /** The two waves of a generated table and the dataset judging it. */
    record Target(String table, DatasetConfig dataset, String judgedWave, StatementCounter counter) {
    }

    public static BenchReport run(Options o, PrintWriter log) {
        EmbeddedServer server = o.jdbcUrl() == null ? EmbeddedServer.start() : null;
        try {
            String url = server != null ? server.jdbcUrl() : o.jdbcUrl();
            String password = o.passwordEnv() == null ? null : System.getenv(o.passwordEnv());
            try (Connection raw = server != null ? DriverManager.getConnection(url)
                    : DriverManager.getConnection(url, o.user(), password)) {
                return run(o, server, raw, log);
            }
        } catch (SQLException e) {
            throw new IllegalStateException("bench database step failed: " + e.getMessage(), e);
        } finally {
            if (server != null) {
                server.close();
            }
        }
    }

    private static BenchReport run(Options o, EmbeddedServer server, Connection raw, PrintWriter log)
            throws SQLException {
        long g0 = System.nanoTime();
        log.printf(Locale.ROOT, "generating %,d rows x %d variables per wave, and %d earlier waves of %,d rows%n",
                o.rows(), o.vars(), o.historyWaves(), o.historyRows());
        generate(raw, o);
        double generateSeconds = (System.nanoTime() - g0) / 1e9;
        log.printf(Locale.ROOT, "generated and analysed in %.1f s%n", generateSeconds);
        try (Statement st = raw.createStatement()) {
            st.execute("DROP SCHEMA IF EXISTS " + Identifiers.quote(RESULTS_SCHEMA) + " CASCADE");
        }
        WardenConfig config = ConfigLoader.parse(configYaml(o, server != null));
        String h1 = Integer.toString(o.historyWaves() + 1);
        String h2 = Integer.toString(o.historyWaves() + 2);
        try (Session s = Session.open(config, server, System.getenv())) {
            s.migrate();
            Target two = new Target(TWO, config.dataset("bench-two"), "2", new StatementCounter(quoted(TWO)));
            Target hist = new Target(HISTORY, config.dataset("bench-history"), h2,
                    new StatementCounter(quoted(HISTORY)));
            WaveJudge.Scanner scanner = new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan;

            // The whole check of the same wave with breakdowns on: its own dataset name, so its stored summaries
            // (whose key covers the domains) stand beside the plain check's and both checks read one wave each.
            Target byDomains = o.breakdowns() == 0 ? null : new Target(TWO,
                    withBreakdowns(rename(two.dataset(), "bench-two-breakdowns"), o.breakdowns()), "2",
                    new StatementCounter(quoted(TWO)));
            log.println("warming up: the first checks store the baseline summaries");
            seedHistory(s, hist.dataset(), o.historyWaves());
            for (Target t : byDomains == null ? List.of(two, hist) : List.of(two, hist, byDomains)) {
                check(s, t, scanner);
            }
            List<String> columns = SyntheticSurvey.columnNames(o.vars());
            Map<String, List<Sample>> samples = new LinkedHashMap<>();
            Map<String, StatementCounter.SourceStatements> statements = new LinkedHashMap<>();
            for (int r = 0; r < o.repeat(); r++) {
                log.printf(Locale.ROOT, "repetition %d of %d%n", r + 1, o.repeat());
                add(samples, "a1_count_scan", measure(() -> countScan(raw, columns, "2")));
                add(samples, "a2_binary_copy", measure(() -> binaryCopy(raw, columns, "2")));
                add(samples, "listing_two_waves", measure(() -> s.source().withHandle(h ->
                        org.wavewarden.read.WaveListing.list(h, WaveSource.of(two.dataset(), "dataset"),
                                two.dataset().waveOrder()))));
                // The scanner alone on the judged wave: what the read stage costs inside a check.
                add(samples, "scan_only", measure(() -> s.source().withHandle(h -> WaveJudge.readProfile(h,
                        two.dataset(), WaveSource.of(two.dataset(), "dataset"), "2", scanner, null))));
                if (o.breakdowns() > 0) {
                    // The same scan with the domains of the breakdown columns tallied in the same pass.
                    DatasetConfig byDomain = withBreakdowns(two.dataset(), o.breakdowns());
                    WaveProfile[] read = new WaveProfile[1];
                    add(samples, "d_scan_breakdowns", measure(() -> read[0] = s.source().withHandle(h ->
                            WaveJudge.readProfile(h, byDomain, WaveSource.of(byDomain, "dataset"), "2", scanner,
                                    null))));
                    // The summary's checksum covers every domain tally: equal checksums of two builds over the same
                    // generated data show that a change to the scan left its results as they were.
                    log.printf(Locale.ROOT, "summary with breakdowns: checksum %s%n", read[0].checksum());
                    read[0] = null;
                }
                List<Target> order = new ArrayList<>(r % 2 == 0 ? List.of(two, hist) : List.of(hist, two));
                if (byDomains != null) {
                    order.add(r % 2, byDomains);
                }
                for (Target t : order) {
                    String key = t == two ? "b_check" : t == hist ? "c_check_history" : "e_check_breakdowns";
                    add(samples, key, measure(() -> check(s, t, scanner)));
                    statements.put(key, t.counter().snapshot());
                }
            }
            List<BenchReport.Measurement> ms = new ArrayList<>();
            samples.forEach((k, v) -> ms.add(BenchReport.Measurement.of(k, v.stream().map(Sample::seconds).toList(),
                    v.stream().mapToLong(x -> x.heap().peakUsedSampled()).max().orElse(0),
                    v.stream().mapToLong(x -> x.heap().peakLiveAfterGc()).max().orElse(0))));
            String version = s.source().withHandle(h -> h.createQuery("SHOW server_version").mapTo(String.class).one());
            BenchReport report = new BenchReport(Instant.now(), new BenchReport.Setup(o.rows(), o.vars(), o.repeat(),
                    o.historyWaves(), o.historyRows(), server != null ? "embedded" : "external", version,
                    System.getProperty("java.version"), Runtime.getRuntime().availableProcessors(),
                    Runtime.getRuntime().maxMemory(), generateSeconds), ms, BenchReport.Ratios.of(ms), statements);
            BenchReport.print(report, log);
            return report;
        }
    }

    private static String quoted(String table) {
        return Identifiers.quote(SCHEMA) + "." + Identifiers.quote(table);
    }

    static void generate(Connection raw, Options o) throws SQLException {
        SyntheticSurvey.createTable(raw, SCHEMA, TWO, o.vars());
        SyntheticSurvey.insertWave(raw, SCHEMA, TWO, o.vars(), "1", o.rows(), 0, 0.11);
        SyntheticSurvey.insertWave(raw, SCHEMA, TWO, o.vars(), "2", o.rows(), 1, 0.22);
        SyntheticSurvey.createTable(raw, SCHEMA, HISTORY, o.vars());
        for (int w = 1; w <= o.historyWaves(); w++) {
            SyntheticSurvey.insertWave(raw, SCHEMA, HISTORY, o.vars(), Integer.toString(w), o.historyRows(), 0,
                    w / 1000.0);
        }
        String cols = String.join(", ", SyntheticSurvey.columnNames(o.vars()));
        try (var ps = raw.prepareStatement("INSERT INTO " + quoted(HISTORY) + " SELECT ?, respondent_id, " + cols
                + " FROM " + quoted(TWO) + " WHERE wave = ?")) {
            for (int i = 1; i <= 2; i++) {
                ps.setString(1, Integer.toString(o.historyWaves() + i));
                ps.setString(2, Integer.toString(i));
                ps.executeUpdate();
            }
        }
        try (Statement st = raw.createStatement()) {
            if (o.breakdowns() > 0) {
                // Stored generated columns: the table is rewritten once, with no dead rows left for the scans.
                StringBuilder alter = new StringBuilder("ALTER TABLE " + quoted(TWO));
                for (int i = 0; i < BREAKDOWN_COLUMNS.size(); i++) {
                    alter.append(i == 0 ? " " : ", ").append("ADD COLUMN ")
                            .append(Identifiers.quote(BREAKDOWN_COLUMNS.get(i))).append(" text GENERATED ALWAYS AS (")
                            .append(BREAKDOWN_EXPRESSIONS.get(i)).append(") STORED");
                }
                st.execute(alter.toString());
            }
            st.execute("ANALYZE " + quoted(TWO));
            st.execute("ANALYZE " + quoted(HISTORY));
        }
    }

    static String configYaml(Options o, boolean embedded) {
        String source = embedded ? "  jdbcUrl: embedded\n  user: postgres\n"
                : "  jdbcUrl: " + yamlString(o.jdbcUrl()) + "\n  user: " + yamlString(o.user()) + "\n"
                + (o.passwordEnv() == null ? "" : "  passwordEnv: " + yamlString(o.passwordEnv()) + "\n");
        return "source:\n" + source
                + "results:\n  schema: " + RESULTS_SCHEMA + "\n"
                + "alpha: 0.05\n"
                + "datasets:\n"
                + "  - name: bench-two\n    table: " + SCHEMA + "." + TWO + "\n    waveColumn: wave\n"
                + "    exclude: [respondent_id" + (o.breakdowns() > 0 ? ", " + String.join(", ", BREAKDOWN_COLUMNS) : "")
                + "]\n"
                + "  - name: bench-history\n    table: " + SCHEMA + "." + HISTORY + "\n    waveColumn: wave\n"
                + "    exclude: [respondent_id]\n";
    }

    /** The dataset with its first {@code n} generated breakdown columns, at most 500 domains each (the default). */
    static DatasetConfig withBreakdowns(DatasetConfig d, int n) {
        org.wavewarden.config.Breakdowns b = new org.wavewarden.config.Breakdowns(BREAKDOWN_COLUMNS.subList(0, n),
                org.wavewarden.config.Breakdowns.DEFAULT_MAX_DOMAINS, null,
                org.wavewarden.config.Breakdowns.DEFAULT_MIN_INTERVIEWS, List.of(),
                org.wavewarden.config.Breakdowns.DEFAULT_ICC_THRESHOLD, org.wavewarden.config.Breakdowns.DEFAULT_MAX_CASES);
        return copy(d, d.name(), b);
    }

    private static DatasetConfig rename(DatasetConfig d, String name) {
        return copy(d, name, d.breakdowns());
    }

    /** The dataset under another name and with other breakdowns, everything else as configured. */
    private static DatasetConfig copy(DatasetConfig d, String name, org.wavewarden.config.Breakdowns b) {
        return new DatasetConfig(name, d.table(), d.waveColumn(), d.tablePattern(), d.waveOrder(), d.compareWith(),
                d.schedule(), d.exclude(), d.variables(), d.quietPeriod(), d.alerts(), d.readyTable(), d.readyColumn(),
                d.weightColumn(), d.respondentKey(), d.releases(), d.design(), d.relationships(), d.codebook(),
                d.population(), d.alertRules(), b);
    }

    /** A YAML double-quoted scalar (JSON strings are valid YAML). */
    private static String yamlString(String v) {
        return org.wavewarden.deliver.Json.write(v);
    }

    /**
     * Stores a summary for every earlier wave of a dataset without judging each: one earlier wave is read once and
     * its summary stored under every earlier label, as a long-running monitor would have stored them.
     */
    public static void seedHistory(Session s, DatasetConfig d, int earlierWaves) {
        if (earlierWaves < 1) {
            return;
        }
        WaveSource source = WaveSource.of(d, "dataset");
        WaveProfile first = s.source().withHandle(h -> WaveJudge.readProfile(h, d, source, "1",
                new BinaryWaveScanner(WaveScanner.DEFAULT_MAX_DISTINCT)::scan, null));
        for (int w = 1; w <= earlierWaves; w++) {
            WaveProfile p = new WaveProfile(Integer.toString(w), first.rows(), first.schema(), first.columns());
            s.store().saveSummary(d.name(), p, p.checksum());
        }
    }

    /** One full check of the target's newer wave, its source statements counted afresh. */
    static org.wavewarden.pipeline.JudgedWave check(Session s, Target t, WaveJudge.Scanner scanner) {
        t.counter().reset();
        s.source().setSqlLogger(t.counter());
        try {
            return new WaveJudge(s, Clock.systemUTC()).useScanner(t.counter().counting(scanner))
                    .judge(t.dataset(), t.judgedWave(), null, null, null);
        } finally {
            s.source().setSqlLogger(org.jdbi.v3.core.statement.SqlLogger.NOP_SQL_LOGGER);
        }
    }

    static long countScan(Connection c, List<String> columns, String wave) throws SQLException {
        StringBuilder sql = new StringBuilder("SELECT ");
        for (int i = 0; i < columns.size(); i++) {
            sql.append(i == 0 ? "" : ", ").append("count(").append(Identifiers.quote(columns.get(i))).append(')');
        }
        sql.append(" FROM ").append(quoted(TWO)).append(" WHERE wave = ?");
        try (var ps = c.prepareStatement(sql.toString())) {
            ps.setString(1, wave);
            try (var rs = ps.executeQuery()) {
                rs.next();
                return rs.getLong(1);
            }
        }
    }

    static long binaryCopy(Connection c, List<String> columns, String wave) throws SQLException {
        String cols = String.join(", ", columns.stream().map(Identifiers::quote).toList());
        String sql = "COPY (SELECT " + cols + " FROM " + quoted(TWO) + " WHERE wave = '"
                + org.postgresql.core.Utils.escapeLiteral(null, wave, true) + "') TO STDOUT (FORMAT binary)";
        long[] bytes = {0};
        OutputStream discard = new OutputStream() {
            @Override
            public void write(int b) {
                bytes[0]++;
            }

            @Override
            public void write(byte[] b, int off, int len) {
                bytes[0] += len;
            }
        };
        try {
            c.unwrap(PGConnection.class).getCopyAPI().copyOut(sql, discard);
        } catch (java.io.IOException e) {
            throw new IllegalStateException(e);
        }
        return bytes[0];
    }

    /** One timed run with its heap figures. */
    record Sample(double seconds, HeapWatch.Heap heap) {
    }

    interface Work {
        Object run() throws Exception;
    }

    static Sample measure(Work w) {
        System.gc();
        HeapWatch watch = HeapWatch.start();
        long t0 = System.nanoTime();
        try {
            Objects.requireNonNull(w.run());
            double seconds = (System.nanoTime() - t0) / 1e9;
            return new Sample(seconds, watch.stop());
        } catch (RuntimeException e) {
            throw e;
        } catch (Exception e) {
            throw new IllegalStateException(e);
        } finally {
            watch.close();
        }
    }

    private static void add(Map<String, List<Sample>> samples, String key, Sample s) {
        samples.computeIfAbsent(key, k -> new ArrayList<>()).add(s);
    }
}
