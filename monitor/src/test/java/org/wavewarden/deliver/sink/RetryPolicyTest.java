package org.wavewarden.deliver.sink;

import org.junit.jupiter.api.Test;

import java.time.Duration;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class RetryPolicyTest {

    private static final RetryPolicy.Sleeper NO_SLEEP = d -> { };

    private final RetryPolicy policy = new RetryPolicy(6, Duration.ofMillis(100), Duration.ofMillis(1000), 1L,
            NO_SLEEP);

    @Test
    void ceilingDoublesUntilTheMaximum() {
        assertEquals(Duration.ofMillis(100), policy.ceiling(1));
        assertEquals(Duration.ofMillis(200), policy.ceiling(2));
        assertEquals(Duration.ofMillis(400), policy.ceiling(3));
        assertEquals(Duration.ofMillis(800), policy.ceiling(4));
        assertEquals(Duration.ofMillis(1000), policy.ceiling(5));
        assertEquals(Duration.ofMillis(1000), policy.ceiling(60));
    }

    @Test
    void equalJitterKeepsEveryWaitBetweenHalfTheCeilingAndTheCeiling() {
        Random rnd = new Random(7L);
        for (int i = 0; i < 500; i++) {
            int failures = 1 + rnd.nextInt(8);
            double u = rnd.nextDouble();
            Duration c = policy.ceiling(failures);
            Duration d = policy.delay(failures, u, null);
            assertTrue(d.compareTo(c.dividedBy(2)) >= 0 && d.compareTo(c) <= 0, failures + " " + u + " " + d);
        }
        assertEquals(Duration.ofMillis(50), policy.delay(1, 0.0, null));
        assertEquals(Duration.ofMillis(300), policy.delay(3, 0.5, null));
    }

    @Test
    void receiversRetryAfterLengthensTheWaitButNotBeyondTheMaximum() {
        assertEquals(Duration.ofMillis(700), policy.delay(1, 0.0, Duration.ofMillis(700)));
        assertEquals(Duration.ofMillis(1000), policy.delay(1, 0.0, Duration.ofSeconds(120)));
        // A shorter request than the backoff does not shorten it.
        assertEquals(Duration.ofMillis(300), policy.delay(3, 0.5, Duration.ofMillis(10)));
    }

    @Test
    void badSettingsAreRefusedNamingTheArgument() {
        assertEquals("maxAttempts", field(assertThrows(IllegalArgumentException.class,
                () -> new RetryPolicy(0, Duration.ZERO, Duration.ZERO, 0, NO_SLEEP))));
        assertEquals("initialDelay", field(assertThrows(IllegalArgumentException.class,
                () -> new RetryPolicy(1, Duration.ofMillis(-1), Duration.ZERO, 0, NO_SLEEP))));
        assertEquals("maxDelay", field(assertThrows(IllegalArgumentException.class,
                () -> new RetryPolicy(1, Duration.ofSeconds(2), Duration.ofSeconds(1), 0, NO_SLEEP))));
        assertEquals("unit", field(assertThrows(IllegalArgumentException.class, () -> policy.delay(1, 1.0, null))));
    }

    private static String field(IllegalArgumentException e) {
        return e.getMessage().substring(0, e.getMessage().indexOf(':'));
    }
}
