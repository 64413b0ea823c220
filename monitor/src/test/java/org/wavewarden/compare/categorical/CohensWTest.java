package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.categorical.RandomTables.assertClose;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;

class CohensWTest {

    @Test
    void cohensWMatchesRForThePartyIdentificationTable() {
        EffectSize w = CohensW.estimate(new long[][] {{762, 327, 468}, {484, 239, 477}}, 0.95);
        // R 4.2.2: sqrt(chisq.test(tab, correct = FALSE)$statistic / sum(tab)); for 2 rows w equals V
        assertClose(0.10443580235646777, w.estimate(), 1e-12, "w");
        // R 4.2.2: uniroot on pchisq(30.070149095754672, 2, ncp) (see CramersVTest) = 11.615166353507924, 54.241115858842470
        assertClose(Math.sqrt(11.615166353507924 / 2757), w.ciLow(), 1e-8, "lower");
        assertClose(Math.sqrt(54.241115858842470 / 2757), w.ciHigh(), 1e-8, "upper");
    }

    @Test
    void cohensWIsCramersVTimesRootOfMinDimensionLessOne() {
        Random random = new Random(17L);
        for (int rep = 0; rep < 50; rep++) {
            int rows = 2 + random.nextInt(3);
            int cols = 2 + random.nextInt(4);
            long[][] t = RandomTables.table(random, rows, cols, 40);
            double k = Math.min(rows, cols) - 1;
            EffectSize w = CohensW.estimate(t, 0.9);
            EffectSize v = CramersV.estimate(t, 0.9);
            assertClose(v.estimate() * Math.sqrt(k), w.estimate(), 1e-12, "estimate");
            assertEquals(v.ciHigh() * Math.sqrt(k), w.ciHigh(), 1e-12);
            assertEquals(v.ciLow() * Math.sqrt(k), w.ciLow(), 1e-12);
            assertTrue(w.ciLow() <= w.ciHigh());
        }
    }
}
