package org.wavewarden.deliver.sink;

import org.wavewarden.config.SinkSettings;

import java.util.List;

/**
 * A place alerts go: a file, a web endpoint. A sink applies its own {@link SinkFilter} and delivers each message
 * at least once; receivers rely on {@link AlertMessage#idempotencyKey()} to make that exactly once for readers.
 * {@link #deliver} does not throw for a message that cannot be delivered when the sink has somewhere to record
 * the failure (a webhook's dead letters); a sink without one (a file) throws.
 */
public interface AlertSink {

    /** A short name for logs, reports and the dead-letter table; never contains a secret. */
    String name();

    SinkFilter filter();

    /** Delivers the messages this sink's filter accepts, in the given order. */
    DeliveryReport deliver(List<AlertMessage> messages);

    /** Whether the sink is sent one message per alert, one roll-up per firing, or both. */
    default SinkSettings.Messages messages() {
        return SinkSettings.Messages.PER_ALERT;
    }

    /**
     * Delivers one firing's roll-up.
     *
     * @throws UndeliveredException when the sink gave up on it; the outbox keeps it owed
     */
    default void deliverRollUp(RollUp rollUp) {
        throw new UnsupportedOperationException(name() + " takes no roll-ups");
    }
}
