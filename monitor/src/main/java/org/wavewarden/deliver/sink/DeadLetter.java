package org.wavewarden.deliver.sink;

import java.util.Objects;

/**
 * An alert a sink gave up on, kept so that an operator can see what was not delivered and send it again. It
 * carries the message, never the sink's credentials.
 *
 * @param sink           the sink's name ({@link AlertSink#name()})
 * @param kind           the finding kind's name
 * @param payload        the message as JSON ({@link AlertMessage#toJson()})
 * @param attempts       delivery attempts made; 0 when delivery stopped before this message was tried
 * @param lastError      why the last attempt failed, in words
 */
public record DeadLetter(String sink, String dataset, String wave, String variable, String kind,
                         String idempotencyKey, String payload, int attempts, String lastError) {

    public DeadLetter {
        Objects.requireNonNull(sink, "sink");
        Objects.requireNonNull(dataset, "dataset");
        Objects.requireNonNull(wave, "wave");
        Objects.requireNonNull(variable, "variable");
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(idempotencyKey, "idempotencyKey");
        Objects.requireNonNull(payload, "payload");
        Objects.requireNonNull(lastError, "lastError");
        if (attempts < 0) {
            throw new IllegalArgumentException("attempts: expected zero or more but got " + attempts);
        }
    }

    public static DeadLetter of(String sink, AlertMessage message, int attempts, String lastError) {
        return new DeadLetter(sink, message.dataset(), message.wave(), message.variable(), message.kind().name(),
                message.idempotencyKey(), message.toJson(), attempts, lastError);
    }
}
