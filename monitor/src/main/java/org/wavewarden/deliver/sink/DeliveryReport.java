package org.wavewarden.deliver.sink;

/**
 * What one {@link AlertSink#deliver} call did with the messages it was offered. Every offered message is counted
 * exactly once: {@code offered = filteredOut + duplicates + delivered + deadLettered}.
 *
 * @param sink         the sink's name
 * @param offered      messages handed to the sink
 * @param filteredOut  rejected by the sink's filter
 * @param duplicates   already delivered earlier (same idempotency key), or repeated within the call
 * @param delivered    written or accepted by the receiver in this call
 * @param deadLettered given up on and recorded as dead letters
 */
public record DeliveryReport(String sink, int offered, int filteredOut, int duplicates, int delivered,
                             int deadLettered) {

    public DeliveryReport {
        if (offered != filteredOut + duplicates + delivered + deadLettered) {
            throw new IllegalArgumentException("offered: expected " + (filteredOut + duplicates + delivered
                    + deadLettered) + " (the sum of the outcomes) but got " + offered);
        }
    }
}
