package org.wavewarden.pipeline;

import com.zaxxer.hikari.HikariDataSource;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.db.Databases;
import org.wavewarden.db.EmbeddedServer;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.store.ResultsStore;

import java.sql.Connection;
import java.sql.SQLException;
import java.util.Map;

/**
 * The open connections of one command or daemon: the source (read-only) and the results store. An embedded
 * server, when the config asks for one, must be handed in by the caller (the demo and the tests start it).
 */
public final class Session implements AutoCloseable {

    private final WardenConfig config;
    private final HikariDataSource source;
    private final HikariDataSource results;
    private final ResultsStore store;
    private final Jdbi sourceJdbi;
    private String embeddedUrl;
    private Map<String, String> env = Map.of();

    private Session(WardenConfig config, HikariDataSource source, HikariDataSource results) {
        this.config = config;
        this.source = source;
        this.results = results;
        this.store = new ResultsStore(Jdbi.create(results), config.results().schema());
        this.sourceJdbi = Jdbi.create(source);
    }

    /**
     * Opens both pools and checks both servers answer.
     *
     * @param embedded the running embedded server for configs that say {@code embedded}; may be null otherwise
     * @throws DatabaseUnavailableException when a server cannot be reached (exit code 3)
     * @throws Databases.LoginFailedException when a server refuses the login (exit code 3, at once)
     * @throws org.wavewarden.config.ConfigException when the source session turns out not to be read-only
     */
    public static Session open(WardenConfig config, EmbeddedServer embedded, Map<String, String> env) {
        String embeddedUrl = embedded == null ? null : embedded.jdbcUrl();
        if (embeddedUrl == null && config.source().isEmbedded()) {
            throw new org.wavewarden.config.ConfigException("source.jdbcUrl", "'embedded' is only for the demo and"
                    + " the tests; point jdbcUrl at a PostgreSQL server (jdbc:postgresql://host:port/database)");
        }
        ConnectionConfig rc = config.results().connection() == null ? config.source() : config.results().connection();
        HikariDataSource src = Databases.open(config.source(), embeddedUrl, "source", true, env, 4);
        HikariDataSource res;
        if (config.results().connection() == null) {
            // Same server as the source, but a writable pool of its own.
            res = Databases.open(config.source(), embeddedUrl, "source", false, env, 4);
        } else {
            res = Databases.open(rc, embeddedUrl, "results", false, env, 4);
        }
        Session s = new Session(config, src, res);
        s.embeddedUrl = embeddedUrl;
        s.env = Map.copyOf(env);
        try {
            Databases.firstContact(src, "source");
            if (config.results().connection() != null) {
                Databases.firstContact(res, "results");
            }
            s.ping(src, "source");
            s.ping(res, "results");
        } catch (RuntimeException e) {
            s.close();
            throw e;
        }
        return s;
    }

    private void ping(HikariDataSource ds, String which) {
        try (Connection c = ds.getConnection()) {
            c.isValid(5);
        } catch (SQLException e) {
            throw new DatabaseUnavailableException("the " + which + " database is unreachable: "
                    + Redact.message(e), e);
        }
    }

    /** Applies the results schema (idempotent). */
    public org.flywaydb.core.api.output.MigrateResult migrate() {
        return ResultsSchema.migrate(results, config.results().schema());
    }

    /** The embedded server's URL when the config says embedded, else null. */
    public String embeddedUrl() {
        return embeddedUrl;
    }

    /** The environment the session's secrets were read from. */
    public Map<String, String> env() {
        return env;
    }

    public WardenConfig config() {
        return config;
    }

    /** The source, one Jdbi for the session, so a statement logger set on it sees every query of the session. */
    public Jdbi source() {
        return sourceJdbi;
    }

    public ResultsStore store() {
        return store;
    }

    public javax.sql.DataSource resultsDataSource() {
        return results;
    }

    @Override
    public void close() {
        source.close();
        results.close();
    }

    /** A server could not be reached; the CLI exits 3, the daemon retries. */
    public static final class DatabaseUnavailableException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public DatabaseUnavailableException(String message, Throwable cause) {
            super(message, cause);
        }
    }

    /** Keeps connection details that may carry secrets out of messages. */
    static final class Redact {
        private Redact() {
        }

        static String message(Throwable e) {
            String m = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            return m.replaceAll("(?i)password=[^&\\s]*", "password=***").replaceAll("//[^/\\s@]*@", "//***@");
        }
    }

    static {
        // Quiet the JDBC driver's own java.util.logging output; SLF4J carries the project's logs.
        java.util.logging.Logger.getLogger("org.postgresql").setLevel(java.util.logging.Level.WARNING);
    }

}
