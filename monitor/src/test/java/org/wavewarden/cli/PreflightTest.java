package org.wavewarden.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code run} refuses to start, with exit 2 and the key to fix, when the machine cannot give it what the config
 * asks for: a webhook secret missing from the environment, a status port another program holds. Nothing is
 * written first.
 */
class PreflightTest {

    @TempDir
    static Path dir;
    static String url;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("preflight");
        SmallSurvey.createTable(url);
    }

    static String config(String datasetKeys, String daemon) {
        return SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    " + datasetKeys) + "daemon:\n  " + daemon + "\n  outputDir: \""
                + dir.resolve("digests").toString().replace("\\", "/") + "\"\n";
    }

    @Test
    void anUnsetWebhookSecretVariableExitsTwoNamingItsKey() throws Exception {
        String unset = "WAVEWARDEN_PREFLIGHT_SECRET_THAT_IS_NOT_SET";
        assertEquals(null, System.getenv(unset), "the variable must not be set for this test");
        Path file = dir.resolve("secret.yaml");
        Files.writeString(file, config("alerts: {webhook: {url: \"http://127.0.0.1:9/hook\", secretEnv: " + unset
                + "}}", "httpPort: -1"));
        CliRun r = CliRun.of("run", "--once", "--config", file.toString());
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().startsWith("config error at datasets[0].alerts.webhook.secretEnv: environment variable "
                + unset + " is not set or empty"), r.err());
        assertEquals(0, schemas(), "the results schema is not created");
    }

    @Test
    void anUnsetRelayPasswordVariableOrAnUnreadableCaFileExitsTwoNamingItsKey() throws Exception {
        String unset = "WAVEWARDEN_PREFLIGHT_RELAY_PASSWORD_THAT_IS_NOT_SET";
        assertEquals(null, System.getenv(unset), "the variable must not be set for this test");
        String email = "alerts: {email: {host: 127.0.0.1, userEnv: PATH, passwordEnv: " + unset + ","
                + " from: wavewarden@harrowmere.example, to: survey-ops@harrowmere.example}}";
        Path file = dir.resolve("relay.yaml");
        Files.writeString(file, config(email, "httpPort: -1"));
        CliRun r = CliRun.of("run", "--once", "--config", file.toString());
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().startsWith("config error at datasets[0].alerts.email.passwordEnv: environment variable "
                + unset + " is not set or empty"), r.err());

        Path notPem = dir.resolve("not-a-ca.pem");
        Files.writeString(notPem, "not a certificate\n");
        Files.writeString(file, config(email.replace(unset, "PATH").replace("host: 127.0.0.1,", "host: 127.0.0.1,"
                + " caFile: \"" + notPem.toString().replace("\\", "/") + "\","), "httpPort: -1"));
        r = CliRun.of("run", "--once", "--config", file.toString());
        assertEquals(2, r.exitCode(), r.err());
        assertTrue(r.err().startsWith("config error at datasets[0].alerts.email.caFile: cannot read certificates"),
                r.err());
        assertEquals(0, schemas(), "the results schema is not created");
    }

    @Test
    void aBusyStatusPortExitsTwoNamingDaemonHttpPortBeforeAnythingIsWritten() throws Exception {
        try (ServerSocket taken = new ServerSocket()) {
            taken.bind(new InetSocketAddress(InetAddress.getByName("127.0.0.1"), 0));
            Path file = dir.resolve("port.yaml");
            Files.writeString(file, config("schedule: \"0 15 2 * * ?\"", "httpBind: 127.0.0.1\n  httpPort: "
                    + taken.getLocalPort()));
            CliRun r = CliRun.of("run", "--config", file.toString());
            assertEquals(2, r.exitCode(), r.err());
            assertTrue(r.err().startsWith("config error at daemon.httpPort: cannot listen on 127.0.0.1:"
                    + taken.getLocalPort()), r.err());
        }
        assertEquals(0, schemas(), "neither the results schema nor the scheduler tables are created");
    }

    static long schemas() throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT count(*) FROM information_schema.schemata"
                     + " WHERE schema_name = 'ww_results'")) {
            rs.next();
            return rs.getLong(1);
        }
    }
}
