package org.wavewarden.compare.relation;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.Comparison;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Judge;
import org.wavewarden.judge.Verdict;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.PairCounter;

import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Properties of the relationship comparison (the numbers themselves are checked against R in
 * {@link CorrelationTest}, {@link CorrelationDifferenceTest} and RelationshipDriftIntegrationTest): swapping the waves
 * flips the signed effect and mirrors its interval, swapping x and y changes nothing, and a pair that gives no
 * correlation is refused with the reason.
 */
class RelationshipChangeTest {

    /** Invented pairs with correlation about rho, on a 1..10 scale against an amount. */
    private static JointTally wave(double rho, int n, long seed) {
        Random r = new Random(seed);
        PairCounter c = new PairCounter();
        for (int i = 0; i < n; i++) {
            double a = r.nextGaussian();
            double b = rho * a + Math.sqrt(1 - rho * rho) * r.nextGaussian();
            c.add(Math.max(1, Math.min(10, Math.round(5.5 + 2 * a))), Math.round(Math.exp(7 + 0.5 * b)));
        }
        return c.tally("x", "y");
    }

    private static JointTally swapped(JointTally t) {
        return new JointTally(t.y(), t.x(), t.ys(), t.xs(), t.counts(), t.binning());
    }

    private static Comparison compare(JointTally b, JointTally c) {
        RelationshipChange.Outcome o = RelationshipChange.compare(b.x() + " ~ " + b.y(), b, c, 0.1, "default", 0.95,
                0, 0);
        assertNull(o.notCompared());
        return o.comparison();
    }

    @Test
    void swappingTheWavesFlipsTheEffectAndMirrorsItsInterval() {
        JointTally one = wave(0.6, 800, 1);
        JointTally two = wave(0.3, 1200, 2);
        Comparison forward = compare(one, two);
        Comparison backward = compare(two, one);
        assertEquals(-forward.effect().estimate(), backward.effect().estimate(), 1e-15);
        assertEquals(-forward.effect().ciLow(), backward.effect().ciHigh(), 1e-15);
        assertEquals(-forward.effect().ciHigh(), backward.effect().ciLow(), 1e-15);
        assertEquals(forward.test().pValue(), backward.test().pValue(), 1e-15);
        assertTrue(forward.effect().estimate() < 0, "the current wave's rho is the lower");
        assertEquals(FindingKind.RELATIONSHIP_CHANGE, forward.kind());
    }

    @Test
    void swappingXAndYChangesNothing() {
        JointTally one = wave(0.5, 900, 3);
        JointTally two = wave(0.45, 900, 4);
        Comparison xy = compare(one, two);
        Comparison yx = compare(swapped(one), swapped(two));
        assertEquals(xy.effect().estimate(), yx.effect().estimate(), 1e-12);
        assertEquals(xy.effect().ciLow(), yx.effect().ciLow(), 1e-12);
        assertEquals(xy.test().pValue(), yx.test().pValue(), 1e-12);
        RelationshipDetail d = (RelationshipDetail) yx.detail();
        assertEquals(((RelationshipDetail) xy.detail()).pearsonCurrent().estimate(), d.pearsonCurrent().estimate(),
                1e-12);
    }

    @Test
    void aPairThatGivesNoCorrelationIsNotComparedAndSaysWhy() {
        JointTally ok = wave(0.5, 100, 5);
        JointTally three = new JointTally("x", "y", new double[] {1, 2, 3}, new double[] {3, 1, 2},
                new long[] {1, 1, 1}, Binning.EXACT);
        JointTally constant = new JointTally("x", "y", new double[] {4, 4}, new double[] {1, 2}, new long[] {5, 5},
                Binning.EXACT);
        JointTally perfect = new JointTally("x", "y", new double[] {1, 2, 3}, new double[] {10, 20, 30},
                new long[] {2, 2, 2}, Binning.EXACT);
        assertEquals("fewer than 4 pairs with both answers in the current wave (3)",
                RelationshipChange.compare("x ~ y", ok, three, 0.1, "", 0.95, 0, 0).notCompared());
        assertEquals("x takes a single value in the baseline wave's pairs",
                RelationshipChange.compare("x ~ y", constant, ok, 0.1, "", 0.95, 0, 0).notCompared());
        assertTrue(RelationshipChange.compare("x ~ y", ok, perfect, 0.1, "", 0.95, 0, 0).notCompared()
                .startsWith("the ranks of x and y agree perfectly in the current wave"));
    }

    @Test
    void aSummarisedPairSaysHowFarItsValuesCanBe() {
        JointTally exact = wave(0.6, 2000, 6);
        JointTally binned = new JointTally("x", "y", exact.xs(), exact.ys(), exact.counts(), new Binning(2));
        Comparison c = compare(exact, binned);
        assertEquals(new Binning(2).relativeError(), ((RelationshipDetail) c.detail()).relativeError());
        Finding f = Judge.judge(List.of(c), 0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG).get(0);
        assertEquals(Verdict.STABLE, f.verdict(), f.sentence());
        assertTrue(f.sentence().endsWith("each value stands within 0.20% of the one it replaces, and values sharing a"
                + " bin count as ties."), f.sentence());
        assertTrue(f.sentence().startsWith("The Spearman correlation of x and y stayed at "), f.sentence());
    }
}
