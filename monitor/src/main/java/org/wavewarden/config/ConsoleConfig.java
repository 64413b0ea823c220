package org.wavewarden.config;

import org.wavewarden.review.Role;

import java.time.Duration;
import java.util.List;
import java.util.Objects;

/**
 * The web console's people and sessions (key {@code console}). The console is served on the daemon's
 * {@code daemon.httpBind}/{@code daemon.httpPort} and by the standalone {@code console} command.
 *
 * @param enabled          whether the daemon serves the console
 * @param users            who may log in with a password, each with a role
 * @param proxy            a trusted reverse proxy that names the person in a header, or null for none
 * @param sessionLength    how long a session lasts from login, whatever it does
 * @param idleTimeout      how long a session lasts without a request
 * @param secureCookie     whether the session cookie carries the Secure flag (true unless the console is reached over
 *                         plain HTTP on this machine only)
 * @param loginFailures    failed logins allowed per name and per address before further attempts are refused
 * @param lockout          how long such a refusal lasts
 */
public record ConsoleConfig(boolean enabled, List<User> users, Proxy proxy, Duration sessionLength,
                            Duration idleTimeout, boolean secureCookie, int loginFailures, Duration lockout) {

    public static final ConsoleConfig DISABLED = new ConsoleConfig(false, List.of(), null, Duration.ofHours(8),
            Duration.ofMinutes(30), true, 5, Duration.ofMinutes(15));

    public ConsoleConfig {
        users = List.copyOf(users);
        Objects.requireNonNull(sessionLength, "sessionLength");
        Objects.requireNonNull(idleTimeout, "idleTimeout");
        Objects.requireNonNull(lockout, "lockout");
    }

    /**
     * One person who logs in with a password.
     *
     * @param passwordHash the encoded hash (made by the {@code console-password} command), never the password
     */
    public record User(String name, Role role, String passwordHash) {
        public User {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(role, "role");
        }

        @Override
        public String toString() {
            // The hash stays out of logs and error messages.
            return "User[name=" + name + ", role=" + role.key() + "]";
        }
    }

    /**
     * A reverse proxy that has authenticated the person and names them in {@code userHeader}. The header is believed
     * only from {@code trustedAddresses}; the person must still be listed under {@code users} (their role comes from
     * there; a proxy-only person may have no password hash).
     */
    public record Proxy(String userHeader, List<String> trustedAddresses) {
        public Proxy {
            Objects.requireNonNull(userHeader, "userHeader");
            trustedAddresses = List.copyOf(trustedAddresses);
        }
    }
}
