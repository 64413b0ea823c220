package org.wavewarden.db;

import com.zaxxer.hikari.HikariConfig;
import com.zaxxer.hikari.HikariDataSource;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.ConnectionConfig;

import java.util.Map;

/**
 * Opens connection pools. The source pool is read-only at the server: every session starts with
 * {@code default_transaction_read_only = on}, so even a mistaken write from this process fails.
 */
public final class Databases {

    private Databases() {
    }

    /**
     * @param c          where to connect ({@code embedded} must already be resolved to a URL by the caller)
     * @param embeddedUrl the URL of the embedded server when {@code c} says embedded, else ignored
     * @param key        config key for error messages
     * @param readOnly   true for the source database
     */
    public static HikariDataSource open(ConnectionConfig c, String embeddedUrl, String key, boolean readOnly,
                                        Map<String, String> env, int poolSize) {
        return open(c, embeddedUrl, key, readOnly, env, poolSize, java.time.Duration.ofSeconds(10));
    }

    /**
     * As {@link #open(ConnectionConfig, String, String, boolean, Map, int)}, waiting at most
     * {@code connectionTimeout} (at least 250 ms) for a connection before giving up.
     */
    public static HikariDataSource open(ConnectionConfig c, String embeddedUrl, String key, boolean readOnly,
                                        Map<String, String> env, int poolSize, java.time.Duration connectionTimeout) {
        if (connectionTimeout.toMillis() < 250) {
            throw new IllegalArgumentException("connectionTimeout: expected at least 250 ms but got "
                    + connectionTimeout);
        }
        HikariConfig hc = new HikariConfig();
        if (c.isEmbedded()) {
            hc.setJdbcUrl(embeddedUrl);
            hc.setUsername("postgres");
        } else {
            hc.setJdbcUrl(c.jdbcUrl());
            hc.setUsername(c.user());
            String pw = Secrets.password(c, key, env);
            if (pw != null) {
                hc.setPassword(pw);
            }
        }
        hc.setPoolName(readOnly ? "source" : "results");
        hc.setMaximumPoolSize(poolSize);
        hc.setMinimumIdle(0);
        hc.setConnectionTimeout(connectionTimeout.toMillis());
        // Fail fast at start-up is handled by the caller, who maps it to exit code 3.
        hc.setInitializationFailTimeout(-1);
        hc.addDataSourceProperty("ApplicationName", readOnly ? "wavewarden-source" : "wavewarden-results");
        hc.addDataSourceProperty("connectTimeout", "10");
        if (readOnly) {
            hc.setReadOnly(true);
            hc.addDataSourceProperty("options", "-c default_transaction_read_only=on");
        }
        return new HikariDataSource(hc);
    }

    public static Jdbi jdbi(javax.sql.DataSource ds) {
        return Jdbi.create(ds);
    }
}
