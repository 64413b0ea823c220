package org.wavewarden.missing;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Declared missing ranges (an SPSS {@code LO THRU -1}, {@code 998 THRU HI}, {@code -99 THRU -90}) are missing codes in
 * every respect: left out of every comparison, weighted or not, and counted by their reason.
 */
class MissingRangeScreenTest {

    static VariableConfig variable(VariableKind kind, List<MissingCodeSpec> codes, List<MissingRangeSpec> ranges) {
        return new VariableConfig("income", kind, null, null, codes, null, null, List.of(), null, null, null, null,
                ranges);
    }

    static final List<MissingRangeSpec> OPEN_ENDS = List.of(new MissingRangeSpec(null, -1.0, "refused"),
            new MissingRangeSpec(998.0, null, "don't know"));

    /** 0..99 five times each (500 valid rows), and below them the coded rows. */
    static Map<String, Long> answers(Map<String, Long> coded) {
        Map<String, Long> values = new HashMap<>(coded);
        for (int v = 0; v < 100; v++) {
            values.put(String.valueOf(v), 5L);
        }
        return values;
    }

    static ColumnTally tally(ColumnType type, Map<String, Long> values) {
        long rows = values.values().stream().mapToLong(Long::longValue).sum();
        return new ColumnTally("income", type, rows, 0, values, false);
    }

    @Test
    void rangesWithOpenEndsLeaveOutEveryValueBeyondThemAndCountThemByReason() {
        Map<String, Long> coded = Map.of("-1", 3L, "-9", 4L, "-123.5", 2L, "998", 6L, "999", 7L, "100000", 1L);
        ScreenedVariable s = VariableScreen.screen(tally(ColumnType.DECIMAL, answers(coded)),
                variable(VariableKind.CONTINUOUS, List.of(), OPEN_ENDS));
        assertEquals(500, s.numeric().n());
        assertEquals(0.0, s.numeric().value(0));
        assertEquals(99.0, s.numeric().value(s.numeric().size() - 1));
        assertEquals(Map.of("refused", 9L, "don't know", 14L), s.missingByReason());
    }

    @ParameterizedTest(name = "{0} in a {1} column is missing: {2}")
    @CsvSource({
            "-90, INTEGER, true",
            "-99, INTEGER, true",
            "-95, INTEGER, true",
            "-90.00, DECIMAL, true",
            "-89.999, DECIMAL, false",
            "-99.0001, DECIMAL, false",
            "' -95 ', DECIMAL, true",
            "-95, TEXT, false",
    })
    void aClosedRangeIncludesBothEndsAndMatchesNumbersOnly(String value, ColumnType type, boolean missing) {
        Codebook c = VariableScreen.codebook(variable(VariableKind.CONTINUOUS, List.of(),
                List.of(new MissingRangeSpec(-99.0, -90.0, "not asked"))));
        assertEquals(missing, c.reasonOf(value, type).isPresent(), value + " as " + type);
    }

    @Test
    void aValueThatIsBothACodeAndInARangeCountsOnceUnderTheCodesReason() {
        Map<String, Long> coded = Map.of("-9", 10L, "-50", 5L);
        ScreenedVariable s = VariableScreen.screen(tally(ColumnType.INTEGER, answers(coded)),
                variable(VariableKind.CONTINUOUS, List.of(new MissingCodeSpec("-9", "refused")),
                        List.of(new MissingRangeSpec(-99.0, -1.0, "not asked"))));
        assertEquals(500, s.numeric().n());
        Map<String, Long> expected = new LinkedHashMap<>();
        expected.put("refused", 10L);
        expected.put("not asked", 5L);
        assertEquals(expected, s.missingByReason());
        assertEquals(515, s.numeric().n() + s.missingByReason().values().stream().mapToLong(Long::longValue).sum());
    }

    @Test
    void aCategoricalVariableLosesItsRangeCodesFromTheShares() {
        Map<String, Long> values = Map.of("1", 40L, "2", 30L, "3", 20L, "-7", 6L, "-8", 4L);
        ScreenedVariable s = VariableScreen.screen(tally(ColumnType.INTEGER, values),
                variable(VariableKind.CATEGORICAL, List.of(), List.of(new MissingRangeSpec(null, -1.0, "no answer"))));
        assertEquals(List.of("1", "2", "3"), s.categories().categories());
        assertEquals(Map.of("no answer", 10L), s.missingByReason());
    }

    @Test
    void theWeightedViewLeavesOutTheWeightsOfValuesInARange() {
        // Each value's weight sum {sum w, sum w^2} as the scan keeps them: the coded rows carry heavy weights, so a
        // range that leaked into the weighted view would move its total.
        Map<String, Long> coded = Map.of("-95", 10L, "999", 5L);
        Map<String, Long> values = answers(coded);
        Map<String, double[]> weights = new HashMap<>();
        double validWeight = 0;
        for (Map.Entry<String, Long> e : values.entrySet()) {
            boolean isCoded = coded.containsKey(e.getKey());
            double w = isCoded ? 50.0 : 1.5;
            weights.put(e.getKey(), new double[] {w * e.getValue(), w * w * e.getValue()});
            validWeight += isCoded ? 0 : w * e.getValue();
        }
        ScreenedVariable s = VariableScreen.screen(tally(ColumnType.INTEGER, values),
                variable(VariableKind.CONTINUOUS, List.of(), List.of(new MissingRangeSpec(-99.0, -90.0, "not asked"),
                        new MissingRangeSpec(998.0, null, "don't know"))), weights);
        assertEquals(500, s.weighted().n());
        assertEquals(validWeight, s.weighted().totalWeight(), 1e-9);
        for (double v : s.weighted().values()) {
            assertTrue(v >= 0 && v <= 99, "value " + v + " in the weighted view");
        }
    }

    @Test
    void theValidNumberRuleOfTheOtherComparisonsLeavesOutRangeValuesToo() {
        ValidNumber rule = ValidNumber.of(variable(VariableKind.CONTINUOUS, List.of(), OPEN_ENDS));
        assertEquals(ValidNumber.Status.LEFT_OUT, rule.status("-3"));
        assertEquals(ValidNumber.Status.LEFT_OUT, rule.status("998.0"));
        assertEquals(ValidNumber.Status.VALID, rule.status("997.5"));
        assertTrue(Double.isNaN(rule.value("1000")));
    }

    @Test
    void theMissingRateFindingsCountEachRangeByItsReason() {
        VariableConfig v = variable(VariableKind.CONTINUOUS, List.of(new MissingCodeSpec("-9", "refused")),
                List.of(new MissingRangeSpec(-99.0, -90.0, "not asked")));
        ScreenedVariable baseline = VariableScreen.screen(tally(ColumnType.INTEGER,
                answers(Map.of("-9", 10L, "-95", 5L))), v);
        ColumnTally currentTally = tally(ColumnType.INTEGER, answers(Map.of("-9", 10L, "-95", 60L, "-90", 40L)));
        ScreenedVariable current = VariableScreen.screen(currentTally, v);
        DataQualityFindings.Result r = DataQualityFindings.of(v, currentTally, current, baseline,
                new VariableComparator(0.95));
        Finding codes = r.findings().stream().filter(f -> f.kind() == FindingKind.MISSING_CODE).findFirst()
                .orElseThrow();
        assertTrue(codes.sentence().contains("refused 10, not asked 100"), codes.sentence());
        Comparison notAsked = r.rateComparisons().stream()
                .filter(c -> c.kind() == FindingKind.MISSING_RATE_CHANGE
                        && c.change().measure().equals("share missing (not asked)"))
                .findFirst().orElseThrow(() -> new AssertionError(r.rateComparisons().toString()));
        // Shares of all rows, as the codes' rates are: 5 of 515 rows, then 100 of 610.
        assertEquals(5.0 / 515, notAsked.change().before(), 1e-12);
        assertEquals(100.0 / 610, notAsked.change().after(), 1e-12);
        assertFalse(r.findings().stream().anyMatch(f -> f.sentence().contains("disguised")), r.findings().toString());
    }
}
