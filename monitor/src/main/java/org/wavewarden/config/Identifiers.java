package org.wavewarden.config;

import java.util.regex.Pattern;

/**
 * Checks and quotes SQL identifiers that come from configuration.
 *
 * <p>Configured names are never pasted into SQL as they are: each must be a plain identifier (letters, digits,
 * underscore, not starting with a digit, at most 63 bytes as PostgreSQL allows), and it is always emitted
 * double-quoted. Anything else, such as {@code x"; DROP TABLE t; --}, is refused with the key that carried it.
 */
public final class Identifiers {

    private static final Pattern PLAIN = Pattern.compile("[A-Za-z_][A-Za-z0-9_]{0,62}");

    private Identifiers() {
    }

    public static boolean isPlain(String name) {
        return name != null && PLAIN.matcher(name).matches();
    }

    /** Validates a single identifier or fails naming {@code key}. */
    public static String require(String key, String name) {
        if (!isPlain(name)) {
            throw new ConfigException(key, "expected a plain SQL identifier (letters, digits and _, not starting"
                    + " with a digit, at most 63 characters) but got " + Text.show(name));
        }
        return name;
    }

    /** Double-quotes an identifier already known to be plain. */
    public static String quote(String name) {
        if (!isPlain(name)) {
            throw new IllegalArgumentException("refusing to quote unchecked identifier " + Text.show(name));
        }
        return '"' + name + '"';
    }

    /** A table name as {@code schema.table} or {@code table}, validated part by part. */
    public record TableName(String schema, String table) {

        public static TableName parse(String key, String qualified) {
            if (qualified == null) {
                throw new ConfigException(key, "expected a table name such as survey.household_wave");
            }
            String[] parts = qualified.split("\\.", -1);
            if (parts.length == 1) {
                return new TableName("public", require(key, parts[0]));
            }
            if (parts.length == 2) {
                return new TableName(require(key, parts[0]), require(key, parts[1]));
            }
            throw new ConfigException(key, "expected schema.table but got " + Text.show(qualified));
        }

        public String quoted() {
            return quote(schema) + "." + quote(table);
        }

        @Override
        public String toString() {
            return schema + "." + table;
        }
    }

    /** Small text helpers for messages. */
    static final class Text {
        private Text() {
        }

        static String show(String s) {
            if (s == null) {
                return "nothing";
            }
            String cut = s.length() > 80 ? s.substring(0, 80) + "..." : s;
            return "'" + cut + "'";
        }
    }
}
