package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * One daemon with fifty datasets, each on a two-second schedule, for two minutes (a scaled-down stand-in for
 * several minutes or days in production: the steady state, firings that find nothing new, sets in within the first
 * seconds). Quartz has four threads, so firings queue behind one another; every one completes, no two firings of
 * one dataset overlap, every wave is judged exactly once, and the heap after a full collection stays flat.
 */
class DaemonLoadTest {

    static final int DATASETS = 50;
    static final int WAVES = 3;
    static final int ROWS = 300;
    static final Duration RUN_FOR = Duration.ofSeconds(120);
    static final Duration SAMPLE_EVERY = Duration.ofSeconds(10);
    /**
     * How far the mean heap of the last third of the samples may exceed that of the first third. The daemon keeps
     * nothing per firing, and some 3,000 firings run here, so a leak of even 20 KB a firing (a retained profile or
     * result set) would exceed it; collector noise and lazily loaded classes and caches stay well below it.
     */
    static final double HEAP_GROWTH_BOUND_MB = 64;

    @TempDir
    Path dir;

    /** Counts firings per dataset and notes any that start while another of the same dataset is running. */
    static final class FiringLog implements Daemon.FiringListener {
        final Map<String, AtomicInteger> running = new ConcurrentHashMap<>();
        final Map<String, AtomicLong> lastStart = new ConcurrentHashMap<>();
        final AtomicLong maxGapNanos = new AtomicLong();
        final AtomicInteger overlaps = new AtomicInteger();
        final AtomicInteger started = new AtomicInteger();
        final AtomicInteger succeeded = new AtomicInteger();
        final AtomicInteger failed = new AtomicInteger();

        @Override
        public void started(String dataset) {
            started.incrementAndGet();
            if (running.computeIfAbsent(dataset, k -> new AtomicInteger()).incrementAndGet() > 1) {
                overlaps.incrementAndGet();
            }
            long now = System.nanoTime();
            long before = lastStart.computeIfAbsent(dataset, k -> new AtomicLong()).getAndSet(now);
            if (before != 0) {
                maxGapNanos.accumulateAndGet(now - before, Math::max);
            }
        }

        @Override
        public void finished(String dataset, boolean ok) {
            running.get(dataset).decrementAndGet();
            (ok ? succeeded : failed).incrementAndGet();
        }
    }

    @Test
    void fiftyDatasetsOnAFastScheduleRunWithoutFailureOverlapOrHeapGrowth() throws Exception {
        String url = TestDatabase.freshDatabase("daemon_load");
        createTables(url);
        WardenConfig cfg = ConfigLoader.parse(yaml(url));
        FiringLog log = new FiringLog();
        List<Double> heapMb = new ArrayList<>();
        long firings = 0;
        long failures = 0;
        try (Session s = Session.open(cfg, null, Map.of());
             Daemon d = new Daemon(s, Clock.systemUTC(), DaemonIntegrationTest.FAST, Map.of())) {
            d.firingListener(log);
            d.start("load", 1000);
            long end = System.nanoTime() + RUN_FOR.toNanos();
            while (System.nanoTime() < end) {
                Thread.sleep(SAMPLE_EVERY.toMillis());
                heapMb.add(usedHeapMb());
            }
            d.close();
            for (int i = 1; i <= DATASETS; i++) {
                firings += d.metrics().firings(name(i));
                failures += d.metrics().failures(name(i));
            }
        }
        double[] fit = slope(heapMb);
        double first = mean(heapMb.subList(0, heapMb.size() / 3));
        double last = mean(heapMb.subList(heapMb.size() - heapMb.size() / 3, heapMb.size()));
        System.out.printf(Locale.ROOT, "daemon load: %d datasets on \"0/2 * * * * ?\" for %d s: %d firings completed"
                        + " (%d started, %d failed attempts), %d overlapping, longest gap between firings of one"
                        + " dataset %.1f s%n", DATASETS, RUN_FOR.toSeconds(), firings, log.started.get(), failures,
                log.overlaps.get(), log.maxGapNanos.get() / 1e9);
        System.out.printf(Locale.ROOT, "daemon load: heap after GC every %d s (MB): %s; slope %+.2f MB/min;"
                        + " mean of first third %.2f MB, of last third %.2f MB%n", SAMPLE_EVERY.toSeconds(),
                heapMb.stream().map(m -> String.format(Locale.ROOT, "%.2f", m)).toList(), fit[0] * 60 / SAMPLE_EVERY
                        .toSeconds(), first, last);

        assertEquals(0, failures, "failed firing attempts");
        assertEquals(0, log.failed.get(), "firings that gave up");
        assertEquals(log.started.get(), log.succeeded.get(), "every firing that started completed");
        assertEquals(0, log.overlaps.get(), "firings of one dataset that overlapped");
        // Each dataset fires every 2 s: fewer than half of the due firings would mean the queue never drained.
        assertTrue(firings >= DATASETS * RUN_FOR.toSeconds() / 2 / 2, "firings: " + firings);
        // A firing missed by more than the misfire threshold (60 s) would show as such a gap.
        assertTrue(log.maxGapNanos.get() < Duration.ofSeconds(60).toNanos(), "no misfire");
        assertEquals(DATASETS * WAVES, count(url, "SELECT count(*) FROM ww_results.run"), "one run per wave");
        assertEquals(DATASETS * WAVES, count(url, "SELECT count(DISTINCT (dataset, wave)) FROM ww_results.run"));
        assertEquals(0, count(url, "SELECT count(*) FROM ww_results.run a JOIN ww_results.run b ON a.dataset = b.dataset"
                + " AND a.run_id < b.run_id AND a.started_at < b.finished_at AND b.started_at < a.finished_at"),
                "runs of one dataset whose intervals overlap");
        assertTrue(last - first <= HEAP_GROWTH_BOUND_MB, "heap grew from " + first + " MB to " + last + " MB");
    }

    static String name(int i) {
        return String.format(Locale.ROOT, "d%02d", i);
    }

    /**
     * Fifty tables of three waves of 300 rows; the values are a deterministic function of the table, wave and row,
     * with a shift of {@code score} in the last wave of every fifth table, so some runs raise alerts.
     */
    static void createTables(String url) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("CREATE SCHEMA src");
            for (int i = 1; i <= DATASETS; i++) {
                st.execute("CREATE TABLE src.t" + name(i) + " AS SELECT 'w' || w AS wave, g AS id,"
                        + " (40 + (g * 37 + " + i + " * 11 + w * 7) % 21 + CASE WHEN w = " + WAVES + " AND "
                        + i + " % 5 = 0 THEN 4 ELSE 0 END)::float8 AS score,"
                        + " (ARRAY['north','south','east','west'])[1 + (g * 13 + w) % 4] AS region,"
                        + " (g + " + i + ") % 3 = 0 AS flag"
                        + " FROM generate_series(1, " + WAVES + ") w, generate_series(1, " + ROWS + ") g");
            }
        }
    }

    String yaml(String url) {
        StringBuilder sb = new StringBuilder("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results:
                  schema: ww_results
                alpha: 0.05
                datasets:
                """.formatted(url));
        for (int i = 1; i <= DATASETS; i++) {
            sb.append("""
                      - name: %s
                        table: src.t%s
                        waveColumn: wave
                        exclude: [id]
                        schedule: "0/2 * * * * ?"
                        variables:
                          - name: score
                            kind: continuous
                          - name: region
                            kind: categorical
                    """.formatted(name(i), name(i)));
        }
        sb.append("daemon:\n  httpPort: -1\n  outputDir: \"").append(dir.resolve("digests").toString()
                .replace("\\", "/")).append("\"\n");
        return sb.toString();
    }

    static double usedHeapMb() {
        Runtime rt = Runtime.getRuntime();
        System.gc();
        return (rt.totalMemory() - rt.freeMemory()) / (1024.0 * 1024.0);
    }

    /** Least-squares slope per sample and intercept of the series. */
    static double[] slope(List<Double> y) {
        int n = y.size();
        double mx = (n - 1) / 2.0;
        double my = mean(y);
        double sxy = 0;
        double sxx = 0;
        for (int i = 0; i < n; i++) {
            sxy += (i - mx) * (y.get(i) - my);
            sxx += (i - mx) * (i - mx);
        }
        double b = sxx == 0 ? 0 : sxy / sxx;
        return new double[] {b, my - b * mx};
    }

    static double mean(List<Double> y) {
        return y.stream().mapToDouble(Double::doubleValue).average().orElse(Double.NaN);
    }

    static long count(String url, String sql) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement(); ResultSet rs = st.executeQuery(sql)) {
            rs.next();
            return rs.getLong(1);
        }
    }
}
