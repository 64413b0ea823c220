package org.wavewarden.missing;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** What an undeclared column is taken for, and what that earns it. */
class VariableInferenceTest {

    /** Ages lo..hi, {@code each} answers per age, {@code heaped} times as many on ages ending in 0 or 5. */
    static Map<String, Long> ages(int lo, int hi, long each, long heaped) {
        Map<String, Long> m = new LinkedHashMap<>();
        for (int a = lo; a <= hi; a++) {
            m.put(Integer.toString(a), a % 5 == 0 ? each * heaped : each);
        }
        return m;
    }

    static ColumnTally tally(String column, ColumnType type, Map<String, Long> counts) {
        long n = counts.values().stream().mapToLong(Long::longValue).sum();
        return new ColumnTally(column, type, n, 0, counts, false);
    }

    @ParameterizedTest
    @ValueSource(strings = {"age", "AGE", "age_years", "Age_Yrs", "age_in_years", "respondent_age", "hh_head_age"})
    void anIntegerColumnNamedLikeAnAgeIsAnAgeInYears(String column) {
        VariableInference.Inferred i = VariableInference.infer(tally(column, ColumnType.INTEGER, ages(16, 94, 10, 1)));
        assertEquals(VariableKind.CONTINUOUS, i.variable().kind());
        assertEquals("years", i.variable().unit());
        assertEquals(column + ": continuous (inferred as an age in years from its name and integer range 16-94)",
                VariableInference.describe(i));
    }

    @ParameterizedTest
    @ValueSource(strings = {"stage", "wage", "usage", "age_group", "page_count", "mileage"})
    void otherNamesWithAgeInsideAreNotAges(String column) {
        VariableInference.Inferred i = VariableInference.infer(tally(column, ColumnType.INTEGER, ages(16, 94, 10, 1)));
        assertNull(i.variable().unit(), i.reason());
    }

    @Test
    void anAgeColumnWithRefusalCodesIsStillAnAgeAndTheCodesDoNotSetItsRange() {
        Map<String, Long> m = ages(18, 90, 10, 1);
        m.put("-9", 12L);
        m.put("999", 4L);
        VariableInference.Inferred i = VariableInference.infer(tally("age", ColumnType.INTEGER, m));
        assertEquals("years", i.variable().unit());
        assertTrue(i.reason().endsWith("integer range 18-90"), i.reason());
    }

    @Test
    void valuesBeyondAPlausibleAgeOrFractionsOrAFewBandsAreNotAges() {
        assertNull(VariableInference.infer(tally("age", ColumnType.INTEGER, ages(16, 140, 10, 1))).variable().unit());
        Map<String, Long> fractions = ages(16, 94, 10, 1);
        fractions.put("30.5", 3L);
        assertNull(VariableInference.infer(tally("age", ColumnType.DECIMAL, fractions)).variable().unit());
        VariableInference.Inferred bands = VariableInference.infer(tally("age", ColumnType.INTEGER, ages(1, 7, 10, 1)));
        assertEquals(VariableKind.ORDINAL, bands.variable().kind(), "age coded 1..7 holds age bands");
    }

    @Test
    void anInferredAgeIsCheckedForHeapingLikeADeclaredOne() {
        ColumnTally before = tally("respondent_age", ColumnType.INTEGER, ages(16, 94, 20, 1));
        ColumnTally after = tally("respondent_age", ColumnType.INTEGER, ages(16, 94, 20, 3));
        VariableConfig v = VariableInference.infer(after).variable();
        List<Finding> findings = WaveJudge.judgeVariables(
                ScreenedWave.screen("before", Map.of(v.name(), before), null, List.of(v),
                        List.of()),
                ScreenedWave.screen("after", Map.of(v.name(), after), null, List.of(v),
                        List.of()), 0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG, "inference test");
        Finding heaping = findings.stream().filter(f -> f.kind() == FindingKind.HEAPING).findFirst().orElseThrow(
                () -> new AssertionError("no heaping finding in " + findings));
        // Whipple's index over ages 23-62: 8 of 40 ages end in 0 or 5 and carry 3 times the answers, so the index
        // is 5 * 8 * 60 / (8 * 60 + 32 * 20) * 100 = 214.3 (the definition, United Nations 1955, Manual II).
        assertTrue(heaping.sentence().contains("from 100.0 to 214.3"), heaping.sentence());
    }

    @Test
    void aWavesVariablesAreTheDeclaredOnesThenEveryOtherColumnInferredAndDescribed() {
        VariableConfig declared = VariableConfig.inferred("region", VariableKind.CATEGORICAL);
        DatasetConfig d = new DatasetConfig("layout", "s.t", "wave", null, null, CompareWith.PREVIOUS, null,
                List.of(), List.of(declared), null, null, null, null, null, null, null, null, List.of());
        ColumnTally region = tally("region", ColumnType.INTEGER, Map.of("1", 5L, "2", 5L, "3", 5L));
        ColumnTally age = tally("age", ColumnType.INTEGER, ages(16, 94, 10, 1));
        List<String> inference = new ArrayList<>();

        List<VariableConfig> variables = VariableInference.variables(d, List.of(region, age), inference);

        assertEquals(List.of("region", "age"), variables.stream().map(VariableConfig::name).toList());
        assertEquals(VariableKind.CATEGORICAL, variables.get(0).kind(), "a declaration is not second-guessed");
        assertEquals(List.of("age: continuous (inferred as an age in years from its name and integer range 16-94)"),
                inference);
        assertEquals(variables.get(0), VariableInference.variable(d, "region", region));
        assertEquals(variables.get(1), VariableInference.variable(d, "age", age), "the digest takes the run's kind");
        assertNull(VariableInference.variable(d, "gone", null));
    }
}
