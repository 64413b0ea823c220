package org.wavewarden.console;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

/**
 * How the console reads what a request carries, before anything is looked up: where a login may go on to (only a
 * page of this console, so the login page cannot send anyone to another site), which ids it accepts (digits only),
 * and the order of waves it shows when the configuration fixes none.
 */
class ConsoleRequestsTest {

    @ParameterizedTest(name = "next {0} -> {1}")
    @CsvSource(delimiter = '|', value = {
            "/console|/console",
            "/console/wave?dataset=small-survey&wave=w3|/console/wave?dataset=small-survey&wave=w3",
            "/console/dataset?name=harrowmere%20households|/console/dataset?name=harrowmere%20households",
            "//evil.example/console|/console",
            "https://evil.example/console|/console",
            "/console//evil.example|/console",
            "/console/..\\evil|/console",
            "/consolex|/console",
            "/console/login?next=/console|/console",
            "/console/logout|/console",
            "javascript:alert(1)|/console",
            "/console?x=<b>|/console",
            "/health|/console",
            "''|/console"})
    void aLoginGoesOnOnlyToAPageOfThisConsole(String next, String expected) {
        assertEquals(expected, ConsoleApp.safeNext(next));
    }

    @ParameterizedTest(name = "id {0} is {1}")
    @CsvSource({"1, 1", "42, 42", "900000000000000000, 900000000000000000"})
    void anIdIsDigitsOnly(String text, long id) {
        assertEquals(id, ConsoleApp.id(text, "id"));
    }

    @ParameterizedTest(name = "id ''{0}'' is refused")
    @ValueSource(strings = {"", "0", "-1", "+1", "01", "1e3", "1.0", " 1", "1 ", "0x10", "9999999999999999999",
            "1;DROP", "１"})
    void anythingElseIsRefusedNamingTheField(String text) {
        ConsoleApp.BadRequest e = assertThrows(ConsoleApp.BadRequest.class, () -> ConsoleApp.id(text, "alert"));
        assertEquals("alert: expected a positive whole number", e.getMessage());
    }

    @ParameterizedTest(name = "{0} sorts as {1}")
    @CsvSource(delimiter = '|', value = {
            "10,9,2,1|1,2,9,10",
            "2025-Q3,2024-Q4,2025-Q1|2024-Q4,2025-Q1,2025-Q3",
            "w3,w10,w1|w1,w10,w3",
            "b,2,a,10|2,10,a,b"})
    void wavesWithoutAConfiguredOrderSortNumbersAsNumbers(String labels, String sorted) {
        List<String> waves = new ArrayList<>(List.of(labels.split(",")));
        waves.sort(ConsoleApp.NATURAL_WAVES);
        assertEquals(List.of(sorted.split(",")), waves);
    }
}
