package org.wavewarden.deliver.sink;

import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.ArrayList;
import java.util.List;

/**
 * The sinks of one dataset. Every sink gets its chance even when another fails: a full disk under the JSON Lines
 * file must not keep the webhook from being called.
 */
public final class AlertSinks {

    private static final Logger LOG = LoggerFactory.getLogger(AlertSinks.class);

    private final List<AlertSink> sinks;

    public AlertSinks(List<AlertSink> sinks) {
        this.sinks = List.copyOf(sinks);
    }

    public List<AlertSink> sinks() {
        return sinks;
    }

    /**
     * Offers the messages to every sink in order.
     *
     * @return one report per sink that completed
     * @throws RuntimeException the first sink's failure, with later failures suppressed, after all were tried
     */
    public List<DeliveryReport> deliver(List<AlertMessage> messages) {
        List<DeliveryReport> reports = new ArrayList<>();
        RuntimeException failure = null;
        for (AlertSink sink : sinks) {
            try {
                reports.add(sink.deliver(messages));
            } catch (RuntimeException e) {
                LOG.error("{}: delivery failed: {}", sink.name(), e.getMessage());
                if (failure == null) {
                    failure = e;
                } else {
                    failure.addSuppressed(e);
                }
            }
        }
        if (failure != null) {
            throw failure;
        }
        return reports;
    }
}
