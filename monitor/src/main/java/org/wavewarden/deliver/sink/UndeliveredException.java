package org.wavewarden.deliver.sink;

/**
 * A sink gave up on a message after the attempts its retry policy allows, or at once for a failure that trying
 * again cannot mend (a refused login, an address the relay rejects). The outbox then marks the row dead with this
 * reason and tries it again after its backoff; the message is owed, not lost. The text never holds a credential.
 */
public final class UndeliveredException extends RuntimeException {

    private final int attempts;

    public UndeliveredException(String reason, int attempts) {
        super(reason);
        this.attempts = attempts;
    }

    /** How many attempts were made. */
    public int attempts() {
        return attempts;
    }
}
