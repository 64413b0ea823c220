package org.wavewarden.compare;

import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

class ChecksTest {

    @Test
    void aConfidenceMustLieStrictlyBetweenZeroAndOne() {
        assertEquals(0.95, Checks.confidence(0.95), 0.0);
        for (double bad : new double[] {0, 1, -0.5, 1.5, Double.NaN}) {
            var e = assertThrows(IllegalArgumentException.class, () -> Checks.confidence(bad));
            assertEquals("confidence must lie in (0, 1), was " + bad, e.getMessage());
        }
    }

    @Test
    void aClosedUnitValueMayBeZeroOrOneButNotNaN() {
        assertEquals(0.0, Checks.closedUnit(0, "d"), 0.0);
        assertEquals(1.0, Checks.closedUnit(1, "d"), 0.0);
        var e = assertThrows(IllegalArgumentException.class, () -> Checks.closedUnit(Double.NaN, "pValue"));
        assertEquals("pValue must lie in [0, 1], was NaN", e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> Checks.openUnit(0, "p"));
    }

    @Test
    void countsNameTheArgumentThatIsWrong() {
        assertEquals(3, Checks.positive(3, "n"));
        assertEquals("n must be positive, was 0",
                assertThrows(IllegalArgumentException.class, () -> Checks.positive(0, "n")).getMessage());
        Checks.successes(0, 5, "x", "n");
        Checks.successes(5, 5, "x", "n");
        assertEquals("x must lie in [0, n = 5], was 6",
                assertThrows(IllegalArgumentException.class, () -> Checks.successes(6, 5, "x", "n")).getMessage());
        assertEquals("n must be positive, was 0",
                assertThrows(IllegalArgumentException.class, () -> Checks.successes(0, 0, "x", "n")).getMessage());
    }

    @Test
    void aTableMustBeGivenAndHoldEnoughObservations() {
        NumericDistribution one = NumericDistribution.ofSample(4.0);
        assertEquals(one, Checks.observations(one, 1, "sample"));
        assertEquals("baseline must not be null", assertThrows(IllegalArgumentException.class,
                () -> Checks.observations(null, 1, "baseline")).getMessage());
        assertEquals("current needs at least 2 observations, has 1", assertThrows(IllegalArgumentException.class,
                () -> Checks.observations(one, 2, "current")).getMessage());
    }
}
