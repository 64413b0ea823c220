package org.wavewarden.cli;

import org.wavewarden.db.EmbeddedServer;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;

@Command(name = "server", mixinStandardHelpOptions = true,
        description = "Run a PostgreSQL server on this machine from the packaged binaries, for trying Wavewarden on"
                + " your own files without a database server of your own. It listens on 127.0.0.1 only, keeps its"
                + " data in --data-dir between runs, and stops with Ctrl-C. Not for production: use your own"
                + " PostgreSQL server there.")
final class ServerCommand implements Callable<Integer> {

    @Option(names = "--data-dir", required = true, paramLabel = "DIR",
            description = "folder for the server's data (created on first use, reused after)")
    Path dataDir;

    @Option(names = "--port", paramLabel = "PORT", defaultValue = "54329",
            description = "port on 127.0.0.1 (default: ${DEFAULT-VALUE})")
    int port;

    @picocli.CommandLine.Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() throws InterruptedException {
        if (port < 1 || port > 65535) {
            throw new org.wavewarden.config.ConfigException("--port", "expected a port from 1 to 65535, got " + port);
        }
        EmbeddedServer server = EmbeddedServer.start(dataDir.toAbsolutePath(), port);
        CountDownLatch stopped = new CountDownLatch(1);
        Runtime.getRuntime().addShutdownHook(new Thread(() -> {
            server.close();
            stopped.countDown();
        }, "server-stop"));
        var o = spec.commandLine().getOut();
        o.println("PostgreSQL is running on 127.0.0.1:" + server.port() + ", data in " + dataDir.toAbsolutePath());
        o.println("In your configuration:  jdbcUrl: \"jdbc:postgresql://127.0.0.1:" + server.port()
                + "/postgres\"   user: postgres   (no password: the server trusts local connections)");
        o.println("Stop it with Ctrl-C.");
        o.flush();
        stopped.await();
        return Main.OK;
    }
}
