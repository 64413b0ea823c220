package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.deliver.Alerts;

import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Collectors;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A finding that says what the previous wave's finding said raises no new alert: a data-quality rate that has not
 * risen beyond its sampling error (the 95% interval of its rise does not lie above zero) is still present,
 * so are a state and the same unlabelled codes, a change is always news, and a variable still too small to resolve
 * its threshold stays quiet until its state changes.
 */
class RepeatsTest {

    static final String BEFORE = "2025-Q1";

    /** The detail of a finding in this run: a record, as the detectors give it. */
    record Counted(long count, long rows) {
    }

    static Finding quality(String variable, FindingKind kind, Object detail) {
        return Finding.dataQuality(variable, kind, 1000L, 1000L, "Some rows look like missing values.", detail);
    }

    static Finding shift(String variable, Verdict verdict, double estimate, double halfWidth) {
        return new Finding(variable, FindingKind.SHIFT, "Welch t", 1.0, 0.3, 0.4,
                new Finding.Effect("Hedges' g", estimate, estimate - halfWidth, estimate + halfWidth, 0.2), verdict,
                35L, 37L, "The mean rose.", null);
    }

    /**
     * A rate is still present unless the interval of its rise lies above zero: a rise beyond sampling error is news,
     * a rate that held or fell is not. Each case is the last previous count on either side whose interval holds
     * zero, and the first that does not.
     */
    @ParameterizedTest(name = "{0} of {1} now, {2} of {3} before: repeat {4}")
    @CsvSource({
            // Newcombe's interval of (now - before) from R 4.2.2, as in NewcombeDifferenceTest (the Wilson limits
            // of prop.test(x, n, correct = FALSE)$conf.int combined by method 10), searched over every previous count
            "168, 3800, 149, 4200, false",   // [0.000164, 0.017452]
            "168, 3800, 150, 4200, true",    // [-0.000087, 0.017225]
            "168, 3800, 221, 4200, true",    // the demo's blank occupations in its last two waves, roughly
            "168, 3800, 225, 4200, true",    // [-0.018811, 0.000138]
            "168, 3800, 226, 4200, true",    // [-0.019059, -0.000090]: fell
            "235, 2500, 196, 2500, false",   // [0.000027, 0.031212]
            "235, 2500, 197, 2500, true",    // [-0.000390, 0.030828]
            "235, 2500, 277, 2500, true",    // [-0.033645, 0.000019]
            "235, 2500, 278, 2500, true",    // [-0.034059, -0.000367]: fell
            "5, 40, 0, 40, false",           // [0.012597, 0.261121]: a sentinel that was absent is news
            "5, 40, 1, 40, true",            // [-0.025436, 0.237667]
            "5, 40, 12, 40, true",           // [-0.344604, 0.005969]
            "5, 40, 13, 40, true",           // [-0.370079, -0.015763]: fell
            "27, 1000, 14, 1000, false",     // [0.000436, 0.026259]
            "27, 1000, 15, 1000, true",      // [-0.000743, 0.025366]
            "27, 1000, 43, 1000, true",      // [-0.032677, 0.000225]
            "27, 1000, 44, 1000, true",      // [-0.033792, -0.000680]: fell
    })
    void aRateIsStillPresentUnlessItRoseBeyondItsSamplingError(long count, long rows,
                                                                                   long previousCount,
                                                                                   long previousRows,
                                                                                   boolean repeat) {
        // The previous run's detail comes back from the results schema as the JSON object it was stored as.
        Finding previous = quality("occupation", FindingKind.BLANK, Map.of("count", previousCount,
                "rows", previousRows));
        Finding now = quality("occupation", FindingKind.BLANK, new Counted(count, rows));
        Finding marked = Repeats.mark(BEFORE, List.of(previous), List.of(now)).get(0);
        assertEquals(repeat, marked.repeat() != null, marked.sentence());
        assertEquals(repeat, !Alerts.worthAPerson(marked));
    }

    /**
     * Every data-quality kind, reported again in the next wave with the same detail: whether it repeats, and why.
     * The detail holds every field any kind reads (a rate and codes), so only the kind decides.
     */
    static final Map<FindingKind, String> AGAIN = new LinkedHashMap<>();

    static {
        // A level with a rate: the same rate has not moved.
        for (FindingKind k : List.of(FindingKind.BLANK, FindingKind.INVISIBLE, FindingKind.PLACEHOLDER,
                FindingKind.PATTERN_OUTLIER, FindingKind.NUMERIC_SENTINEL, FindingKind.OUT_OF_RANGE_SENTINEL,
                FindingKind.TEXT_IN_NUMERIC, FindingKind.SENTINEL_DATE, FindingKind.INLIER_SPIKE,
                FindingKind.OUT_OF_RANGE)) {
            AGAIN.put(k, "STILL_PRESENT");
        }
        // A state of the column: the same state again.
        AGAIN.put(FindingKind.ALL_NULL, "STILL_PRESENT");
        AGAIN.put(FindingKind.CONSTANT, "STILL_PRESENT");
        AGAIN.put(FindingKind.TOO_MANY_DISTINCT, "STILL_PRESENT");
        // The same codes without a label.
        AGAIN.put(FindingKind.CODE_UNLABELLED, "STILL_PRESENT");
        // Never alerted, so there is nothing to hold back.
        AGAIN.put(FindingKind.MISSING_CODE, "not alerted");
        // Changes against the baseline: news each time they are reported.
        for (FindingKind k : List.of(FindingKind.MISSING_RATE_CHANGE, FindingKind.CODE_APPEARED,
                FindingKind.CODE_VANISHED, FindingKind.LABEL_CHANGED, FindingKind.HEAPING,
                FindingKind.DIGIT_PREFERENCE, FindingKind.EMPTY_WAVE, FindingKind.SIGNED_WAVE_CHANGED,
                FindingKind.COLUMN_ADDED, FindingKind.COLUMN_DROPPED, FindingKind.COLUMN_RETYPED,
                FindingKind.INTERVIEWER_OUTLIER, FindingKind.INTERVIEWER_EFFECT)) {
            AGAIN.put(k, "news");
        }
    }

    static Stream<Arguments> dataQualityKinds() {
        return AGAIN.entrySet().stream().map(e -> Arguments.of(e.getKey(), e.getValue()));
    }

    @Test
    void everyDataQualityKindIsDecided() {
        Set<FindingKind> dataQuality = EnumSet.allOf(FindingKind.class).stream().filter(FindingKind::isDataQuality)
                .collect(Collectors.toCollection(() -> EnumSet.noneOf(FindingKind.class)));
        assertEquals(dataQuality, AGAIN.keySet());
    }

    @ParameterizedTest(name = "{0} reported again: {1}")
    @MethodSource("dataQualityKinds")
    void aDataQualityKindReportedAgainUnchanged(FindingKind kind, String expected) {
        Map<String, Object> detail = Map.of("count", 50, "rows", 1000, "codes", List.of("7"), "counts", List.of(50));
        Finding previous = quality("children", kind, detail);
        Finding now = quality("children", kind, detail);
        Finding marked = Repeats.mark(BEFORE, List.of(previous), List.of(now)).get(0);
        switch (expected) {
            case "STILL_PRESENT" -> {
                assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, BEFORE, BEFORE), marked.repeat());
                assertFalse(Alerts.worthAPerson(marked));
            }
            case "news" -> {
                assertSame(now, marked);
                assertTrue(Alerts.worthAPerson(marked));
            }
            default -> {
                assertSame(now, marked);
                assertFalse(Alerts.worthAPerson(marked));
            }
        }
    }

    @ParameterizedTest(name = "previous codes {0}, now {1}: repeat {2}")
    @CsvSource(delimiter = ';', value = {
            "7; 7; true",
            "7,8; 8; true",
            "7; 7,8; false",     // code 8 newly without a label is news
            "8; 7; false",
    })
    void unlabelledCodesAreStillPresentOnlyWhenNoCodeIsNew(String before, String now, boolean repeat) {
        Finding previous = quality("main_activity", FindingKind.CODE_UNLABELLED,
                Map.of("codes", List.of(before.split(","))));
        Finding current = quality("main_activity", FindingKind.CODE_UNLABELLED,
                Map.of("codes", List.of(now.split(","))));
        assertEquals(repeat, Repeats.mark(BEFORE, List.of(previous), List.of(current)).get(0).repeat() != null);
    }

    @Test
    void aRateIsOnlyComparedWithTheSameVariableAndKind() {
        Finding otherVariable = quality("height_cm", FindingKind.NUMERIC_SENTINEL, Map.of("count", 50, "rows", 1000));
        Finding otherKind = quality("children", FindingKind.PLACEHOLDER, Map.of("count", 50, "rows", 1000));
        Finding now = quality("children", FindingKind.NUMERIC_SENTINEL, new Counted(50, 1000));
        assertSame(now, Repeats.mark(BEFORE, List.of(otherVariable, otherKind), List.of(now)).get(0));
    }

    @ParameterizedTest(name = "detail {0}")
    @CsvSource(delimiter = ';', value = {
            "{}",
            "{\"count\": 5}",
            "{\"count\": 5, \"rows\": 0}",
            "{\"count\": 50, \"rows\": 40}",
            "{\"count\": -1, \"rows\": 40}",
            "{\"count\": \"5\", \"rows\": \"40\"}",
            "{\"count\": 2.5, \"rows\": 40}",
    })
    void aDetailWithoutAUsableRateIsNeverARepeatAndNeverACrash(String json) {
        Object bad = org.wavewarden.deliver.Json.read(json, Object.class);
        Finding previous = quality("children", FindingKind.NUMERIC_SENTINEL, bad);
        Finding now = quality("children", FindingKind.NUMERIC_SENTINEL, bad);
        assertNull(Repeats.mark(BEFORE, List.of(previous), List.of(now)).get(0).repeat());
    }

    @ParameterizedTest(name = "{0} then {3}: repeat {6}")
    @CsvSource({
            // previous verdict, estimate, half-width; current verdict, estimate, half-width; repeat (T = 0.2)
            "UNCERTAIN, 0.10, 0.35, UNCERTAIN, 0.39, 0.47, true",   // both intervals wider than the band
            "UNCERTAIN, 0.10, 0.15, UNCERTAIN, 0.15, 0.35, false",  // the previous wave could resolve T
            "UNCERTAIN, 0.10, 0.35, UNCERTAIN, 0.15, 0.15, false",  // this wave can: not a repeat (and resolvable)
            "STABLE,    0.01, 0.15, UNCERTAIN, 0.10, 0.35, false",  // the verdict changed
            "MATERIAL,  0.60, 0.35, UNCERTAIN, 0.10, 0.35, false",
            "UNCERTAIN, 0.10, 0.35, MATERIAL,  0.60, 0.35, false",
    })
    void aVariableTooSmallToJudgeAlertsOnlyWhenItsStateChanges(Verdict was, double wasEstimate, double wasHalf,
                                                              Verdict is, double isEstimate, double isHalf,
                                                              boolean repeat) {
        Finding previous = shift("mooring_fee", was, wasEstimate, wasHalf);
        Finding now = shift("mooring_fee", is, isEstimate, isHalf);
        Finding marked = Repeats.mark(BEFORE, List.of(previous), List.of(now)).get(0);
        assertEquals(repeat ? new Finding.Repeat(Finding.Repeat.Kind.STILL_UNRESOLVABLE, BEFORE, BEFORE) : null,
                marked.repeat());
        if (repeat) {
            assertEquals(now.sentence() + " Too few answers to judge since wave 2025-Q1: the smallest change these"
                    + " waves could show (0.470) is larger than the threshold (0.200), as in wave 2025-Q1; no new"
                    + " alert.", marked.sentence());
        }
    }

    @Test
    void aMissingRateThatCannotBeResolvedIsStillUnresolvableLikeAShift() {
        Finding.Effect wide = new Finding.Effect("Cohen's h", 0.05, -0.3, 0.4, 0.2);
        Finding previous = new Finding("mooring_fee", FindingKind.MISSING_RATE_CHANGE, "z", 1.0, 0.5, 0.6, wide,
                Verdict.UNCERTAIN, 40L, 40L, "The missing rate moved.", null);
        Finding marked = Repeats.mark(BEFORE, List.of(previous), List.of(previous)).get(0);
        assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_UNRESOLVABLE, BEFORE, BEFORE), marked.repeat());
        assertEquals("The missing rate moved. Too few answers to judge since wave 2025-Q1: the smallest change these"
                + " waves could show (0.350) is larger than the threshold (0.200), as in wave 2025-Q1; no new alert.",
                marked.sentence());
        assertFalse(Alerts.worthAPerson(marked));
    }

    @Test
    void theFirstWaveIsCarriedAlongAnUnbrokenRunOfRepeats() {
        Finding first = quality("occupation", FindingKind.BLANK, Map.of("count", 235, "rows", 2500));
        Finding second = Repeats.mark("2024-Q2", List.of(first),
                List.of(quality("occupation", FindingKind.BLANK, new Counted(240, 2500)))).get(0);
        assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, "2024-Q2", "2024-Q2"), second.repeat());
        Finding third = Repeats.mark("2024-Q3", List.of(second),
                List.of(quality("occupation", FindingKind.BLANK, new Counted(238, 2500)))).get(0);
        assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_PRESENT, "2024-Q3", "2024-Q2"), third.repeat());
        assertEquals("Some rows look like missing values. Still present since wave 2024-Q2: unchanged from wave"
                + " 2024-Q3 (its rate has not moved beyond sampling error); no new alert.", third.sentence());
    }

    @Test
    void aRateThatFellSaysSo() {
        // the demo's blank occupations, 432 of 4200 then 337 of 3800: Newcombe's interval of the rise, computed in
        // R 4.2.2 as in NewcombeDifferenceTest, is [-0.027046, -0.001235]
        Finding previous = quality("occupation", FindingKind.BLANK, Map.of("count", 432, "rows", 4200));
        Finding marked = Repeats.mark("2025-Q2", List.of(previous),
                List.of(quality("occupation", FindingKind.BLANK, new Counted(337, 3800)))).get(0);
        assertEquals("Some rows look like missing values. Still present since wave 2025-Q2: lower than in wave"
                + " 2025-Q2 (its rate fell beyond sampling error); no new alert.", marked.sentence());
    }

    @Test
    void withoutOneComparedWaveNothingIsARepeat() {
        Finding f = quality("occupation", FindingKind.BLANK, new Counted(235, 2500));
        List<Finding> now = List.of(f);
        assertSame(now, Repeats.mark(null, List.of(f), now), "a pooled baseline or none");
        assertSame(now, Repeats.mark(BEFORE, List.of(), now), "a previous wave without findings");
    }

    @Test
    void aRepeatStaysInTheFindingsButRaisesNoAlert() {
        Finding previous = quality("occupation", FindingKind.BLANK, Map.of("count", 235, "rows", 2500));
        Finding sentinel = quality("children", FindingKind.NUMERIC_SENTINEL, new Counted(40, 2500));
        List<Finding> marked = Repeats.mark(BEFORE, List.of(previous),
                List.of(quality("occupation", FindingKind.BLANK, new Counted(235, 2500)), sentinel));
        assertEquals(2, marked.size());
        assertEquals(List.of("children"), Alerts.group(marked).stream().map(a -> a.variable()).toList());
    }
}
