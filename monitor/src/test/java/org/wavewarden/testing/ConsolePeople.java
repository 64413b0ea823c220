package org.wavewarden.testing;

/** Password hashes for the console's people in tests, made as the {@code console-password} command makes them. */
public final class ConsolePeople {

    private ConsolePeople() {
    }

    /**
     * An Argon2id hash by Spring Security Crypto's encoder, the one the console checks passwords with (looked up by
     * name, so the tests compile whether or not the dependency is on the classpath yet).
     */
    public static String hash(String password) throws ReflectiveOperationException {
        Class<?> encoder = Class.forName("org.springframework.security.crypto.argon2.Argon2PasswordEncoder");
        Object e = encoder.getMethod("defaultsForSpringSecurity_v5_8").invoke(null);
        return (String) encoder.getMethod("encode", CharSequence.class).invoke(e, password);
    }
}
