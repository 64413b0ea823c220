package org.wavewarden.security;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.LoggerContext;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DaemonConfig;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.daemon.DatasetFiring;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.time.Clock;
import java.util.Map;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Nobody let in: secrets stay secret, the source is only read, the status port stays on loopback. */
class SecurityTest {

    @TempDir
    Path dir;

    static final String SECRET = "s3cret-Pa55word-that-must-not-leak";

    @Test
    void theDatabasePasswordReachesNoOutputLogOrErrorMessage() throws Exception {
        String url = TestDatabase.freshDatabase("secrets");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path plainConfig = dir.resolve("plain.yaml");
        Files.writeString(plainConfig, SmallSurvey.config(url, null));
        for (int w = 1; w <= 3; w++) {
            assertEquals(0, CliRun.of("import", "--config", plainConfig.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
        String yaml = SmallSurvey.config(url, null).replace("  user: postgres",
                "  user: postgres\n  passwordEnv: SURVEY_PASSWORD");
        ListAppender<ILoggingEvent> logs = new ListAppender<>();
        Logger root = ((LoggerContext) LoggerFactory.getILoggerFactory()).getLogger(org.slf4j.Logger.ROOT_LOGGER_NAME);
        logs.start();
        root.addAppender(logs);
        Path out = dir.resolve("out");
        try {
            WardenConfig cfg = ConfigLoader.parse(yaml);
            try (Session s = Session.open(cfg, null, Map.of("SURVEY_PASSWORD", SECRET))) {
                s.migrate();
                var fired = new DatasetFiring(s, Clock.systemUTC(), out).fire(cfg.datasets().get(0));
                assertEquals(3, fired.judged().size(), "judged " + fired);
                assertFalse(s.toString().contains(SECRET));
                assertFalse(cfg.source().toString().contains(SECRET));
            }
            // An unreachable server: the error names the problem, not the password.
            WardenConfig down = ConfigLoader.parse(yaml.replace(url, "jdbc:postgresql://127.0.0.1:1/x"));
            RuntimeException e = assertThrows(RuntimeException.class,
                    () -> Session.open(down, null, Map.of("SURVEY_PASSWORD", SECRET)));
            assertFalse(chain(e).contains(SECRET), chain(e));
        } finally {
            root.detachAppender(logs);
        }
        for (ILoggingEvent ev : logs.list) {
            assertFalse(ev.getFormattedMessage().contains(SECRET), ev.getFormattedMessage());
            if (ev.getThrowableProxy() != null) {
                assertFalse(ev.getThrowableProxy().getMessage() != null
                        && ev.getThrowableProxy().getMessage().contains(SECRET));
            }
        }
        long files = 0;
        try (Stream<Path> all = Files.walk(out)) {
            for (Path p : (Iterable<Path>) all.filter(Files::isRegularFile)::iterator) {
                files++;
                assertFalse(Files.readString(p).contains(SECRET), "the secret is in " + p);
            }
        }
        assertTrue(files >= 6, "findings and digests were written: " + files);
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             var rs = st.executeQuery("SELECT count(*) FROM (SELECT row_to_json(f)::text AS t FROM ww_results.finding f"
                     + " UNION ALL SELECT row_to_json(a)::text FROM ww_results.alert a UNION ALL SELECT summary::text"
                     + " FROM ww_results.wave_summary) x WHERE t LIKE '%" + SECRET + "%'")) {
            rs.next();
            assertEquals(0, rs.getLong(1), "the secret is in the results schema");
        }
    }

    @Test
    void aRoleWithSelectOnlyCanRunTheMonitorAndCannotWriteTheSource() throws Exception {
        String url = TestDatabase.freshDatabase("roles");
        SmallSurvey.createTable(url);
        String db = url.substring(url.lastIndexOf('/') + 1);
        Path script = Path.of("..", "sql", "roles", "create_roles.sql");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // The script's psql variables, filled in as psql -v survey_schema=src -v results_db=... would.
            String sql = Files.readString(script).replace(":\"survey_schema\"", "\"src\"")
                    .replace(":\"results_db\"", "\"" + db + "\"");
            st.execute("DO $$ BEGIN IF EXISTS (SELECT FROM pg_roles WHERE rolname = 'wavewarden_reader') THEN"
                    + " EXECUTE 'REASSIGN OWNED BY wavewarden_reader TO postgres';"
                    + " EXECUTE 'DROP OWNED BY wavewarden_reader'; DROP ROLE wavewarden_reader; END IF;"
                    + " IF EXISTS (SELECT FROM pg_roles WHERE rolname = 'wavewarden_writer') THEN"
                    + " EXECUTE 'DROP OWNED BY wavewarden_writer'; DROP ROLE wavewarden_writer; END IF; END $$");
            st.execute(sql);
            st.execute("INSERT INTO src.answers (wave, respondent_id, score) SELECT 'w' || (g % 2 + 1), g, g % 17"
                    + " FROM generate_series(1, 400) g");
        }
        try (Connection reader = java.sql.DriverManager.getConnection(url, "wavewarden_reader", "");
             var st = reader.createStatement()) {
            var rs = st.executeQuery("SELECT count(*) FROM src.answers");
            rs.next();
            assertEquals(400, rs.getLong(1));
            SQLException denied = assertThrows(SQLException.class,
                    () -> st.executeUpdate("DELETE FROM src.answers"));
            assertTrue(denied.getMessage().contains("read-only") || denied.getMessage().contains("permission denied"),
                    denied.getMessage());
        }
        Path cfg = dir.resolve("reader.yaml");
        Files.writeString(cfg, SmallSurvey.config(url, null).replace("  user: postgres", "  user: wavewarden_reader")
                .replace("results:\n  schema: ww_results", "results:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\n"
                        + "  schema: ww_results"));
        CliRun r = CliRun.of("check", "--config", cfg.toString(), "--wave", "w2", "--out", dir.resolve("o").toString());
        assertEquals(0, r.exitCode(), r.err());
    }

    @Test
    void theStatusPortBindsLoopbackUnlessConfigured() {
        assertEquals("127.0.0.1", DaemonConfig.DEFAULTS.httpBind());
        assertEquals("127.0.0.1", ConfigLoader.parse(SmallSurvey.config("jdbc:postgresql://127.0.0.1:1/x", null))
                .daemon().httpBind());
    }

    static String chain(Throwable e) {
        StringBuilder sb = new StringBuilder();
        for (Throwable t = e; t != null; t = t.getCause()) {
            sb.append(t).append('\n');
        }
        return sb.toString();
    }

}
