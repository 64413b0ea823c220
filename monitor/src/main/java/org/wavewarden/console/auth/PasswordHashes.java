package org.wavewarden.console.auth;

import org.springframework.security.crypto.argon2.Argon2PasswordEncoder;

import java.nio.CharBuffer;
import java.util.concurrent.Semaphore;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Console passwords as Argon2id hashes (RFC 9106), made and checked by Spring Security Crypto's encoder, in the
 * encoded form {@code $argon2id$v=19$m=<KiB>,t=<passes>,p=<lanes>$<salt>$<tag>}. A check reads its cost from the
 * stored hash, so hashes made with other parameters keep working.
 */
public final class PasswordHashes {

    /**
     * RFC 9106 section 4, second recommended option for memory-constrained settings: 64 MiB, 3 passes, 4 lanes, a
     * 128-bit salt and a 256-bit tag. One check took about 0.6 s on the build machine; a login is rare and the
     * failed-login limit keeps the number of checks small.
     */
    static final int MEMORY_KIB = 1 << 16;
    static final int PASSES = 3;
    static final int LANES = 4;
    static final int SALT_BYTES = 16;
    static final int TAG_BYTES = 32;

    /**
     * The largest memory a stored hash may ask for, so that a mistyped hash cannot make each login allocate more
     * than a daemon has (1 GiB; common practice, no source).
     */
    static final long MAX_MEMORY_KIB = 1L << 20;

    private static final Argon2PasswordEncoder ENCODER =
            new Argon2PasswordEncoder(SALT_BYTES, TAG_BYTES, LANES, MEMORY_KIB, PASSES);

    // Each check holds its memory until it ends; a burst of logins from many addresses waits here rather than
    // holding many times 64 MiB at once.
    private static final Semaphore CHECKS = new Semaphore(2, true);

    /** Hash checks carried out since start; the tests read it to see that an unknown name costs one too. */
    static final java.util.concurrent.atomic.AtomicLong CHECKS_DONE = new java.util.concurrent.atomic.AtomicLong();

    // The encoder writes base64 without padding; the version is 0x13 = 19, the only one RFC 9106 defines.
    private static final Pattern ENCODED = Pattern.compile(
            "\\$argon2id\\$v=19\\$m=(\\d{1,10}),t=(\\d{1,10}),p=(\\d{1,8})\\$([A-Za-z0-9+/]+)\\$([A-Za-z0-9+/]+)");

    private PasswordHashes() {
    }

    /** A new encoded hash of {@code password} with a fresh random salt. */
    public static String encode(char[] password) {
        return ENCODER.encode(CharBuffer.wrap(password));
    }

    /** Whether {@code password} is the one {@code encoded} was made from; false for a hash that is not well formed. */
    public static boolean matches(char[] password, String encoded) {
        if (encoded == null || problem(encoded) != null) {
            return false;
        }
        CHECKS.acquireUninterruptibly();
        try {
            CHECKS_DONE.incrementAndGet();
            return ENCODER.matches(CharBuffer.wrap(password), encoded);
        } finally {
            CHECKS.release();
        }
    }

    /**
     * What is wrong with {@code encoded} as a stored hash, as a phrase that never repeats it (a value in a
     * password's place would otherwise land in a log or on a terminal), or null when it is a usable Argon2id hash.
     * Bounds from RFC 9106 section 3.1: at least 8 bytes of salt, a tag of at least 4 bytes, 1 to 2^24-1 lanes,
     * at least 8 KiB of memory per lane, at least one pass.
     */
    public static String problem(String encoded) {
        String expected = "; expected the encoded Argon2id hash printed by wavewarden console-password"
                + " ($argon2id$v=19$m=...,t=...,p=...$salt$hash)";
        if (encoded.startsWith("$argon2i$") || encoded.startsWith("$argon2d$")) {
            return "is an Argon2i or Argon2d hash, not Argon2id" + expected;
        }
        Matcher m = ENCODED.matcher(encoded);
        if (!m.matches()) {
            return "is not an encoded Argon2id hash (the value is not shown)" + expected;
        }
        long memory = Long.parseLong(m.group(1));
        long passes = Long.parseLong(m.group(2));
        long lanes = Long.parseLong(m.group(3));
        if (lanes < 1 || lanes > (1 << 24) - 1 || passes < 1 || memory < 8 * lanes) {
            return "has Argon2 parameters outside RFC 9106's bounds (at least 1 pass, 1 lane and 8 KiB per lane)";
        }
        if (memory > MAX_MEMORY_KIB) {
            return "asks for more than 1 GiB of memory per check (m=" + memory + ")";
        }
        if (decodedLength(m.group(4)) < 8 || decodedLength(m.group(5)) < 4) {
            return "has a salt shorter than 8 bytes or a hash shorter than 4 bytes";
        }
        return null;
    }

    private static int decodedLength(String unpaddedBase64) {
        return unpaddedBase64.length() * 3 / 4;
    }
}
