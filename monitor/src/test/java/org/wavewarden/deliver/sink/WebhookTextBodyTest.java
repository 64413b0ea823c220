package org.wavewarden.deliver.sink;

import com.fasterxml.jackson.databind.JsonNode;
import com.sun.net.httpserver.HttpServer;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.postgresql.ds.PGSimpleDataSource;
import org.wavewarden.config.SinkSettings;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Verdict;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.testing.TestDatabase;

import java.io.IOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.URI;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A webhook for chat tools that take one text field: the body is {@code {"<field>": "<plain text>"}}, written by
 * Jackson (so quotes, backslashes and line breaks in the data are JSON-escaped), and still signed and keyed like a
 * full message. Received by a real HTTP server on loopback.
 */
class WebhookTextBodyTest {

    static final String SECRET = "a-shared-secret-of-some-length";
    static HttpServer server;
    static String base;
    static JdbiDeadLetters deadLetters;

    record Received(byte[] body, String delivery, boolean signed) {
    }

    static final List<Received> received = new CopyOnWriteArrayList<>();
    static volatile int status = 204;

    @BeforeAll
    static void start() throws IOException {
        server = HttpServer.create(new InetSocketAddress(InetAddress.getLoopbackAddress(), 0), 0);
        server.createContext("/", ex -> {
            byte[] body = ex.getRequestBody().readAllBytes();
            received.add(new Received(body, ex.getRequestHeaders().getFirst(WebhookSink.IDEMPOTENCY_HEADER),
                    Signatures.verify(body, SECRET, ex.getRequestHeaders().getFirst(WebhookSink.SIGNATURE_HEADER))));
            ex.sendResponseHeaders(status, -1);
            ex.close();
        });
        server.start();
        base = "http://127.0.0.1:" + server.getAddress().getPort();
        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setUrl(TestDatabase.freshDatabase("textbody"));
        ds.setUser("postgres");
        ResultsSchema.migrate(ds, "wavewarden");
        deadLetters = new JdbiDeadLetters(Jdbi.create(ds), "wavewarden");
    }

    @AfterAll
    static void stop() {
        server.stop(0);
    }

    @BeforeEach
    void reset() {
        received.clear();
        status = 204;
    }

    WebhookSink sink(SinkSettings.Messages messages, String textField) {
        return new WebhookSink(URI.create(base + "/chat"), SECRET, SinkFilter.all(),
                RetryPolicy.of(2, Duration.ofMillis(1), Duration.ofMillis(2)), deadLetters,
                SinkFactory.httpClient(), WebhookSink.REQUEST_TIMEOUT, messages, textField);
    }

    @Test
    void aRollUpIsPostedAsOneTextFieldSignedAndKeyed() {
        AlertMessage quoted = AlertMessage.ofRun("survey", "w2", "w1", 7L, "abc123", List.of(
                Messages.shift("age", Verdict.MATERIAL))).get(0);
        AlertMessage tricky = new AlertMessage("survey", "w2", "w1", 7L, "income", quoted.kind(), Verdict.UNCERTAIN,
                "Said \"more\" \\ less\nthan before.", null, null, null, quoted.idempotencyKey());
        RollUp r = RollUpTest.rollUp(List.of(quoted, tricky), new RollUp.NotSent(0, 0, 2, 1, 0), null);
        sink(SinkSettings.Messages.PER_FIRING, "text").deliverRollUp(r);

        assertEquals(1, received.size());
        Received got = received.get(0);
        assertTrue(got.signed(), "signed with the shared secret like a full message");
        assertEquals(r.idempotencyKey(), got.delivery());
        JsonNode body = Json.read(new String(got.body(), java.nio.charset.StandardCharsets.UTF_8), JsonNode.class);
        assertEquals(List.of("text"), iterable(body.fieldNames()));
        assertEquals(r.text(), body.get("text").asText());
        assertTrue(body.get("text").asText().contains("Said \"more\" \\ less\\nthan before."),
                body.get("text").asText());
    }

    @Test
    void withoutATextFieldTheRollUpIsPostedAsItsJson() {
        RollUp r = RollUpTest.rollUp(List.of(Messages.message(Messages.shift("age", Verdict.MATERIAL))),
                RollUp.NotSent.NONE, "https://reports.example/s/digest-x/digest.html");
        sink(SinkSettings.Messages.BOTH, null).deliverRollUp(r);
        JsonNode body = Json.read(new String(received.get(0).body(), java.nio.charset.StandardCharsets.UTF_8),
                JsonNode.class);
        assertEquals("survey", body.get("dataset").asText());
        assertEquals("age", body.get("alerts").get(0).get("variable").asText());
        assertEquals("https://reports.example/s/digest-x/digest.html", body.get("digestLink").asText());
    }

    @Test
    void eachAlertCanBePostedAsTextToo() {
        AlertMessage m = Messages.message(Messages.shift("age", Verdict.MATERIAL));
        DeliveryReport report = sink(SinkSettings.Messages.PER_ALERT, "content").deliver(List.of(m));
        assertEquals(1, report.delivered());
        JsonNode body = Json.read(new String(received.get(0).body(), java.nio.charset.StandardCharsets.UTF_8),
                JsonNode.class);
        assertEquals(RollUp.text(m), body.get("content").asText());
        assertEquals(m.idempotencyKey(), received.get(0).delivery());
    }

    @Test
    void aRollUpTheReceiverRefusesIsReportedUndeliveredWithTheReason() {
        status = 400;
        RollUp r = RollUpTest.rollUp(List.of(Messages.message(Messages.shift("age", Verdict.MATERIAL))),
                RollUp.NotSent.NONE, null);
        UndeliveredException e = assertThrows(UndeliveredException.class,
                () -> sink(SinkSettings.Messages.PER_FIRING, "text").deliverRollUp(r));
        assertTrue(e.getMessage().startsWith("HTTP 400"), e.getMessage());
        assertEquals(1, e.attempts(), "a 4xx is final at once");
    }

    private static List<String> iterable(java.util.Iterator<String> it) {
        List<String> out = new java.util.ArrayList<>();
        it.forEachRemaining(out::add);
        return out;
    }
}
