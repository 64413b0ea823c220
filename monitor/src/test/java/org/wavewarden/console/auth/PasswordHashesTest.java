package org.wavewarden.console.auth;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.springframework.security.crypto.argon2.Argon2PasswordEncoder;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The stored form of a console password: Argon2id, the variant RFC 9106 recommends (section 4: "Argon2id MUST be
 * supported"), with the parameters of its second recommended option, and one that the library's own matcher and
 * the reference implementation agree on.
 */
class PasswordHashesTest {

    @Test
    void aNewHashIsArgon2idWithRfc9106sSecondOptionAndAFreshSalt() {
        String hash = PasswordHashes.encode("tide-gauge-42".toCharArray());
        // RFC 9106 section 4, second recommended option: t=3 passes, p=4 lanes, m=64 MiB; 128-bit salt, 256-bit tag.
        assertTrue(hash.startsWith("$argon2id$v=19$m=65536,t=3,p=4$"), hash);
        String[] parts = hash.split("\\$");
        assertTrue(parts[4].length() == 22 && parts[5].length() == 43, "16 bytes of salt and a 32-byte tag in"
                + " unpadded base64: " + hash);
        assertNull(PasswordHashes.problem(hash));
        assertNotEquals(hash, PasswordHashes.encode("tide-gauge-42".toCharArray()), "each hash has its own salt");
    }

    @Test
    void theLibrarysOwnMatcherVerifiesOurHash() {
        String hash = PasswordHashes.encode("tide-gauge-42".toCharArray());
        // A separately made encoder with other defaults: the check reads its parameters from the stored hash.
        Argon2PasswordEncoder library = Argon2PasswordEncoder.defaultsForSpringSecurity_v5_8();
        assertTrue(library.matches("tide-gauge-42", hash));
        assertFalse(library.matches("tide-gauge-43", hash));
        assertTrue(PasswordHashes.matches("tide-gauge-42".toCharArray(), hash));
        assertFalse(PasswordHashes.matches("tide-gauge-43".toCharArray(), hash));
    }

    /**
     * Hashes made outside the project by the reference implementation of RFC 9106: the {@code argon2} command
     * 0~20171227-0.3+deb12u1 (Debian package argon2), as {@code printf '%s' PASSWORD | argon2 SALT -id -t T -m LOG2KIB
     * -p P -l 32 -e}.
     */
    @ParameterizedTest(name = "{0}: {1}")
    @CsvSource(delimiter = '|', value = {
            // argon2 harrowmere-salt1 -id -t 3 -m 16 -p 4 -l 32 -e (argon2 0~20171227, Debian)
            "tide-gauge-42 | $argon2id$v=19$m=65536,t=3,p=4$aGFycm93bWVyZS1zYWx0MQ$NZC3G8YMCbXsQ02UCdQ6PWfnQI8aoBp2yxtEC4zjEWI",
            // argon2 harrowmere-salt1 -id -t 2 -m 12 -p 1 -l 32 -e (argon2 0~20171227, Debian)
            "tide-gauge-42 | $argon2id$v=19$m=4096,t=2,p=1$aGFycm93bWVyZS1zYWx0MQ$iyEGAJqdemM6RYdwib3/Fs+P5DaweDA4CrsdCwtPkeg",
            // argon2 moor-lark-salt -id -t 3 -m 16 -p 4 -l 32 -e, password in UTF-8 (argon2 0~20171227, Debian)
            "Wåve-ørd 2026 | $argon2id$v=19$m=65536,t=3,p=4$bW9vci1sYXJrLXNhbHQ$s75wy9/z7MkqaQlr1UNkn5V/xyJW/l/P12VRkkQ68gI"})
    void aHashFromTheReferenceImplementationIsVerified(String password, String referenceHash) {
        assertNull(PasswordHashes.problem(referenceHash));
        assertTrue(PasswordHashes.matches(password.toCharArray(), referenceHash));
        assertFalse(PasswordHashes.matches((password + " ").toCharArray(), referenceHash));
    }

    @Test
    void aHashThatIsNotWellFormedNeverMatches() {
        assertFalse(PasswordHashes.matches("tide-gauge-42".toCharArray(), "tide-gauge-42"));
        assertFalse(PasswordHashes.matches("tide-gauge-42".toCharArray(), null));
    }
}
