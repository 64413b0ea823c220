package org.wavewarden.missing;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The one rule for a valid numeric answer, on the texts the five places that used to decide it disagreed on. */
class ValidNumberTest {

    /** Hours worked, 0 to 99, with the codebook code -9 (refused). */
    static final VariableConfig HOURS = new VariableConfig("hours", VariableKind.CONTINUOUS, "hours",
            new RangeSpec(0.0, 99.0), List.of(new MissingCodeSpec("-9", "refused")), null, null, List.of(), null);

    @ParameterizedTest(name = "''{0}'' is {1}")
    @CsvSource(delimiter = '|', quoteCharacter = '"', textBlock = """
            12          | VALID         | 12
            " 12 "      | VALID         | 12
            12.50       | VALID         | 12.5
            .5          | VALID         | 0.5
            1e1         | VALID         | 10
            +7          | VALID         | 7
            -0          | VALID         | 0
            99          | VALID         | 99
            0           | VALID         | 0
            1e3         | OUTSIDE_RANGE | NaN
            99.01       | OUTSIDE_RANGE | NaN
            -1          | OUTSIDE_RANGE | NaN
            -9          | LEFT_OUT      | NaN
            -9.0        | LEFT_OUT      | NaN
            NaN         | NOT_A_NUMBER  | NaN
            Infinity    | NOT_A_NUMBER  | NaN
            -Infinity   | NOT_A_NUMBER  | NaN
            0x1p3       | NOT_A_NUMBER  | NaN
            1.5d        | NOT_A_NUMBER  | NaN
            2f          | NOT_A_NUMBER  | NaN
            1e400       | NOT_A_NUMBER  | NaN
            1,5         | NOT_A_NUMBER  | NaN
            twelve      | NOT_A_NUMBER  | NaN
            "   "       | NOT_A_NUMBER  | NaN
            """)
    void anAnswerIsValidOnlyAsAFinitePlainDecimalInsideTheRangeThatIsNoMissingCode(String text,
                                                                                  ValidNumber.Status status,
                                                                                  double value) {
        ValidNumber rule = ValidNumber.of(HOURS);
        assertEquals(status, rule.status(text));
        assertEquals(value, rule.value(text), 0.0);
    }

    @ParameterizedTest(name = "''{0}'' parses to {1}")
    @CsvSource(delimiter = '|', quoteCharacter = '"', textBlock = """
            " 12 "   | 12
            1e3      | 1000
            -0.25    | -0.25
            NaN      | NaN
            Infinity | NaN
            0x1p3    | NaN
            1.5d     | NaN
            1e400    | NaN
            """)
    void parsingAloneAcceptsOnlyFinitePlainDecimals(String text, double expected) {
        Double x = ValidNumber.parse(text);
        assertEquals(expected, x == null ? Double.NaN : x, 0.0);
    }

    @ParameterizedTest(name = "level ''{0}'' has value {1}")
    @CsvSource(delimiter = '|', quoteCharacter = '"', textBlock = """
            low     | 1
            " high" | 3
            2       | NaN
            medium  | NaN
            """)
    void anOrdinalAnswerWithLevelsIsValidOnlyAsALevelAndCountsAsItsRank(String text, double value) {
        VariableConfig mood = new VariableConfig("mood", VariableKind.ORDINAL, null, null, List.of(), null, null,
                List.of("low", "mid", "high"), null);
        assertEquals(value, ValidNumber.of(mood).value(text), 0.0);
    }

    @ParameterizedTest(name = "''{0}'' left out by the screen: {1}")
    @CsvSource(delimiter = '|', textBlock = """
            999  | true
            999.0| false
            12   | false
            """)
    void aScreensRuleLeavesOutExactlyTheAnswersThatScreenLeftOut(String text, boolean leftOut) {
        ValidNumber rule = ValidNumber.ofScreen(new VariableConfig("income", VariableKind.CONTINUOUS, null, null,
                List.of(), null, null, List.of(), null), List.of("999"));
        assertEquals(leftOut, rule.status(text) == ValidNumber.Status.LEFT_OUT);
    }
}
