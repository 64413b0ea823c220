package org.wavewarden.console.auth;

import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConsoleConfig;

import java.net.InetAddress;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.SecureRandom;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Base64;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.function.Function;
import java.util.regex.Pattern;

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

    private static final Logger LOG = LoggerFactory.getLogger(ConsoleAuth.class);

    /** The login form's double-submit cookie. */
    public static final String LOGIN_COOKIE = "ww_login";

    /** The path both cookies are limited to: the console's pages, never the daemon's other endpoints. */
    static final String PATH = "/console";

    /** 256 random bits in unpadded base64url: 43 characters. */
    private static final int SECRET_BYTES = 32;
    private static final Pattern SECRET = Pattern.compile("[A-Za-z0-9_-]{43}");

    private static final SecureRandom RANDOM = new SecureRandom();

    private final ConsoleConfig config;
    private final Clock clock;
    private final LoginThrottle throttle;
    private final Set<InetAddress> trustedProxies;
    private final Map<String, Live> sessions = new ConcurrentHashMap<>();
    // One session per person the proxy names, so that the CSRF token in a page they were shown is still theirs when
    // they send its form (the proxy sets no cookie of ours).
    private final Map<String, String> proxySessionIds = new ConcurrentHashMap<>();
    private final java.util.concurrent.atomic.AtomicBoolean untrustedHeaderSeen =
            new java.util.concurrent.atomic.AtomicBoolean();

    /** A session as kept here: everything but the last request is fixed at login. */
    private static final class Live {
        final String id;
        final Principal principal;
        final String csrfToken;
        final Instant createdAt;
        volatile Instant lastSeenAt;

        Live(String id, Principal principal, String csrfToken, Instant createdAt) {
            this.id = id;
            this.principal = principal;
            this.csrfToken = csrfToken;
            this.createdAt = createdAt;
            this.lastSeenAt = createdAt;
        }

        Session view() {
            return new Session(id, principal, csrfToken, createdAt, lastSeenAt);
        }

        @Override
        public String toString() {
            return "Live[" + principal.name() + "]";
        }
    }

    /** Reads {@code passwordHashEnv} from the process's environment. */
    public ConsoleAuth(ConsoleConfig config, Clock clock) {
        this(config, clock, System::getenv);
    }

    /**
     * @param environment looks up the variables named by {@code passwordHashEnv} ({@code System::getenv} in
     *                    production); a variable that is unset or holds no Argon2id hash is a ConfigException naming
     *                    {@code console.users[i].passwordHashEnv}
     */
    public ConsoleAuth(ConsoleConfig config, Clock clock, Function<String, String> environment) {
        Objects.requireNonNull(config, "config");
        this.config = config.withHashesFrom(Objects.requireNonNull(environment, "environment"));
        this.clock = Objects.requireNonNull(clock, "clock");
        this.throttle = new LoginThrottle(config.loginFailures(), config.lockout(), clock);
        Set<InetAddress> trusted = new HashSet<>();
        if (config.proxy() != null) {
            List<String> addresses = config.proxy().trustedAddresses();
            for (int i = 0; i < addresses.size(); i++) {
                int index = i;
                trusted.add(IpLiteral.parse(addresses.get(i)).orElseThrow(() -> new ConfigException(
                        "console.proxy.trustedAddresses[" + index + "]", "expected an IPv4 or IPv6 address")));
            }
        }
        this.trustedProxies = Set.copyOf(trusted);
    }

    /**
     * The session a request carries: its session cookie (from the raw {@code Cookie} header) while live, or, when a
     * proxy is configured and the peer address is one it trusts, a session for the person its header names (who
     * must be a configured user).
     */
    public Optional<Session> session(String cookieHeader, String proxyUser, String remoteAddress) {
        Instant now = clock.instant();
        if (config.proxy() != null && proxyUser != null && !proxyUser.isBlank()) {
            if (trustedProxy(remoteAddress)) {
                // The proxy's word decides who this is, whatever cookie the browser also sends.
                return proxySession(proxyUser.strip(), now);
            }
            // From anywhere else the header is what any client can write: ignored, and the cookie decides. Said
            // once at warning level (a proxy address missing from the config shows at once), then quietly, so that
            // a client sending it on every request cannot fill the log.
            (untrustedHeaderSeen.getAndSet(true) ? LOG.atDebug() : LOG.atWarn()).log("console: header {} ignored"
                    + " from {}, which is not among console.proxy.trustedAddresses", config.proxy().userHeader(),
                    remoteAddress);
        }
        for (String id : cookies(cookieHeader, COOKIE)) {
            Live live = sessions.get(id);
            if (live == null || live.principal.via().equals("proxy")) {
                continue;
            }
            if (expired(live, now)) {
                sessions.remove(id, live);
                continue;
            }
            live.lastSeenAt = now;
            return Optional.of(live.view());
        }
        return Optional.empty();
    }

    private Optional<Session> proxySession(String name, Instant now) {
        Optional<ConsoleConfig.User> user = config.user(name);
        if (user.isEmpty()) {
            // The name is not repeated: whatever the proxy sends is not ours to write into the log.
            LOG.warn("console: the proxy named a person who is not among console.users; refused");
            return Optional.empty();
        }
        synchronized (proxySessionIds) {
            String id = proxySessionIds.get(name);
            Live live = id == null ? null : sessions.get(id);
            if (live != null && !expired(live, now) && live.principal.role() == user.get().role()) {
                live.lastSeenAt = now;
                return Optional.of(live.view());
            }
            if (live != null) {
                sessions.remove(live.id, live);
            }
            Live fresh = open(new Principal(name, user.get().role(), "proxy"), now);
            proxySessionIds.put(name, fresh.id);
            LOG.info("console: {} ({}) recognised through the proxy", name, fresh.principal.role().key());
            return Optional.of(fresh.view());
        }
    }

    /**
     * Checks a name and password. The caller keeps {@code password} and should clear it afterwards. A name that is
     * not configured (or has no password hash) is checked against a stand-in hash all the same, so the answer takes
     * as long as for a configured name with a wrong password and does not tell names apart.
     */
    public LoginResult login(String name, char[] password, String remoteAddress) {
        String n = name == null ? "" : name.strip();
        Optional<Duration> wait = throttle.begin(n, remoteAddress);
        if (wait.isPresent()) {
            LOG.warn("console login throttled from {} for {} s", remoteAddress, wait.get().toSeconds());
            return new LoginResult.Throttled(wait.get());
        }
        Optional<ConsoleConfig.User> user = config.user(n).filter(u -> u.passwordHash() != null);
        boolean matched = PasswordHashes.matches(password == null ? new char[0] : password,
                user.map(ConsoleConfig.User::passwordHash).orElseGet(StandIn::hash));
        if (matched && user.isPresent()) {
            throttle.succeeded(n, remoteAddress);
            Live live = open(new Principal(n, user.get().role(), "password"), clock.instant());
            LOG.info("console login: {} ({}) from {}", n, live.principal.role().key(), remoteAddress);
            return new LoginResult.LoggedIn(live.view());
        }
        if (user.isPresent()) {
            LOG.warn("console login refused: wrong password for {} from {}", n, remoteAddress);
        } else {
            // A name that is not configured is not logged: people type their password into the name field.
            LOG.warn("console login refused: a name that is not among console.users, from {}", remoteAddress);
        }
        return new LoginResult.Refused("wrong name or password");
    }

    public void logout(Session session) {
        if (session == null) {
            return;
        }
        Live live = sessions.remove(session.id());
        if (live != null) {
            proxySessionIds.remove(live.principal.name(), live.id);
            LOG.info("console logout: {}", live.principal.name());
        }
    }

    /** Whether {@code token} is the session's CSRF token (compared in constant time). */
    public boolean csrfValid(Session session, String token) {
        if (session == null || token == null) {
            return false;
        }
        Live live = sessions.get(session.id());
        if (live == null || expired(live, clock.instant())) {
            return false;
        }
        return MessageDigest.isEqual(live.csrfToken.getBytes(StandardCharsets.US_ASCII),
                token.getBytes(StandardCharsets.UTF_8));
    }

    /** The {@code Set-Cookie} value that hands {@code session} to the browser (HttpOnly, SameSite=Strict, Path). */
    public String setCookie(Session session) {
        // No Max-Age: the cookie ends with the browser; the session's own expiry is kept here.
        return COOKIE + "=" + session.id() + flags();
    }

    /** The {@code Set-Cookie} value that removes the session cookie. */
    public String clearCookie() {
        return COOKIE + "=; Max-Age=0" + flags();
    }

    /**
     * A CSRF token for the login form of a browser that has no session yet, and its {@code Set-Cookie} value
     * (double submit: the form's token must equal the cookie's).
     */
    public LoginForm loginForm() {
        String token = secret();
        return new LoginForm(token, LOGIN_COOKIE + "=" + token + flags());
    }

    /** The {@code Set-Cookie} value that removes the login form's cookie once it has served. */
    public String clearLoginFormCookie() {
        return LOGIN_COOKIE + "=; Max-Age=0" + flags();
    }

    /** Whether a login form's token matches the token cookie its browser sent (raw {@code Cookie} header). */
    public boolean loginFormValid(String cookieHeader, String token) {
        if (token == null || !SECRET.matcher(token).matches()) {
            return false;
        }
        byte[] sent = token.getBytes(StandardCharsets.US_ASCII);
        boolean valid = false;
        for (String cookie : cookies(cookieHeader, LOGIN_COOKIE)) {
            valid |= MessageDigest.isEqual(cookie.getBytes(StandardCharsets.US_ASCII), sent);
        }
        return valid;
    }

    /** How many sessions are live now (expired ones are dropped first). */
    public int liveSessions() {
        sweep(clock.instant());
        return sessions.size();
    }

    private String flags() {
        return "; Path=" + PATH + "; HttpOnly; SameSite=Strict" + (config.secureCookie() ? "; Secure" : "");
    }

    private Live open(Principal principal, Instant now) {
        sweep(now);
        Live live = new Live(secret(), principal, secret(), now);
        sessions.put(live.id, live);
        return live;
    }

    private void sweep(Instant now) {
        sessions.values().removeIf(l -> expired(l, now));
        proxySessionIds.values().removeIf(id -> !sessions.containsKey(id));
    }

    private boolean expired(Live live, Instant now) {
        return !now.isBefore(live.createdAt.plus(config.sessionLength()))
                || !now.isBefore(live.lastSeenAt.plus(config.idleTimeout()));
    }

    private boolean trustedProxy(String remoteAddress) {
        return IpLiteral.parse(remoteAddress).map(trustedProxies::contains).orElse(false);
    }

    /** 256 bits from SecureRandom in unpadded base64url. */
    private static String secret() {
        byte[] bytes = new byte[SECRET_BYTES];
        RANDOM.nextBytes(bytes);
        return Base64.getUrlEncoder().withoutPadding().encodeToString(bytes);
    }

    /** The well-formed values of every cookie called {@code name} in a raw {@code Cookie} header. */
    static List<String> cookies(String header, String name) {
        if (header == null || header.isEmpty()) {
            return List.of();
        }
        List<String> values = new ArrayList<>();
        for (String part : header.split(";")) {
            int eq = part.indexOf('=');
            if (eq < 0 || !part.substring(0, eq).strip().equals(name)) {
                continue;
            }
            String value = part.substring(eq + 1).strip();
            if (value.length() >= 2 && value.startsWith("\"") && value.endsWith("\"")) {
                value = value.substring(1, value.length() - 1);
            }
            if (SECRET.matcher(value).matches()) {
                values.add(value);
            }
        }
        return values;
    }

    /**
     * The hash an unknown name's password is checked against: made once, from random characters, with the same
     * parameters as real hashes, so that its check costs the same.
     */
    private static final class StandIn {
        private static final String HASH = PasswordHashes.encode(secret().toCharArray());

        static String hash() {
            return HASH;
        }
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
