package org.wavewarden.deliver.sink;

import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import java.nio.charset.StandardCharsets;
import java.security.InvalidKeyException;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.Objects;

/**
 * Digests and message authentication codes for alert delivery: SHA-256 (FIPS 180-4) for idempotency keys and
 * HMAC-SHA256 (RFC 2104, test vectors in RFC 4231) for webhook signatures. Output is lower-case hexadecimal.
 */
public final class Signatures {

    /** The prefix of the signature header value, naming the algorithm so that it can change later. */
    public static final String SCHEME = "sha256=";

    private Signatures() {
    }

    /** SHA-256 of the UTF-8 bytes of {@code text}, as 64 lower-case hex digits. */
    public static String sha256Hex(String text) {
        Objects.requireNonNull(text, "text");
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256")
                    .digest(text.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is missing from this Java runtime", e);
        }
    }

    /** HMAC-SHA256 of {@code body} keyed with the UTF-8 bytes of {@code secret}, as 64 lower-case hex digits. */
    public static String hmacSha256Hex(byte[] body, String secret) {
        Objects.requireNonNull(body, "body");
        return HexFormat.of().formatHex(mac(key(secret)).doFinal(body));
    }

    /**
     * True when {@code header} is {@code sha256=<hex>} and the hex is the HMAC of {@code body} under {@code secret}.
     * The comparison takes the same time wherever the first difference is, so a receiver using it leaks nothing
     * about the expected value.
     */
    public static boolean verify(byte[] body, String secret, String header) {
        Objects.requireNonNull(body, "body");
        if (header == null || !header.startsWith(SCHEME)) {
            return false;
        }
        byte[] expected = (SCHEME + hmacSha256Hex(body, secret)).getBytes(StandardCharsets.US_ASCII);
        return MessageDigest.isEqual(expected, header.getBytes(StandardCharsets.US_ASCII));
    }

    /** The secret as a MAC key; callers keep this rather than the string so the text is not held twice. */
    static SecretKeySpec key(String secret) {
        if (secret == null || secret.isEmpty()) {
            throw new IllegalArgumentException("secret: expected a non-empty shared secret");
        }
        return new SecretKeySpec(secret.getBytes(StandardCharsets.UTF_8), "HmacSHA256");
    }

    static String hmacSha256Hex(byte[] body, SecretKeySpec key) {
        return HexFormat.of().formatHex(mac(key).doFinal(body));
    }

    private static Mac mac(SecretKeySpec key) {
        try {
            Mac mac = Mac.getInstance("HmacSHA256");
            mac.init(key);
            return mac;
        } catch (NoSuchAlgorithmException | InvalidKeyException e) {
            // The message names the algorithm only: the key must never reach an exception text.
            throw new IllegalStateException("HmacSHA256 is unavailable in this Java runtime");
        }
    }
}
