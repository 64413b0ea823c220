package org.wavewarden.config;

import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.function.Function;

/**
 * Reading an enum constant from the spelling a person types: its key (e.g. {@code planned-change}) or its Java name
 * ({@code PLANNED_CHANGE}), in any case and with surrounding blanks ignored, and the list of keys to show when the
 * text is none of them. One rule for every such enum, so that the configuration, the command line and the results
 * schema accept the same spellings.
 */
public final class EnumKeys {

    private EnumKeys() {
    }

    /**
     * The constant of {@code type} whose key or name is {@code text}; empty for null or any other text.
     *
     * @param key the constant's key as people write it
     */
    public static <E extends Enum<E>> Optional<E> parse(Class<E> type, Function<E, String> key, String text) {
        if (text == null) {
            return Optional.empty();
        }
        // Lower-cased under the root locale, not equalsIgnoreCase: that would also take a dotless i for an i.
        String t = lower(text.strip());
        return Arrays.stream(type.getEnumConstants())
                .filter(e -> lower(key.apply(e)).equals(t) || lower(e.name()).equals(t))
                .findFirst();
    }

    private static String lower(String s) {
        return s.toLowerCase(Locale.ROOT);
    }

    /** The keys of {@code type} in declaration order, for error messages and suggestions. */
    public static <E extends Enum<E>> List<String> keys(Class<E> type, Function<E, String> key) {
        return Arrays.stream(type.getEnumConstants()).map(key).toList();
    }

    /** The keys joined with commas, as an error message lists the choices. */
    public static <E extends Enum<E>> String listed(Class<E> type, Function<E, String> key) {
        return String.join(", ", keys(type, key));
    }
}
