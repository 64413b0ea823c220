package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.ReviewReason;

import java.util.List;
import java.util.Locale;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * An enum constant is read from its key or its name as a person types it, and the keys are listed in declaration
 * order for a refusal: the rule the configuration, the command line and the results schema share.
 */
class EnumKeysTest {

    /** Each row: what was typed, and the reason it names (empty: none). */
    @ParameterizedTest(name = "''{0}'' -> {1}")
    @CsvSource(delimiter = '|', nullValues = "null", textBlock = """
            planned-change     | PLANNED_CHANGE
            PLANNED-CHANGE     | PLANNED_CHANGE
            '  real-change  '  | REAL_CHANGE
            NO_PROBLEM         | NO_PROBLEM
            fix_upstream       | FIX_UPSTREAM
            fix upstream       |
            planned            |
            fıx-upstream       |
            ''                 |
            null               |
            """)
    void aKeyOrANameInAnyCaseNamesTheConstantAndNothingElseDoes(String typed, String expected) {
        assertEquals(Optional.ofNullable(expected).map(ReviewReason::valueOf),
                EnumKeys.parse(ReviewReason.class, ReviewReason::key, typed));
    }

    @Test
    void theKeysAreListedInDeclarationOrder() {
        assertEquals(List.of("planned-change", "fix-upstream", "real-change", "no-problem"),
                EnumKeys.keys(ReviewReason.class, ReviewReason::key));
        assertEquals("open, explained, muted, superseded",
                EnumKeys.listed(AlertState.class, s -> s.name().toLowerCase(Locale.ROOT)));
    }
}
