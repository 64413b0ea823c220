package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.CompareWith;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Alerts;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

/**
 * A finding's baseline is part of what it is: findings of one variable against the previous wave and against the
 * same quarter a year back raise separate alerts, and each repeats only its own kind of the previous wave's run.
 */
class BaselinesApartTest {

    static final String BEFORE = "2025-Q1";
    static final String SEASON_NOW = "2024-Q2 (4 waves back)";
    static final String SEASON_BEFORE = "2024-Q1 (4 waves back)";

    /** UNCERTAIN, and an interval too wide to resolve the threshold 0.2: a repeat when it was so before. */
    static Finding unresolvable(String against) {
        return RepeatsTest.shift("heating_hours", Verdict.UNCERTAIN, 0.10, 0.35).withAgainst(against);
    }

    @Test
    void aSeasonalAndAPreviousWaveShiftOfOneVariableAreTwoAlerts() {
        Finding previousWave = RepeatsTest.shift("heating_hours", Verdict.MATERIAL, 0.9, 0.1);
        Finding seasonal = RepeatsTest.shift("heating_hours", Verdict.MATERIAL, 0.5, 0.1).withAgainst(SEASON_NOW);
        List<Alert> alerts = Alerts.group(List.of(previousWave, seasonal));
        assertEquals(2, alerts.size());
        assertEquals(List.of(previousWave), alerts.get(0).facets());
        assertEquals(List.of(seasonal), alerts.get(1).facets());
        assertNull(alerts.get(0).against());
        assertEquals(SEASON_NOW, alerts.get(1).against());
    }

    @Test
    void findingsOfOneVariableAgainstOneBaselineStayOneEvent() {
        Finding shift = RepeatsTest.shift("heating_hours", Verdict.MATERIAL, 0.9, 0.1).withAgainst(SEASON_NOW);
        Finding shape = new Finding("heating_hours", FindingKind.SHAPE_CHANGE, "KS", 0.3, 0.001, 0.002,
                new Finding.Effect("KS D", 0.3, 0.2, 0.4, 0.1), Verdict.MATERIAL, 500L, 500L, "The shape changed.",
                null).withAgainst(SEASON_NOW);
        List<Alert> alerts = Alerts.group(List.of(shift, shape));
        assertEquals(1, alerts.size());
        assertEquals(2, alerts.get(0).facets().size());
    }

    @Test
    void aSeasonalFindingRepeatsTheSeasonalFindingOfThePreviousWaveRun() {
        Finding marked = Repeats.mark(BEFORE, List.of(unresolvable(SEASON_BEFORE)), List.of(unresolvable(SEASON_NOW)))
                .get(0);
        assertEquals(new Finding.Repeat(Finding.Repeat.Kind.STILL_UNRESOLVABLE, BEFORE, BEFORE), marked.repeat());
        assertEquals(SEASON_NOW, marked.against());
    }

    @Test
    void findingsOfDifferentBaselinesNeverRepeatEachOther() {
        List<Finding> marked = Repeats.mark(BEFORE, List.of(unresolvable(SEASON_BEFORE)),
                List.of(unresolvable(null)));
        assertNull(marked.get(0).repeat(), "a previous-wave finding is not a repeat of a seasonal one");
        marked = Repeats.mark(BEFORE, List.of(unresolvable(null)), List.of(unresolvable(SEASON_NOW)));
        assertNull(marked.get(0).repeat(), "a seasonal finding is not a repeat of a previous-wave one");
        marked = Repeats.mark(BEFORE, List.of(unresolvable(null), unresolvable(SEASON_BEFORE)),
                List.of(unresolvable(null), unresolvable(SEASON_NOW), unresolvable("2023-Q2 (8 waves back)")));
        assertEquals(List.of(true, true, false), marked.stream().map(f -> f.repeat() != null).toList());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
            "2024-Q1 (4 waves back)           | 4 waves back     | 2024-Q1          | against 2024-Q1, 4 waves back",
            "2024-Q4 (1 wave back)            | 1 wave back      | 2024-Q4          | against 2024-Q4, 1 wave back",
            "pooled 2024-Q1 .. 2024-Q3 (last 3 waves pooled) | last 3 waves pooled | pooled 2024-Q1 .. 2024-Q3"
                    + " | against pooled 2024-Q1 .. 2024-Q3, last 3 waves pooled",
            "wave (2) (fixed baseline)        | fixed baseline   | wave (2)         | against wave (2), fixed baseline",
            "2024-Q1                          | 2024-Q1          | 2024-Q1          | against 2024-Q1",
    })
    void aBaselineNameSplitsIntoItsWavesAndItsRule(String against, String rule, String waves, String phrase) {
        assertEquals(rule, Against.rule(against));
        assertEquals(waves, Against.wavesOf(against));
        assertEquals(phrase, Against.phrase(against));
    }

    @Test
    void theMainBaselineHasNoName() {
        assertNull(Against.rule(null));
        assertEquals("", Against.phrase(null));
    }

    @Test
    void labelsAreMadeFromTheRuleAndItsWaves() {
        assertEquals("2024-Q1 (4 waves back)", Against.label(List.of("2024-Q1"), new CompareWith.SameWaveBack(4)));
        assertEquals("2024-Q4 (previous wave)", Against.label(List.of("2024-Q4"), CompareWith.PREVIOUS));
        assertEquals("2023-Q1 (fixed baseline)", Against.label(List.of("2023-Q1"), new CompareWith.Baseline("2023-Q1")));
        assertEquals("pooled 2024-Q2 .. 2024-Q4 (last 3 waves pooled)", Against.label(List.of("2024-Q2", "2024-Q3",
                "2024-Q4"), new CompareWith.PooledLast(3)));
        assertEquals("2025-Q1 + 2024-Q2 (4 waves back) + 2023-Q2 (8 waves back)", Against.runLabel("2025-Q1",
                List.of("2024-Q2 (4 waves back)", "2023-Q2 (8 waves back)")));
        assertEquals("2025-Q1", Against.runLabel("2025-Q1", List.of()));
        assertNull(Against.runLabel(null, List.of()));
    }
}
