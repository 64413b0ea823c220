package org.wavewarden.deliver;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.store.CaseLists;

import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A case list's CSV cells: RFC 4180 quoting (a comma, a double quote, CR or LF quotes the cell, quotes doubled), a
 * cell a spreadsheet would run as a formula made inert with a leading apostrophe (OWASP "CSV Injection": cells
 * starting with = + - @, a tab or CR), while a plain number such as the missing code -9 stays as it is.
 */
class CaseListCsvTest {

    static Stream<Arguments> cells() {
        return Stream.of(
                Arguments.of("999", "999"),
                Arguments.of("-9", "-9"),
                Arguments.of("+1.5e3", "+1.5e3"),
                Arguments.of("-.5", "-.5"),
                Arguments.of("=cmd|' /C calc'!A0", "'=cmd|' /C calc'!A0"),
                Arguments.of("+SUM(A1:A2)", "'+SUM(A1:A2)"),
                Arguments.of("-2+3", "'-2+3"),
                Arguments.of("@import", "'@import"),
                Arguments.of("\tx", "'\tx"),
                Arguments.of("\rx", "\"'\rx\""),
                Arguments.of("=1,2", "\"'=1,2\""),
                Arguments.of("Lee, \"Ann\"", "\"Lee, \"\"Ann\"\"\""),
                Arguments.of("two\nlines", "\"two\nlines\""),
                Arguments.of("North", "North"),
                Arguments.of("", "\"\""),
                Arguments.of(null, ""));
    }

    @ParameterizedTest(name = "[{0}] is written as [{1}]")
    @MethodSource("cells")
    void aCellIsQuotedAndMadeInertAsTheClassSays(String value, String written) {
        assertEquals(written, CaseListCsv.cell(value));
    }

    @Test
    void theHeaderNamesTheKeyAndTheVariableAndTheLinesEndInCrLf() {
        CaseLists.CaseList list = new CaseLists.CaseList(3, 1, "height_cm", "NUMERIC_SENTINEL", "height_cm = '999'",
                2, List.of(new CaseLists.CaseRow("H-0001", "999"), new CaseLists.CaseRow(null, null)));
        assertEquals("respondent_key,height_cm\r\nH-0001,999\r\n,\r\n", CaseListCsv.render(list));
    }

    @ParameterizedTest(name = "variable [{0}] gives the file {1}")
    @MethodSource("names")
    void aFileNameIsMadeOfSafeCharactersOnly(String variable, String file) {
        assertEquals(file, new CaseLists.CaseList(12, 1, variable, "BLANK", "", 0, List.of()).fileName());
    }

    static Stream<Arguments> names() {
        return Stream.of(
                Arguments.of("height_cm", "cases/12-height_cm.csv"),
                Arguments.of("../../etc/passwd", "cases/12-______etc_passwd.csv"),
                Arguments.of("größe", "cases/12-gr__e.csv"),
                Arguments.of("a b/c\\d", "cases/12-a_b_c_d.csv"));
    }
}
