package org.wavewarden.compare.proportion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.EffectSize;

class CohensHTest {

    @Test
    void cohensHMatchesPwrEsH() {
        // R 4.2.2, Debian r-cran-pwr: pwr::ES.h(762/1557, 484/1200)
        EffectSize h = CohensH.estimate(484, 1200, 762, 1557, 0.95);
        assertEquals(0.17336225668231831, h.estimate(), 1e-14);
        // R 4.2.2, pwr: ES.h(45/100, 38/50)
        assertEquals(-0.64701837185750355, CohensH.estimate(38, 50, 45, 100, 0.9).estimate(), 1e-14);
        assertEquals("Cohen's h", h.name());
    }

    /**
     * R 4.2.2 (Debian r-base-core): the MOVER arithmetic written out on prop.test(x, n, correct = FALSE)$conf.int,
     * the script test/resources/proportion/cohens-h-mover.R, which prints these rows; the last two columns are
     * Newcombe's interval of the risk difference from the same Wilson limits.
     */
    @ParameterizedTest(name = "{0}/{1} -> {2}/{3}")
    @CsvSource({
            "4, 31, 0, 30, -0.73484380923960335, -1.1340958808259354, 0.0064191550293843935, -0.28852406256306418, 0.0085211334857352994",
            "0, 50, 0, 50, 0, -0.540785036222729, 0.540785036222729, -0.071347599133358683, 0.071347599133358683",
            "1, 200, 12, 210, 0.3412264500013068, 0.11499246008996336, 0.51343057361769406, 0.01894415071336597, 0.092420820948504789",
            "484, 1200, 762, 1557, 0.17336225668231831, 0.09792590676184891, 0.24836021117367724, 0.04866699427618127, 0.1230467942974886",
            "38, 50, 45, 100, -0.64701837185750355, -0.9607822789529934, -0.29535519571708291, -0.44499167049903243, -0.14414830230953293",
            "3, 10, 9, 12, 0.93511562166578677, 0.080850532660946883, 1.5948692626723977, 0.035705667442761768, 0.70076679019552546"
    })
    void intervalIsTheMoverIntervalOfWilsonLimitsOnTheArcsineScaleAsInR(long sB, long nB, long sC, long nC, double h,
                                                                       double low, double high, double dLow,
                                                                       double dHigh) {
        EffectSize e = CohensH.estimate(sB, nB, sC, nC, 0.95);
        assertEquals(h, e.estimate(), 1e-14);
        assertEquals(low, e.ciLow(), 1e-12);
        assertEquals(high, e.ciHigh(), 1e-12);
        EffectSize rd = TwoProportionZTest.test(sB, nB, sC, nC, 0.95).riskDifference();
        assertEquals(dLow, rd.ciLow(), 1e-12);
        assertEquals(dHigh, rd.ciHigh(), 1e-12);
        // in each of these rows both intervals agree on whether no change is plausible
        assertEquals(dLow <= 0 && dHigh >= 0, e.ciLow() <= 0 && e.ciHigh() >= 0);
    }

    @Test
    void aShareFallingToAZeroCountKeepsNoChangeInsideTheInterval() {
        // 4/31 -> 0/30: Fisher's p is 0.11 and Newcombe's interval of the difference includes 0; the Wald interval
        // on the arcsine scale, h +- z sqrt(1/31 + 1/30) = -0.735 +- 0.502, excluded it.
        EffectSize e = CohensH.estimate(4, 31, 0, 30, 0.95);
        assertTrue(e.ciLow() < 0 && e.ciHigh() > 0, e.toString());
    }

    @Test
    void bothWavesAtZeroGiveASymmetricIntervalAroundNoChange() {
        EffectSize e = CohensH.estimate(0, 50, 0, 50, 0.95);
        assertEquals(0, e.estimate());
        assertEquals(-e.ciHigh(), e.ciLow(), 0);
    }

    @Test
    void swappingWavesFlipsHAndMirrorsItsInterval() {
        Random random = new Random(47L);
        for (int rep = 0; rep < 300; rep++) {
            long nB = 1 + random.nextInt(500);
            long nC = 1 + random.nextInt(500);
            long sB = random.nextInt((int) nB + 1);
            long sC = random.nextInt((int) nC + 1);
            EffectSize a = CohensH.estimate(sB, nB, sC, nC, 0.95);
            EffectSize b = CohensH.estimate(sC, nC, sB, nB, 0.95);
            assertEquals(a.estimate(), -b.estimate(), 1e-14);
            assertEquals(a.ciLow(), -b.ciHigh(), 1e-12);
            assertEquals(a.ciHigh(), -b.ciLow(), 1e-12);
            // the sign of h follows the sign of the risk difference
            assertEquals(Math.signum((double) sC / nC - (double) sB / nB), Math.signum(a.estimate()));
        }
    }
}
