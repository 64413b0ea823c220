package org.wavewarden.config;

/**
 * A configuration that cannot be used, with the key that is wrong and what was expected there.
 * The CLI turns it into exit code 2 and one line: {@code config error at <key>: <message>}.
 */
public final class ConfigException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    private final String key;

    public ConfigException(String key, String message) {
        super(key + ": " + message);
        this.key = key;
    }

    /** The dotted path of the offending key, e.g. {@code datasets[0].variables[3].kind}. */
    public String key() {
        return key;
    }

    public String problem() {
        return getMessage().substring(key.length() + 2);
    }
}
