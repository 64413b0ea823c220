package org.wavewarden.load;

import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Future;

/**
 * What the import tests share: a fresh database with the small survey's table {@code src.answers} and a config
 * naming it, the files a test writes, the command line run on them, and one-value queries.
 */
abstract class SmallSurveyImportTest {

    @TempDir
    Path dir;
    String url;
    Path config;

    private final String database;

    SmallSurveyImportTest(String database) {
        this.database = database;
    }

    @BeforeEach
    void smallSurveyDatabase() throws Exception {
        url = TestDatabase.freshDatabase(database);
        SmallSurvey.createTable(url);
        config = dir.resolve("survey.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
    }

    CliRun importWave(String wave, Path file, String... options) {
        List<String> args = new ArrayList<>(List.of("import", "--config", config.toString(), "--wave", wave));
        args.addAll(List.of(options));
        args.add(file.toString());
        return CliRun.of(args.toArray(String[]::new));
    }

    String text(String sql) throws SQLException {
        return text(url, sql);
    }

    long count(String sql) throws SQLException {
        return Long.parseLong(text(sql));
    }

    static String text(String url, String sql) throws SQLException {
        try (Connection c = TestDatabase.connect(url); var rs = c.createStatement().executeQuery(sql)) {
            rs.next();
            return rs.getString(1);
        }
    }

    Path write(String name, byte[] content) throws Exception {
        Path p = dir.resolve(name);
        Files.write(p, content);
        return p;
    }

    Path write(String name, String content) throws Exception {
        return write(name, content.getBytes(StandardCharsets.UTF_8));
    }

    /**
     * Waits until {@code sessions} sessions of the database wait for a lock ({@code locktype} as {@code pg_locks}
     * names it, or any when null) or one of the runs has ended; a condition, not a time.
     *
     * @return whether they all waited, that is no run ended first
     */
    static boolean awaitWaiting(String url, int sessions, String locktype, List<? extends Future<?>> runs)
            throws SQLException, InterruptedException {
        String sql = "SELECT count(*) FROM pg_locks l JOIN pg_stat_activity a ON a.pid = l.pid WHERE NOT l.granted"
                + " AND a.datname = current_database()"
                + (locktype == null ? "" : " AND l.locktype = '" + locktype + "'");
        while (Long.parseLong(text(url, sql)) < sessions && runs.stream().noneMatch(Future::isDone)) {
            Thread.sleep(20);
        }
        return runs.stream().noneMatch(Future::isDone);
    }
}
