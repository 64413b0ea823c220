package org.wavewarden.db;

import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConnectionConfig;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;

/** Resolves a connection's password from where the config says it lives. The value itself is never logged. */
public final class Secrets {

    private Secrets() {
    }

    public static String password(ConnectionConfig c, String key, Map<String, String> env) {
        if (c.passwordEnv() != null) {
            String v = env.get(c.passwordEnv());
            if (v == null) {
                throw new ConfigException(key + ".passwordEnv", "environment variable " + c.passwordEnv()
                        + " is not set");
            }
            return v;
        }
        if (c.passwordFile() != null) {
            try {
                String text = Files.readString(Path.of(c.passwordFile()), StandardCharsets.UTF_8);
                int nl = text.indexOf('\n');
                return (nl < 0 ? text : text.substring(0, nl)).strip();
            } catch (IOException e) {
                throw new ConfigException(key + ".passwordFile", "cannot read the password file: "
                        + e.getClass().getSimpleName());
            }
        }
        return null;
    }
}
