package org.wavewarden.daemon;

import org.eclipse.jetty.server.HttpConfiguration;
import org.eclipse.jetty.server.HttpConnectionFactory;
import org.eclipse.jetty.server.NetworkConnectionLimit;
import org.eclipse.jetty.server.Server;
import org.eclipse.jetty.server.ServerConnector;
import org.eclipse.jetty.util.thread.QueuedThreadPool;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConfigException;
import org.wavewarden.console.ConsoleApp;
import org.wavewarden.deliver.Json;

import java.io.IOException;
import java.net.BindException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;

/**
 * {@code GET|HEAD /health} (200 ok, 503 degraded, with the reasons and each sink's delivery backlog as JSON),
 * {@code /metrics} (Prometheus text) and {@code /digest} (the latest digest) on an embedded Jetty, at an address
 * that is 127.0.0.1 unless configured otherwise.
 *
 * <p>Jetty reads requests without blocking, so a client that sends half a request and waits holds only its own
 * connection, never a worker thread, and loses it after {@link #IDLE_TIMEOUT}. Workers come from a bounded pool,
 * connections are capped, and request headers are limited in size.
 */
public final class StatusServer {

    private static final Logger LOG = LoggerFactory.getLogger(StatusServer.class);

    /** Workers for requests (Jetty's acceptor and selector take two of them). */
    static final int MAX_THREADS = 16;
    /** How long a connection may send nothing (a stalled or half-sent request) before it is closed. */
    static final Duration IDLE_TIMEOUT = Duration.ofSeconds(10);
    /** Request line and headers together; the endpoints take no large headers. */
    static final int MAX_REQUEST_HEADER_BYTES = 8 * 1024;
    /** Open connections at once; more wait in the operating system's accept queue. */
    static final int MAX_CONNECTIONS = 256;

    private final Server server;
    private final ServerConnector connector;

    private StatusServer(Server server, ServerConnector connector) {
        this.server = server;
        this.connector = connector;
    }

    static StatusServer start(String bind, int port, Daemon daemon) throws IOException {
        return start(bind, port, routes(daemon));
    }

    /** The daemon's endpoints, and the web console's when the configuration enables it. */
    static Router routes(Daemon daemon) {
        Router router = new Router()
                .get("/health", request -> {
                    DaemonMetrics.Health health = daemon.metrics().health();
                    return Router.Reply.of(health.degraded() ? 503 : 200, "application/json",
                            Json.write(health) + "\n");
                })
                .get("/metrics", request -> Router.Reply.of(200, DaemonMetrics.CONTENT_TYPE,
                        daemon.metrics().prometheus()))
                .get("/digest", request -> digest(daemon.latestDigest()));
        if (daemon.config().console().enabled()) {
            new ConsoleApp(daemon.config(), daemon.resultsJdbi(), daemon.clock(), daemon.metrics()::firingLine)
                    .install(router);
        }
        return router;
    }

    private static Router.Reply digest(Path latest) throws IOException {
        if (latest == null || !Files.exists(latest)) {
            return Router.Reply.text(404, "no digest yet\n");
        }
        Path html = latest.resolveSibling("digest.html");
        return Files.exists(html)
                ? new Router.Reply(200, "text/html; charset=utf-8", Files.readAllBytes(html))
                : new Router.Reply(200, "text/markdown; charset=utf-8", Files.readAllBytes(latest));
    }

    /**
     * @throws ConfigException naming {@code daemon.httpPort} when the port is taken, {@code daemon.httpBind} when
     *                         the address is not one of this machine's
     */
    public static StatusServer start(String bind, int port, Router router) throws IOException {
        QueuedThreadPool pool = new QueuedThreadPool(MAX_THREADS, 2, (int) Duration.ofMinutes(1).toMillis());
        pool.setName("wavewarden-http");
        pool.setDaemon(true);
        Server server = new Server(pool);
        HttpConfiguration http = new HttpConfiguration();
        http.setRequestHeaderSize(MAX_REQUEST_HEADER_BYTES);
        http.setIdleTimeout(IDLE_TIMEOUT.toMillis());
        http.setSendServerVersion(false);
        http.setSendXPoweredBy(false);
        ServerConnector connector = new ServerConnector(server, 1, 1, new HttpConnectionFactory(http));
        connector.setHost(bind);
        connector.setPort(port);
        connector.setIdleTimeout(IDLE_TIMEOUT.toMillis());
        server.addConnector(connector);
        server.addBean(new NetworkConnectionLimit(MAX_CONNECTIONS, connector));
        server.setHandler(router);
        server.setStopTimeout(Duration.ofSeconds(2).toMillis());
        try {
            server.start();
        } catch (Exception e) {
            stopQuietly(server);
            BindException refusal = bindFailure(e);
            if (refusal != null) {
                throw refused(refusal, port);
            }
            throw e instanceof IOException io ? io : new IOException("the status endpoint did not start: " + e, e);
        }
        return new StatusServer(server, connector);
    }

    private static BindException bindFailure(Throwable e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof BindException b) {
                return b;
            }
        }
        return null;
    }

    private static ConfigException refused(BindException e, int port) {
        String message = String.valueOf(e.getMessage());
        if (message.contains("in use")) {
            return new ConfigException("daemon.httpPort", "port " + port
                    + " is already in use; choose a free port, 0 for any, or -1 for no status endpoint");
        }
        return new ConfigException("daemon.httpBind", "cannot listen on this address (" + message
                + "); use an address of this machine such as 127.0.0.1");
    }

    public int port() {
        return connector.getLocalPort();
    }

    public void stop() {
        stopQuietly(server);
    }

    private static void stopQuietly(Server server) {
        try {
            server.stop();
        } catch (Exception e) {
            LOG.warn("status endpoint stop: {}", e.toString());
        }
    }
}
