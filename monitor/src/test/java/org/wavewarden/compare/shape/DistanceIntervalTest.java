package org.wavewarden.compare.shape;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

import java.util.SplittableRandom;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

class DistanceIntervalTest {

    @Test
    void halfWidthMatchesTheMassartBound() {
        // R 4.2.2 (Debian r-base-core): sqrt(log(4 / 0.05) / (2 * 3000)) = 0.02702476
        assertEquals(0.02702476, DistanceInterval.halfWidth(3000, 0.95), 1e-8);
        // sqrt(log(4 / 0.10) / (2 * 40)) = 0.2147347
        assertEquals(0.2147347, DistanceInterval.halfWidth(40, 0.90), 1e-7);
    }

    @Test
    void intervalIsClampedToTheUnitRange() {
        EffectSize e = DistanceInterval.of(0.02, 30, 30, 0.95);
        assertEquals(0, e.ciLow());
        EffectSize f = DistanceInterval.of(0.99, 30, 30, 0.95);
        assertEquals(1, f.ciHigh());
    }

    @Test
    void coversTheTrueDistanceAtLeastAtTheNominalRate() {
        // Property (seeded simulation): normal(0,1) against normal(0.5,1); the population KS distance is
        // 2 * pnorm(0.25) - 1 = 0.1974127 (R 4.2.2: 2 * pnorm(0.25) - 1).
        double truth = 0.1974126;
        SplittableRandom r = new SplittableRandom(7);
        int covered = 0;
        int runs = 300;
        for (int k = 0; k < runs; k++) {
            double[] a = new double[200];
            double[] b = new double[150];
            for (int i = 0; i < a.length; i++) {
                a[i] = gaussian(r);
            }
            for (int i = 0; i < b.length; i++) {
                b[i] = 0.5 + gaussian(r);
            }
            double d = KolmogorovSmirnovTest.test(NumericDistribution.ofSample(a), NumericDistribution.ofSample(b)).d();
            EffectSize e = DistanceInterval.of(d, 200, 150, 0.95);
            if (e.ciLow() <= truth && truth <= e.ciHigh()) {
                covered++;
            }
        }
        assertTrue(covered >= 0.95 * runs, "covered " + covered + " of " + runs);
    }

    static double gaussian(SplittableRandom r) {
        double u = r.nextDouble();
        double v = r.nextDouble();
        return Math.sqrt(-2 * Math.log(1 - u)) * Math.cos(2 * Math.PI * v);
    }
}
