package org.wavewarden.console.auth;

import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.HashMap;
import java.util.Map;
import java.util.Optional;

/**
 * Failed logins counted per name and per address over a sliding window of {@code lockout}: once either has
 * {@code limit} failures inside the window, attempts for that name or from that address are refused unchecked until
 * enough of those failures have left the window. A refused attempt is not itself counted, so waiting always ends
 * the refusal. A success clears the name's failures (the address keeps its own, so one address cannot try many names
 * by logging into its own account in between).
 */
public final class LoginThrottle {

    /**
     * Keys kept at most before expired ones are swept; names typed at the login form are any text, so the maps are
     * bounded by sweeping rather than trusted to stay small.
     */
    static final int SWEEP_ABOVE = 10_000;
    /** Names are counted on their first characters only, so a long typed name costs no more memory than a short. */
    static final int NAME_CHARS = 128;

    private final int limit;
    private final Duration lockout;
    private final Clock clock;
    private final Map<String, Deque<Instant>> byName = new HashMap<>();
    private final Map<String, Deque<Instant>> byAddress = new HashMap<>();

    public LoginThrottle(int limit, Duration lockout, Clock clock) {
        if (limit < 1) {
            throw new IllegalArgumentException("limit must be at least 1");
        }
        this.limit = limit;
        this.lockout = lockout;
        this.clock = clock;
    }

    /**
     * Starts an attempt for {@code name} from {@code address}: how long until one is checked again, or empty when it
     * may be checked now, in which case it is already counted as a failure. Counting before the check, in one step
     * with the test, keeps a burst of simultaneous attempts to the limit: none of them can pass the test while
     * another is still being checked.
     */
    public synchronized Optional<Duration> begin(String name, String address) {
        Instant now = clock.instant();
        Duration wait = Duration.ZERO;
        for (Duration d : new Duration[] {wait(byName, nameKey(name), now), wait(byAddress, address, now)}) {
            if (d.compareTo(wait) > 0) {
                wait = d;
            }
        }
        if (!wait.isZero()) {
            return Optional.of(wait);
        }
        add(byName, nameKey(name), now);
        add(byAddress, address, now);
        return Optional.empty();
    }

    /**
     * The attempt begun for {@code name} from {@code address} succeeded: the name's failures are forgotten and the
     * address is no longer charged for this attempt (its other failures stay).
     */
    public synchronized void succeeded(String name, String address) {
        byName.remove(nameKey(name));
        Deque<Instant> failures = byAddress.get(address);
        if (failures != null && !failures.isEmpty()) {
            failures.removeLast();
        }
    }

    private Duration wait(Map<String, Deque<Instant>> map, String key, Instant now) {
        Deque<Instant> failures = map.get(key);
        if (failures == null) {
            return Duration.ZERO;
        }
        prune(failures, now);
        if (failures.isEmpty()) {
            map.remove(key);
            return Duration.ZERO;
        }
        if (failures.size() < limit) {
            return Duration.ZERO;
        }
        // Attempts resume when the count falls below the limit: when the failure that is limit-th from the newest
        // leaves the window.
        Instant unlocks = failures.stream().skip(failures.size() - limit).findFirst().orElseThrow().plus(lockout);
        return Duration.between(now, unlocks);
    }

    private void add(Map<String, Deque<Instant>> map, String key, Instant now) {
        if (map.size() > SWEEP_ABOVE) {
            map.values().forEach(d -> prune(d, now));
            map.values().removeIf(Deque::isEmpty);
        }
        Deque<Instant> failures = map.computeIfAbsent(key, k -> new ArrayDeque<>());
        prune(failures, now);
        failures.addLast(now);
        // Only the newest limit failures decide anything.
        while (failures.size() > limit) {
            failures.removeFirst();
        }
    }

    private void prune(Deque<Instant> failures, Instant now) {
        Instant start = now.minus(lockout);
        while (!failures.isEmpty() && !failures.peekFirst().isAfter(start)) {
            failures.removeFirst();
        }
    }

    private static String nameKey(String name) {
        String n = name == null ? "" : name;
        return n.length() > NAME_CHARS ? n.substring(0, NAME_CHARS) : n;
    }
}
