package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.LinkedHashMap;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The one lookup of a code's label: as written first, then as a number; and how a sentence shows a label. */
class CodeLabelsTest {

    static CodeLabels labels(String... codeThenLabel) {
        Map<String, String> m = new LinkedHashMap<>();
        for (int i = 0; i < codeThenLabel.length; i += 2) {
            m.put(codeThenLabel[i], codeThenLabel[i + 1]);
        }
        return new CodeLabels("Tenure of the home", m);
    }

    @ParameterizedTest(name = "answer {0} under labels keyed {1}: {2}")
    @CsvSource(value = {
            "1, 1, Yes",
            "1, 1.0, Yes",
            "1, 01, Yes",
            "1.0, 1, Yes",
            "-9, -9.00, Yes",
            "2.5, 2.50, Yes",
            "1e1, 10, Yes",
            "COUN, COUN, Yes",
            "coun, COUN, NULL",
            "2, 1, NULL",
            "NaN, NaN, Yes",
            "Infinity, 1, NULL"}, nullValues = "NULL")
    void aCodeFindsItsLabelAsWrittenOrAsTheSameNumber(String answer, String key, String expected) {
        assertEquals(expected, labels(key, "Yes").label(answer));
    }

    @Test
    void aLabelKeyedExactlyWinsOverOneOfTheSameNumber() {
        CodeLabels l = labels("01", "leading zero", "1", "one");
        assertEquals("leading zero", l.label("01"));
        assertEquals("one", l.label("1"));
    }

    @Test
    void aLabelledCodeIsQuotedByItsLabelWithTheCodeInBracketsAndAnUnlabelledOneAsItself() {
        CodeLabels l = labels("COUN", "Council tenant");
        assertEquals("'Council tenant' (COUN)", l.quoted("COUN"));
        assertEquals("'HA'", l.quoted("HA"));
        assertEquals("tenure (Tenure of the home)", l.named("tenure"));
        assertEquals("tenure", CodeLabels.NONE.named("tenure"));
        assertTrue(l.hasValueLabels());
        assertFalse(CodeLabels.NONE.hasValueLabels());
        assertNull(CodeLabels.NONE.label("1"));
    }

    @Test
    void aSentenceShowsLineBreaksAndDirectionControlsAsEscapesAndCutsALongLabel() {
        assertEquals("a\\u000Ab \\u202Eevil\\u0009tab", CodeLabels.shown("a\nb \u202Eevil\ttab"));
        String shown = CodeLabels.shown("x".repeat(500));
        assertEquals("x".repeat(CodeLabels.SHOWN_LENGTH) + "...", shown);
    }
}
