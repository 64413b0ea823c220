package org.wavewarden.daemon;

import com.zaxxer.hikari.HikariDataSource;
import org.quartz.CronScheduleBuilder;
import org.quartz.JobBuilder;
import org.quartz.JobDetail;
import org.quartz.JobKey;
import org.quartz.Scheduler;
import org.quartz.SchedulerException;
import org.quartz.Trigger;
import org.quartz.TriggerBuilder;
import org.quartz.impl.StdSchedulerFactory;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.Databases;
import org.wavewarden.pipeline.JudgedWave;
import org.wavewarden.pipeline.Session;

import java.io.IOException;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Properties;
import java.util.Set;
import java.util.UUID;

/**
 * The long-running monitor: one Quartz cron trigger per dataset on a clustered JDBC job store in the results
 * database, so several instances share one schedule with fail-over. Misfire policy: a firing missed while every
 * instance was down runs once, as soon as an instance is back ({@code withMisfireHandlingInstructionFireAndProceed});
 * since each firing judges every pending wave, one catch-up firing is enough.
 */
public final class Daemon implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(Daemon.class);
    static final String GROUP = "wavewarden";
    /** Group of the triggers that carry out what is owed between firings; named like their dataset's job. */
    static final String REDELIVER_GROUP = "wavewarden-redeliver";
    static final String DEFAULT_SCHEDULE = "0 15 2 * * ?";

    /** Retry policy of one firing when a database is unreachable: delays double from initial up to max. */
    public record Retry(int attempts, Duration initial, Duration max) {
        public static final Retry DEFAULT = new Retry(6, Duration.ofSeconds(2), Duration.ofMinutes(2));
    }

    private final Session session;
    private final WardenConfig config;
    private final Clock clock;
    private final Retry retry;
    private final Path outputDir;
    private final DaemonMetrics metrics = new DaemonMetrics();
    private final String registryKey = UUID.randomUUID().toString();
    private final HikariDataSource quartzPool;
    private final Deliveries deliveries;
    private final Map<String, FiringReport> lastFirings = new java.util.concurrent.ConcurrentHashMap<>();
    private Scheduler scheduler;
    private StatusServer status;
    private DatabaseProbe probe;
    private volatile FiringListener firingListener = FiringListener.NONE;

    /**
     * @param sinksByDataset the sinks of each dataset besides the alerts table, which the run itself writes
     */
    public Daemon(Session session, Clock clock, Retry retry,
                  Map<String, List<org.wavewarden.deliver.sink.AlertSink>> sinksByDataset) {
        this.session = session;
        this.config = session.config();
        this.clock = clock;
        this.retry = retry;
        this.deliveries = new Deliveries(session, sinksByDataset, clock, Deliveries.DEAD_LETTER_BACKOFF);
        this.outputDir = Path.of(config.daemon().outputDir());
        this.quartzPool = Databases.open(config.results().connection() == null ? config.source()
                : config.results().connection(), session.embeddedUrl(), "results", false, session.env(), 4);
        // Read at each scrape and each /health request, so an operator sees what is owed now, not at the last firing.
        metrics.backlogSource(this::backlog);
    }

    public DaemonMetrics metrics() {
        return metrics;
    }

    /** What the web console, served on the status endpoint, reads and acts on. */
    WardenConfig config() {
        return config;
    }

    Clock clock() {
        return clock;
    }

    org.jdbi.v3.core.Jdbi resultsJdbi() {
        return session.store().jdbi();
    }

    /** Starts the scheduler (and the status endpoint unless its port is -1). */
    public void start(String instanceId, int clusterCheckinMillis) throws SchedulerException, IOException {
        // First, so that a port in use is refused before the schema is migrated or a job is stored.
        if (config.daemon().httpPort() >= 0) {
            status = StatusServer.start(config.daemon().httpBind(), config.daemon().httpPort(), this);
        }
        session.migrate();
        RegisteredConnectionProvider.register(registryKey, quartzPool);
        Properties p = new Properties();
        p.setProperty("org.quartz.scheduler.instanceName", "wavewarden");
        p.setProperty("org.quartz.scheduler.instanceId", instanceId == null ? "AUTO" : instanceId);
        p.setProperty("org.quartz.scheduler.skipUpdateCheck", "true");
        p.setProperty("org.quartz.threadPool.threadCount", "4");
        p.setProperty("org.quartz.jobStore.class", "org.quartz.impl.jdbcjobstore.JobStoreTX");
        p.setProperty("org.quartz.jobStore.driverDelegateClass", "org.quartz.impl.jdbcjobstore.PostgreSQLDelegate");
        p.setProperty("org.quartz.jobStore.tablePrefix", "\"" + config.results().schema() + "\".QRTZ_");
        p.setProperty("org.quartz.jobStore.isClustered", "true");
        p.setProperty("org.quartz.jobStore.clusterCheckinInterval", String.valueOf(clusterCheckinMillis));
        p.setProperty("org.quartz.jobStore.acquireTriggersWithinLock", "true");
        p.setProperty("org.quartz.jobStore.misfireThreshold", "60000");
        // Quartz keeps data sources in one registry per JVM, by name: a name of its own keeps this scheduler off
        // another daemon's pool (in tests, several run in one JVM; one closing must not strand the others).
        String dataSource = "results_" + registryKey.replace("-", "");
        p.setProperty("org.quartz.jobStore.dataSource", dataSource);
        p.setProperty("org.quartz.dataSource." + dataSource + ".connectionProvider.class",
                RegisteredConnectionProvider.class.getName());
        p.setProperty("org.quartz.dataSource." + dataSource + ".registryKey", registryKey);
        StdSchedulerFactory factory = new StdSchedulerFactory(p);
        scheduler = factory.getScheduler();
        // Quartz keeps schedulers in a per-JVM repository by name; every member of a cluster shares the name, so
        // the entry is dropped to let another instance (in tests, in the same JVM) build its own scheduler.
        org.quartz.impl.SchedulerRepository.getInstance().remove(scheduler.getSchedulerName());
        scheduler.setJobFactory((bundle, s) -> new JudgeDatasetJob(this));
        JobStoreReconciler.reconcile(scheduler, config.datasets());
        for (DatasetConfig d : config.datasets()) {
            JobDetail job = JobBuilder.newJob(JudgeDatasetJob.class).withIdentity(d.name(), GROUP)
                    .usingJobData(JudgeDatasetJob.DATASET, d.name()).requestRecovery(true).storeDurably(true).build();
            Trigger trigger = TriggerBuilder.newTrigger().withIdentity(d.name(), GROUP).forJob(job)
                    .withSchedule(CronScheduleBuilder.cronSchedule(d.schedule() == null ? DEFAULT_SCHEDULE : d.schedule())
                            .withMisfireHandlingInstructionFireAndProceed())
                    .build();
            Set<Trigger> triggers = new java.util.LinkedHashSet<>(Set.of(trigger));
            if (config.daemon().redeliverSeconds() > 0) {
                // A second trigger on the same job, so Quartz's one-at-a-time rule (cluster-wide on the JDBC store)
                // keeps a redelivery and the dataset's firing from ever overlapping; a missed one is simply skipped.
                triggers.add(TriggerBuilder.newTrigger().withIdentity(d.name(), REDELIVER_GROUP).forJob(job)
                        .usingJobData(JudgeDatasetJob.MODE, JudgeDatasetJob.REDELIVER)
                        .startAt(java.util.Date.from(clock.instant().plusSeconds(config.daemon().redeliverSeconds())))
                        .withSchedule(org.quartz.SimpleScheduleBuilder.repeatSecondlyForever(
                                        config.daemon().redeliverSeconds())
                                .withMisfireHandlingInstructionNextWithRemainingCount())
                        .build());
            }
            scheduler.scheduleJob(job, triggers, true);
        }
        // Probed twice per check-in interval, so /health turns 503 within about the time after which another
        // cluster member would take over this instance's work.
        Duration every = Duration.ofMillis(Math.max(500, clusterCheckinMillis / 2));
        Duration timeout = every.dividedBy(2);
        ConnectionConfig rc = config.results().connection() == null ? config.source() : config.results().connection();
        probe = new DatabaseProbe(Map.of(
                "source", Databases.open(config.source(), session.embeddedUrl(), "source", true, session.env(), 1,
                        timeout),
                "results", Databases.open(rc, session.embeddedUrl(), "results", false, session.env(), 1, timeout)),
                metrics, every, timeout);
        scheduler.start();
        LOG.info("daemon started: {} dataset(s), instance {}", config.datasets().size(), scheduler.getSchedulerInstanceId());
    }

    /** The status endpoint's port, once started. */
    public int statusPort() {
        return status == null ? -1 : status.port();
    }

    /**
     * What one firing of a dataset did, for {@code run --once} and the log.
     *
     * @param judged     false when a database stayed unreachable through every retry
     * @param wavesFound the waves the source lists
     * @param deliveries null when the firing did not get as far as delivering
     */
    public record FiringReport(String dataset, boolean judged, int wavesFound, int wavesJudged, int alerts,
                               Deliveries.Outcome deliveries) {
        /** Whether anything the dataset's runs owe is left undelivered (pending or dead-lettered). */
        public boolean deliveryLeftFailing() {
            return deliveries != null && !deliveries.owesNothing();
        }
    }

    /** One firing of every dataset, in this thread; for {@code run --once}. */
    public List<FiringReport> runOnce() {
        session.migrate();
        List<FiringReport> reports = new java.util.ArrayList<>();
        for (DatasetConfig d : config.datasets()) {
            fireWithRetries(d.name());
            reports.add(lastFirings.get(d.name()));
        }
        return reports;
    }

    /**
     * What each sink of each dataset still owes, from the outbox table in one query; for {@code /health} (degraded
     * while anything is dead-lettered) and {@code /metrics}.
     */
    public List<DeliveryBacklog> backlog() {
        return session.store().outbox().backlog().stream().map(b -> new DeliveryBacklog(b.dataset(), b.sink(),
                b.pending(), b.oldestPendingSeconds(), b.failedAttempts(), b.deadLetters())).toList();
    }

    /** One firing of one dataset, retried with backoff while a database is unreachable. */
    boolean fireWithRetries(String dataset) {
        FiringListener listener = firingListener;
        listener.started(dataset);
        boolean ok = false;
        try {
            ok = attempts(dataset);
            return ok;
        } finally {
            listener.finished(dataset, ok);
        }
    }

    /**
     * Judging commits each wave with everything it owes; delivering is the step after it, in which a failing sink
     * delays only itself and never fails the firing. Only an unreachable database fails an attempt, which is then
     * retried.
     */
    private boolean attempts(String dataset) {
        DatasetConfig d = config.dataset(dataset);
        Duration delay = retry.initial();
        for (int attempt = 1; ; attempt++) {
            long started = System.nanoTime();
            try {
                DatasetFiring.Result r = new DatasetFiring(session, clock, outputDir,
                        deliveries.sinkNames(dataset), deliveries.rollUpSinkNames(dataset), true).fire(d);
                long judgedNanos = System.nanoTime() - started;
                int alerts = 0;
                for (JudgedWave j : r.judged()) {
                    metrics.waveJudged(dataset, j.alerts());
                    alerts += j.alerts().size();
                }
                Deliveries.Outcome o = deliveries.deliver(dataset);
                FiringReport report = new FiringReport(dataset, true, r.found(), r.judged().size(), alerts, o);
                lastFirings.put(dataset, report);
                LOG.info("firing of {}: {} wave(s) found, {} judged, {} waiting, {} alert(s); judged in {} ms;"
                                + " deliveries in {} ms: {}", dataset, r.found(), r.judged().size(), r.waiting().size(),
                        alerts, judgedNanos / 1_000_000, o.took().toMillis(), describe(o));
                metrics.firingSucceeded(dataset, clock.instant());
                metrics.firingDuration(dataset, (System.nanoTime() - started) / 1e9);
                return true;
            } catch (RuntimeException e) {
                metrics.firingFailed(dataset, clock.instant());
                if (attempt >= retry.attempts()) {
                    LOG.error("firing of {} failed {} times; giving up until the next firing: {}", dataset, attempt,
                            e.toString());
                    lastFirings.put(dataset, new FiringReport(dataset, false, 0, 0, 0, null));
                    return false;
                }
                LOG.warn("firing of {} failed (attempt {} of {}), retrying in {}: {}", dataset, attempt,
                        retry.attempts(), delay, e.toString());
                try {
                    Thread.sleep(delay.toMillis());
                } catch (InterruptedException ie) {
                    Thread.currentThread().interrupt();
                    lastFirings.put(dataset, new FiringReport(dataset, false, 0, 0, 0, null));
                    return false;
                }
                delay = delay.multipliedBy(2).compareTo(retry.max()) > 0 ? retry.max() : delay.multipliedBy(2);
            }
        }
    }

    /**
     * Between two firings of a dataset: carries out what its committed runs still owe and is due now (outputs
     * pending after a failure, dead letters whose backoff has passed), so an alert dead-lettered in an outage
     * reaches its receiver minutes after it is back, not at the next scheduled firing (nightly, by default).
     * Does nothing, and logs nothing, when nothing is due; an unreachable database waits for the next time.
     */
    void redeliver(String dataset) {
        try {
            if (!session.store().outbox().anyDue(dataset, clock.instant())) {
                return;
            }
            Deliveries.Outcome o = deliveries.deliver(dataset);
            LOG.info("redelivery of {}: deliveries in {} ms: {}", dataset, o.took().toMillis(), describe(o));
        } catch (RuntimeException e) {
            LOG.warn("redelivery of {} failed; tried again in {} s: {}", dataset,
                    config.daemon().redeliverSeconds(), e.toString());
        }
    }

    /** Per sink: delivered and failed in this firing, pending and dead-lettered after it. */
    static String describe(Deliveries.Outcome o) {
        StringBuilder sb = new StringBuilder();
        for (Deliveries.SinkOutcome s : o.sinks()) {
            if (sb.length() > 0) {
                sb.append("; ");
            }
            sb.append(s.sink()).append(" delivered ").append(s.delivered()).append(", failed ").append(s.failed())
                    .append(", pending ").append(s.pending()).append(", dead ").append(s.dead());
        }
        return sb.toString();
    }

    Path latestDigest() {
        return deliveries.latestDigest();
    }

    /** Stops taking new firings and waits for the one in progress to finish (its run commits or rolls back). */
    @Override
    public void close() {
        try {
            if (scheduler != null) {
                scheduler.shutdown(true);
            }
        } catch (SchedulerException e) {
            LOG.warn("scheduler shutdown: {}", e.toString());
        }
        if (status != null) {
            status.stop();
        }
        if (probe != null) {
            probe.close();
        }
        RegisteredConnectionProvider.unregister(registryKey);
        quartzPool.close();
    }

    /** For tests: the scheduler's instance id. */
    String instanceId() throws SchedulerException {
        return scheduler.getSchedulerInstanceId();
    }

    /** Told when each firing of a dataset starts and ends (after its retries); for tests. */
    interface FiringListener {
        FiringListener NONE = new FiringListener() {
        };

        default void started(String dataset) {
        }

        default void finished(String dataset, boolean succeeded) {
        }
    }

    void firingListener(FiringListener listener) {
        this.firingListener = listener == null ? FiringListener.NONE : listener;
    }

    JobKey jobKey(String dataset) {
        return JobKey.jobKey(dataset, GROUP);
    }
}
