package org.wavewarden.deliver.sink;

import ch.qos.logback.classic.Level;
import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.classic.spi.IThrowableProxy;
import ch.qos.logback.core.read.ListAppender;
import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpServer;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.postgresql.ds.PGSimpleDataSource;
import org.slf4j.LoggerFactory;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.testing.TestDatabase;

import java.io.IOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.URI;
import java.net.http.HttpClient;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.function.IntFunction;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The webhook sink against a real HTTP server on the loopback interface, which checks each request's signature
 * with the shared secret and answers as each test scripts, and dead letters in a real PostgreSQL results schema.
 * Waits between retries are recorded, not slept.
 */
class WebhookSinkTest {

    private static final String SECRET = "wh-7f3a9c2e41d8b6-shared";

    static HttpServer server;
    static String base;
    static Jdbi jdbi;
    static JdbiDeadLetters deadLetters;
    static ListAppender<ILoggingEvent> logs;
    static Logger sinkLogger;

    /** A request as the server received it. */
    record Received(String path, byte[] body, String signature, String delivery, String contentType,
                    boolean signatureValid) {
    }

    static final List<Received> received = new CopyOnWriteArrayList<>();
    /** The answer to the n-th request (0-based) of the current test: status and body. */
    static volatile IntFunction<Answer> script = n -> new Answer(200, "", Map.of());

    record Answer(int status, String body, Map<String, String> headers) {
        static Answer of(int status) {
            return new Answer(status, "", Map.of());
        }
    }

    final List<Duration> sleeps = Collections.synchronizedList(new ArrayList<>());

    @BeforeAll
    static void start() throws IOException {
        server = HttpServer.create(new InetSocketAddress(InetAddress.getLoopbackAddress(), 0), 0);
        server.createContext("/", WebhookSinkTest::handle);
        server.start();
        base = "http://127.0.0.1:" + server.getAddress().getPort();

        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setUrl(TestDatabase.freshDatabase("sinks"));
        ds.setUser("postgres");
        ResultsSchema.migrate(ds, "wavewarden");
        jdbi = Jdbi.create(ds);
        deadLetters = new JdbiDeadLetters(jdbi, "wavewarden");

        sinkLogger = (Logger) LoggerFactory.getLogger("org.wavewarden.deliver.sink");
        logs = new ListAppender<>();
        logs.start();
        sinkLogger.addAppender(logs);
        sinkLogger.setLevel(Level.DEBUG);
        // Captured here and checked by the tests; kept off the console so the build output stays readable.
        sinkLogger.setAdditive(false);
    }

    @AfterAll
    static void stop() {
        server.stop(0);
        sinkLogger.detachAppender(logs);
        sinkLogger.setLevel(null);
        sinkLogger.setAdditive(true);
    }

    @BeforeEach
    void reset() {
        received.clear();
        script = n -> Answer.of(200);
    }

    private static void handle(HttpExchange ex) throws IOException {
        byte[] body = ex.getRequestBody().readAllBytes();
        String signature = ex.getRequestHeaders().getFirst(WebhookSink.SIGNATURE_HEADER);
        received.add(new Received(ex.getRequestURI().getPath(), body, signature,
                ex.getRequestHeaders().getFirst(WebhookSink.DELIVERY_HEADER),
                ex.getRequestHeaders().getFirst("Content-Type"), Signatures.verify(body, SECRET, signature)));
        Answer a = script.apply(received.size() - 1);
        a.headers().forEach((k, v) -> ex.getResponseHeaders().add(k, v));
        byte[] out = a.body().getBytes(StandardCharsets.UTF_8);
        ex.sendResponseHeaders(a.status(), out.length == 0 ? -1 : out.length);
        if (out.length > 0) {
            ex.getResponseBody().write(out);
        }
        ex.close();
    }

    private WebhookSink sink(String path, int maxAttempts, SinkFilter filter, DeadLetters letters) {
        return sink(URI.create(base + path), maxAttempts, filter, letters);
    }

    private WebhookSink sink(URI url, int maxAttempts, SinkFilter filter, DeadLetters letters) {
        RetryPolicy retry = new RetryPolicy(maxAttempts, Duration.ofMillis(100), Duration.ofSeconds(2), 42L,
                sleeps::add);
        return new WebhookSink(url, SECRET, filter, retry, letters, SinkFactory.httpClient());
    }

    private static AlertMessage one(String variable) {
        return Messages.message(Messages.shift(variable, Verdict.MATERIAL));
    }

    @Test
    void twoServerErrorsThenSuccessIsDeliveredOnTheThirdSignedAttempt() {
        script = n -> Answer.of(n < 2 ? 500 : 200);
        AlertMessage m = one("age");
        WebhookSink sink = sink("/flaky", 5, SinkFilter.all(), deadLetters);

        assertEquals(new DeliveryReport(sink.name(), 1, 0, 0, 1, 0), sink.deliver(List.of(m)));

        assertEquals(3, received.size());
        for (Received r : received) {
            assertTrue(r.signatureValid(), "signature checks out over the received bytes");
            assertEquals(m.toJson(), new String(r.body(), StandardCharsets.UTF_8));
            assertEquals(m.idempotencyKey(), r.delivery(), "same delivery id on every retry");
            assertEquals("application/json", r.contentType());
        }
        assertEquals(2, sleeps.size());
        assertBetween(Duration.ofMillis(50), Duration.ofMillis(100), sleeps.get(0));
        assertBetween(Duration.ofMillis(100), Duration.ofMillis(200), sleeps.get(1));
        assertTrue(deadLetters.list(sink.name()).isEmpty());
    }

    @Test
    void aServerThatKeepsFailingLeavesOneDeadLetterInTheResultsSchema() {
        script = n -> Answer.of(500);
        AlertMessage m = one("income");
        WebhookSink sink = sink("/down", 3, SinkFilter.all(), deadLetters);

        assertEquals(new DeliveryReport(sink.name(), 1, 0, 0, 0, 1), sink.deliver(List.of(m)));

        assertEquals(3, received.size());
        assertEquals(2, sleeps.size());
        List<DeadLetter> letters = deadLetters.list(sink.name());
        assertEquals(1, letters.size());
        DeadLetter d = letters.get(0);
        assertEquals(3, d.attempts());
        assertTrue(d.lastError().contains("HTTP 500"), d.lastError());
        assertEquals(m.idempotencyKey(), d.idempotencyKey());
        assertEquals("survey", d.dataset());
        assertEquals("w2", d.wave());
        assertEquals("income", d.variable());
        assertEquals("SHIFT", d.kind());
        assertEquals(m, AlertMessage.fromJson(d.payload()), "the payload can be sent again");

        // A later failure of the same alert adds to the same row.
        sink.deliver(List.of(m));
        letters = deadLetters.list(sink.name());
        assertEquals(1, letters.size());
        assertEquals(6, letters.get(0).attempts());
    }

    @Test
    void aClientErrorIsNotRetriedAndBecomesADeadLetter() {
        script = n -> new Answer(400, "{\"error\":\"unknown dataset\"}", Map.of());
        WebhookSink sink = sink("/refuses", 5, SinkFilter.all(), deadLetters);

        DeliveryReport r = sink.deliver(List.of(one("region")));

        assertEquals(1, r.deadLettered());
        assertEquals(1, received.size());
        assertTrue(sleeps.isEmpty());
        DeadLetter d = deadLetters.list(sink.name()).get(0);
        assertEquals(1, d.attempts());
        assertTrue(d.lastError().contains("HTTP 400") && d.lastError().contains("unknown dataset")
                && d.lastError().contains("not retried"), d.lastError());
    }

    @Test
    void tooManyRequestsIsRetriedAfterTheWaitTheReceiverAsksFor() {
        script = n -> n == 0 ? new Answer(429, "", Map.of("Retry-After", "1")) : Answer.of(204);
        WebhookSink sink = sink("/busy", 3, SinkFilter.all(), deadLetters);

        assertEquals(1, sink.deliver(List.of(one("age"))).delivered());

        assertEquals(2, received.size());
        assertEquals(List.of(Duration.ofSeconds(1)), sleeps);
    }

    @Test
    void aRedirectIsNotFollowed() {
        script = n -> new Answer(302, "", Map.of("Location", base + "/elsewhere"));
        WebhookSink sink = sink("/moved", 3, SinkFilter.all(), deadLetters);

        assertEquals(1, sink.deliver(List.of(one("age"))).deadLettered());
        assertEquals(1, received.size());
        assertTrue(deadLetters.list(sink.name()).get(0).lastError().contains("HTTP 302"));
    }

    @Test
    void aRefusedConnectionIsRetriedThenDeadLettered() throws IOException {
        int closedPort;
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            closedPort = s.getLocalPort();
        }
        WebhookSink sink = sink(URI.create("http://127.0.0.1:" + closedPort + "/hook"), 3, SinkFilter.all(),
                deadLetters);

        assertEquals(1, sink.deliver(List.of(one("age"))).deadLettered());

        assertEquals(2, sleeps.size());
        DeadLetter d = deadLetters.list(sink.name()).get(0);
        assertEquals(3, d.attempts());
        assertTrue(d.lastError().contains("ConnectException"), d.lastError());
    }

    @Test
    void onlyWhatTheFilterAcceptsIsSentAndRepeatsAreSentOnce() {
        WebhookSink sink = sink("/pager", 2, new SinkFilter(Verdict.MATERIAL, Set.of(FindingKind.BLANK)),
                deadLetters);
        List<AlertMessage> batch = new ArrayList<>(Messages.batch());
        batch.add(batch.get(0));

        assertEquals(new DeliveryReport(sink.name(), 4, 2, 1, 1, 0), sink.deliver(batch));

        assertEquals(1, received.size());
        assertEquals(batch.get(0).idempotencyKey(), received.get(0).delivery());
    }

    @Test
    void anInterruptionLeavesEveryUndeliveredMessageAsADeadLetter() {
        script = n -> Answer.of(503);
        List<DeadLetter> letters = new ArrayList<>();
        RetryPolicy interrupting = new RetryPolicy(5, Duration.ofMillis(100), Duration.ofSeconds(1), 1L, d -> {
            throw new InterruptedException("shutting down");
        });
        WebhookSink sink = new WebhookSink(URI.create(base + "/stopping"), SECRET, SinkFilter.all(), interrupting,
                letters::add, SinkFactory.httpClient());
        try {
            DeliveryReport r = sink.deliver(Messages.batch());
            assertEquals(3, r.deadLettered());
            assertTrue(Thread.currentThread().isInterrupted(), "the interruption is passed on");
        } finally {
            Thread.interrupted();
        }
        assertEquals(1, received.size(), "nothing is sent after the interruption");
        assertEquals(List.of(1, 0, 0), letters.stream().map(DeadLetter::attempts).toList());
    }

    @Test
    void theSecretAppearsInNoLogLineExceptionOrDeadLetter() throws IOException {
        logs.list.clear();
        // A careless receiver that echoes the secret back in its error answer.
        script = n -> new Answer(n == 0 ? 500 : 401, "bad signature for secret " + SECRET, Map.of());
        WebhookSink sink = sink("/echo?token=abc", 3, SinkFilter.all(), deadLetters);
        sink.deliver(Messages.batch());
        int closedPort;
        try (ServerSocket s = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            closedPort = s.getLocalPort();
        }
        sink(URI.create("http://user:pw@127.0.0.1:" + closedPort + "/x"), 2, SinkFilter.all(), deadLetters)
                .deliver(List.of(one("age")));
        IllegalStateException failed = assertThrows(IllegalStateException.class,
                () -> sink("/echo", 1, SinkFilter.all(), letter -> {
                    throw new IllegalStateException("database unreachable");
                }).deliver(List.of(one("age"))));
        IllegalArgumentException badUrl = assertThrows(IllegalArgumentException.class,
                () -> new WebhookSink(URI.create("ftp://127.0.0.1/x"), SECRET, SinkFilter.all(),
                        RetryPolicy.standard(), deadLetters, SinkFactory.httpClient()));

        assertFalse(received.isEmpty());
        List<String> stored = jdbi.withHandle(h -> h.createQuery(
                "SELECT row_to_json(d)::text FROM wavewarden.dead_letter d").mapTo(String.class).list());
        assertFalse(stored.isEmpty());
        assertTrue(stored.stream().anyMatch(s -> s.contains("bad signature for secret")), "the echo was stored");
        for (String row : stored) {
            assertFalse(row.contains(SECRET), row);
        }
        assertFalse(logs.list.isEmpty());
        for (ILoggingEvent e : logs.list) {
            assertFalse(e.getFormattedMessage().contains(SECRET), e.getFormattedMessage());
            for (IThrowableProxy t = e.getThrowableProxy(); t != null; t = t.getCause()) {
                assertFalse(String.valueOf(t.getMessage()).contains(SECRET));
            }
        }
        for (Throwable t = failed; t != null; t = t.getCause()) {
            assertFalse(String.valueOf(t.getMessage()).contains(SECRET));
        }
        assertFalse(badUrl.getMessage().contains(SECRET));
        assertFalse(sink.name().contains(SECRET) || sink.toString().contains(SECRET));
        assertFalse(sink.name().contains("token"), "query strings are not shown");
        assertTrue(stored.stream().noneMatch(s -> s.contains("user:pw")), "user information is not shown");
    }

    @Test
    void secretComesFromTheNamedEnvironmentVariable() {
        WebhookSink sink = SinkFactory.webhook(URI.create(base + "/env"), "HOOK_SECRET",
                Map.of("HOOK_SECRET", SECRET)::get, "UNCERTAIN", List.of(), RetryPolicy.standard(), deadLetters,
                SinkFactory.httpClient());
        assertEquals(1, sink.deliver(List.of(one("age"))).delivered());
        assertTrue(received.get(0).signatureValid());

        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SinkFactory.secret("HOOK_SECRET", Map.<String, String>of()::get));
        assertTrue(e.getMessage().startsWith("secretEnv:") && e.getMessage().contains("HOOK_SECRET"),
                e.getMessage());
    }

    private static void assertBetween(Duration low, Duration high, Duration actual) {
        assertTrue(actual.compareTo(low) >= 0 && actual.compareTo(high) <= 0,
                actual + " not in [" + low + ", " + high + "]");
    }
}
