package org.wavewarden.deliver.sink;

import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class SignaturesTest {

    private static byte[] bytes(String s) {
        return s.getBytes(StandardCharsets.UTF_8);
    }

    @Test
    void hmacMatchesRfc4231TestCase2() {
        // RFC 4231, section 4.3 (test case 2): key "Jefe", data "what do ya want for nothing?", HMAC-SHA-256.
        assertEquals("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843",
                Signatures.hmacSha256Hex(bytes("what do ya want for nothing?"), "Jefe"));
    }

    @Test
    void hmacMatchesRfc4231TestCase1() {
        // RFC 4231, section 4.2 (test case 1): key 20 bytes of 0x0b, data "Hi There", HMAC-SHA-256.
        assertEquals("b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7",
                Signatures.hmacSha256Hex(bytes("Hi There"), "\u000b".repeat(20)));
    }

    @Test
    void sha256MatchesFips180ExampleAbc() {
        // FIPS 180-4 examples (one-block message "abc"), SHA-256.
        assertEquals("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", Signatures.sha256Hex("abc"));
    }

    @Test
    void verifyAcceptsOnlyTheExactBodyUnderTheRightSecret() {
        byte[] body = bytes("{\"a\":1}");
        String header = Signatures.SCHEME + Signatures.hmacSha256Hex(body, "s3cret-s3cret-s3cret");
        assertTrue(Signatures.verify(body, "s3cret-s3cret-s3cret", header));
        assertFalse(Signatures.verify(bytes("{\"a\":2}"), "s3cret-s3cret-s3cret", header));
        assertFalse(Signatures.verify(body, "other-secret-other", header));
        assertFalse(Signatures.verify(body, "s3cret-s3cret-s3cret", header.substring(Signatures.SCHEME.length())));
        assertFalse(Signatures.verify(body, "s3cret-s3cret-s3cret", null));
    }

    @Test
    void emptySecretIsRefusedNamingTheArgument() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Signatures.hmacSha256Hex(bytes("x"), ""));
        assertTrue(e.getMessage().startsWith("secret:"), e.getMessage());
    }
}
