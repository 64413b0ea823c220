package org.wavewarden.deliver.sink;

import java.time.Duration;
import java.util.Objects;
import java.util.concurrent.ThreadLocalRandom;

/**
 * How often and how patiently a sink retries a delivery that failed for a reason that may pass (a refused
 * connection, a 5xx or 429 answer): exponential backoff with "equal jitter" after Brooker (2015), "Exponential
 * Backoff And Jitter", AWS Architecture Blog. After the {@code k}-th failed attempt the sink waits
 * {@code c/2 + u * c/2} with {@code c = min(maxDelay, initialDelay * 2^(k-1))} and {@code u} uniform on [0, 1):
 * the doubling spreads load away from a struggling receiver, the jitter keeps many senders from retrying in step,
 * and the fixed half keeps every wait at least half the ceiling. A receiver's {@code Retry-After} (RFC 9110,
 * section 10.2.3) lengthens the wait up to {@code maxDelay}.
 *
 * @param maxAttempts  attempts in all, the first included; 1 means no retry
 * @param initialDelay the ceiling after the first failure
 * @param maxDelay     the largest wait
 * @param seed         seeds the jitter, so a run can be repeated exactly
 * @param sleeper      how the sink waits; tests pass one that records instead of sleeping
 */
public record RetryPolicy(int maxAttempts, Duration initialDelay, Duration maxDelay, long seed, Sleeper sleeper) {

    /** Waits for a duration; {@link Thread#sleep} in production. */
    @FunctionalInterface
    public interface Sleeper {
        void sleep(Duration duration) throws InterruptedException;
    }

    /** Sleeps the calling thread. */
    public static final Sleeper THREAD_SLEEP = d -> Thread.sleep(d.toMillis(), d.toNanosPart() % 1_000_000);

    public RetryPolicy {
        if (maxAttempts < 1) {
            throw new IllegalArgumentException("maxAttempts: expected at least 1 but got " + maxAttempts);
        }
        Objects.requireNonNull(initialDelay, "initialDelay");
        Objects.requireNonNull(maxDelay, "maxDelay");
        Objects.requireNonNull(sleeper, "sleeper");
        if (initialDelay.isNegative()) {
            throw new IllegalArgumentException("initialDelay: expected zero or more but got " + initialDelay);
        }
        if (maxDelay.compareTo(initialDelay) < 0) {
            throw new IllegalArgumentException("maxDelay: expected at least initialDelay " + initialDelay
                    + " but got " + maxDelay);
        }
    }

    /** Real sleeps and a random seed. */
    public static RetryPolicy of(int maxAttempts, Duration initialDelay, Duration maxDelay) {
        return new RetryPolicy(maxAttempts, initialDelay, maxDelay, ThreadLocalRandom.current().nextLong(),
                THREAD_SLEEP);
    }

    /** Five attempts over about half a minute at most: 1, 2, 4 and 8 second ceilings. */
    public static RetryPolicy standard() {
        return of(5, Duration.ofSeconds(1), Duration.ofSeconds(30));
    }

    public RetryPolicy withSleeper(Sleeper other) {
        return new RetryPolicy(maxAttempts, initialDelay, maxDelay, seed, other);
    }

    public RetryPolicy withSeed(long other) {
        return new RetryPolicy(maxAttempts, initialDelay, maxDelay, other, sleeper);
    }

    /** The ceiling {@code c} after {@code failures} failed attempts (1 or more). */
    public Duration ceiling(int failures) {
        if (failures < 1) {
            throw new IllegalArgumentException("failures: expected at least 1 but got " + failures);
        }
        Duration c = initialDelay;
        for (int i = 1; i < failures && c.compareTo(maxDelay) < 0; i++) {
            c = c.multipliedBy(2);
        }
        return c.compareTo(maxDelay) > 0 ? maxDelay : c;
    }

    /**
     * The wait after {@code failures} failed attempts for a jitter draw {@code unit} in [0, 1) and the receiver's
     * requested wait ({@code null} when it asked for none).
     */
    public Duration delay(int failures, double unit, Duration retryAfter) {
        if (!(unit >= 0 && unit < 1)) {
            throw new IllegalArgumentException("unit: expected a number in [0, 1) but got " + unit);
        }
        long c = ceiling(failures).toNanos();
        long half = c / 2;
        Duration d = Duration.ofNanos(half + (long) (unit * (c - half)));
        if (retryAfter != null && retryAfter.compareTo(d) > 0) {
            d = retryAfter.compareTo(maxDelay) > 0 ? maxDelay : retryAfter;
        }
        return d;
    }
}
