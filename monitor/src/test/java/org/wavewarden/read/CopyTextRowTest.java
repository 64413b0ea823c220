package org.wavewarden.read;

import org.junit.jupiter.api.Test;

import java.nio.charset.StandardCharsets;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

/** COPY text format as the PostgreSQL manual (COPY, "Text Format") defines it. */
class CopyTextRowTest {

    static String[] split(String row, int n) {
        String[] out = new String[n];
        assertEquals(n, CopyTextRow.split(row.getBytes(StandardCharsets.UTF_8), out));
        return out;
    }

    @Test
    void backslashNIsNullAndAnEmptyFieldIsAnEmptyString() {
        assertArrayEquals(new String[] {null, "", "x"}, split("\\N\t\tx\n", 3));
    }

    @Test
    void escapesAreUndone() {
        assertArrayEquals(new String[] {"a\tb", "line\nbreak", "back\\slash", "\\N"},
                split("a\\tb\tline\\nbreak\tback\\\\slash\t\\\\N\n", 4));
    }

    @Test
    void octalAndHexEscapesGiveBytes() {
        assertArrayEquals(new String[] {"A", "B"}, split("\\101\t\\x42\n", 2));
    }

    @Test
    void multiByteTextSurvives() {
        assertArrayEquals(new String[] {"Ærø", "\u00A0", "\u200B"}, split("Ærø\t\u00A0\t\u200B\n", 3));
    }
}
