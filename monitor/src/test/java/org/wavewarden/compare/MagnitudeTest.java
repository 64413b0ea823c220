package org.wavewarden.compare;

import org.junit.jupiter.api.Test;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** The effect-size conventions and default thresholds, as listed in the project's check sources. */
class MagnitudeTest {

    @Test
    void standardizedDifferencesFollowCohen1988() {
        // Cohen (1988), Statistical Power Analysis for the Behavioral Sciences: d and h 0.2 / 0.5 / 0.8.
        assertEquals("negligible", Magnitude.standardizedDifference(0.199));
        assertEquals("small", Magnitude.standardizedDifference(0.2));
        assertEquals("medium", Magnitude.standardizedDifference(-0.5));
        assertEquals("large", Magnitude.standardizedDifference(0.8));
        assertEquals(0.2, Thresholds.HEDGES_G);
        assertEquals(0.2, Thresholds.COHENS_H);
    }

    @Test
    void wFollowsCohen1988() {
        // Cohen (1988): w 0.1 / 0.3 / 0.5.
        assertEquals("negligible", Magnitude.w(0.099));
        assertEquals("small", Magnitude.w(0.1));
        assertEquals("medium", Magnitude.w(0.3));
        assertEquals("large", Magnitude.w(0.5));
        assertEquals(0.1, Thresholds.CRAMERS_V);
    }

    @Test
    void cliffsDeltaFollowsRomanoEtAl2006() {
        // Romano et al. (2006): negligible < 0.147, small < 0.33, medium < 0.474.
        assertEquals("negligible", Magnitude.cliffsDelta(0.146));
        assertEquals("small", Magnitude.cliffsDelta(-0.147));
        assertEquals("small", Magnitude.cliffsDelta(0.329));
        assertEquals("medium", Magnitude.cliffsDelta(0.33));
        assertEquals("large", Magnitude.cliffsDelta(0.474));
        assertEquals(0.147, Thresholds.CLIFFS_DELTA);
    }

    @Test
    void psiBandsFollowCommonPractice() {
        // Common practice in scorecard monitoring, no single source: < 0.1 stable, 0.1 to 0.25 moderate, > 0.25 large.
        assertEquals("stable", Magnitude.psi(0.099));
        assertEquals("moderate", Magnitude.psi(0.1));
        assertEquals("moderate", Magnitude.psi(0.25));
        assertEquals("large", Magnitude.psi(0.2501));
    }

    @Test
    void namedEffectsPickTheirConvention() {
        assertEquals("small", Magnitude.of("Hedges' g", -0.3));
        assertEquals("medium", Magnitude.of("Cramér's V", 0.35));
        assertEquals("negligible", Magnitude.of("Cliff's delta", 0.05));
        assertEquals("", Magnitude.of("mean difference", 12));
    }
}
