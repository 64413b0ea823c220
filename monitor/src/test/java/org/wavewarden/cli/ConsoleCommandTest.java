package org.wavewarden.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The standalone console reads a results schema as this version writes it and changes none: a database without
 * one is refused with what to run instead, and is left as it was; a bad port is refused naming the option.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class ConsoleCommandTest {

    @TempDir
    static Path dir;
    String url;
    Path config;

    @BeforeAll
    void aSourceWithoutResults() throws Exception {
        url = TestDatabase.freshDatabase("console_cmd");
        SmallSurvey.createTable(url);
        config = dir.resolve("c.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
    }

    boolean schemaExists() throws Exception {
        try (Connection c = TestDatabase.connect(url);
             ResultSet rs = c.createStatement().executeQuery(
                     "SELECT 1 FROM information_schema.schemata WHERE schema_name = 'ww_results'")) {
            return rs.next();
        }
    }

    @Test
    void aMissingResultsSchemaIsRefusedAndNotMade() throws Exception {
        assertFalse(schemaExists());
        CliRun r = CliRun.of("console", "--config", config.toString(), "--port", "0");
        assertEquals(Main.USAGE, r.exitCode(), r.err());
        assertTrue(r.err().contains("the results schema 'ww_results' is missing or older than this version"),
                r.err());
        assertTrue(r.err().contains("init-db"), r.err());
        assertFalse(schemaExists(), "the console changes no schema");
    }

    @Test
    void aPortOutOfRangeIsRefusedNamingTheOption() {
        CliRun r = CliRun.of("console", "--config", config.toString(), "--port", "70000");
        assertEquals(Main.USAGE, r.exitCode(), r.err());
        assertTrue(r.err().contains("--port: the console needs a port from 0 (any free one) to 65535, got 70000"),
                r.err());
    }

    @Test
    void overAMigratedSchemaItServesTheConsoleAndNothingOfTheDaemon() throws Exception {
        Path other = dir.resolve("migrated.yaml");
        String migratedUrl = TestDatabase.freshDatabase("console_cmd_ok");
        SmallSurvey.createTable(migratedUrl);
        Files.writeString(other, SmallSurvey.config(migratedUrl, null));
        CliRun init = CliRun.of("init-db", "--config", other.toString());
        assertEquals(0, init.exitCode(), init.err());
        try (Session s = Session.open(ConfigLoader.load(other), null, Map.of())) {
            ConsoleCommand.Running running = ConsoleCommand.serve(s, "127.0.0.1", 0);
            try {
                assertTrue(running.url().matches("http://127\\.0\\.0\\.1:\\d+/console"), running.url());
                HttpClient http = HttpClient.newBuilder().followRedirects(HttpClient.Redirect.NEVER).build();
                String root = running.url().replace("/console", "");
                HttpResponse<String> health = http.send(HttpRequest.newBuilder(URI.create(root + "/health")).build(),
                        HttpResponse.BodyHandlers.ofString());
                assertEquals(404, health.statusCode(), "no daemon runs here");
                HttpResponse<String> page = http.send(HttpRequest.newBuilder(URI.create(running.url())).build(),
                        HttpResponse.BodyHandlers.ofString());
                assertEquals(303, page.statusCode(), page.body());
                assertEquals("/console/login?next=%2Fconsole", page.headers().firstValue("Location").orElse(null));
            } finally {
                running.server().stop();
            }
        }
    }
}
