package org.wavewarden.daemon;

import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpServer;

import java.io.IOException;
import java.io.OutputStream;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * {@code /health} (200 ok, 503 degraded while a firing keeps failing or a database is unreachable), {@code /metrics}
 * (Prometheus text) and {@code /digest} (the latest digest) on an address that is 127.0.0.1 unless configured otherwise.
 */
final class StatusServer {

    private final HttpServer server;

    private StatusServer(HttpServer server) {
        this.server = server;
    }

    static StatusServer start(String bind, int port, Daemon daemon) throws IOException {
        HttpServer s = HttpServer.create(new InetSocketAddress(bind, port), 16);
        s.createContext("/health", ex -> {
            boolean degraded = daemon.metrics().degraded();
            send(ex, degraded ? 503 : 200, "application/json",
                    degraded ? "{\"status\":\"degraded\"}\n" : "{\"status\":\"ok\"}\n");
        });
        s.createContext("/metrics", ex -> send(ex, 200, "text/plain; version=0.0.4; charset=utf-8",
                daemon.metrics().prometheus()));
        s.createContext("/digest", ex -> {
            Path latest = daemon.latestDigest();
            if (latest == null || !Files.exists(latest)) {
                send(ex, 404, "text/plain; charset=utf-8", "no digest yet\n");
                return;
            }
            Path html = latest.resolveSibling("digest.html");
            if (Files.exists(html)) {
                send(ex, 200, "text/html; charset=utf-8", Files.readString(html));
            } else {
                send(ex, 200, "text/markdown; charset=utf-8", Files.readString(latest));
            }
        });
        s.start();
        return new StatusServer(s);
    }

    int port() {
        return server.getAddress().getPort();
    }

    void stop() {
        server.stop(0);
    }

    private static void send(HttpExchange ex, int code, String type, String body) throws IOException {
        byte[] bytes = body.getBytes(StandardCharsets.UTF_8);
        ex.getResponseHeaders().set("Content-Type", type);
        ex.sendResponseHeaders(code, bytes.length);
        try (OutputStream o = ex.getResponseBody()) {
            o.write(bytes);
        }
    }
}
