package org.wavewarden.deliver.sink;

import org.slf4j.Logger;

import java.time.Duration;
import java.util.Objects;
import java.util.Random;

/**
 * The attempts of one sink on one message under its {@link RetryPolicy}: try, and after a failure that may pass wait
 * the policy's delay and try again, until the message goes through, a failure is final or the attempts run out.
 * Every sink that sends over the network uses this one loop, so they retry, wait and give up alike; what an attempt
 * is and which failures may pass is the sink's own.
 *
 * <p>The jitter comes from one generator per sink, seeded by the policy, so a run can be repeated exactly; sinks may
 * be called from several threads, hence the lock around each draw.
 */
final class RetryLoop {

    /** One attempt's outcome: through, or an error that is {@code retryable} (with the receiver's wish to wait). */
    record Outcome(boolean ok, boolean retryable, String error, Duration retryAfter) {

        static final Outcome DELIVERED = new Outcome(true, false, null, null);

        static Outcome failed(String error, boolean retryable, Duration retryAfter) {
            return new Outcome(false, retryable, error, retryable ? retryAfter : null);
        }
    }

    /** One attempt at sending the message. */
    @FunctionalInterface
    interface Attempt {
        Outcome once() throws InterruptedException;
    }

    /**
     * What the attempts on one message came to.
     *
     * @param attempts    attempts made, the one that ended the loop included
     * @param lastError   why it was not delivered; null when it was
     * @param interrupted the thread was interrupted during an attempt or a wait; the loop stopped at once
     */
    record Result(boolean delivered, int attempts, String lastError, boolean interrupted) {
    }

    private final String sink;
    private final RetryPolicy policy;
    private final Random jitter;
    private final Logger log;

    /**
     * @param sink the sink's name, for log lines
     * @param log  the sink's logger, so that its lines stay under the sink's name
     */
    RetryLoop(String sink, RetryPolicy policy, Logger log) {
        this.sink = Objects.requireNonNull(sink, "sink");
        this.policy = Objects.requireNonNull(policy, "policy");
        this.jitter = new Random(policy.seed());
        this.log = Objects.requireNonNull(log, "log");
    }

    /**
     * Tries {@code attempt} until it goes through or gives up.
     *
     * @param key  the message's idempotency key, for log lines
     * @param done the verb logged when a retry goes through, e.g. "delivered"
     */
    Result run(String key, String done, Attempt attempt) {
        String lastError = "not attempted";
        for (int n = 1; n <= policy.maxAttempts(); n++) {
            Outcome o;
            try {
                o = attempt.once();
            } catch (InterruptedException e) {
                return new Result(false, n, "interrupted during attempt " + n + "; before that: " + lastError, true);
            }
            if (o.ok()) {
                if (n > 1) {
                    log.info("{}: {} {} on attempt {}", sink, done, key, n);
                }
                return new Result(true, n, null, false);
            }
            lastError = o.error();
            if (!o.retryable()) {
                return new Result(false, n, lastError + " (not retried)", false);
            }
            if (n == policy.maxAttempts()) {
                break;
            }
            double u;
            synchronized (jitter) {
                u = jitter.nextDouble();
            }
            Duration wait = policy.delay(n, u, o.retryAfter());
            log.info("{}: attempt {} for {} failed ({}); retrying in {} ms", sink, n, key, lastError,
                    wait.toMillis());
            try {
                policy.sleeper().sleep(wait);
            } catch (InterruptedException e) {
                return new Result(false, n, "interrupted while waiting to retry; last error: " + lastError, true);
            }
        }
        return new Result(false, policy.maxAttempts(), lastError, false);
    }
}
