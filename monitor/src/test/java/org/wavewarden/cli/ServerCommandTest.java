package org.wavewarden.cli;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.Statement;
import java.util.List;
import java.util.concurrent.TimeUnit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The {@code server} command, as a user runs it to try the monitor without a database server: a real PostgreSQL on
 * loopback whose data outlives the process, so an import in one session is still there for the check in the next.
 */
class ServerCommandTest {

    @Test
    void keepsItsDataBetweenRunsAndStopsCleanlyOnATerminationSignal(@TempDir Path dir) throws Exception {
        int port;
        try (ServerSocket s = new ServerSocket(0)) {
            port = s.getLocalPort();
        }
        Path data = dir.resolve("pg");
        String url = "jdbc:postgresql://127.0.0.1:" + port + "/postgres";

        Process first = start(data, port);
        try (Connection c = DriverManager.getConnection(url, "postgres", ""); Statement st = c.createStatement()) {
            st.execute("CREATE TABLE kept (wave text)");
            st.execute("INSERT INTO kept VALUES ('2025-Q1')");
        }
        stop(first);

        Process second = start(data, port);
        try (Connection c = DriverManager.getConnection(url, "postgres", ""); Statement st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT wave FROM kept")) {
            assertTrue(rs.next(), "the row written in the first run is there in the second");
            assertEquals("2025-Q1", rs.getString(1));
        } finally {
            stop(second);
        }
    }

    private static Process start(Path data, int port) throws Exception {
        List<String> cmd = List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-Xmx128m",
                "-cp", System.getProperty("java.class.path"), Main.class.getName(), "server", "--data-dir",
                data.toString(), "--port", Integer.toString(port));
        Process p = new ProcessBuilder(cmd).redirectError(ProcessBuilder.Redirect.DISCARD).start();
        BufferedReader out = new BufferedReader(new InputStreamReader(p.getInputStream(), StandardCharsets.UTF_8));
        String line = out.readLine();
        assertNotNull(line, "the server printed where it runs");
        assertTrue(line.startsWith("PostgreSQL is running on 127.0.0.1:" + port), line);
        return p;
    }

    private static void stop(Process p) throws InterruptedException {
        p.destroy();
        assertTrue(p.waitFor(60, TimeUnit.SECONDS), "the server stopped on SIGTERM");
    }
}
