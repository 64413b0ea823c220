package org.wavewarden.db;

import com.zaxxer.hikari.HikariConfig;
import com.zaxxer.hikari.HikariDataSource;
import org.jdbi.v3.core.Jdbi;
import org.postgresql.util.PSQLException;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.JdbcUrl;

import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.Map;
import java.util.Properties;

/**
 * Opens connection pools. The source pool is read-only at the server: every session starts with
 * {@code default_transaction_read_only = on}, so even a mistaken write from this process fails, and every
 * connection the pool opens is checked to really be read-only before it is handed out.
 */
public final class Databases {

    /** The SQLSTATE the read-only check raises; PostgreSQL leaves codes outside its own classes to applications. */
    static final String NOT_READ_ONLY = "WW001";

    /**
     * Run on every new source connection: a server, pooler or setting that leaves the session writable (whatever
     * the reason) stops the connection from being used at all.
     */
    public static final String READ_ONLY_CHECK = "DO $$BEGIN IF current_setting('transaction_read_only') <> 'on'"
            + " THEN RAISE EXCEPTION USING ERRCODE = '" + NOT_READ_ONLY + "', MESSAGE = 'the session is not"
            + " read-only: SHOW transaction_read_only gives ' || current_setting('transaction_read_only'); END IF;"
            + " END$$";

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
        if (!c.isEmbedded()) {
            // Again here, for connections built without the config loader.
            JdbcUrl.check(key + ".jdbcUrl", c.jdbcUrl());
        }
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
            hc.setConnectionInitSql(READ_ONLY_CHECK);
        }
        return new HikariDataSource(hc);
    }

    /**
     * Logs in once, outside the pool, with the pool's own settings, so that what waiting for the pool would hide
     * is reported at once: a refused login (SQLSTATE class 28) becomes {@link LoginFailedException} instead of a
     * connection timeout, and a read-only pool whose session is writable is refused. Any other failure is left
     * to the caller, who waits for the pool as before (a server that is starting may still come up).
     *
     * @param key config key of the connection, e.g. {@code source} or {@code results}
     */
    public static void firstContact(HikariDataSource ds, String key) {
        Properties props = new Properties();
        props.putAll(ds.getDataSourceProperties());
        if (ds.getUsername() != null) {
            props.setProperty("user", ds.getUsername());
        }
        if (ds.getPassword() != null) {
            props.setProperty("password", ds.getPassword());
        }
        try (Connection c = DriverManager.getConnection(ds.getJdbcUrl(), props)) {
            if (ds.isReadOnly()) {
                try (Statement st = c.createStatement()) {
                    st.execute(READ_ONLY_CHECK);
                }
            }
        } catch (SQLException e) {
            String state = e.getSQLState() == null ? "" : e.getSQLState();
            if (state.startsWith("28")) {
                throw new LoginFailedException("authentication failed for user " + ds.getUsername() + " (SQLState "
                        + state + ": " + serverMessage(e) + "); check " + key + ".user and " + key
                        + ".passwordEnv or " + key + ".passwordFile", e);
            }
            if (state.equals(NOT_READ_ONLY)) {
                throw new ConfigException(key, "refusing to run: the server gave this connection a session that is"
                        + " not read-only (" + serverMessage(e) + "); the source must be read through read-only"
                        + " sessions");
            }
        }
    }

    private static String serverMessage(SQLException e) {
        if (e instanceof PSQLException p && p.getServerErrorMessage() != null
                && p.getServerErrorMessage().getMessage() != null) {
            return p.getServerErrorMessage().getMessage();
        }
        return e.getClass().getSimpleName();
    }

    /** The server refused the login (wrong password, unknown role, no matching pg_hba.conf entry): exit code 3. */
    public static final class LoginFailedException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public LoginFailedException(String message, Throwable cause) {
            super(message, cause);
        }
    }

    public static Jdbi jdbi(javax.sql.DataSource ds) {
        return Jdbi.create(ds);
    }
}
