package org.wavewarden.cli;

import org.wavewarden.config.ConfigException;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.console.ConsoleApp;
import org.wavewarden.daemon.Router;
import org.wavewarden.daemon.StatusServer;
import org.wavewarden.pipeline.Session;
import org.wavewarden.store.ResultsSchema;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

import java.io.IOException;
import java.io.PrintWriter;
import java.time.Clock;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

@Command(name = "console", mixinStandardHelpOptions = true,
        description = {"Serve the web console against an existing results schema, without scheduling anything: for"
                + " reading and acting on the history where no daemon runs, or beside one. The people who may log"
                + " in come from the configuration's console section (console.enabled is not needed here).",
                "It listens on daemon.httpBind and daemon.httpPort unless --bind or --port say otherwise, prints"
                        + " the address and serves until interrupted (Ctrl-C). It changes no schema: a results schema"
                        + " that is missing or older than this version is refused (run 'init-db' first)."})
final class ConsoleCommand implements Callable<Integer> {

    @Mixin
    ConfigOption config;
    @Option(names = "--bind", paramLabel = "ADDRESS", description = "address to listen on (default: daemon.httpBind,"
            + " which is 127.0.0.1 unless configured)")
    String bind;
    @Option(names = "--port", paramLabel = "PORT", description = "port to listen on, 0 for any free one (default:"
            + " daemon.httpPort)")
    Integer port;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws IOException, InterruptedException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        WardenConfig c = config.load();
        try (Session s = Session.open(c, null, System.getenv())) {
            Running running = serve(s, bind, port);
            if (running == null) {
                err.println(refusal(c));
                return Main.USAGE;
            }
            CountDownLatch stopped = new CountDownLatch(1);
            Thread hook = new Thread(() -> {
                running.server().stop();
                stopped.countDown();
            }, "console-stop");
            Runtime.getRuntime().addShutdownHook(hook);
            out.println("The console is at " + running.url());
            out.println("Stop it with Ctrl-C.");
            out.flush();
            try {
                stopped.await();
            } finally {
                running.server().stop();
            }
            return Main.OK;
        }
    }

    /** A console being served, and where. */
    record Running(StatusServer server, String url) {
    }

    /**
     * Starts the console over the session's results schema, or returns null when the schema is missing or behind
     * this version (the console reads it as this version writes it, and leaves migrating to {@code init-db}).
     */
    static Running serve(Session s, String bindOption, Integer portOption) throws IOException {
        WardenConfig c = s.config();
        String address = bindOption == null ? c.daemon().httpBind() : bindOption;
        int p = portOption == null ? c.daemon().httpPort() : portOption;
        if (p < 0 || p > 65535) {
            throw new ConfigException(portOption == null ? "daemon.httpPort" : "--port", "the console needs a port"
                    + " from 0 (any free one) to 65535, got " + p);
        }
        if (ResultsSchema.pending(s.resultsDataSource(), c.results().schema()) > 0) {
            return null;
        }
        Router router = new ConsoleApp(c, s.store().jdbi(), Clock.systemUTC(), null).install(new Router());
        StatusServer server = StatusServer.start(address, p, router);
        String host = address.contains(":") ? "[" + address + "]" : address;
        return new Running(server, "http://" + host + ":" + server.port() + "/console");
    }

    static String refusal(WardenConfig c) {
        return "the results schema '" + c.results().schema() + "' is missing or older than this version; the console"
                + " changes no schema: run 'init-db --config FILE' first";
    }
}
