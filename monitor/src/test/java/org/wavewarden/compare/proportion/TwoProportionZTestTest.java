package org.wavewarden.compare.proportion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.categorical.ChiSquareHomogeneity;

class TwoProportionZTestTest {

    private static void close(double expected, double actual, double relative) {
        assertEquals(expected, actual, relative * Math.abs(expected));
    }

    @Test
    void zTestMatchesRPropTestWithoutContinuityCorrection() {
        // baseline 484 of 1200, current 762 of 1557
        TwoProportionResult r = TwoProportionZTest.test(484, 1200, 762, 1557, 0.95);
        // R 4.2.2: prop.test(c(762, 484), c(1557, 1200), correct = FALSE): X2 = 20.268, z = 4.502, p = 6.73e-06
        assertEquals(4.502, r.test().statistic(), 0.0005);
        assertEquals(20.268, r.chiSquare(), 0.0005);
        assertEquals(6.73e-06, r.test().pValue(), 0.005e-06);
        close(20.268485906729165, r.chiSquare(), 1e-12);
        close(6.7300027761172749e-06, r.test().pValue(), 1e-9);
        // the Wald interval prop.test prints: 0.0488 to 0.1233
        close(0.048828018500465212, r.waldRiskDifference().ciLow(), 1e-10);
        close(0.123310709823234263, r.waldRiskDifference().ciHigh(), 1e-10);
        assertEquals(762.0 / 1557, r.proportionCurrent());
        assertEquals(484.0 / 1200, r.proportionBaseline());
        close(762.0 / 1557 - 484.0 / 1200, r.riskDifference().estimate(), 1e-15);
    }

    @Test
    void newcombeIntervalMatchesRWilsonLimitsAndEpiCiPd() {
        EffectSize d = TwoProportionZTest.test(484, 1200, 762, 1557, 0.95).riskDifference();
        // R 4.2.2: w1 <- prop.test(762, 1557, correct = FALSE)$conf.int; w2 <- prop.test(484, 1200, correct = FALSE)$conf.int
        //   c(d - sqrt((p1 - w1[1])^2 + (w2[2] - p2)^2), d + sqrt((w1[2] - p1)^2 + (p2 - w2[1])^2))
        close(0.04866699427618127, d.ciLow(), 1e-10);
        close(0.12304679429748860, d.ciHigh(), 1e-10);
        // R 4.2.2, Debian r-cran-epi 2.47: Epi::ci.pd(762, 484, 1557 - 762, 1200 - 484) (method "Nc", Newcombe method 10)
        close(0.048666994276182061, d.ciLow(), 1e-10);
        close(0.12304679429748777, d.ciHigh(), 1e-10);
    }

    @Test
    void newcombeIntervalMatchesEpiAtABoundaryAndAtNinetyPercent() {
        // R 4.2.2, Epi 2.47: ci.pd(3, 0, 27, 20): 3 of 30 (current) versus 0 of 20 (baseline)
        EffectSize zero = TwoProportionZTest.test(0, 20, 3, 30, 0.95).riskDifference();
        close(0.1, zero.estimate(), 1e-15);
        close(-0.073892182427523351, zero.ciLow(), 1e-9);
        close(0.256210825791840735, zero.ciHigh(), 1e-9);
        // R 4.2.2, Epi 2.47: ci.pd(45, 38, 55, 12, conf.level = 0.9): 45 of 100 (current) versus 38 of 50 (baseline)
        EffectSize ninety = TwoProportionZTest.test(38, 50, 45, 100, 0.9).riskDifference();
        close(-0.31, ninety.estimate(), 1e-14);
        close(-0.42585599091212339, ninety.ciLow(), 1e-9);
        close(-0.17193171374264957, ninety.ciHigh(), 1e-9);
    }

    @Test
    void wilsonIntervalMatchesRPropTest() {
        // R 4.2.2: prop.test(762, 1557, correct = FALSE)$conf.int
        WilsonInterval w = WilsonInterval.of(762, 1557, 0.95);
        close(0.46462936764366974, w.lower(), 1e-12);
        close(0.51422819036549960, w.upper(), 1e-12);
        assertEquals(0, WilsonInterval.of(0, 20, 0.95).lower());
        assertEquals(1, WilsonInterval.of(20, 20, 0.95).upper());
    }

    @Test
    void swappingWavesFlipsZAndDifferenceAndMirrorsTheIntervals() {
        Random random = new Random(41L);
        for (int rep = 0; rep < 300; rep++) {
            long nB = 1 + random.nextInt(400);
            long nC = 1 + random.nextInt(400);
            long sB = random.nextInt((int) nB + 1);
            long sC = random.nextInt((int) nC + 1);
            TwoProportionResult a = TwoProportionZTest.test(sB, nB, sC, nC, 0.95);
            TwoProportionResult b = TwoProportionZTest.test(sC, nC, sB, nB, 0.95);
            assertEquals(a.test().statistic(), -b.test().statistic(), 1e-12);
            assertEquals(a.test().pValue(), b.test().pValue(), 1e-15);
            assertEquals(a.riskDifference().estimate(), -b.riskDifference().estimate(), 1e-15);
            assertEquals(a.riskDifference().ciLow(), -b.riskDifference().ciHigh(), 1e-12);
            assertEquals(a.riskDifference().ciHigh(), -b.riskDifference().ciLow(), 1e-12);
            EffectSize d = a.riskDifference();
            assertTrue(d.ciLow() <= d.estimate() && d.estimate() <= d.ciHigh());
            assertTrue(d.ciLow() >= -1 - 1e-12 && d.ciHigh() <= 1 + 1e-12);
        }
    }

    @Test
    void zSquaredIsPearsonChiSquareOfTheTwoByTwoTable() {
        Random random = new Random(43L);
        ChiSquareTest reference = new ChiSquareTest(); // commons-math3 3.6.1
        for (int rep = 0; rep < 200; rep++) {
            long nB = 2 + random.nextInt(300);
            long nC = 2 + random.nextInt(300);
            long sB = 1 + random.nextInt((int) nB - 1);
            long sC = 1 + random.nextInt((int) nC - 1);
            TwoProportionResult r = TwoProportionZTest.test(sB, nB, sC, nC, 0.95);
            long[][] table = {{sB, nB - sB}, {sC, nC - sC}};
            close(reference.chiSquare(table), r.chiSquare(), 1e-10);
            close(ChiSquareHomogeneity.test(table).test().statistic(), r.chiSquare(), 1e-10);
            assertEquals(reference.chiSquareTest(table), r.test().pValue(), 1e-12 + 1e-9 * r.test().pValue());
        }
    }

    @Test
    void identicalDegenerateWavesGiveNoEvidence() {
        TwoProportionResult r = TwoProportionZTest.test(0, 40, 0, 55, 0.95);
        assertEquals(0, r.test().statistic());
        assertEquals(1, r.test().pValue());
        assertTrue(r.riskDifference().ciLow() < 0 && r.riskDifference().ciHigh() > 0);
    }

    @Test
    void countsOutsideTheirRangeAreRejectedByName() {
        assertTrue(assertThrows(IllegalArgumentException.class, () -> TwoProportionZTest.test(5, 4, 1, 2, 0.95))
                .getMessage().startsWith("successesBaseline"));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> TwoProportionZTest.test(1, 4, 1, 0, 0.95))
                .getMessage().startsWith("nCurrent"));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> TwoProportionZTest.test(1, 4, 1, 2, 1.0))
                .getMessage().startsWith("confidence"));
    }
}
