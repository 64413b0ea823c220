package org.wavewarden.judge;

import org.junit.jupiter.api.Test;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A shift that rests on fewer answers than before says so, with the counts it rests on. */
class MissingRateContextTest {

    static Finding shift(String variable, long validBaseline, long validCurrent) {
        return new Finding(variable, FindingKind.SHIFT, "Welch t", 2.0, 0.01, 0.02,
                new Finding.Effect("Hedges' g", 0.3, 0.1, 0.5, 0.2), Verdict.MATERIAL, validBaseline, validCurrent,
                "Mean x rose from 1.0 to 2.0 (...): MATERIAL.", null);
    }

    static Finding rate(String variable, Verdict verdict, long rowsBaseline, long rowsCurrent) {
        return new Finding(variable, FindingKind.MISSING_RATE_CHANGE, "two-proportion z", 5.0, 1e-6, 1e-5,
                new Finding.Effect("Cohen's h", 0.9, 0.8, 1.0, 0.2), verdict, rowsBaseline, rowsCurrent,
                "Share missing (NULL) rose ...: " + verdict + ".", null);
    }

    @Test
    void aShiftOfAVariableWhoseMissingRateChangedMateriallySaysHowManyRowsItRestsOn() {
        List<Finding> out = MissingRateContext.apply(List.of(shift("x", 2760, 900),
                rate("x", Verdict.MATERIAL, 3000, 3000)));
        assertEquals("Mean x rose from 1.0 to 2.0 (...); note that 2,100 of 3,000 rows (70.0%) have no valid answer"
                + " this wave against 240 of 3,000 (8.0%) before, so the shift rests on the 900 rows (30.0%) that"
                + " answered: MATERIAL.", out.get(0).sentence());
        assertEquals(out.get(1), rate("x", Verdict.MATERIAL, 3000, 3000));
    }

    @Test
    void aMissingShareThatMovedBeyondTheThresholdCountsEvenWhenNoSingleReasonIsMaterial() {
        // Every reason alone STABLE, but together 8% -> 20% missing: Cohen's h = 2 asin(sqrt(.2)) - 2 asin(sqrt(.08))
        // = 0.3538 (R 4.2.2: 2*asin(sqrt(.2)) - 2*asin(sqrt(.08)) gives 0.3537821136), at or above 0.2.
        List<Finding> out = MissingRateContext.apply(List.of(shift("x", 920, 800), rate("x", Verdict.STABLE, 1000,
                1000)));
        assertTrue(out.get(0).sentence().contains("; note that 200 of 1,000 rows (20.0%) have no valid answer this"
                + " wave against 80 of 1,000 (8.0%) before"), out.get(0).sentence());
    }

    @Test
    void aMissingShareThatHardlyMovedLeavesTheSentenceAlone() {
        // 8% -> 9% missing: Cohen's h 0.0359 (R 4.2.2: 2*asin(sqrt(.09)) - 2*asin(sqrt(.08)) gives 0.0358722036), below 0.2.
        Finding s = shift("x", 920, 910);
        List<Finding> out = MissingRateContext.apply(List.of(s, rate("x", Verdict.STABLE, 1000, 1000)));
        assertSame(s, out.get(0));
    }

    @Test
    void onlyTheShiftOfTheSameVariableIsTouched() {
        Finding other = shift("y", 500, 100);
        List<Finding> out = MissingRateContext.apply(List.of(other, rate("x", Verdict.MATERIAL, 3000, 3000)));
        assertSame(other, out.get(0));
    }
}
