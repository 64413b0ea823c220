package org.wavewarden.daemon;

import com.zaxxer.hikari.HikariDataSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.sql.Connection;
import java.sql.SQLException;
import java.time.Duration;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;

/**
 * Checks at a fixed interval that the source and results databases answer, and tells the metrics, so that
 * {@code /health} shows an outage while it lasts. Firings alone cannot: none starts while Quartz cannot reach its
 * job store, and one in progress fails only after its pool's connection timeout. Each database is checked on a
 * one-connection pool of its own with a short timeout, apart from the working pools, so a pool kept busy by long
 * scans is never mistaken for an outage.
 */
final class DatabaseProbe implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(DatabaseProbe.class);

    private final Map<String, HikariDataSource> pools;
    private final DaemonMetrics metrics;
    private final int validSeconds;
    private final ScheduledExecutorService timer;
    private volatile String lastProblem;

    /**
     * @param pools    one small pool per database, by name ("source", "results"); the probe closes them
     * @param interval time between checks
     * @param timeout  how long a check may take before the database counts as unreachable (the pools'
     *                 connection timeout should not exceed it)
     */
    DatabaseProbe(Map<String, HikariDataSource> pools, DaemonMetrics metrics, Duration interval, Duration timeout) {
        if (interval.isNegative() || interval.isZero()) {
            throw new IllegalArgumentException("interval: expected a positive duration but got " + interval);
        }
        this.pools = new LinkedHashMap<>(pools);
        this.metrics = metrics;
        this.validSeconds = (int) Math.max(1, (timeout.toMillis() + 999) / 1000);
        this.timer = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "wavewarden-database-probe");
            t.setDaemon(true);
            return t;
        });
        timer.scheduleWithFixedDelay(this::check, 0, interval.toMillis(), TimeUnit.MILLISECONDS);
    }

    void check() {
        String problem = null;
        String unreachable = null;
        for (Map.Entry<String, HikariDataSource> e : pools.entrySet()) {
            HikariDataSource pool = e.getValue();
            Connection c;
            try {
                c = pool.getConnection();
            } catch (SQLException | RuntimeException ex) {
                // No connection to blame: the pool is still making one (a slow start after an outage may take
                // longer than this check waits) or cannot reach the database; either way the next check asks again.
                problem = "the " + e.getKey() + " database is unreachable: " + ex.getMessage();
                unreachable = e.getKey();
                break;
            }
            try (c) {
                if (!c.isValid(validSeconds)) {
                    problem = "the " + e.getKey() + " database did not answer";
                }
            } catch (SQLException | RuntimeException ex) {
                problem = "the " + e.getKey() + " database is unreachable: " + ex.getMessage();
            }
            if (problem != null) {
                // This connection may be the one the outage broke: the next check gets a new one rather than
                // asking the pool to vouch for it again. Only this one: evicting the pool's others as well would
                // throw away a connection just made, and under load the probe then never catches one.
                pool.evictConnection(c);
                unreachable = e.getKey();
                break;
            }
        }
        metrics.unreachableDatabase(unreachable);
        if (problem != null && lastProblem == null) {
            LOG.warn("{}; /health reports degraded until it answers again", problem);
        } else if (problem == null && lastProblem != null) {
            LOG.info("the databases answer again");
        }
        lastProblem = problem;
    }

    @Override
    public void close() {
        timer.shutdownNow();
        try {
            timer.awaitTermination(5, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        pools.values().forEach(HikariDataSource::close);
    }
}
