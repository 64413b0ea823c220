package org.wavewarden.daemon;

import io.prometheus.metrics.core.metrics.Counter;
import io.prometheus.metrics.core.metrics.Gauge;
import io.prometheus.metrics.core.metrics.Histogram;
import io.prometheus.metrics.expositionformats.PrometheusTextFormatWriter;
import io.prometheus.metrics.instrumentation.jvm.JvmMetrics;
import io.prometheus.metrics.model.registry.MultiCollector;
import io.prometheus.metrics.model.registry.PrometheusRegistry;
import io.prometheus.metrics.model.snapshots.CounterSnapshot;
import io.prometheus.metrics.model.snapshots.GaugeSnapshot;
import io.prometheus.metrics.model.snapshots.Labels;
import io.prometheus.metrics.model.snapshots.MetricSnapshot;
import io.prometheus.metrics.model.snapshots.MetricSnapshots;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.function.Supplier;
import java.util.function.ToDoubleFunction;

/**
 * The daemon's metrics, through the Prometheus Java client, and the health verdict that {@code /health} shows.
 *
 * <p>Each daemon has a registry of its own, so several daemons in one JVM (as in tests) keep apart; the JVM and
 * process metrics belong to the JVM and are registered once, in a registry shared by all daemons, and joined to
 * each daemon's at scrape time.
 */
public final class DaemonMetrics {

    private static final Logger LOG = LoggerFactory.getLogger(DaemonMetrics.class);

    /** A pending output older than this makes the daemon degraded. */
    public static final Duration BACKLOG_ALARM = Duration.ofMinutes(15);

    /** Prometheus text exposition format 0.0.4. */
    public static final String CONTENT_TYPE = PrometheusTextFormatWriter.CONTENT_TYPE;

    private static final PrometheusTextFormatWriter WRITER = PrometheusTextFormatWriter.create();

    /** Firing durations from a tenth of a second (an idle firing) to an hour (a very large wave). */
    private static final double[] DURATION_BUCKETS = {0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 120, 300, 600, 1800, 3600};

    private static final class JvmRegistry {
        static final PrometheusRegistry INSTANCE = new PrometheusRegistry();

        static {
            JvmMetrics.builder().register(INSTANCE);
        }
    }

    private final PrometheusRegistry registry = new PrometheusRegistry();
    private final Duration backlogAlarm;
    private final Counter wavesJudged;
    private final Counter firings;
    private final Counter failures;
    private final Gauge lastSuccess;
    private final Counter alerts;
    private final Histogram firingDuration;
    private final Map<String, Boolean> failing = new ConcurrentHashMap<>();
    /** When each dataset's firing last succeeded and last failed, for the console's health line. */
    private final Map<String, Instant> lastSucceededAt = new ConcurrentHashMap<>();
    private final Map<String, Instant> lastFailedAt = new ConcurrentHashMap<>();
    private volatile String unreachableDatabase;
    private volatile Supplier<List<DeliveryBacklog>> backlogSource = List::of;
    private Future<List<DeliveryBacklog>> backlogRead;
    /** How long {@code /health} and a scrape wait for the backlog before saying it could not be read. */
    static final Duration BACKLOG_READ_LIMIT = Duration.ofSeconds(1);
    /** Reads backlogs off the request threads; its idle threads end after a minute, none keeps the JVM up. */
    private static final ExecutorService BACKLOG_READER = Executors.newCachedThreadPool(r -> {
        Thread t = new Thread(r, "wavewarden-backlog-read");
        t.setDaemon(true);
        return t;
    });

    public DaemonMetrics() {
        this(BACKLOG_ALARM);
    }

    /** @param backlogAlarm how long an output may wait for delivery before the daemon counts as degraded */
    public DaemonMetrics(Duration backlogAlarm) {
        this.backlogAlarm = Objects.requireNonNull(backlogAlarm, "backlogAlarm");
        wavesJudged = Counter.builder().name("wavewarden_waves_judged_total")
                .help("Waves judged and written, by dataset.").labelNames("dataset").register(registry);
        firings = Counter.builder().name("wavewarden_firings_total")
                .help("Scheduled firings that completed, by dataset.").labelNames("dataset").register(registry);
        failures = Counter.builder().name("wavewarden_failures_total")
                .help("Firing attempts that failed, by dataset.").labelNames("dataset").register(registry);
        lastSuccess = Gauge.builder().name("wavewarden_last_success_timestamp_seconds")
                .help("Time of the last completed firing.").labelNames("dataset").register(registry);
        alerts = Counter.builder().name("wavewarden_alerts_total")
                .help("Alerts raised, by dataset and verdict or kind.").labelNames("dataset", "verdict")
                .register(registry);
        firingDuration = Histogram.builder().name("wavewarden_firing_duration_seconds")
                .help("How long a completed firing took, by dataset.").labelNames("dataset")
                .classicOnly().classicUpperBounds(DURATION_BUCKETS).register(registry);
        registry.register(new StatusCollector());
    }

    void waveJudged(String dataset, List<org.wavewarden.deliver.Alert> alertList) {
        wavesJudged.labelValues(dataset).inc();
        for (org.wavewarden.deliver.Alert a : alertList) {
            String verdict = a.verdict() == null ? a.kind().name() : a.verdict().name();
            alerts.labelValues(dataset, verdict).inc();
        }
    }

    void firingSucceeded(String dataset, Instant at) {
        firings.labelValues(dataset).inc();
        lastSuccess.labelValues(dataset).set(at.toEpochMilli() / 1000.0);
        failing.put(dataset, false);
        lastSucceededAt.put(dataset, at);
    }

    void firingFailed(String dataset) {
        failures.labelValues(dataset).inc();
        failing.put(dataset, true);
    }

    void firingFailed(String dataset, Instant at) {
        firingFailed(dataset);
        lastFailedAt.put(dataset, at);
    }

    private static final java.time.format.DateTimeFormatter MINUTE = java.time.format.DateTimeFormatter
            .ofPattern("yyyy-MM-dd HH:mm 'UTC'").withZone(java.time.ZoneOffset.UTC);

    /**
     * A dataset's last firing in this daemon as one line for the web console: whether it succeeded and when, and
     * when it last succeeded after a failure. Only what this process saw: a restart starts with no firing.
     */
    public String firingLine(String dataset) {
        Instant ok = lastSucceededAt.get(dataset);
        Instant failed = lastFailedAt.get(dataset);
        if (Boolean.TRUE.equals(failing.get(dataset))) {
            return "last firing failed" + (failed == null ? "" : " " + MINUTE.format(failed))
                    + (ok == null ? "" : "; last success " + MINUTE.format(ok));
        }
        if (ok != null) {
            return "last firing succeeded " + MINUTE.format(ok);
        }
        return "no firing since the daemon started";
    }

    /** How long a firing of the dataset took, from the start of its work to its end. */
    public void firingDuration(String dataset, double seconds) {
        firingDuration.labelValues(dataset).observe(seconds);
    }

    /**
     * What the latest database probe found: null when every database answered, else the name of one that did not
     * ("source", "results"). Only the name reaches {@code /health}; the driver's message stays in the log.
     */
    void unreachableDatabase(String name) {
        unreachableDatabase = name;
    }

    /**
     * Where the delivery backlog comes from: read at each scrape of {@code /metrics} and each {@code /health}, one
     * entry per dataset and sink. Until one is set, there is no backlog.
     */
    public void backlogSource(Supplier<List<DeliveryBacklog>> source) {
        this.backlogSource = Objects.requireNonNull(source, "source");
    }

    /**
     * What {@code /health} says.
     *
     * @param status   {@code ok} or {@code degraded}
     * @param problems why it is degraded, one sentence each; empty when ok
     * @param backlog  what each sink of each dataset still owes
     */
    public record Health(String status, List<String> problems, List<DeliveryBacklog> backlog) {
        public boolean degraded() {
            return !problems.isEmpty();
        }
    }

    /**
     * Degraded while the latest attempt of some dataset failed (a database outage, typically), while the latest
     * probe found a database unreachable (an outage between firings), while a sink has dead letters, or while an
     * output has waited for delivery longer than the backlog alarm.
     */
    public Health health() {
        List<String> problems = new ArrayList<>();
        String unreachable = unreachableDatabase;
        if (unreachable != null) {
            problems.add("the " + unreachable + " database is unreachable");
        }
        new TreeMap<>(failing).forEach((dataset, failed) -> {
            if (failed) {
                problems.add("the latest firing of " + dataset + " failed");
            }
        });
        List<DeliveryBacklog> backlog;
        if ("results".equals(unreachable)) {
            // The outbox lives in the results database: asking it now would only wait for the pool's timeout, and
            // the problem already named says why the backlog is not shown.
            backlog = List.of();
        } else {
            try {
                backlog = readBacklog();
            } catch (TimeoutException | ExecutionException | RuntimeException e) {
                LOG.debug("delivery backlog not readable: {}", e.toString());
                backlog = List.of();
                problems.add("the delivery backlog could not be read");
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                backlog = List.of();
                problems.add("the delivery backlog could not be read");
            }
        }
        for (DeliveryBacklog b : backlog) {
            if (b.deadLetters() > 0) {
                problems.add("sink " + b.sink() + " of " + b.dataset() + " has " + b.deadLetters()
                        + " dead letter(s) waiting for a replay");
            }
            if (b.pending() > 0 && b.oldestPendingSeconds() >= backlogAlarm.toSeconds()) {
                problems.add("sink " + b.sink() + " of " + b.dataset() + " has had an output pending for "
                        + (long) (b.oldestPendingSeconds() / 60) + " minutes");
            }
        }
        return new Health(problems.isEmpty() ? "ok" : "degraded", List.copyOf(problems), backlog);
    }

    /**
     * The backlog, waiting at most {@link #BACKLOG_READ_LIMIT}: an outage the probe has not noticed yet would
     * otherwise hold {@code /health} for the connection pool's whole timeout, and it must answer at once, degraded.
     * One read at a time: a request that comes while one is still running waits for that one, not a new one.
     */
    private List<DeliveryBacklog> readBacklog() throws TimeoutException, ExecutionException, InterruptedException {
        Future<List<DeliveryBacklog>> read;
        synchronized (this) {
            if (backlogRead == null || backlogRead.isDone()) {
                Supplier<List<DeliveryBacklog>> source = backlogSource;
                backlogRead = BACKLOG_READER.submit(() -> List.copyOf(source.get()));
            }
            read = backlogRead;
        }
        return read.get(BACKLOG_READ_LIMIT.toMillis(), TimeUnit.MILLISECONDS);
    }

    public boolean degraded() {
        return health().degraded();
    }

    /** Firings of a dataset that completed. */
    public long firings(String dataset) {
        return (long) firings.labelValues(dataset).get();
    }

    public long runs(String dataset) {
        return (long) wavesJudged.labelValues(dataset).get();
    }

    public long failures(String dataset) {
        return (long) failures.labelValues(dataset).get();
    }

    /** This daemon's metrics and the JVM's, in the Prometheus text format. */
    public String prometheus() {
        List<MetricSnapshot> all = new ArrayList<>();
        JvmRegistry.INSTANCE.scrape().forEach(all::add);
        registry.scrape().forEach(all::add);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try {
            WRITER.write(out, new MetricSnapshots(all));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return out.toString(StandardCharsets.UTF_8);
    }

    /**
     * The degraded flag and the delivery backlog, from one reading of the health so that a scrape queries the
     * outbox once.
     */
    private final class StatusCollector implements MultiCollector {

        @Override
        public MetricSnapshots collect() {
            Health h = health();
            return new MetricSnapshots(
                    GaugeSnapshot.builder().name("wavewarden_degraded")
                            .help("1 while a firing keeps failing, a database is unreachable, or a sink has dead"
                                    + " letters or an output pending too long.")
                            .dataPoint(GaugeSnapshot.GaugeDataPointSnapshot.builder()
                                    .value(h.degraded() ? 1 : 0).build())
                            .build(),
                    gauge("wavewarden_delivery_pending", "Outputs not yet delivered, by dataset and sink.",
                            h.backlog(), DeliveryBacklog::pending),
                    gauge("wavewarden_delivery_oldest_pending_age_seconds",
                            "How long the oldest pending output has waited, by dataset and sink; 0 when none.",
                            h.backlog(), DeliveryBacklog::oldestPendingSeconds),
                    gauge("wavewarden_delivery_dead_letters",
                            "Outputs given up on and waiting for a replay, by dataset and sink.",
                            h.backlog(), DeliveryBacklog::deadLetters),
                    counter(h.backlog()));
        }

        private GaugeSnapshot gauge(String name, String help, List<DeliveryBacklog> backlog,
                                    ToDoubleFunction<DeliveryBacklog> value) {
            GaugeSnapshot.Builder g = GaugeSnapshot.builder().name(name).help(help);
            for (DeliveryBacklog b : backlog) {
                g.dataPoint(GaugeSnapshot.GaugeDataPointSnapshot.builder().labels(labels(b))
                        .value(value.applyAsDouble(b)).build());
            }
            return g.build();
        }

        private CounterSnapshot counter(List<DeliveryBacklog> backlog) {
            CounterSnapshot.Builder c = CounterSnapshot.builder().name("wavewarden_delivery_failed_attempts")
                    .help("Delivery attempts that failed, by dataset and sink.");
            for (DeliveryBacklog b : backlog) {
                c.dataPoint(CounterSnapshot.CounterDataPointSnapshot.builder().labels(labels(b))
                        .value(b.failedAttempts()).build());
            }
            return c.build();
        }

        private static Labels labels(DeliveryBacklog b) {
            return Labels.of("dataset", b.dataset(), "sink", b.sink());
        }

        @Override
        public List<String> getPrometheusNames() {
            return List.of("wavewarden_degraded", "wavewarden_delivery_pending",
                    "wavewarden_delivery_oldest_pending_age_seconds", "wavewarden_delivery_dead_letters",
                    "wavewarden_delivery_failed_attempts");
        }
    }
}
