package org.wavewarden.soak;

import org.wavewarden.deliver.Json;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.function.LongSupplier;

/**
 * Injects one fault at a time at seeded random moments until the deadline, each bounded in time and undone before
 * the next: the database taken away (at a random moment, right after a wave was added, or while the daemon holds a
 * write transaction in the results schema), the webhook receiver down, answering 500 or slow, and the daemon
 * killed with SIGKILL (at a random moment, or while one of its webhook requests is in flight) and started again.
 * Every fault is logged with its time, kind and duration, to the console and as a JSON line.
 */
final class FaultInjector {

    /** The kinds of fault, as the summary names them. */
    enum Kind {
        DB_CUT("db-cut"),
        DB_CUT_AFTER_NEW_WAVE("db-cut-after-new-wave"),
        DB_CUT_IN_RESULTS_TRANSACTION("db-cut-in-results-transaction"),
        RECEIVER_DOWN("receiver-down"),
        RECEIVER_500("receiver-500"),
        RECEIVER_SLOW("receiver-slow"),
        DAEMON_SIGKILL("daemon-sigkill"),
        DAEMON_SIGKILL_DURING_DELIVERY("daemon-sigkill-during-delivery");

        final String label;

        Kind(String label) {
            this.label = label;
        }
    }

    /** One fault injected: when it began, how long it lasted, what exactly was done. */
    record Fault(Instant at, String kind, long millis, String detail) {
    }

    private static final Duration MIN_GAP = Duration.ofSeconds(3);
    private static final Duration MAX_GAP = Duration.ofSeconds(10);
    /** The longest database outage: within the daemon's retries of a firing, yet past Quartz's own retry. */
    private static final Duration DB_OUTAGE = Duration.ofSeconds(20);
    /**
     * The longest receiver outage or run of 500s: receivers are down for a minute when they are redeployed,
     * longer than a sender's retries of one request last, so a sender must keep what it could not deliver.
     */
    private static final Duration RECEIVER_OUTAGE = Duration.ofSeconds(60);
    /** How long a targeted fault waits for its moment before it is given up (and logged as not injected). */
    private static final Duration TARGET_WAIT = Duration.ofSeconds(15);
    /** Alerts come in bursts a few waves apart, so a webhook request is waited for longer. */
    private static final Duration DELIVERY_WAIT = Duration.ofSeconds(45);

    private final SplittableRandom random;
    private final TcpProxy proxy;
    private final WebhookReceiver receiver;
    private final DaemonProcess daemon;
    private final Connection watch;
    private final String resultsSchema;
    private final LongSupplier wavesAdded;
    private final Path log;
    private final PrintWriter out;
    private final Instant soakStart;
    private final List<Fault> faults = new ArrayList<>();
    private volatile Instant deadline = Instant.MAX;

    /**
     * @param watch      a connection of the soak's own, straight to the server, to see the daemon's sessions
     * @param wavesAdded how many waves the producer has written so far
     */
    FaultInjector(long seed, TcpProxy proxy, WebhookReceiver receiver, DaemonProcess daemon, Connection watch,
                  String resultsSchema, LongSupplier wavesAdded, Path log, PrintWriter out, Instant soakStart) {
        this.random = new SplittableRandom(seed);
        this.proxy = proxy;
        this.receiver = receiver;
        this.daemon = daemon;
        this.watch = watch;
        this.resultsSchema = resultsSchema;
        this.wavesAdded = wavesAdded;
        this.log = log;
        this.out = out;
        this.soakStart = soakStart;
    }

    /** Injects faults until {@code until}; every fault is undone when this returns. */
    void run(Instant until) throws InterruptedException {
        deadline = until;
        try {
            while (pause(between(MIN_GAP, MAX_GAP))) {
                inject(Kind.values()[random.nextInt(Kind.values().length)]);
            }
        } finally {
            undoAll();
        }
    }

    private void inject(Kind kind) throws InterruptedException {
        switch (kind) {
            case DB_CUT -> cutDatabase(kind, between(Duration.ofSeconds(1), DB_OUTAGE), "at random");
            case DB_CUT_AFTER_NEW_WAVE -> {
                if (awaitNewWave()) {
                    pause(between(Duration.ZERO, Duration.ofSeconds(2)));
                    cutDatabase(kind, between(Duration.ofSeconds(1), DB_OUTAGE), "a wave was just added");
                }
            }
            case DB_CUT_IN_RESULTS_TRANSACTION -> {
                String seen = awaitNewWave() ? awaitResultsWrite() : null;
                if (seen != null) {
                    cutDatabase(kind, between(Duration.ofSeconds(1), DB_OUTAGE),
                            "the daemon held a write transaction, last statement: " + seen);
                } else {
                    note(kind, "not injected: no write transaction seen in " + TARGET_WAIT.toSeconds() + " s");
                }
            }
            case RECEIVER_DOWN -> {
                Duration d = between(Duration.ofSeconds(3), RECEIVER_OUTAGE);
                Instant t = Instant.now();
                receiver.down();
                pause(d);
                up();
                log(new Fault(t, kind.label, millisSince(t), "listener closed, connections refused"));
            }
            case RECEIVER_500 -> {
                Duration d = between(Duration.ofSeconds(3), RECEIVER_OUTAGE);
                Instant t = Instant.now();
                receiver.fail();
                pause(d);
                receiver.accept();
                log(new Fault(t, kind.label, millisSince(t), "every request answered 500"));
            }
            case RECEIVER_SLOW -> {
                Duration d = between(Duration.ofSeconds(5), Duration.ofSeconds(20));
                Duration delay = between(Duration.ofSeconds(1), Duration.ofSeconds(3));
                Instant t = Instant.now();
                receiver.slow(delay);
                pause(d);
                receiver.accept();
                log(new Fault(t, kind.label, millisSince(t), "every request answered after " + delay.toMillis()
                        + " ms"));
            }
            case DAEMON_SIGKILL -> killAndRestart(kind, "at random", Instant.now());
            case DAEMON_SIGKILL_DURING_DELIVERY -> {
                WebhookReceiver.Hold hold = receiver.holdNext();
                boolean arrived = hold.awaitArrival(DELIVERY_WAIT);
                if (!arrived) {
                    receiver.cancel(hold);
                    note(kind, "not injected: no webhook request in " + DELIVERY_WAIT.toSeconds() + " s");
                    return;
                }
                Instant t = Instant.now();
                daemon.kill();
                hold.release();
                killAndRestart(kind, "while a webhook request was in flight (then answered 503)", t);
            }
        }
    }

    private void cutDatabase(Kind kind, Duration outage, String when) throws InterruptedException {
        Instant t = Instant.now();
        proxy.cut();
        pause(outage);
        proxy.restore();
        log(new Fault(t, kind.label, millisSince(t), when + "; every connection dropped, new ones refused"));
    }

    private void killAndRestart(Kind kind, String when, Instant t) throws InterruptedException {
        daemon.kill();
        pause(between(Duration.ofMillis(500), Duration.ofSeconds(3)));
        daemon.start();
        log(new Fault(t, kind.label, millisSince(t), "SIGKILL " + when + ", started again"));
    }

    private boolean awaitNewWave() throws InterruptedException {
        long before = wavesAdded.getAsLong();
        Instant end = Instant.now().plus(TARGET_WAIT);
        while (wavesAdded.getAsLong() == before) {
            if (!Instant.now().isBefore(end) || !Instant.now().isBefore(deadline)) {
                return false;
            }
            Thread.sleep(20);
        }
        return true;
    }

    /**
     * Polls the server's activity view for a daemon session holding a transaction that has written in the results
     * schema (it has a transaction id); Quartz's own bookkeeping is left out. Returns the session's last statement,
     * cut short, or null when none was seen in time.
     */
    private String awaitResultsWrite() throws InterruptedException {
        Instant end = Instant.now().plus(TARGET_WAIT);
        // The daemon writes schema-qualified, quoted names; the quote and the dot keep a longer schema name (such
        // as the source's) from matching.
        String schemaText = "%\"" + resultsSchema + "\".%";
        try (PreparedStatement ps = watch.prepareStatement("SELECT left(query, 80) FROM pg_stat_activity"
                + " WHERE pid <> pg_backend_pid() AND datname = current_database() AND backend_xid IS NOT NULL"
                + " AND query ILIKE ? AND query NOT ILIKE '%qrtz%' LIMIT 1")) {
            ps.setString(1, schemaText);
            while (Instant.now().isBefore(end) && Instant.now().isBefore(deadline)) {
                try (ResultSet rs = ps.executeQuery()) {
                    if (rs.next()) {
                        return rs.getString(1).replaceAll("\\s+", " ") + "...";
                    }
                }
                Thread.sleep(5);
            }
        } catch (SQLException e) {
            out.println("soak: cannot read pg_stat_activity: " + e.getMessage());
        }
        return null;
    }

    /** Sleeps for {@code d} or until the deadline, whichever comes first; false when the deadline has passed. */
    private boolean pause(Duration d) throws InterruptedException {
        Instant wake = Instant.now().plus(d);
        if (wake.isAfter(deadline)) {
            wake = deadline;
        }
        long ms = Duration.between(Instant.now(), wake).toMillis();
        if (ms > 0) {
            Thread.sleep(ms);
        }
        return Instant.now().isBefore(deadline);
    }

    private Duration between(Duration min, Duration max) {
        return Duration.ofMillis(random.nextLong(min.toMillis(), max.toMillis() + 1));
    }

    private void up() {
        try {
            receiver.up();
        } catch (IOException e) {
            throw new UncheckedIOException("the webhook receiver cannot listen again", e);
        }
    }

    private void undoAll() {
        proxy.restore();
        receiver.accept();
        up();
        daemon.start();
    }

    private static long millisSince(Instant t) {
        return Duration.between(t, Instant.now()).toMillis();
    }

    private void note(Kind kind, String detail) {
        String line = String.format(Locale.ROOT, "soak: +%s %s %s", clock(Instant.now()), kind.label, detail);
        out.println(line);
        out.flush();
    }

    private synchronized void log(Fault f) {
        faults.add(f);
        out.println(String.format(Locale.ROOT, "soak: +%s fault %-31s %6d ms  %s", clock(f.at()), f.kind(),
                f.millis(), f.detail()));
        out.flush();
        try {
            Files.writeString(log, Json.write(f) + "\n", StandardCharsets.UTF_8, StandardOpenOption.CREATE,
                    StandardOpenOption.APPEND);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + log, e);
        }
    }

    private String clock(Instant t) {
        long s = Duration.between(soakStart, t).toSeconds();
        return String.format(Locale.ROOT, "%02d:%02d", s / 60, s % 60);
    }

    synchronized List<Fault> faults() {
        return List.copyOf(faults);
    }

    /** Faults injected per kind, every kind listed. */
    synchronized Map<String, Integer> counts() {
        Map<String, Integer> m = new LinkedHashMap<>();
        for (Kind k : Kind.values()) {
            m.put(k.label, 0);
        }
        faults.forEach(f -> m.merge(f.kind(), 1, Integer::sum));
        return m;
    }
}
