package org.wavewarden.cli;

import org.wavewarden.daemon.Daemon;
import org.wavewarden.pipeline.Session;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

import java.time.Clock;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

@Command(name = "run", mixinStandardHelpOptions = true,
        description = "Run the daemon: judge each dataset's new waves on its schedule (Quartz cron, clustered job"
                + " store in the results database), deliver alerts and write digests. SIGTERM stops it gracefully:"
                + " the run in progress commits or rolls back.")
final class RunCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Option(names = "--once", description = "one firing of every dataset, then exit (for an existing scheduler)")
    boolean once;
    @Option(names = "--instance-id", paramLabel = "ID", description = "cluster instance id (default: host name and time)")
    String instanceId;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws Exception {
        Session s = config.open(c -> Preflight.run(c, System.getenv(), !once));
        Daemon daemon = new Daemon(s, Clock.systemUTC(), Daemon.Retry.DEFAULT, Deliveries.from(s));
        var out = spec.commandLine().getOut();
        if (once) {
            try (s; daemon) {
                boolean ok = daemon.runOnce();
                out.println(ok ? "one firing of every dataset completed" : "a firing failed; see the log");
                return ok ? Main.OK : Main.firingFailed(s);
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

    /** The alert sinks configured per dataset. */
    static final class Deliveries {
        private Deliveries() {
        }

        static java.util.Map<String, List<org.wavewarden.deliver.sink.AlertSink>> from(Session s) {
            return org.wavewarden.daemon.Sinks.fromConfig(s);
        }
    }
}
