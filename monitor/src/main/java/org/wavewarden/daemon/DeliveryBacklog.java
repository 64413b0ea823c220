package org.wavewarden.daemon;

/**
 * What one sink of one dataset still owes: outputs written by committed runs and not yet carried out. Read from
 * the results schema's outbox; shown by {@code /health} (degraded while anything is dead-lettered or has waited
 * too long) and {@code /metrics}.
 *
 * @param dataset              the dataset whose runs produced the outputs
 * @param sink                 the sink's name (never a secret)
 * @param pending              outputs not yet delivered and not given up on
 * @param oldestPendingSeconds how long the oldest pending output has waited; 0 when none is pending
 * @param failedAttempts       delivery attempts that failed, over the outbox's lifetime
 * @param deadLetters          outputs given up on, waiting for a replay
 */
public record DeliveryBacklog(String dataset, String sink, long pending, double oldestPendingSeconds,
                              long failedAttempts, long deadLetters) {
}
