package org.wavewarden.cli;

import org.wavewarden.daemon.Daemon;
import org.wavewarden.daemon.Deliveries;
import org.wavewarden.daemon.Sinks;
import org.wavewarden.pipeline.Session;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

import java.io.PrintWriter;
import java.time.Clock;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

@Command(name = "run", mixinStandardHelpOptions = true,
        description = "Run the daemon: judge each dataset's new waves on its schedule (Quartz cron, clustered job"
                + " store in the results database), deliver alerts and write digests. SIGTERM stops it gracefully:"
                + " the run in progress commits or rolls back. With --once: exit 3 when a database stayed"
                + " unreachable, 5 when a delivery is left failing (pending or dead-lettered; see 'outbox list').")
final class RunCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Option(names = "--once", description = "one firing of every dataset, then exit (for an existing scheduler)")
    boolean once;
    @Option(names = "--instance-id", paramLabel = "ID", description = "cluster instance id (default: host name and time)")
    String instanceId;
    @Option(names = "--webhook-timeout", paramLabel = "SECONDS", defaultValue = "5",
            description = "how long one webhook request may take, connection included (default: ${DEFAULT-VALUE})")
    int webhookTimeoutSeconds;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        if (webhookTimeoutSeconds < 1) {
            throw new org.wavewarden.config.ConfigException("--webhook-timeout", "expected at least 1 second but got "
                    + webhookTimeoutSeconds);
        }
        Session s = config.open(c -> Preflight.run(c, System.getenv(), !once));
        Daemon daemon = new Daemon(s, Clock.systemUTC(), Daemon.Retry.DEFAULT, Sinks.fromConfig(s,
                Sinks.DAEMON_RETRY, Duration.ofSeconds(webhookTimeoutSeconds)));
        var out = spec.commandLine().getOut();
        if (once) {
            try (s; daemon) {
                return report(daemon.runOnce(), out, () -> Main.firingFailed(s));
            }
        }
        CountDownLatch stopped = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            daemon.close();
            s.close();
            stopped.countDown();
        }, "wavewarden-shutdown"));
        daemon.start(instanceId, s.config().daemon().clusterCheckinMillis());
        out.println("daemon running; status on " + s.config().daemon().httpBind() + ":" + daemon.statusPort()
                + " (/health, /metrics, /digest)");
        out.flush();
        stopped.await();
        return Main.OK;
    }

    /** Prints what each dataset's firing did and returns the exit code it comes to. */
    static int report(List<Daemon.FiringReport> firings, PrintWriter out, java.util.function.IntSupplier failedCode) {
        boolean unreachable = false;
        boolean failing = false;
        for (Daemon.FiringReport f : firings) {
            if (!f.judged()) {
                out.println(f.dataset() + ": the firing failed after its retries; see the log");
                unreachable = true;
                continue;
            }
            out.println(f.dataset() + ": " + f.wavesFound() + " wave(s) found, " + f.wavesJudged() + " judged, "
                    + f.alerts() + " alert(s)");
            printDeliveries(f.deliveries(), out);
            failing |= f.deliveryLeftFailing();
        }
        if (unreachable) {
            // 3 when a database does not answer now, else 4: the exit code says which kind of failure it was.
            return failedCode.getAsInt();
        }
        if (failing) {
            out.println("a delivery is left failing; it is retried by the next firing ('outbox list' shows what is"
                    + " dead-lettered, 'outbox replay' sends it now)");
            return Main.DELIVERY_FAILING;
        }
        out.println("one firing of every dataset completed; everything delivered");
        return Main.OK;
    }

    static void printDeliveries(Deliveries.Outcome o, PrintWriter out) {
        for (Deliveries.SinkOutcome s : o.sinks()) {
            out.println("    " + s.sink() + ": delivered " + s.delivered() + ", failed " + s.failed() + ", pending "
                    + s.pending() + ", dead " + s.dead());
        }
    }
}
