package org.wavewarden.daemon;

import jakarta.mail.Message;
import jakarta.mail.internet.InternetAddress;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.SinkSettings;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.sink.AlertSink;
import org.wavewarden.deliver.sink.EmailSink;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.RollUp;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.deliver.sink.UndeliveredException;
import org.wavewarden.pipeline.Session;
import org.wavewarden.testing.SmtpRelay;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A firing's alerts reach the survey team as one e-mail: a daemon firing judges the waves of a dataset on a real
 * PostgreSQL server, and its delivery step sends the roll-up to a real SMTP server on loopback that requires
 * STARTTLS (with a certificate made for the test and handed to the sink as its CA file) and AUTH (checked against
 * the credentials the sink read from its environment variables). The message lists every new alert, says what was
 * not sent on its own, and links the firing's digest; it is not sent twice, and one the relay refuses stays owed.
 */
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class EmailRollUpIntegrationTest {

    static final String USER = "survey-ops";
    static final String PASSWORD = "a-relay-password-for-the-test";
    static final String BASE = "https://reports.harrowmere.example/wavewarden";

    @TempDir
    static Path dir;
    static String url;
    static SmtpRelay.Certificate cert;
    static SmtpRelay relay;
    static WardenConfig config;
    static Path out;
    static String sinkName;

    /**
     * Firings one minute apart, so each has a digest folder of its own; from the real time on, so that a replayed
     * row (due from the database's now) is due for the next firing.
     */
    static Instant now = Instant.now().truncatedTo(java.time.temporal.ChronoUnit.SECONDS);

    @BeforeAll
    static void setUp() throws Exception {
        cert = SmtpRelay.certificate(dir);
        relay = SmtpRelay.start(cert, USER, PASSWORD);
        url = TestDatabase.freshDatabase("email");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Harrowmere County household panel, two waves: score rises by about six points for everyone, and one
            // height in eight becomes the sentinel 999 in w2.
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.hh (wave text NOT NULL, pid integer NOT NULL,
                        score double precision, height_cm double precision, region text);
                    INSERT INTO src.hh SELECT 'w1', p, 40 + (p * 7) % 21, 150 + (p * 11) % 41,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;
                    INSERT INTO src.hh SELECT 'w2', p, 46 + (p * 7) % 21 + (p * 13) % 5 - 2,
                        CASE WHEN p % 8 = 0 THEN 999 ELSE 150 + (p * 11) % 41 END,
                        (ARRAY['north', 'south', 'east', 'west'])[1 + p % 4] FROM generate_series(1, 400) p;
                    """);
        }
        out = dir.resolve("out");
        config = ConfigLoader.parse(yaml(url, relay.port(), cert.pem()));
        sinkName = "email:127.0.0.1:" + relay.port();
    }

    static String yaml(String url, int port, Path ca) {
        return "source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\nresults:\n  schema: hh_results\nalpha: 0.05\n"
                + "datasets:\n  - name: household\n    table: src.hh\n    waveColumn: wave\n    respondentKey: pid\n"
                + "    variables:\n"
                + "      - {name: score, kind: continuous, unit: points}\n"
                + "      - {name: height_cm, kind: continuous, unit: cm}\n"
                + "      - {name: region, kind: categorical}\n"
                + "    alerts:\n"
                + "      digestBaseUrl: \"" + BASE + "/\"\n"
                + "      email:\n"
                + "        host: 127.0.0.1\n"
                + "        port: " + port + "\n"
                + (ca == null ? "" : "        caFile: \"" + ca.toString().replace("\\", "/") + "\"\n")
                + "        userEnv: RELAY_USER\n"
                + "        passwordEnv: RELAY_PASSWORD\n"
                + "        from: wavewarden@harrowmere.example\n"
                + "        to: [survey-ops@harrowmere.example, fieldwork@harrowmere.example]\n";
    }

    @AfterAll
    static void tearDown() {
        if (relay != null) {
            relay.close();
        }
    }

    static Session session(String password) {
        return session(password, config);
    }

    static Session session(String password, WardenConfig c) {
        Session s = Session.open(c, null, Map.of("RELAY_USER", USER, "RELAY_PASSWORD", password));
        s.migrate();
        return s;
    }

    /** One firing of the daemon for the dataset: judge what changed, then carry out what is owed. */
    static Deliveries.Outcome fire(Session s) {
        return fire(s, config);
    }

    static Deliveries.Outcome fire(Session s, WardenConfig c) {
        Map<String, List<AlertSink>> sinks = Sinks.fromConfig(s, RetryPolicy.of(2, Duration.ofMillis(1),
                Duration.ofMillis(2)));
        Deliveries deliveries = new Deliveries(s, sinks, Clock.fixed(now, ZoneOffset.UTC),
                Deliveries.DEAD_LETTER_BACKOFF);
        new DatasetFiring(s, Clock.fixed(now, ZoneOffset.UTC), out, deliveries.sinkNames("household"),
                deliveries.rollUpSinkNames("household"), true).fire(c.dataset("household"));
        now = now.plus(Duration.ofMinutes(1));
        return deliveries.deliver("household");
    }

    /** What the firing's new alerts are, from the results schema: variable, kind, verdict. */
    record Stored(String variable, String kind, String verdict) {
    }

    static List<Stored> openAlerts(String wave) throws Exception {
        List<Stored> list = new ArrayList<>();
        try (Connection c = TestDatabase.connect(url); var st = c.prepareStatement("SELECT variable, kind, verdict"
                + " FROM hh_results.alert WHERE wave = ? AND superseded_at IS NULL ORDER BY alert_id")) {
            st.setString(1, wave);
            try (ResultSet rs = st.executeQuery()) {
                while (rs.next()) {
                    list.add(new Stored(rs.getString(1), rs.getString(2), rs.getString(3)));
                }
            }
        }
        return list;
    }

    static List<String> rollUpRow(String... columns) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT " + String.join(", ", columns) + " FROM hh_results.outbox"
                     + " WHERE product = 'roll-up' ORDER BY outbox_id DESC LIMIT 1")) {
            assertTrue(rs.next(), "a roll-up row");
            List<String> row = new ArrayList<>();
            for (int i = 1; i <= columns.length; i++) {
                row.add(rs.getString(i));
            }
            return row;
        }
    }

    static String body(SmtpRelay.Received r) throws Exception {
        return r.message().getContent().toString().replace("\r\n", "\n");
    }

    @Test
    @Order(1)
    void theFiringsNewAlertsArriveAsOneEmailToEveryRecipient() throws Exception {
        try (Session s = session(PASSWORD)) {
            fire(s);
        }
        List<SmtpRelay.Received> got = relay.received();
        assertEquals(1, got.size(), "one message for the firing");
        assertEquals(List.of("survey-ops@harrowmere.example", "fieldwork@harrowmere.example"),
                got.get(0).envelopeTo(), "handed over for every recipient");
        assertEquals(List.of(USER), relay.logins(), "logged in once, with the user from the environment");
        Message m = got.get(0).message();
        assertEquals(List.of("survey-ops@harrowmere.example", "fieldwork@harrowmere.example"),
                Arrays.stream(m.getRecipients(Message.RecipientType.TO)).map(a -> ((InternetAddress) a).getAddress())
                        .toList());
        assertEquals("wavewarden@harrowmere.example", ((InternetAddress) m.getFrom()[0]).getAddress());

        List<Stored> alerts = openAlerts("w2");
        // The planted shift and sentinel alert, and nothing else moves.
        assertEquals(List.of("height_cm", "score"), alerts.stream().map(Stored::variable).sorted().toList(),
                alerts.toString());
        String text = body(got.get(0));
        for (Stored a : alerts) {
            String listed = ", " + a.variable() + " (" + a.kind() + (a.verdict() == null ? "" : ", " + a.verdict())
                    + "): ";
            assertTrue(text.contains(listed), "lists " + listed + " in\n" + text);
        }
        assertTrue(text.contains("\n2 new alerts.\n"), text);
        assertTrue(text.contains("Not sent on their own: 0\n"), text);
        assertTrue(text.contains("- not taken by this sink's filter: 0\n"), text);

        List<String> row = rollUpRow("state", "folder", "item");
        assertEquals("delivered", row.get(0));
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT count(*) FROM hh_results.outbox WHERE product = 'alert'")) {
            rs.next();
            assertEquals(0, rs.getInt(1), "a sink sent only roll-ups owes no alert on its own");
        }
        Path folder = Path.of(row.get(1));
        String link = BASE + "/" + out.toAbsolutePath().normalize().relativize(folder).toString().replace('\\', '/')
                + "/digest.html";
        assertTrue(text.contains("\nDigest: " + link + "\n"), "links " + link + " in\n" + text);
        assertTrue(Files.exists(folder.resolve("digest.html")), "the linked digest is written before the mail goes");

        String subject = m.getSubject();
        assertTrue(subject.startsWith("[Wavewarden] household: 2 new alerts (2 MATERIAL), firing "), subject);
        assertTrue(subject.endsWith(", firing " + folder.getFileName()), subject);
        String key = RollUp.idempotencyKey("household", sinkName, row.get(2));
        assertEquals("<" + key + "@harrowmere.example>", m.getHeader("Message-ID")[0]);
        assertEquals(key, m.getHeader(EmailSink.DELIVERY_HEADER)[0]);
        System.out.println("--- roll-up received by the test relay ---\nSubject: " + subject + "\n\n" + text);
    }

    @Test
    @Order(2)
    void deliveringAgainOrFiringAgainOnTheSameDataSendsNothingMore() throws Exception {
        int before = relay.received().size();
        try (Session s = session(PASSWORD)) {
            Deliveries deliveries = new Deliveries(s, Sinks.fromConfig(s), Clock.fixed(now, ZoneOffset.UTC),
                    Deliveries.DEAD_LETTER_BACKOFF);
            deliveries.deliver("household");
            fire(s);
        }
        assertEquals(before, relay.received().size());
    }

    @Test
    @Order(3)
    void aRefusedLoginLeavesTheRollUpOwedWithTheReasonUntilItIsSent() throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    INSERT INTO src.hh SELECT 'w3', pid, score + 6, height_cm, region FROM src.hh WHERE wave = 'w2';
                    """);
        }
        int before = relay.received().size();
        int loginsBefore = relay.logins().size();
        try (Session s = session("not-the-password")) {
            Deliveries.Outcome o = fire(s);
            assertEquals(1, o.sinks().stream().filter(x -> x.sink().equals(sinkName)).findFirst().orElseThrow()
                    .dead());
        }
        assertEquals(before, relay.received().size(), "nothing was sent");
        assertEquals(loginsBefore + 1, relay.logins().size(), "a refused login is not tried again at once");
        List<String> row = rollUpRow("state", "last_error", "failed_attempts", "item");
        assertEquals("dead", row.get(0));
        assertTrue(row.get(1).contains("AuthenticationFailedException"), row.get(1));
        assertFalse(row.get(1).contains("not-the-password"), "the password is never recorded");
        assertEquals("1", row.get(2));

        try (Session s = session(PASSWORD)) {
            s.store().outbox().replay("household", sinkName);
            Deliveries deliveries = new Deliveries(s, Sinks.fromConfig(s), Clock.fixed(now, ZoneOffset.UTC),
                    Deliveries.DEAD_LETTER_BACKOFF);
            deliveries.deliver("household");
        }
        assertEquals("delivered", rollUpRow("state").get(0));
        List<SmtpRelay.Received> got = relay.received();
        assertEquals(before + 1, got.size(), "the owed roll-up");
        String text = body(got.get(got.size() - 1));
        assertTrue(text.contains("wave w3 against w2, score ("), text);
        assertFalse(text.contains("wave w2 against w1"), "the earlier firing's alerts are not new: " + text);
    }

    @Test
    @Order(4)
    void aRelayWhoseCertificateIsNotTrustedGetsNothing() throws Exception {
        SinkSettings.Email noCa = ConfigLoader.parse(yaml(url, relay.port(), null)).dataset("household").alerts()
                .email();
        int before = relay.received().size();
        try (EmailSink sink = new EmailSink(noCa, Map.of("RELAY_USER", USER, "RELAY_PASSWORD", PASSWORD)::get,
                SinkFilter.all(), RetryPolicy.of(1, Duration.ofMillis(1), Duration.ofMillis(1)))) {
            UndeliveredException e = assertThrows(UndeliveredException.class,
                    () -> sink.deliverRollUp(RollUpFixture.one()));
            assertTrue(e.getMessage().contains("SSLHandshakeException") || e.getMessage().contains("PKIX"),
                    e.getMessage());
        }
        assertEquals(before, relay.received().size());
    }

    @Test
    @Order(5)
    void aRelayThatOffersNoStartTlsGetsNothing() throws Exception {
        try (SmtpRelay plain = SmtpRelay.withoutTls(USER, PASSWORD)) {
            SinkSettings.Email settings = ConfigLoader.parse(yaml(url, plain.port(), cert.pem()))
                    .dataset("household").alerts().email();
            try (EmailSink sink = new EmailSink(settings, Map.of("RELAY_USER", USER, "RELAY_PASSWORD", PASSWORD)::get,
                    SinkFilter.all(), RetryPolicy.of(1, Duration.ofMillis(1), Duration.ofMillis(1)))) {
                UndeliveredException e = assertThrows(UndeliveredException.class,
                        () -> sink.deliverRollUp(RollUpFixture.one()));
                assertTrue(e.getMessage().contains("STARTTLS"), e.getMessage());
            }
            assertEquals(List.of(), plain.received());
            assertEquals(List.of(), plain.logins(), "the password is not sent over a plain connection");
        }
    }

    @Test
    @Order(6)
    void perAlertEachAlertIsAnEmailOfItsOwnKeyedByTheAlert() throws Exception {
        SinkSettings.Email perAlert = ConfigLoader.parse(yaml(url, relay.port(), cert.pem()).replace(
                "        userEnv:", "        messages: perAlert\n        userEnv:")).dataset("household").alerts().email();
        assertEquals(SinkSettings.Messages.PER_ALERT, perAlert.messages());
        var m = RollUpFixture.one().alerts().get(0);
        int before = relay.received().size();
        try (EmailSink sink = new EmailSink(perAlert, Map.of("RELAY_USER", USER, "RELAY_PASSWORD", PASSWORD)::get,
                SinkFilter.all(), RetryPolicy.of(1, Duration.ofMillis(1), Duration.ofMillis(1)))) {
            assertEquals(1, sink.deliver(List.of(m, m)).delivered(), "the same alert twice in a batch is sent once");
        }
        List<SmtpRelay.Received> got = relay.received();
        assertEquals(before + 1, got.size());
        Message mail = got.get(got.size() - 1).message();
        assertEquals("[Wavewarden] household wave w2: MATERIAL score", mail.getSubject());
        assertEquals("<" + m.idempotencyKey() + "@harrowmere.example>", mail.getHeader("Message-ID")[0]);
        assertEquals(RollUp.text(m), body(got.get(got.size() - 1)).stripTrailing());
    }

    @Test
    @Order(7)
    void aFiringWithNothingNewForTheSinkSendsNothingAndSaysWhy() throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("INSERT INTO src.hh SELECT 'w4', pid, score, height_cm, region FROM src.hh WHERE wave = 'w3'");
        }
        // This sink takes only added columns among the data-quality findings: whatever w4 raises is not for it.
        WardenConfig onlyAddedColumns = ConfigLoader.parse(yaml(url, relay.port(), cert.pem()).replace(
                "        userEnv:", "        kinds: [COLUMN_ADDED]\n        userEnv:"));
        int before = relay.received().size();
        try (Session s = session(PASSWORD, onlyAddedColumns)) {
            fire(s, onlyAddedColumns);
        }
        assertEquals(before, relay.received().size(), "nothing new, nothing sent");
        long notSent;
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT (SELECT count(*) FROM hh_results.alert WHERE wave = 'w4'"
                     + " AND superseded_at IS NULL) + (SELECT count(*) FROM hh_results.finding f JOIN"
                     + " hh_results.run r ON r.run_id = f.run_id WHERE r.wave = 'w4' AND f.repeat IS NOT NULL)")) {
            rs.next();
            notSent = rs.getLong(1);
        }
        // The sentinel heights are still in w4: an alert of a kind this sink does not take, or a repeat.
        assertTrue(notSent >= 1, "w4 found something that was not sent: " + notSent);
        List<String> row = rollUpRow("state", "last_error");
        assertEquals(List.of("withheld", "nothing new: " + notSent + " not sent on their own"), row);
    }

    @Test
    @Order(8)
    void aPlainLoopbackRelayIsUsedOnlyWhenConfiguredSo() throws Exception {
        try (SmtpRelay plain = SmtpRelay.withoutTls(USER, PASSWORD)) {
            SinkSettings.Email settings = ConfigLoader.parse(yaml(url, plain.port(), null).replace(
                    "        userEnv:", "        tls: none\n        userEnv:")).dataset("household").alerts().email();
            try (EmailSink sink = new EmailSink(settings, Map.of("RELAY_USER", USER, "RELAY_PASSWORD", PASSWORD)::get,
                    SinkFilter.all(), RetryPolicy.of(1, Duration.ofMillis(1), Duration.ofMillis(1)))) {
                sink.deliverRollUp(RollUpFixture.one());
            }
            assertEquals(1, plain.received().size());
            assertEquals(List.of(USER), plain.logins());
        }
    }

    /** A roll-up of one alert, for the tests of the transport alone. */
    static final class RollUpFixture {
        static RollUp one() {
            var m = new org.wavewarden.deliver.sink.AlertMessage("household", "w2", "w1", 1L, "score",
                    org.wavewarden.judge.FindingKind.SHIFT, org.wavewarden.judge.Verdict.MATERIAL, "Scores rose.",
                    null, null, null, "5".repeat(64));
            return new RollUp("household", "digest-test", List.of(1L), List.of(m), RollUp.NotSent.NONE, null,
                    RollUp.idempotencyKey("household", "email:test", "roll-up of test"));
        }
    }
}
