package org.wavewarden.soak;

import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.sink.Signatures;
import org.wavewarden.deliver.sink.WebhookSink;

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
                .header(WebhookSink.DELIVERY_HEADER, key)
                .header(WebhookSink.SIGNATURE_HEADER, Signatures.SCHEME + Signatures.hmacSha256Hex(body, secret))
                .POST(HttpRequest.BodyPublishers.ofByteArray(body)).build();
    }

    int send(HttpRequest r) throws Exception {
        return http.send(r, HttpResponse.BodyHandlers.discarding()).statusCode();
    }

    @Test
    void aSignedRequestIsAcceptedAndRecordedWithItsKeyInMemoryAndInTheFile() throws Exception {
        assertEquals(200, send(post("k1", SECRET)));
        List<WebhookReceiver.Request> r = receiver.requests();
        assertEquals(1, r.size());
        assertEquals("k1", r.get(0).key());
        assertTrue(r.get(0).accepted());
        assertTrue(r.get(0).signed());
        assertEquals(BODY, r.get(0).body());
        assertEquals(1, Files.readAllLines(dir.resolve("requests.jsonl")).size());
    }

    @Test
    void aRequestSignedWithAnotherSecretIsRefusedWith401AndNotAccepted() throws Exception {
        assertEquals(401, send(post("k1", "another secret altogether")));
        assertFalse(receiver.requests().get(0).accepted());
        assertFalse(receiver.requests().get(0).signed());
    }

    @Test
    void whileFailingEveryRequestIsAnswered500AndNotAcceptedThenAcceptedAgain() throws Exception {
        receiver.fail();
        assertEquals(500, send(post("k1", SECRET)));
        receiver.accept();
        assertEquals(200, send(post("k1", SECRET)));
        assertEquals(List.of(false, true), receiver.requests().stream().map(WebhookReceiver.Request::accepted).toList());
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
        assertFalse(receiver.requests().get(0).accepted());
        assertEquals(200, send(post("k2", SECRET)));
    }
}
