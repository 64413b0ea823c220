package org.wavewarden.daemon;

import org.junit.jupiter.api.Test;

import java.time.Instant;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The one line the console's overview shows for a dataset the daemon runs: its last firing, as this process saw it. */
class FiringLineTest {

    static final Instant MORNING = Instant.parse("2026-03-02T09:12:40Z");
    static final Instant NOON = Instant.parse("2026-03-02T12:00:05Z");

    @Test
    void beforeAnyFiringItSaysSo() {
        assertEquals("no firing since the daemon started", new DaemonMetrics().firingLine("households"));
    }

    @Test
    void aSuccessIsShownWithItsMinute() {
        DaemonMetrics m = new DaemonMetrics();
        m.firingSucceeded("households", MORNING);
        assertEquals("last firing succeeded 2026-03-02 09:12 UTC", m.firingLine("households"));
        assertEquals("no firing since the daemon started", m.firingLine("businesses"));
    }

    @Test
    void aFailureAfterASuccessShowsBoth() {
        DaemonMetrics m = new DaemonMetrics();
        m.firingSucceeded("households", MORNING);
        m.firingFailed("households", NOON);
        assertEquals("last firing failed 2026-03-02 12:00 UTC; last success 2026-03-02 09:12 UTC",
                m.firingLine("households"));
        m.firingSucceeded("households", NOON);
        assertEquals("last firing succeeded 2026-03-02 12:00 UTC", m.firingLine("households"));
    }
}
