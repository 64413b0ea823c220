package org.wavewarden.judge;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The verdict rule of the design at its four corners and on each boundary. */
class VerdictRuleTest {

    static final double ALPHA = 0.05;
    static final double T = 0.2;

    static EffectSize effect(double estimate, double lo, double hi) {
        return new EffectSize("Hedges' g", estimate, lo, hi, 0.95);
    }

    @Test
    void significantAndAtLeastTheThresholdIsMaterial() {
        assertEquals(Verdict.MATERIAL, VerdictRule.judge(0.001, effect(0.45, 0.38, 0.52), T, ALPHA));
        assertEquals(Verdict.MATERIAL, VerdictRule.judge(0.001, effect(-0.45, -0.52, -0.38), T, ALPHA));
    }

    @Test
    void significantButBelowTheThresholdIsMinor() {
        assertEquals(Verdict.MINOR, VerdictRule.judge(0.0001, effect(0.08, 0.04, 0.12), T, ALPHA));
    }

    @Test
    void notSignificantWithAnIntervalReachingTheThresholdIsUncertain() {
        assertEquals(Verdict.UNCERTAIN, VerdictRule.judge(0.3, effect(0.4, -0.1, 0.9), T, ALPHA));
        assertEquals(Verdict.UNCERTAIN, VerdictRule.judge(0.3, effect(-0.05, -0.25, 0.15), T, ALPHA));
    }

    @Test
    void notSignificantWithAnIntervalInsideTheThresholdIsStable() {
        assertEquals(Verdict.STABLE, VerdictRule.judge(0.6, effect(0.01, -0.05, 0.07), T, ALPHA));
    }

    @Test
    void qEqualToAlphaIsNotSignificant() {
        assertEquals(Verdict.STABLE, VerdictRule.judge(0.05, effect(0.01, -0.05, 0.07), T, ALPHA));
        assertEquals(Verdict.MINOR, VerdictRule.judge(Math.nextDown(0.05), effect(0.01, 0.001, 0.07), T, ALPHA));
    }

    @Test
    void effectExactlyAtTheThresholdMatters() {
        assertEquals(Verdict.MATERIAL, VerdictRule.judge(0.01, effect(0.2, 0.1, 0.3), T, ALPHA));
        assertEquals(Verdict.MINOR, VerdictRule.judge(0.01, effect(Math.nextDown(0.2), 0.1, 0.3), T, ALPHA));
    }

    @Test
    void anIntervalTouchingTheThresholdDoesNotShowEquivalence() {
        // Equivalence needs the interval strictly inside (-T, T).
        assertEquals(Verdict.UNCERTAIN, VerdictRule.judge(0.5, effect(0.0, -0.1, 0.2), T, ALPHA));
        assertEquals(Verdict.UNCERTAIN, VerdictRule.judge(0.5, effect(0.0, -0.2, 0.1), T, ALPHA));
        assertEquals(Verdict.STABLE, VerdictRule.judge(0.5, effect(0.0, -0.1, Math.nextDown(0.2)), T, ALPHA));
    }

    static EffectSize points(double estimate, double lo, double hi) {
        return new EffectSize("risk difference", estimate, lo, hi, 0.95);
    }

    @Test
    void aMaterialChangeWhoseSharesIntervalIncludesNoChangeIsUncertain() {
        assertEquals(Verdict.UNCERTAIN, VerdictRule.judge(0.04, effect(0.45, 0.003, 1.15), T, ALPHA,
                points(0.23, -0.0006, 0.48)));
        assertEquals(Verdict.MATERIAL, VerdictRule.judge(0.04, effect(0.45, 0.003, 1.15), T, ALPHA,
                points(0.23, 0.0006, 0.48)));
    }

    @Test
    void aStableChangeWhoseSharesIntervalExcludesNoChangeWhileHsIncludesItIsUncertain() {
        assertEquals(Verdict.UNCERTAIN, VerdictRule.judge(0.2, effect(0.05, -0.01, 0.15), T, ALPHA,
                points(0.02, 0.001, 0.05)));
        assertEquals(Verdict.STABLE, VerdictRule.judge(0.2, effect(0.05, -0.01, 0.15), T, ALPHA,
                points(0.02, -0.001, 0.05)));
    }

    @Test
    void aShareJudgedOnHIsNeverMaterialWhenItsShownDifferenceMayBeZero() {
        // 2/14 -> 17/39: z = 1.96, p = 0.0498 (the only test of the family, so q = p), h = 0.63 beyond 0.2, but
        // Newcombe's interval of the difference, -0.06 to 47.8 points, includes no change.
        var c = new VariableComparator(0.95).proportion("v", FindingKind.SHIFT, "answering 'yes'", 2, 14, 17, 39,
                null);
        var d = (VariableComparator.ProportionDetail) c.detail();
        assertTrue(d.riskDifference().ciLow() < 0, d.riskDifference().toString());
        Finding f = Judge.judge(List.of(c), ALPHA, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG).get(0);
        assertTrue(f.qValue() < ALPHA, "q " + f.qValue());
        assertEquals(Verdict.UNCERTAIN, f.verdict());
    }

    @Test
    void badArgumentsAreRefusedByName() {
        var e = assertThrows(IllegalArgumentException.class, () -> VerdictRule.judge(0.5, effect(0, -1, 1), 0, ALPHA));
        assertEquals("threshold must be positive, was 0.0", e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> VerdictRule.judge(0.5, effect(0, -1, 1), T, 1.0));
        assertThrows(IllegalArgumentException.class, () -> VerdictRule.judge(Double.NaN, effect(0, -1, 1), T, ALPHA));
    }
}
