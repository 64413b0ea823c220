package org.wavewarden.compare.proportion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;

/**
 * References: R 4.2.2 (Debian r-base-core) on the raw answer pairs of each table ({@code xb}, {@code xc}: 1 for
 * yes), the Wilson limits from {@code prop.test(sum(x), n, conf.level = conf, correct = FALSE)$conf.int}:
 * <pre>
 * phi <- cor(xb, xc); h <- 2 * asin(sqrt(mean(xc))) - 2 * asin(sqrt(mean(xb)))
 * h + c(-1, 1) * qnorm(0.5 + conf / 2) * sqrt(2 * (1 - phi) / n)              # Cohen's h, paired
 * A <- a * d - b * c; m <- (a + b) * (c + d) * (a + c) * (b + d)
 * psi <- if (A > n / 2) (A - n / 2) / sqrt(m) else if (A >= 0) 0 else A / sqrt(m)
 * D <- pC - pB                                                               # Newcombe (1998) method 10
 * D - sqrt((pC - wC[1])^2 - 2 * psi * (pC - wC[1]) * (wB[2] - pB) + (wB[2] - pB)^2)
 * D + sqrt((wC[2] - pC)^2 - 2 * psi * (wC[2] - pC) * (pB - wB[1]) + (pB - wB[1])^2)
 * </pre>
 */
class PairedProportionsTest {

    @Test
    void agrestiApprovalTable() {
        // Agresti (2007), section 10.1 (CHECK-SOURCES): 794 / 150 / 86 / 570; phi = 0.70192580690593021
        EffectSize h = PairedProportions.cohensH(794, 150, 86, 570, 0.95);
        assertEquals(-0.080819030084987808, h.estimate(), 1e-13);
        assertEquals(-0.11865155145025136, h.ciLow(), 1e-12);
        assertEquals(-0.042986508719724266, h.ciHigh(), 1e-12);
        EffectSize h90 = PairedProportions.cohensH(794, 150, 86, 570, 0.9);
        assertEquals(-0.11256908287944062, h90.ciLow(), 1e-12);
        assertEquals(-0.049068977290535006, h90.ciHigh(), 1e-12);
        EffectSize rd = PairedProportions.riskDifference(794, 150, 86, 570, 0.95);
        assertEquals(-0.04, rd.estimate(), 1e-15);
        assertEquals(-0.058703872895728836, rd.ciLow(), 1e-12);
        assertEquals(-0.021230423982877056, rd.ciHigh(), 1e-12);
        EffectSize rd90 = PairedProportions.riskDifference(794, 150, 86, 570, 0.9);
        assertEquals(-0.055706020643769075, rd90.ciLow(), 1e-12);
        assertEquals(-0.02424767421385883, rd90.ciHigh(), 1e-12);
    }

    @Test
    void smallTablesWithNegativeAndPositiveCrossProducts() {
        // 1 / 1 / 7 / 12 (airway hyper-responsiveness, Bentur et al. 2009, as Fagerland, Lydersen and Laake use
        // it): ad - bc = 5 <= n / 2, so psi = 0; h 0.70293633710244652 (0.12263049768151768, 1.2832421765233755)
        EffectSize rd = PairedProportions.riskDifference(1, 1, 7, 12, 0.95);
        assertEquals(0.2857142857142857, rd.estimate(), 1e-15);
        assertEquals(0.025559124164859892, rd.ciLow(), 1e-12);
        assertEquals(0.5069202266861409, rd.ciHigh(), 1e-12);
        EffectSize h = PairedProportions.cohensH(1, 1, 7, 12, 0.95);
        assertEquals(0.70293633710244652, h.estimate(), 1e-13);
        assertEquals(0.12263049768151768, h.ciLow(), 1e-12);
        assertEquals(1.2832421765233755, h.ciHigh(), 1e-12);
        // 59 / 6 / 16 / 80 (Cavo et al. 2012, the same authors' second example)
        EffectSize cavo = PairedProportions.riskDifference(59, 6, 16, 80, 0.95);
        assertEquals(0.062111801242236031, cavo.estimate(), 1e-15);
        assertEquals(0.0046251139330500748, cavo.ciLow(), 1e-12);
        assertEquals(0.11862119563870993, cavo.ciHigh(), 1e-12);
        EffectSize cavoH = PairedProportions.cohensH(59, 6, 16, 80, 0.95);
        assertEquals(0.12538038470637791, cavoH.estimate(), 1e-13);
        assertEquals(0.011632100460794353, cavoH.ciLow(), 1e-12);
        assertEquals(0.23912866895196147, cavoH.ciHigh(), 1e-12);
    }

    @Test
    void swappingWavesFlipsBothEffectsAndUncorrelatedAnswersGiveTheIndependentIntervals() {
        Random rng = new Random(17L);
        for (int rep = 0; rep < 300; rep++) {
            long a = rng.nextInt(50);
            long b = rng.nextInt(50);
            long c = rng.nextInt(50);
            long d = rng.nextInt(50) + 1;
            for (boolean risk : new boolean[] {true, false}) {
                EffectSize f = risk ? PairedProportions.riskDifference(a, b, c, d, 0.95)
                        : PairedProportions.cohensH(a, b, c, d, 0.95);
                EffectSize s = risk ? PairedProportions.riskDifference(a, c, b, d, 0.95)
                        : PairedProportions.cohensH(a, c, b, d, 0.95);
                assertEquals(-f.estimate(), s.estimate(), 1e-12);
                assertEquals(-f.ciHigh(), s.ciLow(), 1e-12);
                assertEquals(-f.ciLow(), s.ciHigh(), 1e-12);
            }
        }
        // ad = bc: phi = 0, so the paired intervals are those of two independent samples of n
        EffectSize paired = PairedProportions.riskDifference(20, 20, 30, 30, 0.95);
        EffectSize independent = TwoProportionZTest.test(40, 100, 50, 100, 0.95).riskDifference();
        assertEquals(independent.ciLow(), paired.ciLow(), 1e-12);
        assertEquals(independent.ciHigh(), paired.ciHigh(), 1e-12);
        EffectSize h = PairedProportions.cohensH(20, 20, 30, 30, 0.95);
        double waldIndependent = 1.959963984540054 * Math.sqrt(1.0 / 100 + 1.0 / 100);
        assertEquals(h.estimate() - waldIndependent, h.ciLow(), 1e-12);
        assertThrows(IllegalArgumentException.class, () -> PairedProportions.cohensH(0, 0, 0, 0, 0.95));
        assertThrows(IllegalArgumentException.class, () -> PairedProportions.riskDifference(-1, 0, 0, 3, 0.95));
    }
}
