package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The configuration of seasonal baselines and breakdowns: {@code compareWith} as one rule or a list of rules judged
 * alongside each other, and a dataset's {@code breakdowns} section. Every refusal names the full key path.
 */
class SeasonalConfigTest {

    static final String DATASET = """
            source:
              jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey"
              user: reader
              passwordEnv: SURVEY_PASSWORD
            datasets:
              - name: harrowmere
                table: survey.household
                waveColumn: wave
                weightColumn: weight
                respondentKey: respondent_id
                exclude: [interviewer_id]
                compareWith: COMPARE
                variables:
                  - name: height_cm
                    kind: continuous
                    unit: cm
            BREAKDOWNS""";

    static String config(String compareWith, String breakdowns) {
        return DATASET.replace("COMPARE", compareWith).replace("BREAKDOWNS", breakdowns == null ? ""
                : "    breakdowns:\n" + breakdowns.indent(6));
    }

    static DatasetConfig dataset(String compareWith, String breakdowns) {
        return ConfigLoader.parse(config(compareWith, breakdowns)).dataset("harrowmere");
    }

    static Stream<Arguments> goodRules() {
        return Stream.of(
                Arguments.of("previous", CompareWith.PREVIOUS),
                Arguments.of("{sameWaveBack: 4}", new CompareWith.SameWaveBack(4)),
                Arguments.of("[{sameWaveBack: 4}]", new CompareWith.SameWaveBack(4)),
                Arguments.of("[previous, {sameWaveBack: 4}]", new CompareWith.Alongside(List.of(CompareWith.PREVIOUS,
                        new CompareWith.SameWaveBack(4)))),
                Arguments.of("[{sameWaveBack: 4}, previous]", new CompareWith.Alongside(List.of(
                        new CompareWith.SameWaveBack(4), CompareWith.PREVIOUS))),
                Arguments.of("[previous, {sameWaveBack: 4}, {sameWaveBack: 8}, {baseline: 2024-Q1}, {pooledLast: 4}]",
                        new CompareWith.Alongside(List.of(CompareWith.PREVIOUS, new CompareWith.SameWaveBack(4),
                                new CompareWith.SameWaveBack(8), new CompareWith.Baseline("2024-Q1"),
                                new CompareWith.PooledLast(4)))),
                // Once a year back is not the previous wave, so a yearly survey may compare with both.
                Arguments.of("[{pooledLast: 3}, {sameWaveBack: 1}]", new CompareWith.Alongside(List.of(
                        new CompareWith.PooledLast(3), new CompareWith.SameWaveBack(1)))));
    }

    @ParameterizedTest(name = "compareWith: {0}")
    @MethodSource("goodRules")
    void aRuleOrAListOfRulesIsRead(String yaml, CompareWith expected) {
        CompareWith read = dataset(yaml, null).compareWith();
        assertEquals(expected, read);
        assertEquals(expected.rules(), read.rules());
    }

    static Stream<Arguments> badRules() {
        return Stream.of(
                Arguments.of("{sameWaveBack: 0}",
                        "datasets[0].compareWith.sameWaveBack: expected a whole number of waves from 1 to 1000 but got 0"),
                Arguments.of("{sameWaveBack: 2.5}",
                        "datasets[0].compareWith.sameWaveBack: expected a whole number of waves from 1 to 1000"),
                Arguments.of("{sameWaveBack: four}",
                        "datasets[0].compareWith.sameWaveBack: expected a number but got text (four)"),
                Arguments.of("{sameWavesBack: 4}",
                        "datasets[0].compareWith.sameWavesBack: unknown key; did you mean 'sameWaveBack'?"),
                Arguments.of("{sameWaveBack: 4, pooledLast: 2}",
                        "datasets[0].compareWith: expected exactly one of baseline, pooledLast or sameWaveBack"),
                Arguments.of("[]", "datasets[0].compareWith: expected at least one rule"),
                Arguments.of("[previous, [{sameWaveBack: 4}]]",
                        "datasets[0].compareWith[1]: expected one rule (previous, {baseline: WAVE}, {pooledLast: K} or"
                                + " {sameWaveBack: K}) but got a list"),
                Arguments.of("[previous, {sameWaveBack: 4}, {sameWaveBack: 4}]",
                        "datasets[0].compareWith[2]: the same rule as datasets[0].compareWith[1]"),
                Arguments.of("[previous, previous]",
                        "datasets[0].compareWith[1]: the same rule as datasets[0].compareWith[0]"),
                Arguments.of("[previous, {baseline: 2024-Q1}, {baseline: 2024-Q2}]",
                        "datasets[0].compareWith[2]: a second baseline rule beside datasets[0].compareWith[1]"),
                Arguments.of("[{pooledLast: 2}, previous, {pooledLast: 4}]",
                        "datasets[0].compareWith[2]: a second pooledLast rule beside datasets[0].compareWith[0]"),
                Arguments.of("[previous, {sameWaveBack: 1}]",
                        "datasets[0].compareWith[1]: compares with the same wave as datasets[0].compareWith[0]"),
                Arguments.of("[{pooledLast: 1}, previous]",
                        "datasets[0].compareWith[1]: compares with the same wave as datasets[0].compareWith[0]"),
                Arguments.of("[previous, {sameWaveBack: -4}]",
                        "datasets[0].compareWith[1].sameWaveBack: expected a whole number of waves from 1 to 1000"),
                Arguments.of("[previous, {samewaveback: 4}]",
                        "datasets[0].compareWith[1].samewaveback: unknown key; did you mean 'sameWaveBack'?"),
                Arguments.of("[previus, {sameWaveBack: 4}]",
                        "datasets[0].compareWith[0]: expected previous, {baseline: WAVE}, {pooledLast: K} or"
                                + " {sameWaveBack: K} but got 'previus' (did you mean 'previous'?)"),
                Arguments.of("[previous, {sameWaveBack: 4}]\n    waveOrder: [\"2024-Q1\"]\n    x: 1",
                        "datasets[0].x: unknown key"),
                Arguments.of("[previous, {baseline: 2019-Q1}]\n    waveOrder: [\"2024-Q1\", \"2024-Q2\"]",
                        "datasets[0].compareWith[1].baseline: wave '2019-Q1' is not in datasets[0].waveOrder"));
    }

    @ParameterizedTest(name = "compareWith: {0}")
    @MethodSource("badRules")
    void aBadRuleIsRefusedNamingItsKey(String yaml, String expected) {
        ConfigException e = assertThrows(ConfigException.class, () -> dataset(yaml, null));
        assertTrue(e.getMessage().startsWith(expected), e.getMessage());
    }

    @Test
    void everyRuleIsPartOfTheConfigurationsFingerprint() {
        List<String> rules = List.of("previous", "{sameWaveBack: 4}", "{sameWaveBack: 8}",
                "[previous, {sameWaveBack: 4}]", "[{sameWaveBack: 4}, previous]", "[previous, {sameWaveBack: 8}]");
        List<String> prints = rules.stream().map(r -> ConfigFingerprint.of(0.05,
                WardenConfig.FdrMethod.BENJAMINI_HOCHBERG, dataset(r, null))).toList();
        assertEquals(rules.size(), prints.stream().distinct().count(), prints.toString());
        assertEquals(prints.get(3), ConfigFingerprint.of(0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG,
                dataset("[previous, {sameWaveBack: 4}]", null)));
    }

    @Test
    void aFullBreakdownsSectionIsRead() {
        Breakdowns b = dataset("previous", """
                columns: [district, interview_mode, interviewer_id]
                maxDomains: 300
                interviewer: interviewer_id
                minInterviews: 15
                keyVariables: [height_cm, life_satisfaction]
                iccThreshold: 0.05
                maxCases: 2000
                """).breakdowns();
        assertEquals(new Breakdowns(List.of("district", "interview_mode", "interviewer_id"), 300, "interviewer_id",
                15, List.of("height_cm", "life_satisfaction"), 0.05, 2000), b);
    }

    @Test
    void leftOutSettingsTakeTheirDefaultsAndNoSectionIsNone() {
        assertEquals(new Breakdowns(List.of("district"), Breakdowns.DEFAULT_MAX_DOMAINS, null,
                Breakdowns.DEFAULT_MIN_INTERVIEWS, List.of(), Breakdowns.DEFAULT_ICC_THRESHOLD,
                Breakdowns.DEFAULT_MAX_CASES), dataset("previous", "columns: [district]\n").breakdowns());
        assertEquals(Breakdowns.NONE, dataset("previous", null).breakdowns());
        assertTrue(dataset("previous", null).breakdowns().isEmpty());
    }

    static Stream<Arguments> badBreakdowns() {
        return Stream.of(
                Arguments.of("columns left out", "maxDomains: 10\n",
                        "datasets[0].breakdowns.columns: missing"),
                Arguments.of("columns empty", "columns: []\n", "datasets[0].breakdowns.columns: missing"),
                Arguments.of("columns not a list", "columns: district\n",
                        "datasets[0].breakdowns.columns: expected a list but got text (district)"),
                Arguments.of("a column that is a mapping", "columns: [district, {name: mode}]\n",
                        "datasets[0].breakdowns.columns[1]: expected text but got a mapping"),
                Arguments.of("a column carrying SQL", "columns: [district, \"mode; drop table x\"]\n",
                        "datasets[0].breakdowns.columns[1]:"),
                Arguments.of("a column twice", "columns: [district, interview_mode, district]\n",
                        "datasets[0].breakdowns.columns[2]: 'district' is listed twice (also"
                                + " datasets[0].breakdowns.columns[0])"),
                Arguments.of("the wave column", "columns: [district, wave]\n",
                        "datasets[0].breakdowns.columns[1]: 'wave' is the dataset's waveColumn"
                                + " (datasets[0].waveColumn)"),
                Arguments.of("the weight column", "columns: [weight]\n",
                        "datasets[0].breakdowns.columns[0]: 'weight' is the dataset's weightColumn"),
                Arguments.of("the respondent key", "columns: [district, interview_mode, respondent_id]\n",
                        "datasets[0].breakdowns.columns[2]: 'respondent_id' is the dataset's respondentKey"),
                Arguments.of("an unknown key", "columns: [district]\nmaxDomain: 10\n",
                        "datasets[0].breakdowns.maxDomain: unknown key; did you mean 'maxDomains'?"),
                Arguments.of("maxDomains zero", "columns: [district]\nmaxDomains: 0\n",
                        "datasets[0].breakdowns.maxDomains: expected a whole number of domains from 1 to 100000"),
                Arguments.of("maxDomains a fraction", "columns: [district]\nmaxDomains: 2.5\n",
                        "datasets[0].breakdowns.maxDomains: expected a whole number of domains"),
                Arguments.of("maxCases zero", "columns: [district]\nmaxCases: 0\n",
                        "datasets[0].breakdowns.maxCases: expected a whole number of cases from 1 to 10000000"),
                Arguments.of("maxCases text", "columns: [district]\nmaxCases: many\n",
                        "datasets[0].breakdowns.maxCases: expected a number but got text (many)"),
                Arguments.of("interviewer not among the columns", "columns: [district, interviewer]\n"
                                + "interviewer: interviewer_id\n",
                        "datasets[0].breakdowns.interviewer: 'interviewer_id' is not one of"
                                + " datasets[0].breakdowns.columns [district, interviewer]; did you mean 'interviewer'?"),
                Arguments.of("minInterviews without an interviewer", "columns: [district]\nminInterviews: 20\n",
                        "datasets[0].breakdowns.minInterviews: only meaningful with datasets[0].breakdowns.interviewer"),
                Arguments.of("keyVariables without an interviewer", "columns: [district]\nkeyVariables: [height_cm]\n",
                        "datasets[0].breakdowns.keyVariables: only meaningful with"),
                Arguments.of("iccThreshold without an interviewer", "columns: [district]\niccThreshold: 0.02\n",
                        "datasets[0].breakdowns.iccThreshold: only meaningful with"),
                Arguments.of("minInterviews of one", "columns: [interviewer_id]\ninterviewer: interviewer_id\n"
                                + "minInterviews: 1\n",
                        "datasets[0].breakdowns.minInterviews: expected a whole number of interviews from 2"),
                Arguments.of("iccThreshold of one", "columns: [interviewer_id]\ninterviewer: interviewer_id\n"
                                + "iccThreshold: 1\n",
                        "datasets[0].breakdowns.iccThreshold: expected an intra-interviewer correlation from 0 up to"
                                + " (not including) 1, e.g. 0.02, but got 1"),
                Arguments.of("negative iccThreshold", "columns: [interviewer_id]\ninterviewer: interviewer_id\n"
                                + "iccThreshold: -0.1\n",
                        "datasets[0].breakdowns.iccThreshold: expected an intra-interviewer correlation"),
                Arguments.of("keyVariables not a list", "columns: [interviewer_id]\ninterviewer: interviewer_id\n"
                                + "keyVariables: height_cm\n",
                        "datasets[0].breakdowns.keyVariables: expected a list but got text (height_cm)"),
                Arguments.of("a key variable twice", "columns: [interviewer_id]\ninterviewer: interviewer_id\n"
                                + "keyVariables: [height_cm, life_satisfaction, height_cm]\n",
                        "datasets[0].breakdowns.keyVariables[2]: 'height_cm' is listed twice (also"
                                + " datasets[0].breakdowns.keyVariables[0])"),
                Arguments.of("the interviewer as a key variable", "columns: [interviewer_id]\n"
                                + "interviewer: interviewer_id\nkeyVariables: [height_cm, interviewer_id]\n",
                        "datasets[0].breakdowns.keyVariables[1]: 'interviewer_id' is the interviewer column itself"),
                Arguments.of("the weight as a key variable", "columns: [interviewer_id]\n"
                                + "interviewer: interviewer_id\nkeyVariables: [weight]\n",
                        "datasets[0].breakdowns.keyVariables[0]: 'weight' is a column never compared as a variable"),
                Arguments.of("an excluded column as a key variable", "columns: [district, interviewer_id]\n"
                                + "interviewer: interviewer_id\nkeyVariables: [height_cm, respondent_id]\n",
                        "datasets[0].breakdowns.keyVariables[1]: 'respondent_id' is a column never compared"),
                Arguments.of("a key variable carrying markup", "columns: [interviewer_id]\n"
                                + "interviewer: interviewer_id\nkeyVariables: [\"<b>x</b>\"]\n",
                        "datasets[0].breakdowns.keyVariables[0]:"),
                Arguments.of("breakdowns not a mapping", null, "datasets[0].breakdowns: expected a mapping"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("badBreakdowns")
    void aBadBreakdownsSectionIsRefusedNamingItsKey(String what, String section, String expected) {
        String yaml = section == null ? config("previous", null) + "    breakdowns: [district]\n"
                : config("previous", section);
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(yaml), what);
        assertTrue(e.getMessage().startsWith(expected), what + ": " + e.getMessage());
    }

    @Test
    void anExcludedIdentifierMayBeADomain() {
        // An interviewer id is an identifier never compared as a variable, and still the column a field team
        // breaks its work down by.
        Breakdowns b = dataset("previous", "columns: [interviewer_id]\ninterviewer: interviewer_id\n").breakdowns();
        assertEquals("interviewer_id", b.interviewer());
    }
}
