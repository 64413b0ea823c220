package org.wavewarden.deliver;

import org.junit.jupiter.api.Test;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;

class AlertsTest {

    static Finding judged(String variable, FindingKind kind, Verdict verdict, double effect) {
        return new Finding(variable, kind, "test", 1.0, 0.001, 0.002,
                new Finding.Effect("effect", effect, effect - 0.1, effect + 0.1, 0.2), verdict, 100L, 100L,
                kind + " of " + variable, null);
    }

    static Finding quality(String variable, FindingKind kind) {
        return Finding.dataQuality(variable, kind, 100L, 100L, kind + " in " + variable, null);
    }

    @Test
    void aPairedAndAWeightedShiftOfOneVariableAreOneAlertWithTwoFacetsTheStrongerFirst() {
        Finding paired = judged("employment_status", FindingKind.PANEL_SHIFT, Verdict.MATERIAL, 0.9);
        Finding weighted = judged("employment_status", FindingKind.SHIFT, Verdict.MATERIAL, 0.5);
        List<Alert> alerts = Alerts.group(List.of(weighted, paired));
        assertEquals(1, alerts.size());
        assertEquals(List.of(paired, weighted), alerts.get(0).facets());
        assertEquals(List.of(Alert.Facet.PAIRED, Alert.Facet.DISTRIBUTION),
                alerts.get(0).facets().stream().map(f -> Alert.Facet.of(f.kind())).toList());
    }

    @Test
    void aSentinelAndTheMissingRateChangeItCausesAreOneAlertLedByTheVerdict() {
        Finding sentinel = quality("height_cm", FindingKind.NUMERIC_SENTINEL);
        Finding rate = judged("height_cm", FindingKind.MISSING_RATE_CHANGE, Verdict.MATERIAL, 0.4);
        List<Alert> alerts = Alerts.group(List.of(sentinel, rate));
        assertEquals(1, alerts.size());
        assertSame(rate, alerts.get(0).lead());
        assertEquals(List.of(FindingKind.NUMERIC_SENTINEL), alerts.get(0).otherKinds());
    }

    @Test
    void findingsNotWorthAPersonAreNoFacet() {
        Finding shift = judged("income", FindingKind.SHIFT, Verdict.MATERIAL, 0.5);
        List<Alert> alerts = Alerts.group(List.of(shift,
                judged("income", FindingKind.PANEL_SHIFT, Verdict.MINOR, 0.1),
                judged("income", FindingKind.MISSING_RATE_CHANGE, Verdict.STABLE, 0.0),
                quality("income", FindingKind.MISSING_CODE),
                quality("income", FindingKind.SKIPPED)));
        assertEquals(List.of(Alert.of(shift)), alerts);
    }

    @Test
    void aRelationshipAndAWholeWaveFindingAreAlertsOfTheirOwnEvenWhenNamedLikeAColumn() {
        Finding column = judged("(wave)", FindingKind.SHIFT, Verdict.MATERIAL, 0.5);
        Finding empty = quality("(wave)", FindingKind.EMPTY_WAVE);
        Finding relation = judged("(wave)", FindingKind.RELATIONSHIP_CHANGE, Verdict.MATERIAL, 0.3);
        List<Alert> alerts = Alerts.group(List.of(empty, relation, column));
        assertEquals(List.of(Alert.of(column), Alert.of(relation), Alert.of(empty)), alerts);
    }

    @Test
    void alertsAreInTheOrderOfTheirLeadsAndEveryAlertFindingIsInExactlyOneAlert() {
        Random rnd = new Random(20261202L);
        FindingKind[] kinds = {FindingKind.SHIFT, FindingKind.PANEL_SHIFT, FindingKind.SHAPE_CHANGE,
                FindingKind.REFERENCE, FindingKind.MISSING_RATE_CHANGE, FindingKind.PLACEHOLDER,
                FindingKind.NUMERIC_SENTINEL, FindingKind.CODE_APPEARED, FindingKind.RELATIONSHIP_CHANGE};
        for (int round = 0; round < 50; round++) {
            List<Finding> findings = new ArrayList<>();
            for (String v : List.of("a", "b", "c", "d")) {
                for (FindingKind k : kinds) {
                    if (rnd.nextBoolean()) {
                        findings.add(k.isDataQuality() && k != FindingKind.MISSING_RATE_CHANGE ? quality(v, k)
                                : judged(v, k, Verdict.values()[rnd.nextInt(Verdict.values().length)],
                                rnd.nextDouble()));
                    }
                }
            }
            Collections.shuffle(findings, rnd);
            List<Alert> alerts = Alerts.group(findings);
            assertEquals(Alerts.select(findings).size(), alerts.stream().mapToInt(a -> a.facets().size()).sum());
            assertEquals(FindingsFiles.ordered(alerts.stream().map(Alert::lead).toList()),
                    alerts.stream().map(Alert::lead).toList());
            for (Alert a : alerts) {
                assertEquals(FindingsFiles.ordered(a.facets()), a.facets());
            }
            assertEquals(alerts, Alerts.group(FindingsFiles.ordered(findings)), "the input order does not matter");
        }
    }

    @Test
    void anAlertHasAtLeastOneFinding() {
        assertThrows(IllegalArgumentException.class, () -> new Alert(List.of()));
    }
}
