package org.wavewarden.testing;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;

/** The real command line in a child JVM, so a test can kill it with SIGKILL as an operating system would. */
public final class ChildDaemon implements AutoCloseable {

    private final Process process;
    private final Path log;

    private ChildDaemon(Process process, Path log) {
        this.process = process;
        this.log = log;
    }

    /** Starts {@code wavewarden ARGS} with the given system properties (fault points). */
    public static ChildDaemon start(Path dir, String name, List<String> properties, String... args) throws IOException {
        return start(dir, name, properties, java.util.Map.of(), args);
    }

    /** The same with variables added to the child's environment (a webhook's secret). */
    public static ChildDaemon start(Path dir, String name, List<String> properties,
                                    java.util.Map<String, String> environment, String... args) throws IOException {
        Path log = dir.resolve(name + ".log");
        List<String> cmd = new ArrayList<>();
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        cmd.add("-Xmx256m");
        cmd.addAll(properties);
        cmd.add("-cp");
        cmd.add(System.getProperty("java.class.path"));
        cmd.add("org.wavewarden.cli.Main");
        cmd.addAll(List.of(args));
        ProcessBuilder pb = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile());
        pb.environment().putAll(environment);
        Process p = pb.start();
        return new ChildDaemon(p, log);
    }

    public String output() {
        try {
            return Files.exists(log) ? Files.readString(log) : "";
        } catch (IOException e) {
            return "";
        }
    }

    /** Waits until the child printed {@code marker}; fails with its output if it did not in time or died. */
    public void awaitOutput(String marker, Duration timeout) throws InterruptedException {
        long end = System.nanoTime() + timeout.toNanos();
        while (System.nanoTime() < end) {
            if (output().contains(marker)) {
                return;
            }
            if (!process.isAlive()) {
                throw new AssertionError("child exited (" + process.exitValue() + ") before printing '" + marker
                        + "':\n" + output());
            }
            Thread.sleep(100);
        }
        throw new AssertionError("child did not print '" + marker + "' in " + timeout + ":\n" + output());
    }

    /** SIGKILL: no shutdown hook, no rollback by the process, exactly as a crash. */
    public void kill() throws InterruptedException {
        process.destroyForcibly();
        process.waitFor();
    }

    public int waitFor(Duration timeout) throws InterruptedException {
        if (!process.waitFor(timeout.toMillis(), java.util.concurrent.TimeUnit.MILLISECONDS)) {
            process.destroyForcibly();
            throw new AssertionError("child did not exit in " + timeout + ":\n" + output());
        }
        return process.exitValue();
    }

    @Override
    public void close() throws InterruptedException {
        if (process.isAlive()) {
            kill();
        }
    }
}
