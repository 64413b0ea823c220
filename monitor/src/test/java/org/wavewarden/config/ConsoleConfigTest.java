package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.review.Role;

import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The {@code console} section: who may log in and with which role, a trusted proxy, and how long sessions and
 * failed-login refusals last. A good section gives these values, a missing one leaves the console off, and each bad
 * value is refused with its full key path; a password hash that is not one is refused without being repeated.
 */
class ConsoleConfigTest {

    static final String HEAD = """
            source:
              jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey"
              user: reader
            datasets:
              - name: household
                table: survey.household_wave
                waveColumn: wave
                variables:
                  - {name: age, kind: continuous, unit: years}
            """;

    /** Made by wavewarden console-password from a password of the test's own. */
    static final String HASH =
            "$argon2id$v=19$m=65536,t=3,p=4$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q";

    static final String GOOD = """
            console:
              enabled: true
              users:
                - {name: ada.hartley, role: releaser, passwordHash: "%1$s"}
                - {name: Bryn Ellery, role: steward, passwordHashEnv: WW_BRYN_HASH}
                - {name: cai, role: viewer}
              proxy:
                userHeader: X-Forwarded-User
                trustedAddresses: ["127.0.0.1", "::1"]
              sessionMinutes: 240
              idleMinutes: 20
              secureCookie: false
              loginFailures: 3
              lockoutMinutes: 10
            """.formatted(HASH);

    static ConsoleConfig console(String section) {
        return ConfigLoader.parse(HEAD + section).console();
    }

    @Test
    void aFullSectionGivesItsPeopleProxyAndLimits() {
        ConsoleConfig c = console(GOOD);
        assertTrue(c.enabled());
        assertEquals(List.of("ada.hartley", "Bryn Ellery", "cai"), c.users().stream().map(ConsoleConfig.User::name)
                .toList());
        assertEquals(List.of(Role.RELEASER, Role.STEWARD, Role.VIEWER), c.users().stream()
                .map(ConsoleConfig.User::role).toList());
        assertEquals(HASH, c.users().get(0).passwordHash());
        assertEquals("WW_BRYN_HASH", c.users().get(1).passwordHashEnv());
        assertNull(c.users().get(2).passwordHash(), "a person who only comes through the proxy has no hash");
        assertEquals(new ConsoleConfig.Proxy("X-Forwarded-User", List.of("127.0.0.1", "::1")), c.proxy());
        assertEquals(Duration.ofHours(4), c.sessionLength());
        assertEquals(Duration.ofMinutes(20), c.idleTimeout());
        assertFalse(c.secureCookie());
        assertEquals(3, c.loginFailures());
        assertEquals(Duration.ofMinutes(10), c.lockout());
    }

    @Test
    void withoutTheSectionTheConsoleIsOff() {
        assertSame(ConsoleConfig.DISABLED, ConfigLoader.parse(HEAD).console());
        assertFalse(ConfigLoader.parse(HEAD).console().enabled());
    }

    @Test
    void aShortSectionKeepsTheDefaults() {
        ConsoleConfig c = console("""
                console:
                  enabled: true
                  users: [{name: ada, role: viewer, passwordHash: "%s"}]
                """.formatted(HASH));
        assertEquals(Duration.ofHours(8), c.sessionLength());
        assertEquals(Duration.ofMinutes(30), c.idleTimeout());
        assertTrue(c.secureCookie(), "the Secure flag is on unless turned off");
        assertEquals(5, c.loginFailures());
        assertEquals(Duration.ofMinutes(15), c.lockout());
        assertNull(c.proxy());
    }

    static Stream<Arguments> badValues() {
        String u = "console:\n  users:\n";
        String ada = "    - {name: ada, role: releaser, passwordHash: \"" + HASH + "\"}\n";
        String proxy = "  proxy:\n    userHeader: X-Forwarded-User\n";
        return Stream.of(
                Arguments.of(u + ada + "    - {name: bryn, role: admin, passwordHash: \"" + HASH + "\"}\n",
                        "console.users[1].role", "expected one of viewer, steward, releaser but got 'admin'"),
                Arguments.of(u + ada + "    - {name: bryn, role: Steward, passwordHash: \"" + HASH + "\"}\n",
                        "console.users[1].role", "expected one of viewer, steward, releaser"),
                Arguments.of(u + ada + "    - {name: bryn, passwordHash: \"" + HASH + "\"}\n",
                        "console.users[1].role", "missing"),
                Arguments.of(u + ada + "    - {name: cai, role: viewer, passwordHash: \"" + HASH + "\"}\n" + ada,
                        "console.users[2].name", "user name 'ada' is already given at console.users[0]"),
                Arguments.of(u + "    - {name: \"<b>ada</b>\", role: viewer, passwordHash: \"" + HASH + "\"}\n",
                        "console.users[0].name", "expected 1 to 64 letters"),
                Arguments.of(u + "    - {name: \" ada\", role: viewer, passwordHash: \"" + HASH + "\"}\n",
                        "console.users[0].name", "starting and ending with a letter or digit"),
                Arguments.of(u + "    - {role: viewer, passwordHash: \"" + HASH + "\"}\n",
                        "console.users[0].name", "missing"),
                Arguments.of(u + "    - {name: ada, role: viewer, password: tide}\n",
                        "console.users[0].password", "passwords are never written in the config"),
                Arguments.of(u + "    - {name: ada, role: viewer, passwordHash: \"" + HASH
                                + "\", passwordHashEnv: ADA_HASH}\n",
                        "console.users[0].passwordHashEnv", "give passwordHash or passwordHashEnv, not both"),
                Arguments.of(u + "    - {name: ada, role: viewer, passwordHashEnv: \"1-ADA\"}\n",
                        "console.users[0].passwordHashEnv", "expected an environment variable name"),
                Arguments.of(u + "    - {name: ada, role: viewer}\n",
                        "console.users[0]", "give passwordHash or passwordHashEnv"),
                Arguments.of(u + "    - {name: ada, role: viewer, passwordHash: \"$argon2id$v=19$m=4194304,t=3,p=4"
                                + "$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q\"}\n",
                        "console.users[0].passwordHash", "more than 1 GiB of memory"),
                Arguments.of(u + "    - {name: ada, role: viewer, passwordHash: \"$argon2id$v=19$m=65536,t=0,p=4"
                                + "$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q\"}\n",
                        "console.users[0].passwordHash", "outside RFC 9106's bounds"),
                Arguments.of(u + "    - {name: ada, role: viewer, passwordHash: \"$argon2id$v=19$m=65536,t=3,p=4"
                                + "$c2FsdA$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q\"}\n",
                        "console.users[0].passwordHash", "a salt shorter than 8 bytes"),
                Arguments.of("console:\n  users: {name: ada}\n", "console.users", "expected a list"),
                Arguments.of("console:\n  enabled: true\n", "console.users", "an enabled console needs at least"),
                Arguments.of("console:\n  enabled: \"yes\"\n", "console.enabled", "expected true or false"),
                Arguments.of(u + ada + "  sessionMinute: 60\n", "console.sessionMinute",
                        "unknown key; did you mean 'sessionMinutes'?"),
                Arguments.of(u + ada + "  sessionMinutes: 0\n", "console.sessionMinutes",
                        "expected a whole number from 1 to 10080 but got 0"),
                Arguments.of(u + ada + "  sessionMinutes: 60\n  idleMinutes: 90\n", "console.idleMinutes",
                        "expected at most sessionMinutes (60)"),
                Arguments.of(u + ada + "  idleMinutes: 12.5\n", "console.idleMinutes", "expected a whole number"),
                Arguments.of(u + ada + "  secureCookie: 1\n", "console.secureCookie", "expected true or false"),
                Arguments.of(u + ada + "  loginFailures: 0\n", "console.loginFailures",
                        "expected a whole number from 1 to 1000"),
                Arguments.of(u + ada + "  lockoutMinutes: -5\n", "console.lockoutMinutes",
                        "expected a whole number from 1 to 1440"),
                Arguments.of(u + ada + "  lockoutMinutes: ten\n", "console.lockoutMinutes", "expected a number"),
                Arguments.of(u + ada + proxy + "    trustedAddresses: [\"127.0.0.1\", proxy.harrowmere.example]\n",
                        "console.proxy.trustedAddresses[1]", "expected an IPv4 or IPv6 address (no host name"),
                Arguments.of(u + ada + proxy + "    trustedAddresses: [\"10.0.0.0/8\"]\n",
                        "console.proxy.trustedAddresses[0]", "no range"),
                Arguments.of(u + ada + proxy + "    trustedAddresses: [\"256.1.1.1\"]\n",
                        "console.proxy.trustedAddresses[0]", "expected an IPv4 or IPv6 address"),
                Arguments.of(u + ada + proxy, "console.proxy.trustedAddresses", "missing"),
                Arguments.of(u + ada + "  proxy:\n    userHeader: \"X User\"\n    trustedAddresses: [\"::1\"]\n",
                        "console.proxy.userHeader", "expected an HTTP header name"),
                Arguments.of(u + ada + "  proxy:\n    trustedAddresses: [\"::1\"]\n",
                        "console.proxy.userHeader", "missing"),
                Arguments.of(u + ada + proxy + "    trustedAddresses: [\"::1\"]\n    allow: all\n",
                        "console.proxy.allow", "unknown key"));
    }

    @ParameterizedTest(name = "{1}: {2}")
    @MethodSource("badValues")
    void aBadValueIsRefusedWithItsKeyPath(String section, String key, String message) {
        ConfigException e = assertThrows(ConfigException.class, () -> console(section));
        assertEquals(key, e.key(), e.getMessage());
        assertTrue(e.problem().contains(message), e.getMessage());
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {
            "tide-gauge-42",
            "$2a$10$N9qo8uLOickgx2ZMRZoMyeIjZAgcfl7p92ldGxad68LJZdL17lhWy",
            "$argon2i$v=19$m=65536,t=3,p=4$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q",
            "{argon2}$argon2id$v=19$m=65536,t=3,p=4$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrW",
            "$argon2id$v=16$m=65536,t=3,p=4$vILHLDBrSI/kQD28zdaN1g$ZZKMwHzAgPgWJy7IqKK8+W+c9cCUTgFdbrWKgyOfQ7Q"})
    void aValueThatIsNoArgon2idHashIsRefusedWithoutBeingRepeated(String notAHash) {
        String section = "console:\n  users:\n    - name: ada\n      role: viewer\n      passwordHash: '"
                + notAHash + "'\n";
        ConfigException e = assertThrows(ConfigException.class, () -> console(section));
        assertEquals("console.users[0].passwordHash", e.key());
        assertTrue(e.problem().contains("Argon2id"), e.getMessage());
        assertFalse(e.getMessage().contains(notAHash), "the value may be a password: " + e.getMessage());
        // Not even the part after the parameters, which is the secret-looking part of a hash.
        assertFalse(e.getMessage().contains("ZZKMwHzAgPgW") || e.getMessage().contains("tide-gauge"),
                e.getMessage());
    }

    @Test
    void aHashFromTheEnvironmentIsReadAndCheckedWithTheVariablesKeyPath() {
        ConsoleConfig c = console(GOOD);
        ConsoleConfig resolved = c.withHashesFrom(Map.of("WW_BRYN_HASH", HASH + "\n")::get);
        assertEquals(HASH, resolved.users().get(1).passwordHash(), "read and stripped of its line end");
        assertEquals(HASH, resolved.users().get(0).passwordHash(), "an inline hash is kept");

        ConfigException unset = assertThrows(ConfigException.class, () -> c.withHashesFrom(Map.<String,
                String>of()::get));
        assertEquals("console.users[1].passwordHashEnv", unset.key());
        assertTrue(unset.problem().contains("WW_BRYN_HASH is not set"), unset.getMessage());

        ConfigException plain = assertThrows(ConfigException.class,
                () -> c.withHashesFrom(Map.of("WW_BRYN_HASH", "lantern-ferry-7")::get));
        assertEquals("console.users[1].passwordHashEnv", plain.key());
        assertFalse(plain.getMessage().contains("lantern-ferry-7"), plain.getMessage());
    }

    @Test
    void theConsoleSettingsDoNotChangeTheConfigFingerprint() {
        // The fingerprint says under which rules a wave was judged; who may read the results is not one of them.
        WardenConfig without = ConfigLoader.parse(HEAD);
        WardenConfig with = ConfigLoader.parse(HEAD + GOOD);
        WardenConfig other = ConfigLoader.parse(HEAD + GOOD.replace("releaser", "viewer")
                .replace("sessionMinutes: 240", "sessionMinutes: 60").replace("enabled: true", "enabled: false"));
        String fingerprint = ConfigFingerprint.of(without, without.dataset("household"));
        assertEquals(fingerprint, ConfigFingerprint.of(with, with.dataset("household")));
        assertEquals(fingerprint, ConfigFingerprint.of(other, other.dataset("household")));
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"ada", "ada.hartley", "Bryn Ellery", "o'neill", "María-José", "s3@harrowmere"})
    void namesPeopleActuallyHaveAreAccepted(String name) {
        ConsoleConfig c = console("console:\n  users:\n    - {name: \"" + name + "\", role: viewer, passwordHash: \""
                + HASH + "\"}\n");
        assertEquals(name, c.users().get(0).name());
    }

    @Test
    void aUserPrintsWithoutItsHash() {
        ConsoleConfig.User u = console(GOOD).users().get(0);
        assertEquals("User[name=ada.hartley, role=releaser]", u.toString());
        assertFalse(u.toString().contains("argon2"));
    }
}
