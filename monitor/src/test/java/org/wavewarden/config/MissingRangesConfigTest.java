package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A variable's {@code missingRanges}, {@code label} and {@code valueLabels} keys, and their errors by key path. */
class MissingRangesConfigTest {

    static String config(String variable) {
        return """
                source:
                  jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey"
                  user: reader
                datasets:
                  - name: household
                    table: survey.household
                    waveColumn: wave
                    variables:
                      - %s
                """.formatted(variable);
    }

    static VariableConfig only(String variable) {
        return ConfigLoader.parse(config(variable)).dataset("household").variables().get(0);
    }

    @Test
    void rangesWithOpenEndsAndReasonsAreRead() {
        VariableConfig v = only("{name: income, kind: continuous, missingRanges: [{min: -99, max: -90, reason: \"not"
                + " asked\"}, {max: -1, reason: refused}, {min: 998}]}");
        assertEquals(List.of(new MissingRangeSpec(-99.0, -90.0, "not asked"), new MissingRangeSpec(null, -1.0,
                "refused"), new MissingRangeSpec(998.0, null, "missing range")), v.missingRanges());
    }

    @Test
    void labelsAndValueLabelsAreReadInTheirOrder() {
        VariableConfig v = only("{name: tenure, kind: categorical, label: \"Tenure: of the home\", valueLabels: {3:"
                + " Owner, 1: \"Council tenant\", COUN: \"Le conseil #1\"}}");
        assertEquals("Tenure: of the home", v.label());
        assertEquals(List.of("3", "1", "COUN"), List.copyOf(v.valueLabels().keySet()));
        assertEquals(Map.of("3", "Owner", "1", "Council tenant", "COUN", "Le conseil #1"), v.valueLabels());
    }

    @ParameterizedTest(name = "{0} -> {1}")
    @CsvSource(delimiter = '|', value = {
            "{name: income, kind: continuous, missingRanges: [{min: -1, max: -9}]}"
                    + "|datasets[0].variables[0].missingRanges[0]|min -1.0 is above max -9.0",
            "{name: income, kind: continuous, missingRanges: [{reason: refused}]}"
                    + "|datasets[0].variables[0].missingRanges[0]|expected min, max or both",
            "{name: income, kind: continuous, missingRanges: [{min: low, max: -1}]}"
                    + "|datasets[0].variables[0].missingRanges[0].min|expected a number",
            "{name: income, kind: continuous, missingRanges: [{min: -9, max: \"-1\"}]}"
                    + "|datasets[0].variables[0].missingRanges[0].max|expected a number",
            "{name: income, kind: continuous, missingRanges: [{min: -9, maximum: -1}]}"
                    + "|datasets[0].variables[0].missingRanges[0].maximum|unknown key",
            "{name: income, kind: continuous, missingRanges: {min: -9}}"
                    + "|datasets[0].variables[0].missingRanges|expected a list",
            "{name: remark, kind: text, missingRanges: [{max: -1}]}"
                    + "|datasets[0].variables[0].missingRanges|ranges of numbers",
            "{name: born, kind: date, missingRanges: [{max: -1}]}"
                    + "|datasets[0].variables[0].missingRanges|ranges of numbers",
            "{name: tenure, kind: categorical, valueLabels: [Owner]}"
                    + "|datasets[0].variables[0].valueLabels|expected a map of code to label",
    })
    void aBadRangeIsRefusedWithItsFullKeyPath(String variable, String key, String problem) {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(config(variable)));
        assertEquals(key, e.key());
        assertTrue(e.problem().contains(problem), e.problem());
    }
}
