package org.wavewarden.read;

import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Respondent keys in the order a reader expects, and the few smallest kept whatever order they came in. */
class KeyOrderTest {

    @Test
    void numbersSortAsNumbersAndBeforeText() {
        List<String> keys = new ArrayList<>(List.of("b7", "10", "-3", "9", "2.5", "A1", "100", "007", "7"));
        keys.sort(KeyOrder.ORDER);
        assertEquals(List.of("-3", "2.5", "007", "7", "9", "10", "100", "A1", "b7"), keys);
    }

    @Test
    void keysThatAreEqualNumbersButDifferentTextStayDistinct() {
        assertTrue(KeyOrder.compare("1", "1.0") != 0);
        assertEquals(0, KeyOrder.compare("12", "12"));
        assertEquals(-KeyOrder.compare("1.0", "1"), KeyOrder.compare("1", "1.0"));
    }

    @Test
    void textThatOnlyLooksNumericIsText() {
        for (String s : new String[] {"1e5", "1.", ".5", "--1", "1.2.3", "", "-"}) {
            assertTrue(!KeyOrder.isNumber(s), s);
        }
    }

    @Test
    void smallestKeepsTheNSmallestKeys() {
        KeyOrder.Smallest<String> s = new KeyOrder.Smallest<>(3, k -> k);
        for (String k : new String[] {"50", "4", "x", "31", "2", "100", "3"}) {
            s.offer(k);
        }
        assertEquals(List.of("2", "3", "4"), s.sorted());
    }
}
