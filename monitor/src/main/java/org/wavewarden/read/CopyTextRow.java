package org.wavewarden.read;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;

/**
 * Splits one row of PostgreSQL's COPY text format into fields, undoing its backslash escapes.
 * {@code \N} (unescaped) is SQL NULL and comes back as {@code null}.
 */
final class CopyTextRow {

    private CopyTextRow() {
    }

    /** Fills {@code out} with the row's fields; returns how many there were. */
    static int split(byte[] row, String[] out) {
        int end = row.length;
        if (end > 0 && row[end - 1] == '\n') {
            end--;
        }
        int field = 0;
        int start = 0;
        for (int i = 0; i <= end; i++) {
            if (i == end || row[i] == '\t') {
                if (field < out.length) {
                    out[field] = decode(row, start, i);
                }
                field++;
                start = i + 1;
            }
        }
        return field;
    }

    static String decode(byte[] b, int from, int to) {
        if (to - from == 2 && b[from] == '\\' && b[from + 1] == 'N') {
            return null;
        }
        int backslash = -1;
        for (int i = from; i < to; i++) {
            if (b[i] == '\\') {
                backslash = i;
                break;
            }
        }
        if (backslash < 0) {
            return new String(b, from, to - from, StandardCharsets.UTF_8);
        }
        ByteArrayOutputStream o = new ByteArrayOutputStream(to - from);
        for (int i = from; i < to; i++) {
            byte c = b[i];
            if (c != '\\' || i + 1 >= to) {
                o.write(c);
                continue;
            }
            byte e = b[++i];
            switch (e) {
                case 'b' -> o.write('\b');
                case 'f' -> o.write('\f');
                case 'n' -> o.write('\n');
                case 'r' -> o.write('\r');
                case 't' -> o.write('\t');
                case 'v' -> o.write(0x0B);
                case 'x' -> {
                    int v = 0;
                    int k = 0;
                    while (k < 2 && i + 1 < to && Character.digit(b[i + 1], 16) >= 0) {
                        v = v * 16 + Character.digit(b[++i], 16);
                        k++;
                    }
                    o.write(v);
                }
                default -> {
                    if (e >= '0' && e <= '7') {
                        int v = e - '0';
                        int k = 1;
                        while (k < 3 && i + 1 < to && b[i + 1] >= '0' && b[i + 1] <= '7') {
                            v = v * 8 + (b[++i] - '0');
                            k++;
                        }
                        o.write(v);
                    } else {
                        o.write(e);
                    }
                }
            }
        }
        return o.toString(StandardCharsets.UTF_8);
    }
}
