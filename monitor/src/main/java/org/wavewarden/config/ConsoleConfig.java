package org.wavewarden.config;

import org.wavewarden.console.auth.PasswordHashes;
import org.wavewarden.review.Role;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.function.Function;

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
     * One person who logs in with a password, or whom a trusted proxy names.
     *
     * @param passwordHash    the encoded Argon2id hash (made by the {@code console-password} command), never the
     *                        password; null for a person who only comes through the proxy or whose hash is in
     *                        {@code passwordHashEnv}
     * @param passwordHashEnv the environment variable that holds the encoded hash, for deployments that keep even
     *                        hashes out of the config file; null when the hash is given inline or not at all
     */
    public record User(String name, Role role, String passwordHash, String passwordHashEnv) {
        public User {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(role, "role");
        }

        /** A person whose hash is written in the config (or who has none). */
        public User(String name, Role role, String passwordHash) {
            this(name, role, passwordHash, null);
        }

        @Override
        public String toString() {
            // The hash stays out of logs and error messages.
            return "User[name=" + name + ", role=" + role.key() + "]";
        }
    }

    /**
     * This configuration with every {@code passwordHashEnv} read from {@code environment} into {@code passwordHash}.
     * The hash is checked here as the config file's hashes are checked when it is read, so a bad variable is refused
     * at start-up with its key path, never at someone's first login.
     *
     * @param environment looks a variable up ({@code System::getenv} in production)
     */
    public ConsoleConfig withHashesFrom(Function<String, String> environment) {
        List<User> resolved = new ArrayList<>();
        for (int i = 0; i < users.size(); i++) {
            User u = users.get(i);
            if (u.passwordHashEnv() == null) {
                resolved.add(u);
                continue;
            }
            String key = "console.users[" + i + "].passwordHashEnv";
            String hash = environment.apply(u.passwordHashEnv());
            if (hash == null || hash.isBlank()) {
                throw new ConfigException(key, "the environment variable " + u.passwordHashEnv() + " is not set;"
                        + " it should hold the output of wavewarden console-password");
            }
            String problem = PasswordHashes.problem(hash.strip());
            if (problem != null) {
                throw new ConfigException(key, "the environment variable " + u.passwordHashEnv() + " " + problem);
            }
            resolved.add(new User(u.name(), u.role(), hash.strip(), u.passwordHashEnv()));
        }
        return new ConsoleConfig(enabled, resolved, proxy, sessionLength, idleTimeout, secureCookie, loginFailures,
                lockout);
    }

    /** The configured person called {@code name} (names are compared exactly), if any. */
    public Optional<User> user(String name) {
        return users.stream().filter(u -> u.name().equals(name)).findFirst();
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
