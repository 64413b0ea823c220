package org.wavewarden.cli;

import org.wavewarden.config.ConfigException;
import org.wavewarden.config.DaemonConfig;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.config.SinkSettings;
import org.wavewarden.deliver.sink.EmailSink;
import org.wavewarden.deliver.sink.SinkFactory;

import java.io.IOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.UnknownHostException;
import java.util.Map;

/**
 * The checks of {@code run} that need the machine rather than the database: each webhook's secret and each
 * e-mail relay's credentials are in the environment (and a relay's CA file is readable) and the status port can be bound. They run before any connection is opened, so a daemon that could
 * not work refuses to start with the key to fix (exit 2) instead of failing later with a stack trace.
 */
final class Preflight {

    private Preflight() {
    }

    /**
     * @param statusServer whether the status endpoint will be started ({@code run} without {@code --once})
     */
    static void run(WardenConfig config, Map<String, String> env, boolean statusServer) {
        for (int i = 0; i < config.datasets().size(); i++) {
            DatasetConfig d = config.datasets().get(i);
            if (d.alerts().webhook() != null) {
                String key = "datasets[" + i + "].alerts.webhook.secretEnv";
                try {
                    SinkFactory.secret(d.alerts().webhook().secretEnv(), env::get);
                } catch (IllegalArgumentException e) {
                    throw new ConfigException(key, "environment variable " + d.alerts().webhook().secretEnv()
                            + " is not set or empty; it must hold the webhook's shared secret");
                }
            }
            if (d.alerts().email() != null) {
                email(d.alerts().email(), "datasets[" + i + "].alerts.email", env);
            }
        }
        if (statusServer) {
            portIsFree(config.daemon());
        }
    }

    /** The relay's credentials are in the environment and its CA file holds certificates. */
    static void email(SinkSettings.Email e, String path, Map<String, String> env) {
        for (String[] v : new String[][] {{"userEnv", e.userEnv()}, {"passwordEnv", e.passwordEnv()}}) {
            if (v[1] != null && (env.get(v[1]) == null || env.get(v[1]).isEmpty())) {
                throw new ConfigException(path + "." + v[0], "environment variable " + v[1] + " is not set or empty;"
                        + " it must hold the SMTP relay's " + (v[0].equals("userEnv") ? "user name" : "password"));
            }
        }
        if (e.caFile() != null) {
            try {
                EmailSink.trusting(java.nio.file.Path.of(e.caFile()));
            } catch (IllegalArgumentException x) {
                throw new ConfigException(path + ".caFile", x.getMessage().replaceFirst("^caFile: ", ""));
            }
        }
    }

    /**
     * Binds the configured address and port once and lets go: a port already taken (another daemon, another
     * program) is reported with its key before the daemon writes anything. Port 0 (any free port) and -1 (no
     * endpoint) need no check.
     */
    static void portIsFree(DaemonConfig daemon) {
        if (daemon.httpPort() <= 0) {
            return;
        }
        InetAddress address;
        try {
            address = InetAddress.getByName(daemon.httpBind());
        } catch (UnknownHostException e) {
            throw new ConfigException("daemon.httpBind", "cannot resolve '" + daemon.httpBind() + "' to an address"
                    + " of this machine");
        }
        try (ServerSocket probe = new ServerSocket()) {
            probe.bind(new InetSocketAddress(address, daemon.httpPort()));
        } catch (IOException e) {
            throw new ConfigException("daemon.httpPort", "cannot listen on " + daemon.httpBind() + ":"
                    + daemon.httpPort() + " (" + e.getMessage() + "); is another program or daemon using the port?"
                    + " Choose another port, 0 for any free one, or -1 for no status endpoint");
        }
    }
}
