package org.wavewarden.compare.proportion;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;

class CohensHTest {

    @Test
    void cohensHMatchesPwrEsH() {
        // R 4.2.2, Debian r-cran-pwr: pwr::ES.h(762/1557, 484/1200)
        EffectSize h = CohensH.estimate(484, 1200, 762, 1557, 0.95);
        assertEquals(0.17336225668231831, h.estimate(), 1e-14);
        double half = 1.959963984540054 * Math.sqrt(1.0 / 1200 + 1.0 / 1557);
        assertEquals(0.17336225668231831 - half, h.ciLow(), 1e-12);
        assertEquals(0.17336225668231831 + half, h.ciHigh(), 1e-12);
        // R 4.2.2, pwr: ES.h(45/100, 38/50)
        assertEquals(-0.64701837185750355, CohensH.estimate(38, 50, 45, 100, 0.9).estimate(), 1e-14);
        assertEquals("Cohen's h", h.name());
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
