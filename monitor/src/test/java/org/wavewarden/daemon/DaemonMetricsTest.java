package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The metrics and the health verdict, from inputs given as plain values. */
class DaemonMetricsTest {

    static final DeliveryBacklog QUIET = new DeliveryBacklog("labour", "webhook", 0, 0, 0, 0);

    @Test
    void theDeliveryBacklogIsExposedPerDatasetAndSink() {
        DaemonMetrics m = new DaemonMetrics();
        m.backlogSource(() -> List.of(new DeliveryBacklog("labour", "webhook", 3, 42.5, 7, 2),
                new DeliveryBacklog("labour", "jsonLines", 0, 0, 0, 0)));
        String text = m.prometheus();
        assertTrue(text.contains("# TYPE wavewarden_delivery_pending gauge"), text);
        assertTrue(text.contains("wavewarden_delivery_pending{dataset=\"labour\",sink=\"webhook\"} 3"), text);
        assertTrue(text.contains("wavewarden_delivery_pending{dataset=\"labour\",sink=\"jsonLines\"} 0"), text);
        assertTrue(text.contains(
                "wavewarden_delivery_oldest_pending_age_seconds{dataset=\"labour\",sink=\"webhook\"} 42.5"), text);
        assertTrue(text.contains("# TYPE wavewarden_delivery_failed_attempts_total counter"), text);
        assertTrue(text.contains("wavewarden_delivery_failed_attempts_total{dataset=\"labour\",sink=\"webhook\"} 7"),
                text);
        assertTrue(text.contains("wavewarden_delivery_dead_letters{dataset=\"labour\",sink=\"webhook\"} 2"), text);
    }

    @Test
    void theBacklogIsReadOnceAScrape() {
        DaemonMetrics m = new DaemonMetrics();
        AtomicInteger reads = new AtomicInteger();
        m.backlogSource(() -> {
            reads.incrementAndGet();
            return List.of(QUIET);
        });
        m.prometheus();
        assertEquals(1, reads.get());
    }

    @Test
    void deadLettersMakeTheDaemonDegradedAndSayWhichSink() {
        DaemonMetrics m = new DaemonMetrics();
        m.backlogSource(() -> List.of(QUIET, new DeliveryBacklog("labour", "jsonLines", 0, 0, 6, 1)));
        DaemonMetrics.Health h = m.health();
        assertEquals("degraded", h.status());
        assertEquals(1, h.problems().size(), h.problems().toString());
        assertTrue(h.problems().get(0).contains("jsonLines") && h.problems().get(0).contains("labour"));
        assertEquals(2, h.backlog().size());
        assertTrue(m.prometheus().contains("wavewarden_degraded 1"));
    }

    @Test
    void anOutputPendingLongerThanTheAlarmMakesTheDaemonDegraded() {
        DaemonMetrics m = new DaemonMetrics(Duration.ofMinutes(15));
        m.backlogSource(() -> List.of(new DeliveryBacklog("labour", "webhook", 2, 14 * 60, 0, 0)));
        assertFalse(m.health().degraded(), "14 minutes is within the alarm");
        m.backlogSource(() -> List.of(new DeliveryBacklog("labour", "webhook", 2, 15 * 60, 0, 0)));
        assertTrue(m.health().degraded(), "15 minutes reaches it");
    }

    @Test
    void aBacklogThatCannotBeReadIsDegradedAndTheScrapeStillAnswers() {
        DaemonMetrics m = new DaemonMetrics();
        m.backlogSource(() -> {
            throw new IllegalStateException("connection refused");
        });
        assertTrue(m.health().degraded());
        assertTrue(m.prometheus().contains("wavewarden_degraded 1"));
    }

    @Test
    void aFailingFiringIsDegradedUntilTheNextSuccess() {
        DaemonMetrics m = new DaemonMetrics();
        assertFalse(m.degraded());
        m.firingFailed("labour");
        assertTrue(m.degraded());
        assertTrue(m.health().problems().get(0).contains("labour"));
        m.firingSucceeded("labour", Instant.ofEpochSecond(1_700_000_000));
        assertFalse(m.degraded());
        assertEquals(1, m.failures("labour"));
        assertEquals(1, m.firings("labour"));
        assertTrue(m.prometheus().contains(
                "wavewarden_last_success_timestamp_seconds{dataset=\"labour\"} 1.7E9"), m.prometheus());
    }

    @Test
    void anUnreachableDatabaseIsDegradedAndNamed() {
        DaemonMetrics m = new DaemonMetrics();
        m.unreachableDatabase("results");
        assertEquals(List.of("the results database is unreachable"), m.health().problems());
        m.unreachableDatabase(null);
        assertFalse(m.degraded());
    }

    @Test
    void firingDurationsFallIntoHistogramBucketsPerDataset() {
        DaemonMetrics m = new DaemonMetrics();
        m.firingDuration("labour", 0.3);
        m.firingDuration("labour", 42);
        String text = m.prometheus();
        assertTrue(text.contains("wavewarden_firing_duration_seconds_bucket{dataset=\"labour\",le=\"0.25\"} 0"), text);
        assertTrue(text.contains("wavewarden_firing_duration_seconds_bucket{dataset=\"labour\",le=\"0.5\"} 1"), text);
        assertTrue(text.contains("wavewarden_firing_duration_seconds_bucket{dataset=\"labour\",le=\"+Inf\"} 2"), text);
        assertTrue(text.contains("wavewarden_firing_duration_seconds_count{dataset=\"labour\"} 2"), text);
    }

    @Test
    void twoDaemonsInOneProcessKeepTheirCountsApart() {
        DaemonMetrics a = new DaemonMetrics();
        DaemonMetrics b = new DaemonMetrics();
        a.firingSucceeded("labour", Instant.now());
        assertEquals(1, a.firings("labour"));
        assertEquals(0, b.firings("labour"));
        assertTrue(a.prometheus().contains("jvm_") && b.prometheus().contains("jvm_"),
                "both show the JVM's metrics");
    }
}
