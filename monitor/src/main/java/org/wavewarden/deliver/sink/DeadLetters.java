package org.wavewarden.deliver.sink;

/**
 * Where sinks put the alerts they gave up on. Recording the same (sink, idempotency key) again adds its attempts
 * and keeps the latest error, so a letter stays one row however often its delivery fails.
 */
@FunctionalInterface
public interface DeadLetters {

    void record(DeadLetter letter);
}
