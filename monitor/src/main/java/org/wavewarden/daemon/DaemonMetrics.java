package org.wavewarden.daemon;

import org.wavewarden.judge.Finding;

import java.time.Instant;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicLong;

/** Counters of the daemon, rendered in the Prometheus text exposition format (version 0.0.4). */
public final class DaemonMetrics {

    private final Map<String, AtomicLong> runs = new ConcurrentHashMap<>();
    private final Map<String, AtomicLong> failures = new ConcurrentHashMap<>();
    private final Map<String, AtomicLong> firings = new ConcurrentHashMap<>();
    private final Map<String, Instant> lastSuccess = new ConcurrentHashMap<>();
    private final Map<String, AtomicLong> alerts = new ConcurrentHashMap<>();
    private final Map<String, Boolean> degraded = new ConcurrentHashMap<>();
    private volatile boolean databasesUnreachable;

    void waveJudged(String dataset, java.util.List<Finding> alertList) {
        runs.computeIfAbsent(dataset, k -> new AtomicLong()).incrementAndGet();
        for (Finding a : alertList) {
            String verdict = a.verdict() == null ? a.kind().name() : a.verdict().name();
            alerts.computeIfAbsent(dataset + "\u0000" + verdict, k -> new AtomicLong()).incrementAndGet();
        }
    }

    void firingSucceeded(String dataset, Instant at) {
        firings.computeIfAbsent(dataset, k -> new AtomicLong()).incrementAndGet();
        lastSuccess.put(dataset, at);
        degraded.put(dataset, false);
    }

    void firingFailed(String dataset) {
        failures.computeIfAbsent(dataset, k -> new AtomicLong()).incrementAndGet();
        degraded.put(dataset, true);
    }

    /** What the latest database probe found. */
    void databasesReachable(boolean reachable) {
        databasesUnreachable = !reachable;
    }

    /**
     * True while the latest attempt of some dataset failed (a database outage, typically), or while the latest
     * probe of the databases found one unreachable (an outage between firings).
     */
    public boolean degraded() {
        return databasesUnreachable || degraded.values().stream().anyMatch(b -> b);
    }

    /** Firings of a dataset that completed. */
    public long firings(String dataset) {
        AtomicLong n = firings.get(dataset);
        return n == null ? 0 : n.get();
    }

    public long runs(String dataset) {
        AtomicLong n = runs.get(dataset);
        return n == null ? 0 : n.get();
    }

    public long failures(String dataset) {
        AtomicLong n = failures.get(dataset);
        return n == null ? 0 : n.get();
    }

    public String prometheus() {
        StringBuilder sb = new StringBuilder();
        family(sb, "wavewarden_waves_judged_total", "counter", "Waves judged and written, by dataset.");
        new TreeMap<>(runs).forEach((d, n) -> sb.append("wavewarden_waves_judged_total{dataset=\"").append(esc(d))
                .append("\"} ").append(n.get()).append('\n'));
        family(sb, "wavewarden_firings_total", "counter", "Scheduled firings that completed, by dataset.");
        new TreeMap<>(firings).forEach((d, n) -> sb.append("wavewarden_firings_total{dataset=\"").append(esc(d))
                .append("\"} ").append(n.get()).append('\n'));
        family(sb, "wavewarden_failures_total", "counter", "Firing attempts that failed, by dataset.");
        new TreeMap<>(failures).forEach((d, n) -> sb.append("wavewarden_failures_total{dataset=\"").append(esc(d))
                .append("\"} ").append(n.get()).append('\n'));
        family(sb, "wavewarden_last_success_timestamp_seconds", "gauge", "Time of the last completed firing.");
        new TreeMap<>(lastSuccess).forEach((d, t) -> sb.append("wavewarden_last_success_timestamp_seconds{dataset=\"")
                .append(esc(d)).append("\"} ").append(String.format(Locale.ROOT, "%.3f", t.toEpochMilli() / 1000.0))
                .append('\n'));
        family(sb, "wavewarden_alerts_total", "counter", "Alerts raised, by dataset and verdict or kind.");
        new TreeMap<>(alerts).forEach((k, n) -> {
            String[] p = k.split("\u0000", 2);
            sb.append("wavewarden_alerts_total{dataset=\"").append(esc(p[0])).append("\",verdict=\"").append(esc(p[1]))
                    .append("\"} ").append(n.get()).append('\n');
        });
        family(sb, "wavewarden_degraded", "gauge",
                "1 while the latest attempt of some dataset failed or a database is unreachable.");
        sb.append("wavewarden_degraded ").append(degraded() ? 1 : 0).append('\n');
        return sb.toString();
    }

    private static void family(StringBuilder sb, String name, String type, String help) {
        sb.append("# HELP ").append(name).append(' ').append(help).append('\n');
        sb.append("# TYPE ").append(name).append(' ').append(type).append('\n');
    }

    private static String esc(String s) {
        return s.replace("\\", "\\\\").replace("\"", "\\\"").replace("\n", "\\n");
    }
}
