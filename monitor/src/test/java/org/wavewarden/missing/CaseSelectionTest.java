package org.wavewarden.missing;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Which answers a finding's case list holds, read from the same screen that made the finding: weekly hours declared
 * 0 to 100 with -9 for "refused", answered 10 and 20 (valid), -9 and -9.0 (the code, written two ways) and 150
 * (outside the range). The kinds without cases give no selection, whatever the wave holds.
 */
class CaseSelectionTest {

    static final VariableConfig HOURS = new VariableConfig("hours", VariableKind.CONTINUOUS, "hours",
            new RangeSpec(0.0, 100.0), List.of(new MissingCodeSpec("-9", "refused")), null, null, List.of(), null);

    static ScreenedWave wave() {
        ColumnTally t = new ColumnTally("hours", ColumnType.DECIMAL, 112, 0,
                Map.of("10", 50L, "20", 50L, "-9", 5L, "-9.0", 4L, "150", 3L), false);
        return ScreenedWave.screen("w2", Map.of("hours", t), null, List.of(HOURS), List.of());
    }

    static Stream<Arguments> listed() {
        return Stream.of(
                Arguments.of(FindingKind.MISSING_CODE, Set.of("-9", "-9.0")),
                Arguments.of(FindingKind.OUT_OF_RANGE, Set.of("150")));
    }

    @ParameterizedTest(name = "{0} lists the answers {1}")
    @MethodSource("listed")
    void aFindingListsTheAnswersItCounted(FindingKind kind, Set<String> values) {
        Optional<CaseSelection.Selection> s = CaseSelection.of(Finding.dataQuality("hours", kind, 112L, 112L, "", null),
                wave());
        assertEquals(Optional.of(values), s.map(CaseSelection.Selection::values));
    }

    @ParameterizedTest(name = "{0} lists no cases")
    @EnumSource(value = FindingKind.class, names = {"HEAPING", "DIGIT_PREFERENCE", "CODE_VANISHED", "LABEL_CHANGED",
            "MISSING_RATE_CHANGE", "ALL_NULL", "CONSTANT", "TOO_MANY_DISTINCT", "EMPTY_WAVE", "COLUMN_ADDED",
            "COLUMN_DROPPED", "COLUMN_RETYPED", "SKIPPED", "INTERVIEWER_EFFECT", "SHIFT", "SIGNED_WAVE_CHANGED"})
    void kindsWithoutCasesListNone(FindingKind kind) {
        assertEquals(Optional.empty(), CaseSelection.of(Finding.dataQuality("hours", kind, 112L, 112L, "", null),
                wave()));
    }
}
