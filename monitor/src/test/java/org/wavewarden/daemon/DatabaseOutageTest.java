package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.soak.TcpProxy;
import org.wavewarden.testing.TestDatabase;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.BooleanSupplier;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * The database goes away in the middle of the daemon's runs and comes back: both the source and the results
 * connections (and with the results connection, Quartz's job store) pass through a proxy that drops every
 * connection at once and turns new ones away for a while. At twenty seeded points in the runs, the daemon reports
 * itself degraded during the outage, and afterwards has judged every wave exactly once, holds no duplicate open
 * alert, still judges a wave added after the outage, and reports itself healthy again.
 *
 * <p>Outages in production last minutes; here they last one to three seconds, with retry delays scaled down to
 * match ({@link #RETRY}), so twenty of them fit in a few minutes. What matters is where in a run the connections
 * drop, not for how long, and the seeded start of each outage spreads the cuts over listing, reading, judging,
 * writing and Quartz's own bookkeeping.
 */
class DatabaseOutageTest {

    static final long SEED = 20260301L;
    static final int FAULT_POINTS = 20;
    /** Quick retries, so an outage of seconds is ridden out within one firing (30 attempts, delays up to 0.5 s). */
    static final Daemon.Retry RETRY = new Daemon.Retry(30, Duration.ofMillis(100), Duration.ofMillis(500));
    static final List<String> WAVES = List.of("w1", "w2", "w3");

    @TempDir
    Path dir;

    final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(1)).build();

    @Test
    void afterOutagesAtTwentySeededPointsEveryWaveIsJudgedOnceAndTheDaemonRecovers() throws Exception {
        String template = loadTemplate();
        SplittableRandom random = new SplittableRandom(SEED);
        List<String> problems = new ArrayList<>();
        int clean = 0;
        int insideFiring = 0;
        int judgedBeforeCut = 0;
        long started = System.nanoTime();
        try (TcpProxy proxy = TcpProxy.start(TestDatabase.server().port())) {
            for (int point = 1; point <= FAULT_POINTS; point++) {
                // Judging the three small waves takes a few hundred milliseconds at most, so a cut 0-1.5 s after
                // the start mostly falls between firings (on Quartz's bookkeeping); every other point therefore
                // cuts within the first 0.3 s of the first firing, while waves are read, judged and written.
                boolean duringFirstFiring = point % 2 == 0;
                long cutAfterMillis = duringFirstFiring ? random.nextLong(0, 300) : random.nextLong(0, 1500);
                long outageMillis = random.nextLong(1000, 3000);
                Outcome o = faultPoint(proxy, template, point, duringFirstFiring, cutAfterMillis, outageMillis);
                System.out.printf("fault point %2d: cut %4d ms after %s (%s, %d of 3 waves judged), down %4d ms,"
                                + " all waves judged %5d ms after restore; %s%n", point, cutAfterMillis,
                        duringFirstFiring ? "the first firing began" : "the start         ",
                        o.insideFiring() ? "inside a firing" : "between firings", o.judgedBeforeCut(), outageMillis,
                        o.recoveredMillis(), o.problems().isEmpty() ? "clean" : String.join("; ", o.problems()));
                if (o.problems().isEmpty()) {
                    clean++;
                } else {
                    problems.add("point " + point + ": " + String.join("; ", o.problems()));
                }
                insideFiring += o.insideFiring() ? 1 : 0;
                judgedBeforeCut += o.judgedBeforeCut();
            }
        }
        System.out.printf("database outage: %d of %d fault points ended clean (seed %d; outages of 1-3 s; %d cuts inside"
                        + " a firing, %d between firings; %d of %d waves judged before their cut; %.0f s in all)%n",
                clean, FAULT_POINTS, SEED, insideFiring, FAULT_POINTS - insideFiring, judgedBeforeCut,
                3 * FAULT_POINTS, (System.nanoTime() - started) / 1e9);
        assertEquals(FAULT_POINTS, clean, String.join("\n", problems));
    }

    record Outcome(boolean insideFiring, int judgedBeforeCut, long recoveredMillis, List<String> problems) {
    }

    /** Tracks whether a firing is in progress and when the first one began. */
    static final class FiringWatch implements Daemon.FiringListener {
        final CountDownLatch firstStarted = new CountDownLatch(1);
        final AtomicBoolean inProgress = new AtomicBoolean();

        @Override
        public void started(String dataset) {
            inProgress.set(true);
            firstStarted.countDown();
        }

        @Override
        public void finished(String dataset, boolean succeeded) {
            inProgress.set(false);
        }
    }

    Outcome faultPoint(TcpProxy proxy, String template, int point, boolean duringFirstFiring, long cutAfterMillis,
                       long outageMillis) throws Exception {
        String db = "outage_point_" + point + "_" + ProcessHandle.current().pid();
        admin("CREATE DATABASE " + db + " TEMPLATE " + template);
        String direct = "jdbc:postgresql://127.0.0.1:" + TestDatabase.server().port() + "/" + db;
        String proxied = "jdbc:postgresql://127.0.0.1:" + proxy.port() + "/" + db;
        WardenConfig cfg = ConfigLoader.parse(daemonYaml(proxied, point));
        List<String> problems = new ArrayList<>();
        boolean insideFiring;
        int judgedBeforeCut;
        long recoveredMillis = -1;
        try (Session s = Session.open(cfg, null, Map.of());
             Daemon d = new Daemon(s, Clock.systemUTC(), RETRY, Map.of())) {
            FiringWatch watch = new FiringWatch();
            d.firingListener(watch);
            d.start("outage-" + point, 1000);
            if (duringFirstFiring && !watch.firstStarted.await(30, TimeUnit.SECONDS)) {
                problems.add("no firing began");
            }
            Thread.sleep(cutAfterMillis);
            proxy.cut();
            insideFiring = watch.inProgress.get();
            judgedBeforeCut = (int) WAVES.stream().filter(w -> runs(direct, w) > 0).count();
            boolean sawDegraded = false;
            long end = System.nanoTime() + outageMillis * 1_000_000;
            while (System.nanoTime() < end) {
                sawDegraded |= health(d) == 503;
                Thread.sleep(50);
            }
            proxy.restore();
            long restored = System.nanoTime();
            if (!sawDegraded) {
                problems.add("/health never answered 503 during the outage");
            }
            if (await(() -> WAVES.stream().allMatch(w -> runs(direct, w) > 0), Duration.ofSeconds(60))) {
                recoveredMillis = (System.nanoTime() - restored) / 1_000_000;
            } else {
                problems.add("not every wave was judged after the outage");
            }
            // The daemon goes on after the outage: a wave that arrives now is judged on a later firing.
            execute(direct, "INSERT INTO src.answers SELECT 'w4', respondent_id, score, region, satisfied, has_car,"
                    + " remark, spread FROM src.answers WHERE wave = 'w2'");
            if (!await(() -> runs(direct, "w4") > 0, Duration.ofSeconds(60))) {
                problems.add("w4, added after the outage, was not judged");
            }
            if (!await(() -> health(d) == 200, Duration.ofSeconds(30))) {
                problems.add("/health did not return to 200");
            }
        }
        // After the daemon stopped, so that a second run of any wave would have had every chance to appear.
        for (String w : List.of("w1", "w2", "w3", "w4")) {
            long n = runs(direct, w);
            if (n != 1) {
                problems.add(w + " has " + n + " run rows");
            }
        }
        long duplicates = count(direct, "SELECT count(*) - count(DISTINCT (wave, against_wave, variable, kind))"
                + " FROM ww_results.alert WHERE superseded_at IS NULL");
        if (duplicates != 0) {
            problems.add(duplicates + " duplicate open alerts");
        }
        admin("DROP DATABASE " + db + " WITH (FORCE)");
        return new Outcome(insideFiring, judgedBeforeCut, recoveredMillis, problems);
    }

    /** A database with the three waves imported by the command line, straight to the server; copied per point. */
    String loadTemplate() throws Exception {
        String url = TestDatabase.freshDatabase("outage_template");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("import.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
        for (int w = 1; w <= 3; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        return url.substring(url.lastIndexOf('/') + 1);
    }

    String daemonYaml(String proxied, int point) {
        return SmallSurvey.config(proxied, null)
                .replace("results:\n", "results:\n  jdbcUrl: \"" + proxied + "\"\n  user: postgres\n")
                .replace("    exclude: [respondent_id]", "    exclude: [respondent_id]\n    schedule: \"0/1 * * * * ?\"")
                + "daemon:\n  httpPort: 0\n  clusterCheckinMillis: 1000\n  outputDir: \""
                + dir.resolve("digests-" + point).toString().replace("\\", "/") + "\"\n";
    }

    int health(Daemon d) {
        try {
            return http.send(HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + d.statusPort() + "/health"))
                    .timeout(Duration.ofSeconds(2)).build(), HttpResponse.BodyHandlers.ofString()).statusCode();
        } catch (Exception e) {
            return -1;
        }
    }

    static long runs(String url, String wave) {
        return count(url, "SELECT count(*) FROM ww_results.run WHERE wave = '" + wave + "'");
    }

    static long count(String url, String sql) {
        return DaemonIntegrationTest.count(url, sql);
    }

    static void execute(String url, String sql) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(sql);
        }
    }

    static void admin(String sql) throws Exception {
        try (Connection c = DriverManager.getConnection(TestDatabase.server().jdbcUrl()); var st = c.createStatement()) {
            st.execute(sql);
        }
    }

    static boolean await(BooleanSupplier condition, Duration timeout) throws InterruptedException {
        long end = System.nanoTime() + timeout.toNanos();
        while (System.nanoTime() < end) {
            if (condition.getAsBoolean()) {
                return true;
            }
            Thread.sleep(100);
        }
        return false;
    }
}
