package org.wavewarden.cli;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.daemon.Deliveries;
import org.wavewarden.daemon.Sinks;
import org.wavewarden.pipeline.Session;
import org.wavewarden.store.OutboxStore;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

import java.time.Clock;
import java.util.List;
import java.util.concurrent.Callable;

@Command(name = "outbox", mixinStandardHelpOptions = true,
        description = "What committed runs still owe their sinks: list the dead letters, or replay them now.",
        subcommands = {OutboxCommand.ListDead.class, OutboxCommand.Replay.class})
final class OutboxCommand implements Runnable {

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    /** {@code --dataset} and {@code --sink}, both optional filters. */
    static final class Filter {
        @Option(names = {"-d", "--dataset"}, paramLabel = "NAME", description = "only this dataset")
        String dataset;
        @Option(names = "--sink", paramLabel = "SINK", description = "only this sink, by the name 'outbox list' shows")
        String sink;
    }

    @Command(name = "list", mixinStandardHelpOptions = true,
            description = "List dead-lettered outputs: dataset, sink, what, failures and the last error.")
    static final class ListDead implements Callable<Integer> {
        @Mixin
        ConfigOption config;
        @Mixin
        Filter filter;
        @picocli.CommandLine.Spec
        picocli.CommandLine.Model.CommandSpec spec;

        @Override
        public Integer call() {
            try (Session s = Session.open(config.load(), null, System.getenv())) {
                s.migrate();
                var out = spec.commandLine().getOut();
                List<OutboxStore.Row> dead = s.store().outbox().dead(filter.dataset, filter.sink);
                for (OutboxStore.Row r : dead) {
                    out.println(r.dataset() + "\t" + r.sink() + "\t" + r.product() + " " + r.item() + "\tfailed "
                            + r.failedAttempts() + " time(s)\t" + oneLine(r.lastError()));
                }
                out.println(dead.size() + " dead letter(s)");
                return Main.OK;
            }
        }
    }

    @Command(name = "replay", mixinStandardHelpOptions = true,
            description = "Send dead-lettered outputs again now, with everything else that is owed; exit 5 when some"
                    + " are still not delivered.")
    static final class Replay implements Callable<Integer> {
        @Mixin
        ConfigOption config;
        @Mixin
        Filter filter;
        @picocli.CommandLine.Spec
        picocli.CommandLine.Model.CommandSpec spec;

        @Override
        public Integer call() {
            try (Session s = config.open()) {
                s.migrate();
                var out = spec.commandLine().getOut();
                int due = s.store().outbox().replay(filter.dataset, filter.sink);
                out.println(due + " dead letter(s) due again");
                Deliveries deliveries = new Deliveries(s, Sinks.fromConfig(s), Clock.systemUTC(),
                        Deliveries.DEAD_LETTER_BACKOFF);
                boolean failing = false;
                for (DatasetConfig d : s.config().datasets()) {
                    if (filter.dataset != null && !filter.dataset.equals(d.name())) {
                        continue;
                    }
                    Deliveries.Outcome o = deliveries.deliver(d.name());
                    out.println(d.name() + ":");
                    RunCommand.printDeliveries(o, out);
                    failing |= !o.owesNothing();
                }
                return failing ? Main.DELIVERY_FAILING : Main.OK;
            }
        }
    }

    static String oneLine(String text) {
        return text == null ? "" : text.replaceAll("\\s+", " ");
    }
}
