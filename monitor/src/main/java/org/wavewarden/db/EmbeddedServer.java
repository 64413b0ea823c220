package org.wavewarden.db;

import io.zonky.test.db.postgres.embedded.EmbeddedPostgres;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;

/**
 * A real PostgreSQL server started from packaged binaries, for the demo and the tests. It listens on loopback
 * only and its data directory is removed when it is closed.
 */
public final class EmbeddedServer implements AutoCloseable {

    private final EmbeddedPostgres postgres;

    private EmbeddedServer(EmbeddedPostgres postgres) {
        this.postgres = postgres;
    }

    public static EmbeddedServer start() {
        return start(null);
    }

    /** Starts a server; with a data directory it is kept there (for the {@code server} command), else a temporary one. */
    public static EmbeddedServer start(Path dataDirectory) {
        return start(dataDirectory, 0);
    }

    /**
     * Starts a server keeping its data in {@code dataDirectory} (created on first use, reused after), listening on
     * {@code port} of 127.0.0.1, or on a free port when {@code port} is 0.
     */
    public static EmbeddedServer start(Path dataDirectory, int port) {
        try {
            EmbeddedPostgres.Builder b = EmbeddedPostgres.builder()
                    .setServerConfig("listen_addresses", "127.0.0.1")
                    .setServerConfig("max_connections", "100")
                    .setServerConfig("fsync", "off")
                    .setServerConfig("synchronous_commit", "off")
                    .setServerConfig("full_page_writes", "off");
            if (dataDirectory != null) {
                b.setDataDirectory(dataDirectory).setCleanDataDirectory(false);
            }
            if (port != 0) {
                b.setPort(port);
            }
            return new EmbeddedServer(b.start());
        } catch (IOException e) {
            throw new UncheckedIOException("could not start the embedded PostgreSQL server", e);
        }
    }

    public String jdbcUrl() {
        return postgres.getJdbcUrl("postgres", "postgres");
    }

    public int port() {
        return postgres.getPort();
    }

    @Override
    public void close() {
        try {
            postgres.close();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
