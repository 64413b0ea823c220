package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.junit.jupiter.api.Test;

class NoncentralChiSquareTest {

    @Test
    void cdfMatchesRPchisqWithNoncentrality() {
        // R 4.2.2: pchisq(q, df, ncp) with
        // q = c(0.5, 1, 3, 7.5, 12, 30.07, 55, 150, 0.01), df = c(1, 2, 2, 5, 3, 2, 10, 4, 1),
        // ncp = c(0.3, 0, 4, 2.5, 20, 30, 100, 180, 1)
        double[] q = {0.5, 1, 3, 7.5, 12, 30.07, 55, 150, 0.01};
        double[] df = {1, 2, 2, 5, 3, 2, 10, 4, 1};
        double[] ncp = {0.3, 0, 4, 2.5, 20, 30, 100, 180, 1};
        double[] r = {0.4585465563159705216, 0.3934693402873665757, 0.2902546197658883997, 0.5752961428395031440,
            0.1030473886900015318, 0.4659863650811878477, 0.0009485227979660147, 0.0992112841415105778,
            0.0483940644003768364};
        for (int i = 0; i < q.length; i++) {
            assertEquals(r[i], NoncentralChiSquare.cdf(q[i], df[i], ncp[i]), 1e-12, "point " + i);
        }
    }

    @Test
    void cdfMatchesRPchisqForLargeNoncentrality() {
        // R 4.2.2: pchisq(c(900, 1100, 1000), c(3, 3, 20), c(1000, 1000, 990))
        assertEquals(0.048937362749565359, NoncentralChiSquare.cdf(900, 3, 1000), 1e-11);
        assertEquals(0.934808232639090075, NoncentralChiSquare.cdf(1100, 3, 1000), 1e-11);
        assertEquals(0.443259844490015542, NoncentralChiSquare.cdf(1000, 20, 990), 1e-11);
    }

    @Test
    void zeroNoncentralityIsTheCentralDistribution() {
        Random random = new Random(3L);
        for (int rep = 0; rep < 100; rep++) {
            double df = 1 + random.nextInt(20);
            double x = random.nextDouble() * 40;
            // commons-math3 3.6.1 ChiSquaredDistribution
            assertEquals(new ChiSquaredDistribution(null, df).cumulativeProbability(x),
                    NoncentralChiSquare.cdf(x, df, 0), 1e-13);
        }
    }

    @Test
    void cdfFallsAsNoncentralityGrowsAndRisesWithX() {
        Random random = new Random(4L);
        for (int rep = 0; rep < 200; rep++) {
            double df = 1 + random.nextInt(12);
            double x = random.nextDouble() * 60;
            double ncp = random.nextDouble() * 50;
            double f = NoncentralChiSquare.cdf(x, df, ncp);
            assertTrue(f >= 0 && f <= 1);
            assertTrue(NoncentralChiSquare.cdf(x, df, ncp + 1) <= f + 1e-15, "decreasing in ncp");
            assertTrue(NoncentralChiSquare.cdf(x + 1, df, ncp) >= f - 1e-15, "increasing in x");
        }
    }

    @Test
    void badParametersAreRejectedByName() {
        assertTrue(assertThrows(IllegalArgumentException.class, () -> NoncentralChiSquare.cdf(1, 0, 1))
                .getMessage().startsWith("df"));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> NoncentralChiSquare.cdf(1, 2, -1))
                .getMessage().startsWith("ncp"));
    }
}
