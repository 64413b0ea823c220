package org.wavewarden.soak;

import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpServer;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.sink.Signatures;
import org.wavewarden.deliver.sink.WebhookSink;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.TimeUnit;

/**
 * The soak's own webhook receiver on 127.0.0.1: it checks each request's signature, answers as the soak tells it
 * (accept, fail with 500, answer slowly, or hold a request while the sender is killed), and records every request
 * it got, in memory for the audit and as one JSON line per request in a file for people.
 *
 * <p>It is the idempotent receiver the delivery design counts on (at-least-once sending, each alert under one
 * idempotency key on every retry): a signed request it answers 200 is <em>taken</em>, and its key remembered, before
 * the answer is written, as a receiver that stores first and answers after does. A later request with a key
 * already taken is answered 200 again and recorded as a {@link Outcome#REPEAT}, not taken a second time: the
 * sender missed the first answer (it was killed, or timed out on a slow one) and tried again, as it should. Only
 * a second key for one alert can make the receiver take it twice. Going down closes the listening socket (new
 * connections are refused, as for a receiver that is restarting); coming up listens on the same port again, with
 * the keys it has taken still remembered.
 */
public final class WebhookReceiver implements AutoCloseable {

    /** How the receiver answers signed requests. */
    private enum Mode {
        ACCEPT, FAIL, SLOW
    }

    /** What the receiver made of a request. */
    public enum Outcome {
        /** Not taken: unsigned, answered 500 or 503, or not a delivery. */
        REFUSED,
        /** Taken: the first request under its key (every request without a key is taken). */
        ACCEPTED,
        /** Answered 200 without being taken again: its key was taken before. */
        REPEAT
    }

    /**
     * One request as the receiver saw it.
     *
     * @param key      the idempotency key the request carried ({@link WebhookSink#IDEMPOTENCY_HEADER}), or null
     *                 without one
     * @param status   the answer given
     * @param outcome  taken, recognised as a repeat, or refused
     * @param answered the status line was written (false when the sender had gone: killed, or timed out on a slow
     *                 answer); a taken request whose answer the sender missed comes back as a repeat
     * @param signed   the signature matched the body under the shared secret
     * @param body     the body as received (UTF-8)
     */
    public record Request(Instant at, String key, int status, Outcome outcome, boolean answered, boolean signed,
                          String body) {
    }

    private static final String PATH = "/alerts";
    private static final int THREADS = 4;

    private final String secret;
    private final Path log;
    /** 0 until the first listen picks a free port; the same port ever after. */
    private int port;
    private final List<Request> requests = new ArrayList<>();
    /** The keys taken so far; guarded by this. */
    private final Set<String> taken = new HashSet<>();
    private final ExecutorService handlers = Executors.newFixedThreadPool(THREADS, r -> {
        Thread t = new Thread(r, "soak-receiver");
        t.setDaemon(true);
        return t;
    });
    private HttpServer server;
    private volatile Mode mode = Mode.ACCEPT;
    private volatile Duration slowBy = Duration.ZERO;
    private volatile Hold hold;

    private WebhookReceiver(String secret, Path log) {
        this.secret = secret;
        this.log = log;
    }

    /**
     * Listens on 127.0.0.1 at a free port.
     *
     * @param secret the shared HMAC secret requests are verified with
     * @param log    where every request is appended as a JSON line
     */
    public static WebhookReceiver start(String secret, Path log) throws IOException {
        Objects.requireNonNull(secret, "secret");
        Objects.requireNonNull(log, "log");
        WebhookReceiver r = new WebhookReceiver(secret, log);
        r.up();
        return r;
    }

    /** The URL the daemon posts alerts to. */
    public synchronized String url() {
        return "http://127.0.0.1:" + port + PATH;
    }

    /** Listens again on the same port; nothing when already up. */
    public synchronized void up() throws IOException {
        if (server != null) {
            return;
        }
        HttpServer s = HttpServer.create(new InetSocketAddress(InetAddress.getLoopbackAddress(), port), 64);
        s.createContext("/", this::handle);
        s.setExecutor(handlers);
        s.start();
        port = s.getAddress().getPort();
        server = s;
    }

    /** Closes the listening socket and every open connection: senders get refused connections until {@link #up}. */
    public synchronized void down() {
        if (server != null) {
            server.stop(0);
            server = null;
        }
    }

    /** Answers 500 to every request until the mode changes. */
    public void fail() {
        mode = Mode.FAIL;
    }

    /** Accepts every request, each after {@code delay}. */
    public void slow(Duration delay) {
        slowBy = Objects.requireNonNull(delay, "delay");
        mode = Mode.SLOW;
    }

    /** Accepts every request at once. */
    public void accept() {
        mode = Mode.ACCEPT;
    }

    /**
     * Holds the next request until {@link Hold#release} and then answers it 503; the soak kills the sender
     * meanwhile, so that a delivery is cut off in flight.
     */
    public Hold holdNext() {
        Hold h = new Hold();
        hold = h;
        return h;
    }

    /** Gives up a hold no request has taken yet; a request that has taken it is released. */
    public synchronized void cancel(Hold h) {
        if (hold == h) {
            hold = null;
        }
        h.release();
    }

    /** A request held in flight. */
    public static final class Hold {
        private final CountDownLatch arrived = new CountDownLatch(1);
        private final CountDownLatch released = new CountDownLatch(1);

        /** Waits for the held request to arrive; false when none did in time. */
        public boolean awaitArrival(Duration timeout) throws InterruptedException {
            return arrived.await(timeout.toMillis(), TimeUnit.MILLISECONDS);
        }

        public void release() {
            released.countDown();
        }
    }

    /** Every request so far, oldest first. */
    public synchronized List<Request> requests() {
        return List.copyOf(requests);
    }

    private void handle(HttpExchange ex) throws IOException {
        try (ex) {
            byte[] body;
            try (InputStream in = ex.getRequestBody()) {
                body = in.readAllBytes();
            }
            if (!ex.getRequestURI().getPath().equals(PATH) || !ex.getRequestMethod().equals("POST")) {
                answer(ex, 404);
                return;
            }
            String key = ex.getRequestHeaders().getFirst(WebhookSink.IDEMPOTENCY_HEADER);
            boolean signed = Signatures.verify(body, secret,
                    ex.getRequestHeaders().getFirst(WebhookSink.SIGNATURE_HEADER));
            int status;
            Hold h = hold;
            if (!signed) {
                status = 401;
            } else if (h != null && takeHold(h)) {
                h.arrived.countDown();
                awaitRelease(h);
                status = 503;
            } else if (mode == Mode.FAIL) {
                status = 500;
            } else {
                if (mode == Mode.SLOW) {
                    sleep(slowBy);
                }
                status = 200;
            }
            Outcome outcome = status == 200 ? take(key) : Outcome.REFUSED;
            // Recorded between the status line and the end of the answer: the sender cannot have its answer before
            // the request is on record, so whoever reads the record after an answer finds it there.
            boolean started = startAnswer(ex, status);
            record(new Request(Instant.now(), key, status, outcome, started, signed,
                    new String(body, StandardCharsets.UTF_8)));
            finishAnswer(ex);
        }
    }

    /**
     * Takes a request under its key, or recognises a repeat. Under the lock, so that two requests with one key at
     * once (the sender retrying while its first attempt is still being answered) are taken once.
     */
    private synchronized Outcome take(String key) {
        return key == null || taken.add(key) ? Outcome.ACCEPTED : Outcome.REPEAT;
    }

    private synchronized boolean takeHold(Hold h) {
        if (hold != h) {
            return false;
        }
        hold = null;
        return true;
    }

    private static void awaitRelease(Hold h) {
        try {
            // Bounded: a soak that forgot the hold must not keep a handler thread forever.
            h.released.await(60, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private static void sleep(Duration d) {
        try {
            Thread.sleep(d.toMillis());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private static final byte[] ANSWER_BODY = "{}".getBytes(StandardCharsets.UTF_8);

    /** Writes the status line and headers; false when the sender was gone. */
    private static boolean startAnswer(HttpExchange ex, int status) {
        try {
            ex.sendResponseHeaders(status, ANSWER_BODY.length);
            return true;
        } catch (IOException e) {
            return false;
        }
    }

    private static void finishAnswer(HttpExchange ex) {
        try (var out = ex.getResponseBody()) {
            out.write(ANSWER_BODY);
        } catch (IOException e) {
            // the sender went away after the status line; it is on record as answered
        }
    }

    /** The whole answer at once, for requests that are not deliveries. */
    private static void answer(HttpExchange ex, int status) {
        if (startAnswer(ex, status)) {
            finishAnswer(ex);
        }
    }

    private synchronized void record(Request r) {
        requests.add(r);
        try {
            Files.writeString(log, Json.write(r) + "\n", StandardCharsets.UTF_8, StandardOpenOption.CREATE,
                    StandardOpenOption.APPEND);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot record a webhook request in " + log, e);
        }
    }

    @Override
    public void close() {
        Hold h = hold;
        if (h != null) {
            h.release();
        }
        down();
        handlers.shutdownNow();
    }
}
