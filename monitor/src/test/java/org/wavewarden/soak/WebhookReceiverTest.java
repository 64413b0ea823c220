package org.wavewarden.soak;

import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.sink.AlertMessage;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.Signatures;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.deliver.sink.WebhookSink;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.soak.SoakAudit.AlertRef;
import org.wavewarden.soak.SoakAudit.AlertRow;
import org.wavewarden.soak.WebhookReceiver.Outcome;

import java.io.IOException;
import java.net.ConnectException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.CompletableFuture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

class WebhookReceiverTest {

    static final String SECRET = "a shared secret of the receiver test";
    static final String BODY = "{\"dataset\":\"harrowmere-soak\",\"wave\":\"W0002\"}";

    @TempDir
    Path dir;
    WebhookReceiver receiver;
    final HttpClient http = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(5)).build();

    @BeforeEach
    void start() throws IOException {
        receiver = WebhookReceiver.start(SECRET, dir.resolve("requests.jsonl"));
    }

    @AfterEach
    void stop() {
        receiver.close();
    }

    HttpRequest post(String key, String secret) {
        byte[] body = BODY.getBytes(StandardCharsets.UTF_8);
        return HttpRequest.newBuilder(URI.create(receiver.url())).timeout(Duration.ofSeconds(30))
                .header(WebhookSink.IDEMPOTENCY_HEADER, key)
                .header(WebhookSink.SIGNATURE_HEADER, Signatures.SCHEME + Signatures.hmacSha256Hex(body, secret))
                .POST(HttpRequest.BodyPublishers.ofByteArray(body)).build();
    }

    int send(HttpRequest r) throws Exception {
        return http.send(r, HttpResponse.BodyHandlers.discarding()).statusCode();
    }

    List<Outcome> outcomes() {
        return receiver.requests().stream().map(WebhookReceiver.Request::outcome).toList();
    }

    @Test
    void aSignedRequestIsAcceptedAndRecordedWithItsKeyInMemoryAndInTheFile() throws Exception {
        assertEquals(200, send(post("k1", SECRET)));
        List<WebhookReceiver.Request> r = receiver.requests();
        assertEquals(1, r.size());
        assertEquals("k1", r.get(0).key());
        assertEquals(Outcome.ACCEPTED, r.get(0).outcome());
        assertTrue(r.get(0).answered());
        assertTrue(r.get(0).signed());
        assertEquals(BODY, r.get(0).body());
        assertEquals(1, Files.readAllLines(dir.resolve("requests.jsonl")).size());
    }

    @Test
    void aRequestSignedWithAnotherSecretIsRefusedWith401AndNotAccepted() throws Exception {
        assertEquals(401, send(post("k1", "another secret altogether")));
        assertEquals(Outcome.REFUSED, receiver.requests().get(0).outcome());
        assertFalse(receiver.requests().get(0).signed());
    }

    @Test
    void whileFailingEveryRequestIsAnswered500AndNotTakenSoItsRetryIsTakenAfterwards() throws Exception {
        receiver.fail();
        assertEquals(500, send(post("k1", SECRET)));
        receiver.accept();
        assertEquals(200, send(post("k1", SECRET)));
        assertEquals(List.of(Outcome.REFUSED, Outcome.ACCEPTED), outcomes());
    }

    @Test
    void aRequestWithAKeyAlreadyTakenIsAnswered200AndRecordedAsARepeatNotTakenAgain() throws Exception {
        assertEquals(200, send(post("k1", SECRET)));
        assertEquals(200, send(post("k1", SECRET)));
        assertEquals(200, send(post("k2", SECRET)));
        assertEquals(List.of(Outcome.ACCEPTED, Outcome.REPEAT, Outcome.ACCEPTED), outcomes());
    }

    @Test
    void theReceiverRemembersTheKeysItTookAcrossGoingDownAndUp() throws Exception {
        assertEquals(200, send(post("k1", SECRET)));
        receiver.down();
        receiver.up();
        assertEquals(200, send(post("k1", SECRET)));
        assertEquals(List.of(Outcome.ACCEPTED, Outcome.REPEAT), outcomes());
    }

    @Test
    void theKeyIsTheIdempotencyKeyHeaderNotTheDeliveryHeader() throws Exception {
        byte[] body = BODY.getBytes(StandardCharsets.UTF_8);
        HttpRequest r = HttpRequest.newBuilder(URI.create(receiver.url())).timeout(Duration.ofSeconds(30))
                .header(WebhookSink.IDEMPOTENCY_HEADER, "k1").header(WebhookSink.DELIVERY_HEADER, "other")
                .header(WebhookSink.SIGNATURE_HEADER, Signatures.SCHEME + Signatures.hmacSha256Hex(body, SECRET))
                .POST(HttpRequest.BodyPublishers.ofByteArray(body)).build();
        assertEquals(200, send(r));
        assertEquals("k1", receiver.requests().get(0).key());
    }

    @Test
    void theWebhookSinksSecondSendingOfAnAlertIsRecognisedByItsKeyAndTheAuditCountsItAsARepeat() {
        String key = "ab".repeat(32);
        AlertMessage m = new AlertMessage("harrowmere-soak", "W0004", "W0003", 7, "income_monthly",
                FindingKind.SHIFT, Verdict.MATERIAL, "income moved", null, null, null, key);
        RetryPolicy once = new RetryPolicy(1, Duration.ofMillis(10), Duration.ofMillis(10), 1L,
                RetryPolicy.THREAD_SLEEP);
        WebhookSink sink = new WebhookSink(URI.create(receiver.url()), SECRET, SinkFilter.all(), once,
                letter -> fail("nothing is dead-lettered: " + letter), http);
        // Two firings each sending the alert, as after a sender that was killed before it recorded the first.
        sink.deliver(List.of(m));
        sink.deliver(List.of(m));
        assertEquals(List.of(key, key), receiver.requests().stream().map(WebhookReceiver.Request::key).toList());
        assertEquals(List.of(Outcome.ACCEPTED, Outcome.REPEAT), outcomes());
        AlertRef income = new AlertRef("harrowmere-soak", "W0004", "W0003", "income_monthly", "SHIFT");
        SoakAudit.Sink audit = SoakAudit.sink("webhook", List.of(new AlertRow(income, "MATERIAL")),
                SinkFilter.all(), SoakAudit.fromWebhook(receiver.requests()));
        assertEquals(1, audit.delivered());
        assertEquals(0, audit.duplicated());
        assertEquals(1, audit.repeats());
    }

    @Test
    void downRefusesConnectionsAndUpListensOnTheSamePortAgain() throws Exception {
        String url = receiver.url();
        receiver.down();
        assertThrows(ConnectException.class, () -> send(post("k1", SECRET)));
        receiver.up();
        assertEquals(url, receiver.url());
        assertEquals(200, send(post("k1", SECRET)));
    }

    @Test
    void aHeldRequestWaitsForTheReleaseAndIsThenAnswered503() throws Exception {
        WebhookReceiver.Hold hold = receiver.holdNext();
        CompletableFuture<HttpResponse<Void>> answer = http.sendAsync(post("k1", SECRET),
                HttpResponse.BodyHandlers.discarding());
        assertTrue(hold.awaitArrival(Duration.ofSeconds(30)));
        assertFalse(answer.isDone());
        hold.release();
        assertEquals(503, answer.get().statusCode());
        assertEquals(Outcome.REFUSED, receiver.requests().get(0).outcome());
        assertEquals(200, send(post("k1", SECRET)));
        assertEquals(Outcome.ACCEPTED, receiver.requests().get(1).outcome());
    }
}
