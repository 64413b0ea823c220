package org.wavewarden.deliver;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A listing on the console (alerts, sign-offs) keeps one line per row and its columns in place whatever a cell from
 * the data holds: a line break, a tab or a bidirectional override shows as an escape, a long value is cut.
 */
class ConsoleListingTest {

    @Test
    void cellsArePaddedToTheirWidthAndTheLastColumnIsWhole() {
        String t = ConsoleTable.table(List.of("id", "variable", "note"), new int[] {4, 10, 0},
                List.of(List.of("7", "score", "a long note that is never cut"),
                        List.of("12", "a_very_long_variable", "")));
        assertEquals("""
                  id   variable   note
                  7    score      a long note that is never cut
                  12   a_very_lo~
                """, t);
    }

    @ParameterizedTest
    @ValueSource(strings = {"line\nbreak", "tab\there", "carriage\rreturn", "right\u202Eto left", "nul\u0000"})
    void aCellFromTheDataNeverBreaksTheRow(String hostile) {
        String t = ConsoleTable.table(List.of("id", "variable", "wave"), new int[] {4, 30, 0},
                List.of(List.of("1", hostile, hostile)));
        List<String> lines = t.lines().toList();
        assertEquals(2, lines.size(), t);
        assertEquals(DataText.visible(hostile), lines.get(1).substring(2 + 5, 2 + 5 + 30).strip());
        assertEquals(lines.get(0).indexOf("wave"), lines.get(1).indexOf(DataText.visible(hostile), 2 + 5 + 30), t);
    }
}
