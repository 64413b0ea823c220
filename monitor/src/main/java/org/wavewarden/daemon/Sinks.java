package org.wavewarden.daemon;

import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.SinkSettings;
import org.wavewarden.deliver.sink.AlertSink;
import org.wavewarden.deliver.sink.EmailSink;
import org.wavewarden.deliver.sink.JdbiDeadLetters;
import org.wavewarden.deliver.sink.RetryPolicy;
import org.wavewarden.deliver.sink.SinkFactory;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.deliver.sink.WebhookSink;
import org.wavewarden.pipeline.Session;

import java.net.URI;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Builds each dataset's alert sinks from its {@code alerts} settings. */
public final class Sinks {

    private Sinks() {
    }

    /**
     * The daemon's sinks. A webhook (and an e-mail relay) retries an alert three times within a firing (waits of about 1 and 2 s): the
     * outbox retries across firings, so a longer wait here would only hold up the dataset's firing.
     */
    public static Map<String, List<AlertSink>> fromConfig(Session s) {
        return fromConfig(s, DAEMON_RETRY);
    }

    /** Retries of one alert within one firing. */
    public static final RetryPolicy DAEMON_RETRY = RetryPolicy.of(3, Duration.ofSeconds(1), Duration.ofSeconds(4));

    public static Map<String, List<AlertSink>> fromConfig(Session s, RetryPolicy retry) {
        return fromConfig(s, retry, WebhookSink.REQUEST_TIMEOUT);
    }

    /** @param webhookTimeout how long one webhook attempt may take, connection included */
    public static Map<String, List<AlertSink>> fromConfig(Session s, RetryPolicy retry, Duration webhookTimeout) {
        Map<String, List<AlertSink>> out = new LinkedHashMap<>();
        for (DatasetConfig d : s.config().datasets()) {
            List<AlertSink> sinks = new ArrayList<>();
            SinkSettings a = d.alerts();
            if (a.jsonLines() != null) {
                sinks.add(SinkFactory.jsonLines(Path.of(a.jsonLines().path()), a.jsonLines().filter().minimumVerdict(),
                        a.jsonLines().filter().kinds()));
            }
            if (a.webhook() != null) {
                SinkSettings.Webhook w = a.webhook();
                sinks.add(new WebhookSink(URI.create(w.url()), SinkFactory.secret(w.secretEnv(), s.env()::get),
                        SinkFilter.of(w.filter().minimumVerdict(), w.filter().kinds()), retry,
                        new JdbiDeadLetters(s.store().jdbi(), s.config().results().schema()),
                        SinkFactory.httpClient(), webhookTimeout, w.messages(), w.textField()));
            }
            if (a.email() != null) {
                SinkSettings.Email e = a.email();
                sinks.add(new EmailSink(e, s.env()::get, SinkFilter.of(e.filter().minimumVerdict(),
                        e.filter().kinds()), retry));
            }
            out.put(d.name(), sinks);
        }
        return out;
    }
}
