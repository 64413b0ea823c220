package org.wavewarden.daemon;

import com.fasterxml.jackson.databind.JsonNode;
import com.sun.net.httpserver.HttpServer;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.sink.AlertSink;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.RollUp;
import org.wavewarden.deliver.sink.Signatures;
import org.wavewarden.deliver.sink.WebhookSink;
import org.wavewarden.pipeline.Session;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.testing.TestDatabase;

import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CopyOnWriteArrayList;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * What the daemon's delivery step sends and keeps back, through a real firing on a real PostgreSQL server and a
 * real webhook receiver on loopback. The Harrowmere County household survey's second wave raises three new alerts:
 * {@code score} open, {@code mode} explained at creation by the expected change to telephone interviewing, and
 * {@code income} muted by a configured rule. Only the open one reaches the receiver, whether the sink takes one
 * post per alert or one roll-up per firing; the others are recorded, with their state, as withheld. An alert a
 * person explains after the firing and before the delivery step runs is withheld too, since what is sent is decided
 * by the alerts' states when delivery runs.
 */
class WithheldDeliveryIntegrationTest {

    static final String SECRET = "a-webhook-secret-for-the-test";
    static final String SIGNED_BY = "Harrowmere County Survey Office";

    @TempDir
    static Path dir;
    static String url;
    static HttpServer receiver;
    static String hook;

    /** A post as the receiver got it. */
    record Post(String body, String idempotencyKey, boolean signed) {
    }

    static final List<Post> POSTS = new CopyOnWriteArrayList<>();

    /** An outbox row of the alert sink as stored: product, the alert's variable (null for a roll-up), state, why. */
    record OutboxRow(String product, String variable, String state, String lastError) {
    }

    @BeforeAll
    static void setUp() throws Exception {
        receiver = HttpServer.create(new InetSocketAddress(InetAddress.getLoopbackAddress(), 0), 0);
        receiver.createContext("/hook", ex -> {
            byte[] body = ex.getRequestBody().readAllBytes();
            POSTS.add(new Post(new String(body, StandardCharsets.UTF_8),
                    ex.getRequestHeaders().getFirst(WebhookSink.IDEMPOTENCY_HEADER),
                    Signatures.verify(body, SECRET, ex.getRequestHeaders().getFirst(WebhookSink.SIGNATURE_HEADER))));
            ex.sendResponseHeaders(204, -1);
            ex.close();
        });
        receiver.start();
        hook = "http://127.0.0.1:" + receiver.getAddress().getPort() + "/hook";
        url = TestDatabase.freshDatabase("withheld");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Four variables, each moved by about one standard deviation in w2 (R 4.2.2 sd() of the 400 values:
            // score 5.72 for a step of 6, income 57.8 for 60, commute 8.93 for 9) and the phone share from 10% to
            // 40% (Cramer's V 0.35, R 4.2.2 sqrt(chisq.test(correct = FALSE)$statistic / 800)): every one raises a
            // MATERIAL alert of w2, and w1, the first wave, raises none.
            st.execute("""
                    CREATE SCHEMA src;
                    CREATE TABLE src.hh (wave text NOT NULL, pid integer NOT NULL, score double precision,
                        income double precision, commute double precision, mode text);
                    INSERT INTO src.hh SELECT 'w' || w, p,
                        40 + (p * 7) % 21 + 6 * w,
                        1000 + (p * 13) % 200 + 60 * w,
                        20 + (p * 17) % 31 + 9 * w,
                        CASE WHEN p % 10 < 3 * w - 2 THEN 'phone' ELSE 'web' END
                    FROM generate_series(1, 2) w, generate_series(1, 400) p;
                    """);
        }
    }

    @AfterAll
    static void tearDown() {
        receiver.stop(0);
    }

    @BeforeEach
    void forgetPosts() {
        POSTS.clear();
    }

    /**
     * The configuration of one delivery: its own results schema (each test's firing finds both waves new), a
     * webhook for chat tools (one text field) taking each alert or one roll-up, the expected change and the mute.
     */
    static WardenConfig config(String schema, String messages, boolean withCommute) {
        return ConfigLoader.parse("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: %s}
                alpha: 0.05
                datasets:
                  - name: household
                    table: src.hh
                    waveColumn: wave
                    exclude: [pid%s]
                    variables:
                      - {name: score, kind: continuous, unit: points}
                      - {name: income, kind: continuous, unit: currency per month}
                      - {name: mode, kind: categorical}
                    expectedChanges:
                      - {variable: mode, waves: w2, reason: planned-change, note: "Telephone from w2.", by: %s}
                    mutes:
                      - {variable: income, untilWave: w2, reason: "Income recoded upstream.", by: Edda Marsh}
                    alerts:
                      webhook:
                        url: "%s"
                        secretEnv: HOOK_SECRET
                        messages: %s
                        textField: text
                """.formatted(url, schema, withCommute ? "" : ", commute", SIGNED_BY, hook, messages));
    }

    /** A daemon firing's two halves, as Daemon runs them: judge and commit, then carry out what is owed. */
    record Firing(Session session, Deliveries deliveries) {
        static Firing judge(WardenConfig config, Instant at) {
            Session s = Session.open(config, null, Map.of("HOOK_SECRET", SECRET));
            s.migrate();
            Map<String, List<AlertSink>> sinks = Sinks.fromConfig(s, RetryPolicy.of(1, Duration.ofMillis(1),
                    Duration.ofMillis(1)));
            Deliveries deliveries = new Deliveries(s, sinks, Clock.fixed(at, ZoneOffset.UTC),
                    Deliveries.DEAD_LETTER_BACKOFF);
            new DatasetFiring(s, Clock.fixed(at, ZoneOffset.UTC), dir.resolve(config.results().schema()),
                    deliveries.sinkNames("household"), deliveries.rollUpSinkNames("household"), true)
                    .fire(config.dataset("household"));
            return new Firing(s, deliveries);
        }

        Deliveries.Outcome deliver() {
            try (session) {
                return deliveries.deliver("household");
            }
        }

        long alertOf(String variable) {
            return new AlertReviews(session.store().jdbi(), session.config().results().schema())
                    .list(new AlertReviews.Filter("household", "w2", null, null, null)).stream()
                    .filter(a -> a.variable().equals(variable)).findFirst().orElseThrow().alertId();
        }
    }

    static final Instant FIRED = Instant.parse("2026-06-01T02:15:00Z");
    static final String FIRING = "digest-20260601T021500Z";

    static List<OutboxRow> outbox(String schema) throws Exception {
        List<OutboxRow> rows = new ArrayList<>();
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT o.product, a.variable, o.state, o.last_error FROM " + schema
                     + ".outbox o LEFT JOIN " + schema + ".alert a ON a.alert_id = o.alert_id"
                     + " WHERE o.sink <> 'files' ORDER BY o.product, a.variable")) {
            while (rs.next()) {
                rows.add(new OutboxRow(rs.getString(1), rs.getString(2), rs.getString(3), rs.getString(4)));
            }
        }
        return rows;
    }

    static String rollUpItem(String schema) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT item FROM " + schema + ".outbox WHERE product = 'roll-up'")) {
            assertTrue(rs.next(), "a roll-up row");
            return rs.getString(1);
        }
    }

    /** The item of a variable's alert row: the alert's idempotency key. */
    static String alertItem(String schema, String variable) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.prepareStatement("SELECT o.item FROM " + schema
                + ".outbox o JOIN " + schema + ".alert a ON a.alert_id = o.alert_id WHERE a.variable = ?")) {
            st.setString(1, variable);
            try (ResultSet rs = st.executeQuery()) {
                assertTrue(rs.next(), "an outbox row of " + variable);
                return rs.getString(1);
            }
        }
    }

    /** The sentence stored with the w2 alert of a variable: the text a post carries for it. */
    static String sentence(String schema, String variable) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.prepareStatement("SELECT sentence FROM " + schema
                + ".alert WHERE wave = 'w2' AND variable = ? AND superseded_at IS NULL")) {
            st.setString(1, variable);
            try (ResultSet rs = st.executeQuery()) {
                assertTrue(rs.next(), "an alert of " + variable);
                return rs.getString(1);
            }
        }
    }

    /** The one text field of a post, after checking that the body is a JSON object of that field alone. */
    static String text(Post p) {
        JsonNode body = Json.read(p.body(), JsonNode.class);
        List<String> fields = new ArrayList<>();
        Iterator<String> names = body.fieldNames();
        names.forEachRemaining(fields::add);
        assertEquals(List.of("text"), fields, p.body());
        assertTrue(p.signed(), "signed with the shared secret");
        return body.get("text").asText();
    }

    static String scoreLine(String schema) throws Exception {
        return "wave w2 against w1, score (SHIFT, MATERIAL): " + sentence(schema, "score");
    }

    @Test
    void perAlertOnlyTheOpenAlertIsPostedAndTheOthersAreWithheldWithTheirState() throws Exception {
        Deliveries.Outcome o = Firing.judge(config("per_alert", "perAlert", false), FIRED).deliver();

        assertEquals(1, POSTS.size(), POSTS.toString());
        assertEquals("Wavewarden, dataset household: " + scoreLine("per_alert"), text(POSTS.get(0)));
        assertEquals(alertItem("per_alert", "score"), POSTS.get(0).idempotencyKey(),
                "keyed by the alert, as its outbox row is");
        assertEquals(List.of(
                new OutboxRow("alert", "income", "withheld", "MUTED"),
                new OutboxRow("alert", "mode", "withheld", "EXPLAINED"),
                new OutboxRow("alert", "score", "delivered", null)), outbox("per_alert"));
        Deliveries.SinkOutcome sink = o.sinks().get(1);
        assertEquals("webhook:" + hook, sink.sink());
        assertEquals(List.of(1, 0, 0L, 0L), List.of(sink.delivered(), sink.failed(), sink.pending(), sink.dead()),
                "one delivered, nothing owed: " + sink);
    }

    @Test
    void perFiringTheRollUpListsTheOpenAlertAndCountsTheExplainedAndTheMuted() throws Exception {
        Firing.judge(config("per_firing", "perFiring", false), FIRED).deliver();

        assertEquals(1, POSTS.size(), POSTS.toString());
        assertEquals("""
                Wavewarden, dataset household, firing %s
                1 new alert.

                MATERIAL (1)
                - %s

                Not sent on their own: 2
                - explained (expected change or reviewer): 1
                - muted: 1
                - still present from the previous wave: 0
                - still too few answers to judge: 0
                - not taken by this sink's filter: 0
                """.formatted(FIRING, scoreLine("per_firing")), text(POSTS.get(0)));
        System.out.println("--- roll-up received by the test webhook ---\n" + text(POSTS.get(0)));
        String item = rollUpItem("per_firing");
        assertTrue(item.startsWith("roll-up of ") && item.endsWith(FIRING), item);
        assertEquals(RollUp.idempotencyKey("household", "webhook:" + hook, item), POSTS.get(0).idempotencyKey(),
                "the key a receiver drops a repeat by");
        assertEquals(List.of(new OutboxRow("roll-up", null, "delivered", null)), outbox("per_firing"),
                "a sink sent roll-ups only owes no alert on its own");
    }

    @Test
    void perAlertAnAlertExplainedAfterTheFiringAndBeforeDeliveryIsWithheldToo() throws Exception {
        Firing f = Firing.judge(config("late_per_alert", "perAlert", true), FIRED);
        long commute = f.alertOf("commute");
        AlertReviews reviews = new AlertReviews(f.session().store().jdbi(), "late_per_alert");
        assertEquals(AlertState.OPEN, reviews.get(commute).orElseThrow().state(), "raised open");
        reviews.explain(commute, "Idris Fenwick", ReviewReason.REAL_CHANGE, "New bus route to Gullhaven.",
                "command");
        f.deliver();

        assertEquals(1, POSTS.size(), POSTS.toString());
        assertEquals("Wavewarden, dataset household: " + scoreLine("late_per_alert"), text(POSTS.get(0)));
        assertEquals(List.of(
                new OutboxRow("alert", "commute", "withheld", "EXPLAINED"),
                new OutboxRow("alert", "income", "withheld", "MUTED"),
                new OutboxRow("alert", "mode", "withheld", "EXPLAINED"),
                new OutboxRow("alert", "score", "delivered", null)), outbox("late_per_alert"));
    }

    @Test
    void perFiringAnAlertExplainedAfterTheFiringAndBeforeDeliveryIsCountedNotListed() throws Exception {
        Firing f = Firing.judge(config("late_roll_up", "perFiring", true), FIRED);
        new AlertReviews(f.session().store().jdbi(), "late_roll_up").explain(f.alertOf("commute"),
                "Idris Fenwick", ReviewReason.REAL_CHANGE, "New bus route to Gullhaven.", "command");
        f.deliver();

        assertEquals(1, POSTS.size(), POSTS.toString());
        assertEquals("""
                Wavewarden, dataset household, firing %s
                1 new alert.

                MATERIAL (1)
                - %s

                Not sent on their own: 3
                - explained (expected change or reviewer): 2
                - muted: 1
                - still present from the previous wave: 0
                - still too few answers to judge: 0
                - not taken by this sink's filter: 0
                """.formatted(FIRING, scoreLine("late_roll_up")), text(POSTS.get(0)));
        assertEquals(List.of(new OutboxRow("roll-up", null, "delivered", null)), outbox("late_roll_up"));
    }
}
