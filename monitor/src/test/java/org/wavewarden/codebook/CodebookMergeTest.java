package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

class CodebookMergeTest {

    private static final Map<String, String> TENURE_LABELS = labels("OWN", "Owned outright", "MORT",
            "Owned with a mortgage", "PRIV", "Private tenant", "COUN", "Council tenant", "FREE", "Rent free", "DK",
            "Don't know");

    private static Map<String, String> labels(String... pairs) {
        Map<String, String> m = new LinkedHashMap<>();
        for (int i = 0; i < pairs.length; i += 2) {
            m.put(pairs[i], pairs[i + 1]);
        }
        return m;
    }

    private static VariableMeta meta(String name, StorageType storage, Measure measure, Map<String, String> labels,
                                     List<MissingCodeSpec> missing) {
        return new VariableMeta(name, null, storage, null, null, null, measure, null, labels, missing, null, null);
    }

    private static final DatasetCodebook HOUSEHOLD = new DatasetCodebook("household.xml, DDI-Codebook XML", null,
            List.of(new VariableMeta("Age", "Age in years", StorageType.NUMBER, null, 0, "F3.0", Measure.ORDINAL,
                            "years", Map.of("-9", "Refused"), List.of(new MissingCodeSpec("-9", "Refused")),
                            List.of(new MissingRangeSpec(-99.0, -90.0, "not asked")), new RangeSpec(16.0, 99.0)),
                    new VariableMeta("tenure", "Tenure of the home", StorageType.TEXT, 4, null, "A4",
                            Measure.NOMINAL, null, TENURE_LABELS, List.of(new MissingCodeSpec("DK", "Don't know")),
                            null, null),
                    meta("wave", StorageType.TEXT, Measure.NOMINAL, null, null),
                    meta("weight", StorageType.NUMBER, Measure.SCALE, null, null),
                    new VariableMeta("Q7.Income", "Monthly income", StorageType.NUMBER, null, null, null,
                            Measure.UNKNOWN, null, Map.of("-9", "Refused"),
                            List.of(new MissingCodeSpec("-9", "Refused")), null, new RangeSpec(0.0, null))));

    private static VariableConfig yaml(String name, VariableKind kind) {
        return VariableConfig.inferred(name, kind);
    }

    @Test
    void theYamlWinsFieldByFieldAndTheCodebookFillsWhatItLeavesOut() {
        VariableConfig age = new VariableConfig("age", VariableKind.CONTINUOUS, null, null,
                List.of(new MissingCodeSpec("999", "not measured")), null, null, List.of(), null, null, null, null,
                null);
        VariableConfig merged = CodebookMerge.merge(List.of(age), HOUSEHOLD).variables().get(0);
        assertEquals(VariableKind.CONTINUOUS, merged.kind());
        assertEquals("Age in years", merged.label());
        assertEquals("years", merged.unit());
        assertEquals(new RangeSpec(16.0, 99.0), merged.range());
        assertEquals(List.of(new MissingCodeSpec("999", "not measured")), merged.missingCodes());
        assertEquals(List.of(new MissingRangeSpec(-99.0, -90.0, "not asked")), merged.missingRanges());
        assertEquals(Map.of("-9", "Refused"), merged.valueLabels());
    }

    @Test
    void yamlLabelsUnitAndRangeAreKept() {
        VariableConfig age = new VariableConfig("age", VariableKind.CONTINUOUS, "whole years", new RangeSpec(18.0, 80.0),
                List.of(), null, null, List.of(), null, null, "Age", Map.of("-9", "No answer"), null);
        VariableConfig merged = CodebookMerge.merge(List.of(age), HOUSEHOLD).variables().get(0);
        assertEquals("Age", merged.label());
        assertEquals("whole years", merged.unit());
        assertEquals(new RangeSpec(18.0, 80.0), merged.range());
        assertEquals(Map.of("-9", "No answer"), merged.valueLabels());
        assertEquals(List.of(new MissingCodeSpec("-9", "Refused")), merged.missingCodes());
    }

    @Test
    void codebookOnlyVariablesFollowTheYamlsInCodebookOrderNamedAsTableColumnsWithoutBookkeeping() {
        CodebookMerge.Merged m = CodebookMerge.merge(List.of(yaml("tenure", VariableKind.CATEGORICAL)), HOUSEHOLD,
                Set.of("wave", "weight")::contains);
        assertEquals(List.of("tenure", "age", "q7_income"), m.variables().stream().map(VariableConfig::name)
                .toList());
        VariableConfig age = m.variables().get(1);
        assertEquals(VariableKind.ORDINAL, age.kind());
        assertEquals(new RangeSpec(16.0, 99.0), age.range());
        VariableConfig income = m.variables().get(2);
        assertNull(income.kind(), "numbers of unknown level whose only label is a missing code: left to inference");
        assertEquals("Monthly income", income.label());
        assertEquals(List.of(new MissingCodeSpec("-9", "Refused")), income.missingCodes());
        assertEquals(new RangeSpec(0.0, null), income.range());
    }

    @Test
    void theReportNamesEachDecision() {
        CodebookMerge.Merged m = CodebookMerge.merge(List.of(yaml("age", VariableKind.CONTINUOUS),
                yaml("district", VariableKind.CATEGORICAL)), HOUSEHOLD, Set.of("wave", "weight")::contains);
        assertEquals(List.of(
                "age: label, 1 value label, 1 missing code, 1 missing range, unit years and valid range 16..99 from"
                        + " the codebook; kind continuous from the YAML (codebook says ordinal)",
                "district: not in the codebook; as the YAML says",
                "tenure: only in the codebook; label, 6 value labels and 1 missing code from the codebook;"
                        + " kind categorical (codebook: nominal)",
                "wave: bookkeeping column of the dataset; not added as a variable",
                "weight: bookkeeping column of the dataset; not added as a variable",
                "q7_income (Q7.Income in the codebook): only in the codebook; label, 1 value label, 1 missing code"
                        + " and valid range 0.. from the codebook; kind left to inference from the data (codebook:"
                        + " numbers of unknown level without value labels)"), m.report());
    }

    @Test
    void yamlMissingCodesWinAndTheReportSaysTheCodebooksAreUnused() {
        VariableConfig tenure = new VariableConfig("tenure", VariableKind.CATEGORICAL, null, null,
                List.of(new MissingCodeSpec("X", "refused")), null, null, List.of(), null);
        CodebookMerge.Merged m = CodebookMerge.merge(List.of(tenure), new DatasetCodebook("c", null,
                List.of(HOUSEHOLD.variables().get(1))));
        assertEquals(List.of(new MissingCodeSpec("X", "refused")), m.variables().get(0).missingCodes());
        assertEquals("tenure: label and 6 value labels from the codebook; missing codes from the YAML (the"
                + " codebook's 1 not used); kind categorical from the YAML", m.report().get(0));
    }

    /** The rule of {@link CodebookMerge#kindOf}, one row per case the merge documents. */
    @ParameterizedTest(name = "{0} {1}, labelled {2} -> {3}")
    @CsvSource(nullValues = "unknown", value = {
            "NUMBER, NOMINAL, false, CATEGORICAL",
            "NUMBER, ORDINAL, true, ORDINAL",
            "NUMBER, SCALE, true, CONTINUOUS",
            "DATE, UNKNOWN, false, DATE",
            "DATETIME, SCALE, false, DATE",
            "TEXT, UNKNOWN, false, TEXT",
            "TEXT, UNKNOWN, true, CATEGORICAL",
            "TEXT, NOMINAL, false, CATEGORICAL",
            "TEXT, ORDINAL, true, ORDINAL",
            "NUMBER, UNKNOWN, true, CATEGORICAL",
            "NUMBER, UNKNOWN, false, unknown"})
    void theKindACodebookEntryGives(StorageType storage, Measure measure, boolean labelled, VariableKind expected) {
        VariableMeta m = meta("v", storage, measure, labelled ? labels("1", "Yes", "2", "No", "-9", "Refused")
                : labels("-9", "Refused"), List.of(new MissingCodeSpec("-9", "Refused")));
        assertEquals(expected, CodebookMerge.kindOf(m).kind());
    }

    @Test
    void anOrdinalTextVariableTakesItsLabelledAnswerCodesAsLevelsLowestFirst() {
        VariableMeta m = meta("agreement", StorageType.TEXT, Measure.ORDINAL, labels("SD", "Strongly disagree",
                "D", "Disagree", "A", "Agree", "SA", "Strongly agree", "DK", "Don't know"),
                List.of(new MissingCodeSpec("DK", "Don't know")));
        VariableConfig v = CodebookMerge.merge(List.of(), new DatasetCodebook("c", null, List.of(m))).variables()
                .get(0);
        assertEquals(VariableKind.ORDINAL, v.kind());
        assertEquals(List.of("SD", "D", "A", "SA"), v.levels());
    }
}
