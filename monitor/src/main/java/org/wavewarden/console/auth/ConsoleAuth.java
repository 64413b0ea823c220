package org.wavewarden.console.auth;

import org.wavewarden.config.ConsoleConfig;

import java.time.Clock;
import java.time.Duration;
import java.util.Objects;
import java.util.Optional;

/**
 * Who is asking, and whether they may: password logins against the configured hashes, a trusted proxy's header,
 * sessions with an absolute and an idle expiry, a CSRF token per session checked on every form, and a limit on
 * failed logins per name and per address. It takes plain strings (cookie header, header values, the peer address),
 * not the HTTP server's types, so that it is tested on its own.
 */
public final class ConsoleAuth {

    /** The session cookie's name. */
    public static final String COOKIE = "ww_session";

    /** What a login attempt came to. */
    public sealed interface LoginResult permits LoginResult.LoggedIn, LoginResult.Refused, LoginResult.Throttled {
        /** The name and password matched: a new session. */
        record LoggedIn(Session session) implements LoginResult {
        }

        /** Wrong name or password (the message does not say which). */
        record Refused(String message) implements LoginResult {
        }

        /** Too many failures for this name or address: nothing is checked until {@code retryAfter} has passed. */
        record Throttled(Duration retryAfter) implements LoginResult {
        }
    }

    private final ConsoleConfig config;
    private final Clock clock;

    public ConsoleAuth(ConsoleConfig config, Clock clock) {
        this.config = Objects.requireNonNull(config, "config");
        this.clock = Objects.requireNonNull(clock, "clock");
    }

    /**
     * The session a request carries: its session cookie (from the raw {@code Cookie} header) while live, or, when a
     * proxy is configured and the peer address is one it trusts, a session for the person its header names (who
     * must be a configured user).
     */
    public Optional<Session> session(String cookieHeader, String proxyUser, String remoteAddress) {
        throw new UnsupportedOperationException("not yet");
    }

    public LoginResult login(String name, char[] password, String remoteAddress) {
        throw new UnsupportedOperationException("not yet");
    }

    public void logout(Session session) {
        throw new UnsupportedOperationException("not yet");
    }

    /** Whether {@code token} is the session's CSRF token (compared in constant time). */
    public boolean csrfValid(Session session, String token) {
        throw new UnsupportedOperationException("not yet");
    }

    /** The {@code Set-Cookie} value that hands {@code session} to the browser (HttpOnly, SameSite=Strict, Path). */
    public String setCookie(Session session) {
        throw new UnsupportedOperationException("not yet");
    }

    /** The {@code Set-Cookie} value that removes the session cookie. */
    public String clearCookie() {
        throw new UnsupportedOperationException("not yet");
    }

    /**
     * A CSRF token for the login form of a browser that has no session yet, and its {@code Set-Cookie} value
     * (double submit: the form's token must equal the cookie's).
     */
    public LoginForm loginForm() {
        throw new UnsupportedOperationException("not yet");
    }

    /** Whether a login form's token matches the token cookie its browser sent (raw {@code Cookie} header). */
    public boolean loginFormValid(String cookieHeader, String token) {
        throw new UnsupportedOperationException("not yet");
    }

    /** A login form's token and the cookie that carries it. */
    public record LoginForm(String token, String setCookie) {
        @Override
        public String toString() {
            return "LoginForm[...]";
        }
    }

    ConsoleConfig config() {
        return config;
    }

    Clock clock() {
        return clock;
    }
}
