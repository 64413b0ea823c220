package org.wavewarden.console.auth;

import ch.qos.logback.classic.Level;
import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.slf4j.LoggerFactory;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConsoleConfig;
import org.wavewarden.review.Role;

import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Who the console lets in and for how long, on a clock the test moves: password logins, refusals that do not tell a
 * wrong password from an unknown name, the failed-login limit per name and per address, sessions that end after
 * their absolute length or when left idle, logout, CSRF tokens bound to one session, the login form's double-submit
 * cookie, a proxy's header believed from its own addresses only, the cookies' exact flags, and no secret in any
 * printed value or log line.
 */
class ConsoleAuthTest {

    // Made by wavewarden console-password from the passwords beside them.
    static final String ADA_PASSWORD = "tide-gauge-42";
    static final String ADA_HASH =
            "$argon2id$v=19$m=65536,t=3,p=4$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q";
    static final String BRYN_PASSWORD = "lantern-ferry-7";
    static final String BRYN_HASH =
            "$argon2id$v=19$m=65536,t=3,p=4$Bx9wyc7B72++kxlRK3DH8A$soSwCuX588rAYf6aqiFSqRETckylY+tLC5WkjGBgA2g";

    static final String HERE = "192.0.2.10";
    static final String ELSEWHERE = "198.51.100.7";

    /** A clock that stands still until the test moves it. */
    static final class TestClock extends Clock {
        private Instant now = Instant.parse("2026-03-02T09:00:00Z");

        void advance(Duration d) {
            now = now.plus(d);
        }

        @Override
        public Instant instant() {
            return now;
        }

        @Override
        public ZoneId getZone() {
            return ZoneOffset.UTC;
        }

        @Override
        public Clock withZone(ZoneId zone) {
            return this;
        }
    }

    static ConsoleConfig config(ConsoleConfig.Proxy proxy, boolean secure) {
        return new ConsoleConfig(true, List.of(
                new ConsoleConfig.User("ada", Role.RELEASER, ADA_HASH),
                new ConsoleConfig.User("bryn", Role.STEWARD, null, "WW_BRYN_HASH"),
                new ConsoleConfig.User("cai", Role.VIEWER, null)),
                proxy, Duration.ofHours(8), Duration.ofMinutes(30), secure, 3, Duration.ofMinutes(15));
    }

    static final ConsoleConfig.Proxy PROXY = new ConsoleConfig.Proxy("X-Forwarded-User", List.of("127.0.0.1", "::1"));

    TestClock clock;
    ConsoleAuth auth;
    Logger authLog;
    ListAppender<ILoggingEvent> logs;
    final List<String> secrets = new ArrayList<>();

    @BeforeEach
    void start() {
        clock = new TestClock();
        auth = new ConsoleAuth(config(PROXY, true), clock, Map.of("WW_BRYN_HASH", BRYN_HASH)::get);
        authLog = (Logger) LoggerFactory.getLogger(ConsoleAuth.class);
        logs = new ListAppender<>();
        logs.start();
        authLog.addAppender(logs);
        authLog.setLevel(Level.DEBUG);
        authLog.setAdditive(false);
        secrets.addAll(List.of(ADA_PASSWORD, BRYN_PASSWORD, ADA_HASH, BRYN_HASH));
    }

    @AfterEach
    void noSecretWasLogged() {
        authLog.detachAppender(logs);
        authLog.setLevel(null);
        authLog.setAdditive(true);
        for (ILoggingEvent e : logs.list) {
            for (String secret : secrets) {
                assertFalse(e.getFormattedMessage().contains(secret), "a secret in the log: " + e.getFormattedMessage());
            }
        }
    }

    Session login(String name, String password, String address) {
        ConsoleAuth.LoginResult r = auth.login(name, password.toCharArray(), address);
        Session s = assertInstanceOf(ConsoleAuth.LoginResult.LoggedIn.class, r).session();
        secrets.add(s.id());
        secrets.add(s.csrfToken());
        return s;
    }

    static String cookie(Session s) {
        return "theme=dark; " + ConsoleAuth.COOKIE + "=" + s.id();
    }

    @Test
    void theRightPasswordOpensASessionThatTheCookieCarries() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        assertEquals(new Principal("ada", Role.RELEASER, "password"), s.principal());
        assertTrue(s.id().matches("[A-Za-z0-9_-]{43}"), "256 random bits in base64url: " + s.id().length());
        assertTrue(s.csrfToken().matches("[A-Za-z0-9_-]{43}"));
        assertNotEquals(s.id(), s.csrfToken());
        assertEquals(clock.instant(), s.createdAt());

        Session again = auth.session(cookie(s), null, HERE).orElseThrow();
        assertEquals(s.id(), again.id());
        assertEquals(s.principal(), again.principal());
        assertTrue(logs.list.stream().anyMatch(e -> e.getFormattedMessage().equals(
                "console login: ada (releaser) from " + HERE)), "the login is logged with the person and address");
    }

    @Test
    void aHashFromTheEnvironmentLogsItsPersonIn() {
        assertEquals(Role.STEWARD, login("bryn", BRYN_PASSWORD, HERE).principal().role());
    }

    @Test
    void aWrongPasswordAndAnUnknownNameAreRefusedAlike() {
        ConsoleAuth.LoginResult wrong = auth.login("ada", BRYN_PASSWORD.toCharArray(), HERE);
        ConsoleAuth.LoginResult unknown = auth.login("dora", ADA_PASSWORD.toCharArray(), ELSEWHERE);
        ConsoleAuth.LoginResult proxyOnly = auth.login("cai", "".toCharArray(), "203.0.113.1");
        assertEquals(new ConsoleAuth.LoginResult.Refused("wrong name or password"), wrong);
        assertEquals(wrong, unknown, "the answer does not tell which of name and password was wrong");
        assertEquals(wrong, proxyOnly, "a person without a password hash cannot log in with a password");
        assertEquals(0, auth.liveSessions());
        assertTrue(logs.list.stream().noneMatch(e -> e.getFormattedMessage().contains("dora")),
                "an unknown name is not logged: it may be a password typed into the wrong field");
    }

    @Test
    void everyCheckedAttemptSpendsOneHashCheckWhoeverItNames() {
        // Equal work rather than a timing measurement: a name that is not configured, or has no hash, is checked
        // against a stand-in hash, so its answer takes as long as a configured name's.
        for (String name : List.of("ada", "dora", "cai", "")) {
            long before = PasswordHashes.CHECKS_DONE.get();
            auth.login(name, "wrong".toCharArray(), "203.0.113." + name.length());
            assertEquals(1, PasswordHashes.CHECKS_DONE.get() - before, "checks spent for '" + name + "'");
        }
        long before = PasswordHashes.CHECKS_DONE.get();
        for (int i = 0; i < 3; i++) {
            auth.login("eli", "wrong".toCharArray(), HERE);
        }
        assertInstanceOf(ConsoleAuth.LoginResult.Throttled.class, auth.login("eli", "x".toCharArray(), HERE));
        assertEquals(3, PasswordHashes.CHECKS_DONE.get() - before, "a throttled attempt is not checked at all");
    }

    @Test
    void afterTheAllowedFailuresANameIsThrottledUntilTheWindowHasPassed() {
        for (int i = 0; i < 3; i++) {
            assertInstanceOf(ConsoleAuth.LoginResult.Refused.class,
                    auth.login("ada", "wrong".toCharArray(), i % 2 == 0 ? HERE : ELSEWHERE));
            clock.advance(Duration.ofMinutes(1));
        }
        // Failures at 0, 1 and 2 minutes; now is 3 minutes: the first leaves the 15-minute window at 15.
        assertEquals(new ConsoleAuth.LoginResult.Throttled(Duration.ofMinutes(12)),
                auth.login("ada", ADA_PASSWORD.toCharArray(), "203.0.113.9"),
                "even the right password, from another address, is not checked while the name is throttled");
        clock.advance(Duration.ofMinutes(11).plusSeconds(59));
        assertEquals(new ConsoleAuth.LoginResult.Throttled(Duration.ofSeconds(1)),
                auth.login("ada", ADA_PASSWORD.toCharArray(), "203.0.113.9"));
        clock.advance(Duration.ofSeconds(1));
        login("ada", ADA_PASSWORD, "203.0.113.9");
        assertInstanceOf(ConsoleAuth.LoginResult.Refused.class, auth.login("bryn", "wrong".toCharArray(), HERE),
                "another name from the same addresses is still checked");
    }

    @Test
    void afterTheAllowedFailuresAnAddressIsThrottledForEveryName() {
        auth.login("dora", "a".toCharArray(), HERE);
        auth.login("eli", "b".toCharArray(), HERE);
        auth.login("ada", "c".toCharArray(), HERE);
        ConsoleAuth.LoginResult r = auth.login("bryn", BRYN_PASSWORD.toCharArray(), HERE);
        assertEquals(new ConsoleAuth.LoginResult.Throttled(Duration.ofMinutes(15)), r);
        login("bryn", BRYN_PASSWORD, ELSEWHERE);
    }

    @Test
    void aBurstOfSimultaneousAttemptsGetsNoMoreChecksThanTheLimit() throws Exception {
        int attempts = 12;
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(attempts);
        java.util.concurrent.CountDownLatch go = new java.util.concurrent.CountDownLatch(1);
        List<java.util.concurrent.Future<ConsoleAuth.LoginResult>> results = new ArrayList<>();
        try {
            for (int i = 0; i < attempts; i++) {
                results.add(pool.submit(() -> {
                    go.await();
                    return auth.login("ada", "wrong".toCharArray(), HERE);
                }));
            }
            go.countDown();
            int refused = 0;
            int throttled = 0;
            for (var f : results) {
                ConsoleAuth.LoginResult r = f.get();
                refused += r instanceof ConsoleAuth.LoginResult.Refused ? 1 : 0;
                throttled += r instanceof ConsoleAuth.LoginResult.Throttled ? 1 : 0;
            }
            assertEquals(3, refused, "checked: exactly the three failures allowed");
            assertEquals(attempts - 3, throttled, "the rest refused unchecked, however close together they came");
        } finally {
            pool.shutdownNow();
        }
    }

    @Test
    void aSuccessClearsTheNamesFailures() {
        auth.login("ada", "wrong".toCharArray(), "203.0.113.1");
        auth.login("ada", "wrong".toCharArray(), "203.0.113.2");
        login("ada", ADA_PASSWORD, "203.0.113.3");
        auth.login("ada", "wrong".toCharArray(), "203.0.113.4");
        auth.login("ada", "wrong".toCharArray(), "203.0.113.5");
        assertInstanceOf(ConsoleAuth.LoginResult.Refused.class, auth.login("ada", "wrong".toCharArray(),
                "203.0.113.6"), "two failures since the success: still checked, not throttled");
    }

    @Test
    void aSessionEndsAtItsAbsoluteLengthHoweverBusy() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        Duration elapsed = Duration.ZERO;
        while (elapsed.compareTo(Duration.ofHours(8).minusMinutes(20)) < 0) {
            clock.advance(Duration.ofMinutes(20));
            elapsed = elapsed.plusMinutes(20);
            assertTrue(auth.session(cookie(s), null, HERE).isPresent(), "live after " + elapsed);
        }
        clock.advance(Duration.ofMinutes(19).plusSeconds(59));
        assertTrue(auth.session(cookie(s), null, HERE).isPresent(), "a second before eight hours");
        clock.advance(Duration.ofSeconds(1));
        assertEquals(Optional.empty(), auth.session(cookie(s), null, HERE), "eight hours after login");
        assertFalse(auth.csrfValid(s, s.csrfToken()), "an ended session's forms are refused too");
    }

    @Test
    void aSessionLeftIdleEndsAndEachRequestKeepsItAlive() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        clock.advance(Duration.ofMinutes(29));
        Session seen = auth.session(cookie(s), null, HERE).orElseThrow();
        assertEquals(clock.instant(), seen.lastSeenAt());
        clock.advance(Duration.ofMinutes(29));
        assertTrue(auth.session(cookie(s), null, HERE).isPresent(), "29 minutes since the last request");
        clock.advance(Duration.ofMinutes(30));
        assertEquals(Optional.empty(), auth.session(cookie(s), null, HERE), "30 minutes without a request");
        clock.advance(Duration.ofMinutes(-29));
        assertEquals(Optional.empty(), auth.session(cookie(s), null, HERE), "an ended session stays ended");
    }

    @Test
    void logoutEndsTheSessionAndItsForms() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        Session other = login("bryn", BRYN_PASSWORD, HERE);
        auth.logout(s);
        assertEquals(Optional.empty(), auth.session(cookie(s), null, HERE));
        assertFalse(auth.csrfValid(s, s.csrfToken()));
        assertTrue(auth.session(cookie(other), null, HERE).isPresent(), "only that session ends");
        auth.logout(s);
        assertTrue(logs.list.stream().anyMatch(e -> e.getFormattedMessage().equals("console logout: ada")));
    }

    @Test
    void aFormIsAcceptedWithItsOwnSessionsTokenOnly() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        Session other = login("bryn", BRYN_PASSWORD, ELSEWHERE);
        assertTrue(auth.csrfValid(s, s.csrfToken()));
        assertFalse(auth.csrfValid(s, other.csrfToken()), "another session's token");
        assertFalse(auth.csrfValid(s, auth.loginForm().token()), "a well-formed token of nobody's");
        assertFalse(auth.csrfValid(s, s.csrfToken().substring(1)));
        assertFalse(auth.csrfValid(s, s.csrfToken() + "A"));
        assertFalse(auth.csrfValid(s, ""));
        assertFalse(auth.csrfValid(s, null));
        assertFalse(auth.csrfValid(s, s.id()), "the session id is not the token");
        Session forged = new Session("x".repeat(43), s.principal(), s.csrfToken(), s.createdAt(), s.lastSeenAt());
        assertFalse(auth.csrfValid(forged, s.csrfToken()), "a session this console never opened");
    }

    @Test
    void theCookiesCarryExactlyTheseFlags() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        assertEquals("ww_session=" + s.id() + "; Path=/console; HttpOnly; SameSite=Strict; Secure",
                auth.setCookie(s));
        assertEquals("ww_session=; Max-Age=0; Path=/console; HttpOnly; SameSite=Strict; Secure", auth.clearCookie());
        ConsoleAuth.LoginForm form = auth.loginForm();
        assertEquals("ww_login=" + form.token() + "; Path=/console; HttpOnly; SameSite=Strict; Secure",
                form.setCookie());
        assertEquals("ww_login=; Max-Age=0; Path=/console; HttpOnly; SameSite=Strict; Secure",
                auth.clearLoginFormCookie());

        ConsoleAuth plain = new ConsoleAuth(config(null, false), clock, Map.of("WW_BRYN_HASH", BRYN_HASH)::get);
        assertEquals("ww_session=" + s.id() + "; Path=/console; HttpOnly; SameSite=Strict", plain.setCookie(s),
                "without secureCookie the console also works over plain HTTP");
        assertEquals("ww_session=; Max-Age=0; Path=/console; HttpOnly; SameSite=Strict", plain.clearCookie());
    }

    @Test
    void theLoginFormsTokenMustEqualItsCookie() {
        ConsoleAuth.LoginForm form = auth.loginForm();
        ConsoleAuth.LoginForm other = auth.loginForm();
        assertTrue(form.token().matches("[A-Za-z0-9_-]{43}"));
        assertNotEquals(form.token(), other.token());
        assertTrue(auth.loginFormValid("a=1; ww_login=" + form.token() + "; b=2", form.token()));
        assertFalse(auth.loginFormValid("ww_login=" + form.token(), other.token()), "another browser's token");
        assertFalse(auth.loginFormValid("a=1", form.token()), "no cookie");
        assertFalse(auth.loginFormValid(null, form.token()));
        assertFalse(auth.loginFormValid("ww_login=", ""), "both empty");
        assertFalse(auth.loginFormValid("ww_login=abc", "abc"), "equal but not a token this console makes");
        assertFalse(auth.loginFormValid("ww_session=" + form.token(), form.token()), "the wrong cookie");
    }

    @ParameterizedTest(name = "from {0}")
    @ValueSource(strings = {"127.0.0.1", "::1", "[::1]", "0:0:0:0:0:0:0:1"})
    void aTrustedProxyNamesAConfiguredPerson(String proxyAddress) {
        Session s = auth.session(null, "cai", proxyAddress).orElseThrow();
        assertEquals(new Principal("cai", Role.VIEWER, "proxy"), s.principal());
        Session next = auth.session(null, "cai", proxyAddress).orElseThrow();
        assertEquals(s.id(), next.id(), "the same session from request to request");
        assertTrue(auth.csrfValid(next, s.csrfToken()), "so a form shown in one request is accepted in the next");
        secrets.add(s.id());
        secrets.add(s.csrfToken());
    }

    @Test
    void theProxysWordOutranksACookie() {
        Session ada = login("ada", ADA_PASSWORD, HERE);
        assertEquals("cai", auth.session(cookie(ada), "cai", "127.0.0.1").orElseThrow().principal().name());
    }

    @ParameterizedTest(name = "from {0}")
    @ValueSource(strings = {"192.0.2.10", "127.0.0.2", "::2", "localhost", "", "not an address"})
    void theHeaderFromAnyOtherAddressIsIgnored(String address) {
        assertEquals(Optional.empty(), auth.session(null, "ada", address), "no session from the header alone");
        Session bryn = login("bryn", BRYN_PASSWORD, ELSEWHERE);
        assertEquals("bryn", auth.session(cookie(bryn), "ada", address).orElseThrow().principal().name(),
                "the cookie decides, not the header");
    }

    @Test
    void aProxyNamingSomeoneNotConfiguredIsRefused() {
        assertEquals(Optional.empty(), auth.session(null, "mallory", "127.0.0.1"));
        assertTrue(logs.list.stream().noneMatch(e -> e.getFormattedMessage().contains("mallory")));
    }

    @Test
    void withoutAProxyTheHeaderMeansNothing() {
        ConsoleAuth direct = new ConsoleAuth(config(null, true), clock, Map.of("WW_BRYN_HASH", BRYN_HASH)::get);
        assertEquals(Optional.empty(), direct.session(null, "ada", "127.0.0.1"));
    }

    @Test
    void aCookieThatIsNotASessionsIdFindsNothing() {
        login("ada", ADA_PASSWORD, HERE);
        for (String header : new String[] {null, "", "ww_session=", "ww_session=' OR 1=1", "ww_session=" + "A".repeat(43),
                "ww_session=" + "A".repeat(10_000)}) {
            assertEquals(Optional.empty(), auth.session(header, null, HERE), String.valueOf(header).length() + "");
        }
    }

    @Test
    void anUnsetHashVariableIsAConfigErrorAtStartNotAtLogin() {
        ConfigException e = assertThrows(ConfigException.class,
                () -> new ConsoleAuth(config(null, true), clock, Map.<String, String>of()::get));
        assertEquals("console.users[1].passwordHashEnv", e.key());
    }

    @Test
    void printedValuesHoldNoSecret() {
        Session s = login("ada", ADA_PASSWORD, HERE);
        ConsoleAuth.LoginForm form = auth.loginForm();
        List<String> printed = List.of(s.toString(), new ConsoleAuth.LoginResult.LoggedIn(s).toString(),
                form.toString(), config(PROXY, true).toString(), config(PROXY, true).users().get(0).toString());
        for (String p : printed) {
            for (String secret : List.of(s.id(), s.csrfToken(), form.token(), ADA_HASH, "argon2")) {
                assertFalse(p.contains(secret), p);
            }
        }
        assertEquals("Session[ada, releaser, since 2026-03-02T09:00:00Z]", s.toString());
        assertEquals("LoginForm[...]", form.toString());
    }
}
