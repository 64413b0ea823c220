package org.wavewarden.db;

import com.zaxxer.hikari.HikariConfig;
import com.zaxxer.hikari.HikariDataSource;
import org.jdbi.v3.core.Handle;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.JdbcUrl;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Read-only by construction: what a connection URL may carry, how the source session is checked, how logins fail. */
class ConnectionSafetyTest {

    static final String SECRET = "Zq7-url-secret-that-must-not-leak";

    @TempDir
    Path dir;

    static String configWithSourceUrl(String url) {
        return SmallSurvey.config(url, null);
    }

    @ParameterizedTest
    @ValueSource(strings = {"options=-c%20default_transaction_read_only%3Doff", "readOnly=false",
            "readOnlyMode=ignore", "currentSchema=evil", "assumeMinServerVersion=9.0", "preferQueryMode=simple",
            "socketFactory=com.example.Evil", "sslfactory=com.example.Evil", "sslhostnameverifier=com.example.Evil",
            "authenticationPluginClassName=com.example.Evil", "service=other", "replication=database",
            "loggerFile=x.log", "ssl=true&options=-c%20search_path%3Devil"})
    void aUrlParameterThatCanChangeTheSessionIsRefusedNamingTheKeyAndTheAllowedOnes(String query) {
        ConfigException e = assertThrows(ConfigException.class,
                () -> ConfigLoader.parse(configWithSourceUrl("jdbc:postgresql://db:5432/surveys?" + query)));
        assertEquals("source.jdbcUrl", e.key());
        assertTrue(e.problem().contains("sslmode, sslrootcert"), e.problem());
    }

    @Test
    void theResultsUrlFollowsTheSameRules() {
        String yaml = configWithSourceUrl("jdbc:postgresql://db/surveys").replace("results:\n  schema: ww_results",
                "results:\n  jdbcUrl: \"jdbc:postgresql://db/results?options=-c%20x%3Dy\"\n  user: writer\n"
                        + "  schema: ww_results");
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(yaml));
        assertEquals("results.jdbcUrl", e.key());
    }

    @Test
    void harmlessUrlParametersAreAccepted() {
        String url = "jdbc:postgresql://db1:5432,db2:5433/surveys?sslmode=verify-full&sslrootcert=/etc/ca.pem"
                + "&connectTimeout=5&ApplicationName=monitor&targetServerType=primary&tcpKeepAlive=true";
        assertEquals(url, ConfigLoader.parse(configWithSourceUrl(url)).source().jdbcUrl());
    }

    @ParameterizedTest
    @ValueSource(strings = {"jdbc:postgresql://db/surveys?password=" + SECRET,
            "jdbc:postgresql://db/surveys?ssl=true&sslpassword=" + SECRET})
    void aPasswordInTheUrlIsRefusedSayingWhereSecretsComeFromAndIsNotEchoed(String url) {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(configWithSourceUrl(url)));
        assertEquals("source.jdbcUrl", e.key());
        assertTrue(e.problem().contains("only from passwordEnv or passwordFile"), e.problem());
        assertFalse(e.getMessage().contains(SECRET), e.getMessage());
    }

    @ParameterizedTest
    @ValueSource(strings = {"postgresql://reader:" + SECRET + "@db/surveys",
            "jdbc:postgresql://reader:" + SECRET + "@db:5432/surveys", "jdbc:postgresql://reader@db/surveys"})
    void userInfoInTheUrlIsRefusedAndTheSecretIsNeverEchoed(String url) {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(configWithSourceUrl(url)));
        assertEquals("source.jdbcUrl", e.key());
        assertFalse(e.getMessage().contains(SECRET), e.getMessage());
        assertFalse(e.getMessage().contains("reader"), e.getMessage());
    }

    @Test
    void aUserParameterInTheUrlIsRefusedInFavourOfTheUserKey() {
        ConfigException e = assertThrows(ConfigException.class,
                () -> ConfigLoader.parse(configWithSourceUrl("jdbc:postgresql://db/surveys?user=postgres")));
        assertTrue(e.problem().contains("user key"), e.problem());
    }

    @Test
    void aSourcePoolIsNotOpenedFromAUrlWhoseOptionsWouldMakeItWritable() throws Exception {
        String url = TestDatabase.freshDatabase("ro_options");
        ConnectionConfig hostile = new ConnectionConfig(url + "?options=-c%20default_transaction_read_only%3Doff",
                "postgres", null, null);
        ConfigException e = assertThrows(ConfigException.class, () -> {
            try (HikariDataSource ds = Databases.open(hostile, null, "source", true, Map.of(), 1);
                 Connection c = ds.getConnection(); var st = c.createStatement()) {
                st.execute("CREATE TABLE written_through_the_source (x int)");
            }
        });
        assertEquals("source.jdbcUrl", e.key());
        try (Connection c = TestDatabase.connect(url); var rs = c.createStatement()
                .executeQuery("SELECT to_regclass('written_through_the_source') IS NULL")) {
            rs.next();
            assertTrue(rs.getBoolean(1), "the table was created through the source pool");
        }
    }

    @Test
    void createTableThroughTheSourceSessionFailsAsAReadOnlyTransaction() throws Exception {
        String url = TestDatabase.freshDatabase("ro_session");
        SmallSurvey.createTable(url);
        try (Session s = Session.open(ConfigLoader.parse(configWithSourceUrl(url)), null, Map.of());
             Handle h = s.source().open()) {
            Exception e = assertThrows(Exception.class, () -> h.execute("CREATE TABLE src.written (x int)"));
            assertEquals("25006", sqlState(e), e.toString());
            assertEquals("on", h.createQuery("SHOW transaction_read_only").mapTo(String.class).one());
        }
    }

    @Test
    void aReadOnlyPoolWhoseServerSessionIsWritableIsRefused() {
        String url = TestDatabase.freshDatabase("ro_check");
        // The JDBC read-only flag alone does not reach an autocommit session at the server: this pool is writable.
        HikariConfig hc = new HikariConfig();
        hc.setJdbcUrl(url);
        hc.setUsername("postgres");
        hc.setReadOnly(true);
        hc.setMaximumPoolSize(1);
        hc.setInitializationFailTimeout(-1);
        hc.setConnectionTimeout(1000);
        try (HikariDataSource ds = new HikariDataSource(hc)) {
            ConfigException e = assertThrows(ConfigException.class, () -> Databases.firstContact(ds, "source"));
            assertEquals("source", e.key());
            assertTrue(e.problem().contains("not read-only"), e.problem());
        }
        hc.setConnectionInitSql(Databases.READ_ONLY_CHECK);
        hc.setPoolName("checked");
        try (HikariDataSource ds = new HikariDataSource(hc)) {
            SQLException e = assertThrows(SQLException.class, () -> ds.getConnection().close());
            assertTrue(chain(e).contains("not read-only"), chain(e));
        }
    }

    @Test
    void aWrongPasswordSaysAuthenticationFailedForTheUserWithExitCodeThree() throws Exception {
        String url = TestDatabase.freshDatabase("login");
        SmallSurvey.createTable(url);
        String role = "ww_login_" + ProcessHandle.current().pid();
        PasswordLogin login = PasswordLogin.require(url, role, "right-password");
        try {
            Path wrong = dir.resolve("wrong-password");
            Files.writeString(wrong, "not-the-password\n");
            Path cfg = dir.resolve("login.yaml");
            Files.writeString(cfg, configWithSourceUrl(url).replace("  user: postgres",
                    "  user: " + role + "\n  passwordFile: \"" + wrong + "\""));
            CliRun r = CliRun.of("check", "--config", cfg.toString(), "--wave", "w1", "--out",
                    dir.resolve("o").toString());
            assertEquals(3, r.exitCode(), r.err());
            assertTrue(r.err().contains("authentication failed for user " + role), r.err());
            assertFalse(r.err().contains("not-the-password"), r.err());
            assertFalse(r.err().contains("timed out"), r.err());
        } finally {
            login.close();
        }
    }

    @Test
    void redactionHidesUserInfoAndTheValuesOfParametersOffTheAllowList() {
        assertEquals("jdbc:postgresql://***@db/x?sslmode=require&password=***",
                JdbcUrl.redacted("jdbc:postgresql://me:" + SECRET + "@db/x?sslmode=require&password=" + SECRET));
    }

    static String sqlState(Throwable e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof SQLException s && s.getSQLState() != null) {
                return s.getSQLState();
            }
        }
        return null;
    }

    static String chain(Throwable e) {
        StringBuilder sb = new StringBuilder();
        for (Throwable t = e; t != null; t = t.getCause()) {
            sb.append(t).append('\n');
        }
        return sb.toString();
    }

    /**
     * A role that must give its password. The test server trusts every loopback login, so rules for this one role
     * are put first in pg_hba.conf (the first matching line wins) and the configuration is reloaded; they are
     * removed again on close. Other roles keep logging in as before.
     */
    record PasswordLogin(String url, Path hbaFile, String original) implements AutoCloseable {

        static PasswordLogin require(String url, String role, String password) throws Exception {
            Path hba;
            String original;
            try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
                st.execute("DROP ROLE IF EXISTS " + role);
                st.execute("CREATE ROLE " + role + " LOGIN PASSWORD '" + password + "'");
                var rs = st.executeQuery("SHOW hba_file");
                rs.next();
                hba = Path.of(rs.getString(1));
                original = Files.readString(hba);
                Files.writeString(hba, "host all " + role + " 127.0.0.1/32 scram-sha-256\n"
                        + "host all " + role + " ::1/128 scram-sha-256\n" + original);
                st.execute("SELECT pg_reload_conf()");
            }
            PasswordLogin login = new PasswordLogin(url, hba, original);
            try {
                // The postmaster rereads the file when it handles the reload signal; wait until it has.
                for (int tries = 0; ; tries++) {
                    try (Connection c = DriverManager.getConnection(url, role, "not-" + password)) {
                        if (tries > 500) {
                            throw new IllegalStateException("the server still trusts " + role);
                        }
                        Thread.sleep(20);
                    } catch (SQLException e) {
                        assertEquals("28P01", e.getSQLState(), e.toString());
                        break;
                    }
                }
                try (Connection c = DriverManager.getConnection(url, role, password)) {
                    assertTrue(c.isValid(1), "the right password logs in");
                }
            } catch (Exception | AssertionError e) {
                login.close();
                throw e;
            }
            return login;
        }

        @Override
        public void close() throws Exception {
            Files.writeString(hbaFile, original);
            try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
                st.execute("SELECT pg_reload_conf()");
            }
        }
    }
}
