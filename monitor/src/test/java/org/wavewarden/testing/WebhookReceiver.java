package org.wavewarden.testing;

import com.sun.net.httpserver.HttpServer;
import org.wavewarden.deliver.sink.Signatures;
import org.wavewarden.deliver.sink.WebhookSink;

import java.io.IOException;
import java.net.InetSocketAddress;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * A real webhook receiver on loopback that counts what it is sent by idempotency key, as a receiver that drops
 * repeats would. It can go down (its port refuses connections) and come back on the same port.
 */
public final class WebhookReceiver implements AutoCloseable {

    private final String secret;
    /** 0 until first bound; the same port afterwards, so the sink's URL stays right across an outage. */
    private int port;
    private final Map<String, AtomicInteger> byKey = new ConcurrentHashMap<>();
    private final AtomicInteger badRequests = new AtomicInteger();
    private HttpServer server;
    private volatile java.time.Duration delay = java.time.Duration.ZERO;

    private WebhookReceiver(String secret) throws IOException {
        this.secret = secret;
        up();
    }

    public static WebhookReceiver start(String secret) throws IOException {
        return new WebhookReceiver(secret);
    }

    public synchronized void up() throws IOException {
        if (server != null) {
            return;
        }
        HttpServer s = HttpServer.create(new InetSocketAddress("127.0.0.1", port), 0);
        s.createContext("/hook", ex -> {
            byte[] body = ex.getRequestBody().readAllBytes();
            try {
                Thread.sleep(delay.toMillis());
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            String key = ex.getRequestHeaders().getFirst(WebhookSink.IDEMPOTENCY_HEADER);
            if (key == null || !Signatures.verify(body, secret,
                    ex.getRequestHeaders().getFirst(WebhookSink.SIGNATURE_HEADER))) {
                badRequests.incrementAndGet();
                ex.sendResponseHeaders(400, -1);
            } else {
                byKey.computeIfAbsent(key, k -> new AtomicInteger()).incrementAndGet();
                ex.sendResponseHeaders(204, -1);
            }
            ex.close();
        });
        s.setExecutor(java.util.concurrent.Executors.newCachedThreadPool());
        s.start();
        server = s;
        port = s.getAddress().getPort();
    }

    /** Answers each request only after this long, as a receiver that is up but overloaded. */
    public void slow(java.time.Duration answerAfter) {
        this.delay = answerAfter;
    }

    /** Stops listening: connections to the port are refused until {@link #up}. */
    public synchronized void down() {
        if (server != null) {
            server.stop(0);
            server = null;
        }
    }

    public String url() {
        return "http://127.0.0.1:" + port + "/hook";
    }

    /** How many requests carried each idempotency key. */
    public Map<String, Integer> received() {
        Map<String, Integer> out = new java.util.TreeMap<>();
        byKey.forEach((k, v) -> out.put(k, v.get()));
        return out;
    }

    public int badRequests() {
        return badRequests.get();
    }

    @Override
    public void close() {
        down();
    }
}
