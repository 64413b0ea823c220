package org.wavewarden.soak;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;

/**
 * The daemon as an operator runs it: {@code wavewarden run --config FILE} in a JVM of its own, on this JVM's class
 * path, its output appended to one log across restarts. The soak kills it with SIGKILL and starts it again, and,
 * like a service manager's restart policy, starts it again after it exits by itself (say, with exit code 3 because
 * the database was cut as it started). Every start and exit is written into the log.
 */
final class DaemonProcess implements AutoCloseable {

    /** Exit code of a config error: the soak wrote a config the daemon refuses, so restarting cannot help. */
    static final int CONFIG_ERROR = 2;
    /**
     * The daemon's webhook timeout ({@code run --webhook-timeout}), inside the receiver's slow answers (1 to 3 s):
     * some requests then time out at the sender after the receiver has taken them, and come back under the same
     * idempotency key, the case the key exists for.
     */
    static final int WEBHOOK_TIMEOUT_SECONDS = 2;
    private static final Duration RESTART_AFTER_EXIT = Duration.ofSeconds(2);

    private final Path config;
    private final Path log;
    private final Map<String, String> environment;
    /** Volatile for {@link #destroyNow}, which runs in a shutdown hook without the lock. */
    private volatile Process process;
    private boolean held;
    private Instant exitedAt;
    private int starts;
    private final List<Integer> exits = new ArrayList<>();

    DaemonProcess(Path config, Path log, Map<String, String> environment) {
        this.config = config;
        this.log = log;
        this.environment = Map.copyOf(environment);
    }

    synchronized void start() {
        if (process != null && process.isAlive()) {
            return;
        }
        starts++;
        note("start " + starts);
        List<String> cmd = new ArrayList<>();
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        cmd.add("-Xmx256m");
        cmd.add("-XX:+UseSerialGC");
        cmd.add("-cp");
        cmd.add(System.getProperty("java.class.path"));
        cmd.add("org.wavewarden.cli.Main");
        cmd.add("run");
        cmd.add("--config");
        cmd.add(config.toString());
        // One instance id across restarts: Quartz recovers a firing its own id left behind at its first check-in,
        // instead of waiting for the cluster to declare a stranger dead.
        cmd.add("--instance-id");
        cmd.add("soak");
        cmd.add("--webhook-timeout");
        cmd.add(Integer.toString(WEBHOOK_TIMEOUT_SECONDS));
        ProcessBuilder pb = new ProcessBuilder(cmd).redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.appendTo(log.toFile()));
        pb.environment().putAll(environment);
        try {
            process = pb.start();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot start the daemon's JVM", e);
        }
        held = false;
        exitedAt = null;
    }

    /** SIGKILL, and no restart until {@link #start}. */
    synchronized void kill() throws InterruptedException {
        held = true;
        if (process != null && process.isAlive()) {
            process.destroyForcibly();
            process.waitFor();
            note("killed with SIGKILL");
        }
    }

    /**
     * Restarts a daemon that exited by itself, {@link #RESTART_AFTER_EXIT} after it did; not one the soak holds
     * down. Returns the exit code when the daemon is found to have just exited.
     */
    synchronized Integer superviseOnce() {
        if (held || process == null) {
            return null;
        }
        if (process.isAlive()) {
            return null;
        }
        Integer code = null;
        if (exitedAt == null) {
            code = process.exitValue();
            exits.add(code);
            exitedAt = Instant.now();
            note("exited by itself with code " + code);
            if (code == CONFIG_ERROR) {
                throw new IllegalStateException("the daemon refused the soak's config (exit 2); see " + log);
            }
        }
        if (Duration.between(exitedAt, Instant.now()).compareTo(RESTART_AFTER_EXIT) >= 0) {
            start();
        }
        return code;
    }

    /** SIGTERM, as a service manager stops it; SIGKILL if it has not exited within {@code grace}. */
    synchronized int stop(Duration grace) throws InterruptedException {
        held = true;
        if (process == null) {
            return -1;
        }
        process.destroy();
        if (!process.waitFor(grace.toMillis(), TimeUnit.MILLISECONDS)) {
            note("did not stop within " + grace.toSeconds() + " s of SIGTERM; SIGKILL");
            process.destroyForcibly();
            process.waitFor();
        }
        note("stopped, exit code " + process.exitValue());
        return process.exitValue();
    }

    synchronized int starts() {
        return starts;
    }

    /** Exit codes of the times the daemon exited by itself. */
    synchronized List<Integer> exits() {
        return List.copyOf(exits);
    }

    /** The last lines of the log, for an error message. */
    String tail(int lines) {
        try {
            List<String> all = Files.exists(log) ? Files.readAllLines(log, StandardCharsets.UTF_8) : List.of();
            return String.join("\n", all.subList(Math.max(0, all.size() - lines), all.size()));
        } catch (IOException | UncheckedIOException e) {
            return "(cannot read " + log + ": " + e.getMessage() + ")";
        }
    }

    private void note(String what) {
        try {
            Files.writeString(log, "---- soak: daemon " + what + " at " + Instant.now() + "\n",
                    StandardCharsets.UTF_8, StandardOpenOption.CREATE, StandardOpenOption.APPEND);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + log, e);
        }
    }

    /**
     * SIGKILL without waiting for the lock: for the soak's shutdown hook, so that a soak stopped with Ctrl-C or
     * SIGTERM leaves no daemon behind.
     */
    void destroyNow() {
        Process p = process;
        if (p != null) {
            p.destroyForcibly();
        }
    }

    @Override
    public synchronized void close() throws InterruptedException {
        if (process != null && process.isAlive()) {
            kill();
        }
    }
}
