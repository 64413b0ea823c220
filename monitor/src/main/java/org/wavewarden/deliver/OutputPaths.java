package org.wavewarden.deliver;

import org.wavewarden.deliver.sink.Signatures;

import java.nio.file.Path;

/**
 * File and folder names made from data (wave labels, dataset names). A label comes from the source table and can
 * hold anything: {@code ../../x}, an absolute path, nothing, a newline. It is never used as a path itself: the name
 * is a readable safe part (letters, digits, dot, dash and underscore kept, everything else an underscore, at most
 * {@value #READABLE} characters, no leading dot) followed by a dash and the first 8 hex digits of the SHA-256 of
 * the label's UTF-8 bytes. The hash keeps labels that differ only in unsafe characters apart ({@code a/b} and
 * {@code a_b}), and the same label always gets the same name, so a rerun writes into the same folder.
 */
public final class OutputPaths {

    static final int READABLE = 48;
    private static final int HASH_HEX = 8;

    private OutputPaths() {
    }

    /** The folder or file name for a label; never empty, never {@code .} or {@code ..}, never a separator. */
    public static String name(String label) {
        String l = label == null ? "" : label;
        StringBuilder sb = new StringBuilder(Math.min(l.length(), READABLE));
        l.codePoints().limit(READABLE).forEach(c -> sb.append(c < 128 && (Character.isLetterOrDigit(c) || c == '.'
                || c == '-' || c == '_') ? (char) c : '_'));
        // A leading dot would hide the folder and would let ".." through as a name of its own.
        for (int i = 0; i < sb.length() && sb.charAt(i) == '.'; i++) {
            sb.setCharAt(i, '_');
        }
        String readable = sb.length() == 0 ? "_" : sb.toString();
        return readable + "-" + Signatures.sha256Hex(l).substring(0, HASH_HEX);
    }

    /**
     * {@code parent/name(label)} (relative when {@code parent} is), checked to lie directly under {@code parent} before anything is written there.
     *
     * @throws IllegalArgumentException if the name would leave the folder (which {@link #name} rules out)
     */
    public static Path under(Path parent, String label) {
        Path child = parent.resolve(name(label));
        Path base = parent.toAbsolutePath().normalize();
        Path resolved = child.toAbsolutePath().normalize();
        if (!resolved.startsWith(base) || !base.equals(resolved.getParent())) {
            throw new IllegalArgumentException("label: its folder " + resolved + " is not directly under " + base);
        }
        return child;
    }

    /** The folder of one wave of one dataset under an output folder: {@code outputDir/<dataset>/<wave>}. */
    public static Path wave(Path outputDir, String dataset, String wave) {
        return under(under(outputDir, dataset), wave);
    }
}
