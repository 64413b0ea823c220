package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig.FdrMethod;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A missing reason or a sentinel whose share falls to none is good news: CLEARED, never a MATERIAL change. A rise from
 * none, a fall that leaves some, and the share of an ordinary answer keep the verdict rule's word.
 */
class ClearedTest {

    static final double ALPHA = 0.05;

    static Comparison rate(String reason, long sB, long sC) {
        return new VariableComparator(1 - ALPHA).proportion("height_cm", FindingKind.MISSING_RATE_CHANGE,
                "missing (" + reason + ")", sB, 1000, sC, 1000, null);
    }

    static List<Finding> judged(Comparison... cs) {
        return WaveVerdicts.judge(List.of(cs), Map.of(), ALPHA, FdrMethod.BENJAMINI_HOCHBERG);
    }

    /**
     * Cohen's h of each change, reference R 4.2.2: 2 * asin(sqrt(after / 1000)) - 2 * asin(sqrt(before / 1000)).
     * The fall of 27 to none is beyond 0.2 and significant: the verdict rule alone would call it MATERIAL. The
     * direction changes the verdict only, never the effect, so every row keeps its h.
     */
    @ParameterizedTest(name = "{0}/1000 -> {1}/1000: {2}, h {3}")
    @CsvSource({
            "27, 0,  CLEARED,  -0.33013065",   // fell to none
            "0,  27, MATERIAL,  0.33013065",   // a rise from none stays as judged
            "27, 2,  MATERIAL, -0.24065809",   // some are left: still a change to look at
            "3,  0,  CLEARED,  -0.10959936",   // too small a fall to be significant, but gone is gone
    })
    void aReasonThatFellToNoneIsCleared(long before, long after, Verdict verdict, double h) {
        Finding f = judged(rate("999", before, after)).get(0);
        assertEquals(verdict, f.verdict(), f.sentence());
        assertEquals(h, f.effect().estimate(), 1e-8);   // R 4.2.2, see above
        assertEquals(verdict == Verdict.CLEARED, f.sentence().startsWith("Cleared:"), f.sentence());
        if (verdict == Verdict.CLEARED) {
            assertEquals(String.format(java.util.Locale.ROOT, "Cleared: the share missing (999) fell from %.1f%% of"
                    + " rows to none this wave (%+.1f points); nothing is left to look at: CLEARED.", before / 10.0,
                    -before / 10.0), f.sentence());
        } else {
            assertTrue(f.sentence().endsWith(": MATERIAL."), f.sentence());
        }
    }

    @Test
    void theVariablesFindingIsTheReasonStillPresentWithTheClearedOneInItsDetail() {
        Finding f = judged(rate("999", 27, 0), rate("NULL", 30, 90)).get(0);
        assertEquals(Verdict.MATERIAL, f.verdict(), f.sentence());
        @SuppressWarnings("unchecked")
        List<WaveVerdicts.ReasonRate> reasons = (List<WaveVerdicts.ReasonRate>) f.detail();
        assertEquals(List.of("NULL", "999"), reasons.stream().map(WaveVerdicts.ReasonRate::reason).toList());
        assertEquals(List.of("MATERIAL", "CLEARED"), reasons.stream().map(WaveVerdicts.ReasonRate::verdict).toList());
    }

    @Test
    void theShareOfAnOrdinaryAnswerFallingToNoneIsAChangeLikeAnyOther() {
        Comparison c = new VariableComparator(1 - ALPHA).proportion("owns_boat", FindingKind.SHIFT,
                "answering 'yes'", 27, 1000, 0, 1000, null);
        assertEquals(Verdict.MATERIAL, judged(c).get(0).verdict());
    }
}
