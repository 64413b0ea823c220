package org.wavewarden.deliver.sink;

import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.SinkSettings;
import org.wavewarden.deliver.Json;

import javax.crypto.spec.SecretKeySpec;
import java.io.IOException;
import java.io.InputStream;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;

/**
 * Posts each alert to an HTTP endpoint, signed with a shared secret.
 *
 * <p><b>One alert per request.</b> The body is exactly {@link AlertMessage#toJson()} in UTF-8. One alert per
 * request keeps the contract simple for the receiver: the delivery header names the one alert the body holds,
 * the receiver acknowledges or refuses that alert alone, and one alert the receiver refuses becomes one dead
 * letter instead of holding back the rest. Alerts are few per wave, so the extra requests cost little.
 *
 * <p><b>Roll-ups and chat tools.</b> Configured so, the sink also (or instead) posts one {@link RollUp} per firing,
 * its JSON form as the body, under its own idempotency key. With a text field configured, every body is instead
 * {@code {"<field>": "<the message as plain text>"}}, written by Jackson, for chat tools that take one text field;
 * it is signed the same way.
 *
 * <p><b>Headers.</b> {@code Content-Type: application/json}; {@code X-Wavewarden-Signature: sha256=<hex>}, the
 * HMAC-SHA256 (RFC 2104) of the exact body bytes keyed with the shared secret, which the receiver recomputes over
 * the bytes it received before trusting them (see {@link Signatures#verify}); {@code X-Wavewarden-Delivery} and
 * {@code Idempotency-Key}, both the alert's idempotency key, the same on every retry and every rerun on the same data, so the receiver can drop
 * repeats. The sink itself keeps no record of what it delivered: delivery is at least once.
 *
 * <p><b>Failures.</b> A 2xx answer is success. A connection failure, a timeout, a 5xx or a 429 is retried under
 * the {@link RetryPolicy}; any other answer (4xx, or a redirect, which is not followed) is final at once. A
 * message that is not delivered becomes a {@link DeadLetter}. If the thread is interrupted, the sink stops, and the
 * current message and the untried rest of the batch become dead letters, so that none is lost silently.
 *
 * <p><b>The secret</b> is used only to sign. It is not part of {@link #name()}, {@link #toString()}, log lines,
 * exception texts or dead letters; the endpoint is shown without user information and query (where tokens tend
 * to live), and any echo of the secret in a receiver's answer is masked before it is logged or stored.
 */
public final class WebhookSink implements AlertSink {

    private static final Logger LOG = LoggerFactory.getLogger(WebhookSink.class);
    /**
     * How long one attempt may take by default, connection included: a slow receiver costs at most this per
     * attempt, and the outbox stops a sink for the rest of a firing at its first failure.
     */
    public static final Duration REQUEST_TIMEOUT = Duration.ofSeconds(5);
    public static final String SIGNATURE_HEADER = "X-Wavewarden-Signature";
    public static final String DELIVERY_HEADER = "X-Wavewarden-Delivery";
    /** The alert's idempotency key under the header name receivers commonly deduplicate by. */
    public static final String IDEMPOTENCY_HEADER = "Idempotency-Key";
    private static final int ERROR_BODY_CHARS = 200;
    private static final String MASK = "[secret]";

    private final URI url;
    private final SecretKeySpec key;
    private final String secretText;
    private final SinkFilter filter;
    private final DeadLetters deadLetters;
    private final HttpClient client;
    private final RetryLoop attempts;
    private final String name;
    private final Duration requestTimeout;
    private final SinkSettings.Messages messages;
    private final String textField;

    public WebhookSink(URI url, String secret, SinkFilter filter, RetryPolicy retry, DeadLetters deadLetters,
                       HttpClient client) {
        this(url, secret, filter, retry, deadLetters, client, REQUEST_TIMEOUT);
    }

    /** @param requestTimeout how long one attempt may take, connection included */
    public WebhookSink(URI url, String secret, SinkFilter filter, RetryPolicy retry, DeadLetters deadLetters,
                       HttpClient client, Duration requestTimeout) {
        this(url, secret, filter, retry, deadLetters, client, requestTimeout, SinkSettings.Messages.PER_ALERT, null);
    }

    /**
     * @param messages  one post per alert, one roll-up per firing, or both
     * @param textField null to post the full JSON message; otherwise the body is the JSON object
     *                  {@code {"<textField>": "<the message as plain text>"}}, the form chat tools take
     */
    public WebhookSink(URI url, String secret, SinkFilter filter, RetryPolicy retry, DeadLetters deadLetters,
                       HttpClient client, Duration requestTimeout, SinkSettings.Messages messages, String textField) {
        this.messages = Objects.requireNonNull(messages, "messages");
        if (textField != null && !textField.matches("[A-Za-z_][A-Za-z0-9_]{0,63}")) {
            throw new IllegalArgumentException("textField: expected a JSON field name but got " + textField);
        }
        this.textField = textField;
        Objects.requireNonNull(url, "url");
        String scheme = url.getScheme() == null ? "" : url.getScheme().toLowerCase(Locale.ROOT);
        if (!(scheme.equals("http") || scheme.equals("https")) || url.getHost() == null) {
            throw new IllegalArgumentException("url: expected an absolute http or https URL with a host but got "
                    + shown(url));
        }
        this.url = url;
        this.key = Signatures.key(secret);
        this.secretText = secret;
        this.filter = Objects.requireNonNull(filter, "filter");
        Objects.requireNonNull(retry, "retry");
        this.deadLetters = Objects.requireNonNull(deadLetters, "deadLetters");
        this.client = Objects.requireNonNull(client, "client");
        this.name = "webhook:" + shown(url);
        this.attempts = new RetryLoop(name, retry, LOG);
        this.requestTimeout = Objects.requireNonNull(requestTimeout, "requestTimeout");
        if (requestTimeout.isNegative() || requestTimeout.isZero()) {
            throw new IllegalArgumentException("requestTimeout: expected a positive duration but got "
                    + requestTimeout);
        }
        if (secret.length() < 16) {
            LOG.warn("{}: the shared secret is shorter than 16 characters; a longer random one is harder to guess",
                    name);
        }
        if (scheme.equals("http") && !isLoopback(url.getHost())) {
            LOG.warn("{}: alerts go over plain http; the signature proves the sender but anyone on the way can"
                    + " read them", name);
        }
    }

    @Override
    public String name() {
        return name;
    }

    @Override
    public SinkFilter filter() {
        return filter;
    }

    @Override
    public SinkSettings.Messages messages() {
        return messages;
    }

    /**
     * Posts the roll-up (its JSON form, or its text in the configured field) with the same headers as an alert,
     * its own idempotency key naming it.
     */
    @Override
    public void deliverRollUp(RollUp rollUp) {
        String body = textField == null ? rollUp.toJson() : Json.write(Map.of(textField, rollUp.text()));
        RetryLoop.Result a = send(body.getBytes(StandardCharsets.UTF_8), rollUp.idempotencyKey());
        if (a.interrupted()) {
            Thread.currentThread().interrupt();
        }
        if (!a.delivered()) {
            LOG.warn("{}: giving up on the roll-up of {} firing {} ({} attempts): {}", name, rollUp.dataset(),
                    rollUp.firing(), a.attempts(), a.lastError());
            throw new UndeliveredException(a.lastError(), a.attempts());
        }
    }

    /** The request body of one alert: its JSON message, or its text in the configured field. */
    private byte[] body(AlertMessage m) {
        String body = textField == null ? m.toJson() : Json.write(Map.of(textField, RollUp.text(m)));
        return body.getBytes(StandardCharsets.UTF_8);
    }

    @Override
    public DeliveryReport deliver(List<AlertMessage> messages) {
        Objects.requireNonNull(messages, "messages");
        int filteredOut = 0;
        int duplicates = 0;
        int delivered = 0;
        int dead = 0;
        Set<String> seen = new HashSet<>();
        RuntimeException recordFailure = null;
        boolean interrupted = false;
        for (AlertMessage m : messages) {
            if (!filter.accepts(m)) {
                filteredOut++;
                continue;
            }
            if (!seen.add(m.idempotencyKey())) {
                duplicates++;
                continue;
            }
            RetryLoop.Result a = interrupted
                    ? new RetryLoop.Result(false, 0, "not attempted: delivery was interrupted", true) : send(m);
            interrupted |= a.interrupted();
            if (a.delivered()) {
                delivered++;
                continue;
            }
            dead++;
            LOG.warn("{}: giving up on {} {} of {} wave {} ({} attempts): {}", name, m.kind(), m.variable(),
                    m.dataset(), m.wave(), a.attempts(), a.lastError());
            try {
                deadLetters.record(DeadLetter.of(name, m, a.attempts(), a.lastError()));
            } catch (RuntimeException e) {
                LOG.error("{}: cannot record the dead letter {}: {}", name, m.idempotencyKey(), mask(e.toString()));
                if (recordFailure == null) {
                    recordFailure = new IllegalStateException(name + ": cannot record dead letters", e);
                } else {
                    recordFailure.addSuppressed(e);
                }
            }
        }
        if (interrupted) {
            Thread.currentThread().interrupt();
        }
        if (recordFailure != null) {
            throw recordFailure;
        }
        return new DeliveryReport(name, messages.size(), filteredOut, duplicates, delivered, dead);
    }

    private RetryLoop.Result send(AlertMessage m) {
        return send(body(m), m.idempotencyKey());
    }

    private RetryLoop.Result send(byte[] body, String idempotencyKey) {
        HttpRequest request = HttpRequest.newBuilder(url)
                .timeout(requestTimeout)
                .header("Content-Type", "application/json")
                .header("User-Agent", "wavewarden-monitor")
                .header(SIGNATURE_HEADER, Signatures.SCHEME + Signatures.hmacSha256Hex(body, key))
                .header(DELIVERY_HEADER, idempotencyKey)
                .header(IDEMPOTENCY_HEADER, idempotencyKey)
                .POST(HttpRequest.BodyPublishers.ofByteArray(body))
                .build();
        return attempts.run(idempotencyKey, "delivered", () -> once(request));
    }

    private RetryLoop.Outcome once(HttpRequest request) throws InterruptedException {
        HttpResponse<InputStream> response;
        try {
            response = client.send(request, HttpResponse.BodyHandlers.ofInputStream());
        } catch (IOException e) {
            return RetryLoop.Outcome.failed(mask(describe(e)), true, null);
        }
        int status = response.statusCode();
        String answer;
        try (InputStream in = response.body()) {
            answer = new String(in.readNBytes(ERROR_BODY_CHARS * 4), StandardCharsets.UTF_8);
        } catch (IOException e) {
            answer = "";
        }
        if (status >= 200 && status < 300) {
            return RetryLoop.Outcome.DELIVERED;
        }
        String snippet = answer.strip().replaceAll("\\s+", " ");
        if (snippet.length() > ERROR_BODY_CHARS) {
            snippet = snippet.substring(0, ERROR_BODY_CHARS) + "...";
        }
        String error = mask("HTTP " + status + (snippet.isEmpty() ? "" : ": " + snippet));
        boolean retryable = status == 429 || status >= 500;
        return RetryLoop.Outcome.failed(error, retryable, retryable ? retryAfter(response) : null);
    }

    /** A Retry-After given in seconds; the date form is rare from webhooks and ignored. */
    private static Duration retryAfter(HttpResponse<?> response) {
        Optional<String> v = response.headers().firstValue("Retry-After");
        if (v.isEmpty() || !v.get().strip().matches("\\d{1,9}")) {
            return null;
        }
        return Duration.ofSeconds(Long.parseLong(v.get().strip()));
    }

    /** The exception chain in a line: the JDK's connection errors often carry their reason only in a cause. */
    private static String describe(Throwable e) {
        StringBuilder sb = new StringBuilder();
        for (Throwable t = e; t != null && sb.length() < 300; t = t.getCause()) {
            if (sb.length() > 0) {
                sb.append(" <- ");
            }
            sb.append(t.getClass().getSimpleName());
            if (t.getMessage() != null) {
                sb.append(": ").append(t.getMessage());
            }
            if (t.getCause() == t) {
                break;
            }
        }
        return sb.toString();
    }

    private String mask(String text) {
        return text == null ? null : text.replace(secretText, MASK);
    }

    /** The URL without user information, query or fragment. */
    static String shown(URI url) {
        if (url.getScheme() == null || url.getHost() == null) {
            return "(not an absolute URL)";
        }
        return url.getScheme() + "://" + url.getHost() + (url.getPort() < 0 ? "" : ":" + url.getPort())
                + (url.getRawPath() == null ? "" : url.getRawPath());
    }

    private static boolean isLoopback(String host) {
        return host.equals("localhost") || host.startsWith("127.") || host.equals("[::1]") || host.equals("::1");
    }

    @Override
    public String toString() {
        return name;
    }
}
