package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.config.Breakdowns;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.WaveProfile;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Which findings are broken down, by which number, how the breakdowns' tests are adjusted together, and what the
 * sentence then says. The breakdown statistics themselves are {@code compare.domain}'s; here they are the seam's
 * input, so these rules are specified on their own.
 */
class WhereItChangedTest {

    private static final VariableConfig HEIGHT = new VariableConfig("height_cm", VariableKind.CONTINUOUS, "cm",
            new RangeSpec(50.0, 250.0), List.of(new MissingCodeSpec("-1", "refused")), null, null, List.of(), null,
            null);
    private static final VariableConfig WEIGHT = new VariableConfig("weight_kg", VariableKind.CONTINUOUS, "kg", null,
            List.of(), null, null, List.of(), null, null);
    private static final VariableConfig CAR = new VariableConfig("owns_car", VariableKind.BINARY, null, null,
            List.of(), null, "yes", List.of(), null, null);
    private static final VariableConfig TENURE = new VariableConfig("tenure", VariableKind.CATEGORICAL, null, null,
            List.of(), null, null, List.of(), null, null);
    private static final List<VariableConfig> VARIABLES = List.of(HEIGHT, WEIGHT, CAR, TENURE);

    private static final ScreenedWave BEFORE = ScreenedWave.screen("2025-Q1", tallies(false), null, VARIABLES,
            List.of());
    private static final ScreenedWave AFTER = ScreenedWave.screen("2025-Q2", tallies(true), null, VARIABLES,
            List.of());

    /** Two waves of 1,000 rows; the later one has more 999s in weight_kg and a moved tenure. */
    private static Map<String, ColumnTally> tallies(boolean after) {
        Map<String, ColumnTally> t = new LinkedHashMap<>();
        Map<String, Long> height = new LinkedHashMap<>();
        for (int cm = 150; cm < 200; cm++) {
            height.put(String.valueOf(cm), 19L);
        }
        height.put("-1", 20L);
        height.put("999", 20L);
        t.put("height_cm", new ColumnTally("height_cm", ColumnType.INTEGER, 1000, 10, height, false));
        Map<String, Long> weight = new LinkedHashMap<>();
        for (int kg = 55; kg < 95; kg++) {
            weight.put(String.valueOf(kg), after ? 24L : 25L);
        }
        if (after) {
            weight.put("999", 40L);
        }
        t.put("weight_kg", new ColumnTally("weight_kg", ColumnType.INTEGER, 1000, 0, weight, false));
        t.put("owns_car", new ColumnTally("owns_car", ColumnType.TEXT, 1000, 0,
                Map.of("yes", after ? 700L : 600L, "no", after ? 300L : 400L), false));
        t.put("tenure", new ColumnTally("tenure", ColumnType.TEXT, 1000, 0, after
                ? Map.of("owner", 450L, "renter", 250L, "other", 300L)
                : Map.of("owner", 500L, "renter", 400L, "other", 100L), false));
        return t;
    }

    private static Finding shift(String variable, Verdict verdict) {
        return new Finding(variable, FindingKind.SHIFT, "test", 1.0, 0.001, 0.002, null, verdict, 1000L, 1000L,
                "The share moved.", null);
    }

    private static Finding quality(String variable, FindingKind kind) {
        return Finding.dataQuality(variable, kind, 1000L, 1000L, "Something is odd.", null);
    }

    // ---- which number a finding is broken down by ----------------------------------------------------------------

    @Test
    void aBinaryShiftIsBrokenDownByTheShareOfItsSuccessValueAmongTheValidAnswers() {
        DomainMeasure m = WhereItChanged.measure(shift("owns_car", Verdict.MATERIAL), BEFORE, AFTER).orElseThrow();
        assertEquals(DomainMeasure.Kind.SHARE, m.kind());
        assertEquals(Set.of("yes"), m.target());
        assertEquals("share answering 'yes'", m.label());
        assertEquals("points", m.unit());
    }

    @Test
    void aCategoricalShiftIsBrokenDownByTheCategoryWhoseShareMovedMostAndNamesIt() {
        // owner 50% -> 45%, renter 40% -> 25%, other 10% -> 30%: other moved most (+20 points).
        DomainMeasure m = WhereItChanged.measure(shift("tenure", Verdict.UNCERTAIN), BEFORE, AFTER).orElseThrow();
        assertEquals(DomainMeasure.Kind.SHARE, m.kind());
        assertEquals(Set.of("other"), m.target());
        assertEquals("share of 'other'", m.label());
    }

    @Test
    void aContinuousShiftIsBrokenDownByItsMeanLeavingOutWhatTheWholeWavesComparisonLeftOut() {
        DomainMeasure m = WhereItChanged.measure(shift("height_cm", Verdict.MATERIAL), BEFORE, AFTER).orElseThrow();
        assertEquals(DomainMeasure.Kind.MEAN, m.kind());
        assertEquals("cm", m.unit());
        // the codebook code and the value outside the declared range, as the screen left them out
        assertTrue(m.excluded().containsAll(Set.of("-1", "999")), m.excluded().toString());
        assertFalse(m.excluded().contains("170"), m.excluded().toString());
    }

    @ParameterizedTest(name = "{0} {1}: not broken down")
    @CsvSource({
            "SHIFT,       MINOR,     owns_car",
            "SHIFT,       STABLE,    owns_car",
            "PANEL_SHIFT, MATERIAL,  owns_car",
            "SHAPE_CHANGE, MATERIAL, height_cm",
            "MISSING_RATE_CHANGE, STABLE, height_cm",
            "MISSING_RATE_CHANGE, CLEARED, height_cm",
    })
    void findingsThatAreNotWorthALookOrNotAboutTheSameTalliesAreNotBrokenDown(FindingKind kind, Verdict verdict,
                                                                            String variable) {
        Finding f = new Finding(variable, kind, "test", 1.0, 0.5, 0.5, null, verdict, 1000L, 1000L, "s", null);
        assertEquals(Optional.empty(), WhereItChanged.measure(f, BEFORE, AFTER));
    }

    @ParameterizedTest(name = "{0} of {1}: the rate of {2}")
    @CsvSource({
            "MISSING_CODE,     height_cm, -1",
            "OUT_OF_RANGE,     height_cm, 999",
            "NUMERIC_SENTINEL, weight_kg, 999",
    })
    void aDataQualityFindingIsBrokenDownByTheUnweightedRateOfItsOffendingValues(FindingKind kind, String variable,
                                                                                String offending) {
        DomainMeasure m = WhereItChanged.measure(quality(variable, kind), BEFORE, AFTER).orElseThrow();
        assertEquals(DomainMeasure.Kind.RATE, m.kind());
        assertEquals(Set.of(offending), m.target());
        assertEquals("share of rows holding '" + offending + "'", m.label());
    }

    @Test
    void aMissingRateChangeIsBrokenDownByTheRateOfEveryMissingAnswerNullsIncluded() {
        Finding f = new Finding("height_cm", FindingKind.MISSING_RATE_CHANGE, "z", 3.0, 0.001, 0.002, null,
                Verdict.MATERIAL, 1000L, 1000L, "More missing.", null);
        DomainMeasure m = WhereItChanged.measure(f, BEFORE, AFTER).orElseThrow();
        assertEquals(DomainMeasure.Kind.RATE, m.kind());
        assertTrue(m.target().containsAll(Set.of(DomainMeasure.NULL, "-1", "999")), m.target().toString());
        assertFalse(m.target().contains("170"));
    }

    @Test
    void findingsAboutTheWholeColumnHaveNoRowsToPlaceInADomain() {
        for (FindingKind k : List.of(FindingKind.HEAPING, FindingKind.CONSTANT, FindingKind.ALL_NULL,
                FindingKind.COLUMN_ADDED, FindingKind.LABEL_CHANGED)) {
            assertEquals(Optional.empty(), WhereItChanged.measure(quality("height_cm", k), BEFORE, AFTER), k.name());
        }
    }

    // ---- the run's breakdowns: which are made, one false-discovery family --------------------------------------

    private static final WaveProfile P_BEFORE = new WaveProfile("2025-Q1", 1000, Map.of(), Map.of());
    private static final WaveProfile P_AFTER = new WaveProfile("2025-Q2", 1000, Map.of(), Map.of());

    private static Breakdowns columns(String... columns) {
        return new Breakdowns(List.of(columns), 500, null, 20, List.of(), 0.02, 5000);
    }

    /** A breakdown whose first-ranked domain moved by {@code top} and the rest by {@code elsewhere} (points / 100). */
    static Breakdown breakdown(String column, DomainMeasure.Kind kind, String unit, String domain, double top,
                               double elsewhere, double overall, double p) {
        DomainChange first = new DomainChange(domain, 200, 200, 0.5, 0.5 + top, top, 0.02, top - 0.04, top + 0.04,
                0.0001, 0.0005, 0.2, 0.2, 0.2 * top);
        DomainChange rest = new DomainChange("OTHER", 800, 800, 0.5, 0.5 + elsewhere, elsewhere, 0.01,
                elsewhere - 0.02, elsewhere + 0.02, 0.3, 0.3, 0.8, 0.8, 0.8 * elsewhere);
        return new Breakdown(column, "v", "share answering 'yes'", kind, unit, "unweighted", List.of(first, rest),
                overall, 0, 20, 1, p, null, elsewhere, List.of(), 0, 0, 0);
    }

    @Test
    void everyBreakdownOfTheRunIsOneFalseDiscoveryFamilyAndAVariableIsNotBrokenDownByItsOwnColumn() {
        List<String> asked = new ArrayList<>();
        // p-values in the order the breakdowns are made; owns_car is a breakdown column too, so weight_kg is broken
        // down by it, and owns_car is not broken down by itself.
        double[] p = {0.001, 0.04, 0.03, 0.2, 0.5};
        WhereItChanged.BreakdownMaker maker = (column, measure, b, c, weighted, confidence) -> {
            asked.add(measure.variable() + " by " + column);
            assertEquals(0.95, confidence, 1e-12);
            return Optional.of(breakdown(column, DomainMeasure.Kind.SHARE, "points", "KES", 0.18, 0.01, 0.044,
                    p[asked.size() - 1]));
        };
        List<Finding> findings = List.of(shift("owns_car", Verdict.MATERIAL), shift("owns_car", Verdict.MINOR),
                quality("weight_kg", FindingKind.NUMERIC_SENTINEL));
        WhereItChanged.Result r = WhereItChanged.attach(findings, P_BEFORE, P_AFTER, BEFORE, AFTER,
                columns("district", "owns_car", "interview_mode"), false, 0.05, maker);
        assertEquals(List.of("owns_car by district", "owns_car by interview_mode", "weight_kg by district",
                "weight_kg by owns_car", "weight_kg by interview_mode"), asked);
        // R 4.2.2: p.adjust(c(0.001, 0.04, 0.03, 0.2, 0.5), "BH") = 0.005, 0.06666667, 0.06666667, 0.25, 0.5
        double[] q = {0.005, 0.0666666666666667, 0.0666666666666667, 0.25, 0.5};
        List<Breakdown> made = new ArrayList<>(r.findings().get(0).breakdowns());
        made.addAll(r.findings().get(2).breakdowns());
        for (int i = 0; i < q.length; i++) {
            assertEquals(q[i], made.get(i).qValue(), 1e-12, asked.get(i));
        }
        assertEquals(List.of(), r.findings().get(1).breakdowns(), "a MINOR shift is not broken down");
        assertEquals("The share moved. The rise is concentrated in district KES (+18.0 points; elsewhere +1.0);"
                + " the change differs across districts (q = 0.005).", r.findings().get(0).sentence());
        assertEquals("Something is odd.", r.findings().get(2).sentence(), "q = 0.067 and above: none below alpha");
        assertEquals(List.of(), r.notes());
    }

    @Test
    void aBreakdownThatFailsCostsThatBreakdownOnlyAndTheNotesSaySo() {
        WhereItChanged.BreakdownMaker maker = (column, measure, b, c, weighted, confidence) -> {
            if (column.equals("district")) {
                throw new IllegalStateException("no answers");
            }
            return Optional.of(breakdown(column, DomainMeasure.Kind.SHARE, "points", "telephone", 0.1, 0.0, 0.03,
                    0.2));
        };
        WhereItChanged.Result r = WhereItChanged.attach(List.of(shift("owns_car", Verdict.MATERIAL)), P_BEFORE,
                P_AFTER, BEFORE, AFTER, columns("district", "interview_mode"), false, 0.05, maker);
        assertEquals(List.of("interview_mode"), r.findings().get(0).breakdowns().stream().map(Breakdown::column)
                .toList());
        assertEquals(List.of("SHIFT of owns_car could not be broken down by district (IllegalStateException)."),
                r.notes());
    }

    @Test
    void aFirstWaveADatasetWithoutBreakdownsOrAFindingAgainstAnotherBaselineIsLeftAsItIs() {
        WhereItChanged.BreakdownMaker never = (column, measure, b, c, weighted, confidence) -> {
            throw new AssertionError("no breakdown is asked for");
        };
        List<Finding> findings = List.of(shift("owns_car", Verdict.MATERIAL));
        assertEquals(findings, WhereItChanged.attach(findings, null, P_AFTER, null, AFTER, columns("district"),
                false, 0.05, never).findings());
        assertEquals(findings, WhereItChanged.attach(findings, P_BEFORE, P_AFTER, BEFORE, AFTER, Breakdowns.NONE,
                false, 0.05, never).findings());
        List<Finding> seasonal = List.of(shift("owns_car", Verdict.MATERIAL).withAgainst("2024-Q2, 4 waves back"));
        assertEquals(seasonal, WhereItChanged.attach(seasonal, P_BEFORE, P_AFTER, BEFORE, AFTER,
                columns("district"), false, 0.05, never).findings(), "made against another baseline than these");
    }

    // ---- the sentence ------------------------------------------------------------------------------------------

    @ParameterizedTest(name = "{0}: {8}")
    @CsvSource(delimiter = '|', value = {
            // column | kind | unit | domain | top | elsewhere | overall | q | what the sentence adds
            "district | SHARE | points | KES | 0.18 | 0.01 | 0.044 | 0.0004 | The rise is concentrated in district KES (+18.0 points; elsewhere +1.0); the change differs across districts (q < 0.001).",
            "district | RATE | points | GUL | -0.05 | -0.002 | -0.012 | 0.012 | The fall is concentrated in district GUL (-5.0 points; elsewhere -0.2); the change differs across districts (q = 0.012).",
            "interview_mode | MEAN | cm | telephone | 3.5 | 0.25 | 1.1 | 0.03 | The rise in the mean is concentrated in interview mode telephone (+3.50 cm; elsewhere +0.25); the change differs across interview modes (q = 0.03).",
            "city | SHARE | points | Ashby | -0.06 | 0.03 | 0.01 | 0.001 | The change differs across cities (q = 0.001): city Ashby carries most of it (-6.0 points; elsewhere +3.0).",
            "district | SHARE | points | KES | 0.18 | 0.01 | 0.044 | 0.05 | ",
            "district | SHARE | points | KES | 0.18 | 0.01 | 0.044 | 0.2 | ",
    })
    void theSentenceSaysWhereWhenTheChangeDiffersAcrossDomainsAndNothingOtherwise(String column,
                                                                                 DomainMeasure.Kind kind,
                                                                                 String unit, String domain,
                                                                                 double top, double elsewhere,
                                                                                 double overall, double q,
                                                                                 String added) {
        Breakdown b = breakdown(column, kind, unit, domain, top, elsewhere, overall, q).withQValue(q);
        String expected = added == null ? "Base." : "Base. " + added;
        assertEquals(expected, WhereItChanged.sentence("Base.", List.of(b), 0.05));
    }

    @Test
    void severalSignificantBreakdownsAreNamedMostSignificantFirst() {
        Breakdown mode = breakdown("interview_mode", DomainMeasure.Kind.SHARE, "points", "web", 0.1, 0.01, 0.04,
                0.01).withQValue(0.01);
        Breakdown district = breakdown("district", DomainMeasure.Kind.SHARE, "points", "KES", 0.18, 0.01, 0.044,
                0.0004).withQValue(0.0004);
        String s = WhereItChanged.sentence("Base.", List.of(mode, district), 0.05);
        assertTrue(s.indexOf("district KES") < s.indexOf("interview mode web"), s);
    }

    @ParameterizedTest
    @CsvSource({"district, districts", "interview mode, interview modes", "city, cities", "address, addresses",
            "survey day, survey days", "box, boxes"})
    void domainColumnsArePluralisedAsPlainEnglish(String words, String plural) {
        assertEquals(plural, WhereItChanged.plural(words));
    }
    /** 80 of KES's 400 rows hold 999 in the second wave; no other row of either wave does. */
    private static Breakdown keyedInOneDistrict(long nullRows, long otherBefore) {
        DomainChange kes = new DomainChange("KES", 400, 400, 0, 0.2, 0.2, 0.02, 0.16, 0.24, 1e-20, 1e-19, 1 / 6.0,
                1 / 6.0, 0.2 / 6);
        DomainChange gul = new DomainChange("GUL", 400, 400, otherBefore / 400.0, 0, -otherBefore / 400.0, 0, 0, 0,
                Double.NaN, Double.NaN, 5 / 6.0, 5 / 6.0, 0);
        return new Breakdown("district", "weight_kg", "share of rows holding '999'", DomainMeasure.Kind.RATE,
                "points", "unweighted", List.of(kes, gul), 80 / 2400.0, 0, 0, 0, 1, null, 0.0, List.of(), nullRows,
                0, 0).withQValue(1);
    }

    @Test
    void offendingRowsAllInOneDomainAreNamedByTheirCountsWhereTheTestHasNothingToCompare() {
        assertEquals("Base. All 80 rows holding '999' in this wave are in district KES (20.0% of its rows; none"
                + " elsewhere in either wave).", WhereItChanged.sentence("Base.", List.of(keyedInOneDistrict(0, 0)),
                0.05));
        assertEquals("Base.", WhereItChanged.sentence("Base.", List.of(keyedInOneDistrict(12, 0)), 0.05),
                "rows with no district could hold more");
        assertEquals("Base.", WhereItChanged.sentence("Base.", List.of(keyedInOneDistrict(0, 4)), 0.05),
                "another district held some before");
    }
}
