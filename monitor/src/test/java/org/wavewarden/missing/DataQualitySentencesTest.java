package org.wavewarden.missing;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.missing.CandidateKind;
import org.wavewarden.missing.MissingCandidate;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Data-quality sentences: the most frequent value is the one called most frequent, and every share has its count. */
class DataQualitySentencesTest {

    static final VariableComparator COMPARATOR = new VariableComparator(0.95);

    static Finding only(List<Finding> findings, FindingKind kind) {
        return findings.stream().filter(f -> f.kind() == kind).findFirst().orElseThrow(() -> new AssertionError(
                "no " + kind + " in " + findings));
    }

    @Test
    void theMostFrequentCandidateIsCalledMostFrequentAndTheMostConfidentOneIsNamedApart() {
        VariableConfig v = VariableConfig.inferred("score", VariableKind.CONTINUOUS);
        Map<String, Long> values = new HashMap<>(Map.of("99", 10L, "-9", 50L));
        for (int i = 1; i <= 40; i++) {
            values.put(String.valueOf(i), 10L);
        }
        ColumnTally tally = new ColumnTally("score", ColumnType.INTEGER, 460, 0, values, false);
        // Most confident first, as the detector orders them.
        List<MissingCandidate> candidates = List.of(
                new MissingCandidate("99", CandidateKind.NUMERIC_SENTINEL, 10, 10 / 460.0, 0.95, "99 stands apart."),
                new MissingCandidate("-9", CandidateKind.NUMERIC_SENTINEL, 50, 50 / 460.0, 0.8, "-9 is negative."));
        ScreenedVariable s = new ScreenedVariable(460, 0, Map.of(), candidates, List.of(), Map.of(), null, null, null, null);
        String sentence = only(DataQualityFindings.of(v, tally, s, null, COMPARATOR).findings(),
                FindingKind.NUMERIC_SENTINEL).sentence();
        assertTrue(sentence.contains("most often '-9' (50 rows); the most confident candidate is '99': 99 stands"
                + " apart"), sentence);
        assertFalse(sentence.contains("most often '99'"), sentence);
    }

    @Test
    void eachShareOfADisguisedMissingFindingNamesItsDenominator() {
        VariableConfig v = VariableConfig.inferred("region", VariableKind.CATEGORICAL);
        Map<String, Long> values = new HashMap<>(Map.of("", 12L, "north", 100L, "south", 100L, "east", 88L));
        ColumnTally tally = new ColumnTally("region", ColumnType.TEXT, 480, 180, values, false);
        ScreenedVariable s = VariableScreen.screen(tally, v);
        String sentence = only(DataQualityFindings.of(v, tally, s, null, COMPARATOR).findings(), FindingKind.BLANK)
                .sentence();
        // 12 / 480 = 2.5% of the rows; 12 / 300 = 4.0% of the non-null answers.
        assertTrue(sentence.startsWith("12 of 480 rows (2.5%) look like disguised missing values (blank)"), sentence);
        assertTrue(sentence.contains("(4.0% of the non-null answers)"), sentence);
    }

    @Test
    void codebookCodesAreCountedAgainstTheRowsAndListedByReasonInWords() {
        VariableConfig v = new VariableConfig("income", VariableKind.CONTINUOUS, "EUR", null,
                List.of(new MissingCodeSpec("-9", "refused")), null, null, List.of(), null);
        Map<String, Long> values = new HashMap<>(Map.of("-9", 88L));
        for (int i = 1000; i < 1100; i++) {
            values.put(String.valueOf(i), 39L);
        }
        ColumnTally tally = new ColumnTally("income", ColumnType.INTEGER, 3988, 0, values, false);
        ScreenedVariable s = VariableScreen.screen(tally, v);
        String sentence = only(DataQualityFindings.of(v, tally, s, null, COMPARATOR).findings(),
                FindingKind.MISSING_CODE).sentence();
        // 88 / 3,988 = 2.2%.
        assertTrue(sentence.equals("88 of 3,988 rows (2.2%) carry codebook missing codes and were left out of the"
                + " comparison (refused 88)."), sentence);
    }
}
