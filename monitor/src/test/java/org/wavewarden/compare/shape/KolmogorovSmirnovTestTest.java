package org.wavewarden.compare.shape;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.ReferenceWaves.*;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class KolmogorovSmirnovTestTest {

    private static void assertRelative(double expected, double actual, double rel) {
        assertEquals(expected, actual, Math.abs(expected) * rel, () -> "expected " + expected + " got " + actual);
    }

    @Test
    void exactTestMatchesROnHollanderWolfeData() {
        KolmogorovSmirnovResult r = KolmogorovSmirnovTest.test(of(HW_Y), of(HW_X));
        // R 4.2.2 ks.test on the Hollander & Wolfe data (CHECK-SOURCES): D = 0.6, p = 0.1658; more digits 0.165834165834164
        assertEquals(0.6, r.d(), 1e-15);
        assertRelative(0.165834165834164, r.test().pValue(), 1e-10);
        assertTrue(r.exact());
    }

    @Test
    void exactTestMatchesRForFortyNinePerWaveAndWithTies() {
        KolmogorovSmirnovResult r = KolmogorovSmirnovTest.test(of(modular(49, 17, 101, 1, 0)),
                of(modular(49, 23, 103, 1, 0.5)));
        // R 4.2.2: ks.test(sc, sb): D = 0.122448979591837, p = 0.861276559722591, exact
        assertEquals(0.122448979591837, r.d(), 1e-14);
        assertRelative(0.861276559722591, r.test().pValue(), 1e-9);

        KolmogorovSmirnovResult ties = KolmogorovSmirnovTest.test(of(1, 2, 2, 3, 3, 3, 4, 5), of(2, 3, 4, 4, 5, 5, 6));
        // R 4.2.2: ks.test(c(2,3,4,4,5,5,6), c(1,2,2,3,3,3,4,5)): D = 0.464285714285714, p = 0.220512820512822,
        // exact conditional on the ties (psmirnov)
        assertEquals(0.464285714285714, ties.d(), 1e-14);
        assertRelative(0.220512820512822, ties.test().pValue(), 1e-9);
        assertTrue(ties.exact());
    }

    @Test
    void asymptoticTestMatchesRForLargeAndTiedWaves() {
        // R 4.2.2: ks.test(lc, lb): D = 0.127380952380952, p = 0.0719897425278035, asymptotic
        KolmogorovSmirnovResult likert = KolmogorovSmirnovTest.test(likertBaseline(), likertCurrent());
        assertEquals(0.127380952380952, likert.d(), 1e-14);
        assertRelative(0.0719897425278035, likert.test().pValue(), 1e-5);
        assertFalse(likert.exact());
        // R 4.2.2: ks.test(uc, ub): D = 0.0635, p = 0.997230972078366
        KolmogorovSmirnovResult unbalanced = KolmogorovSmirnovTest.test(of(modular(4000, 37, 101, 1, 0)),
                of(modular(40, 53, 97, 1, 5)));
        assertEquals(0.0635, unbalanced.d(), 1e-14);
        assertEquals(0.997230972078366, unbalanced.test().pValue(), 1e-6);
        // R 4.2.2: ks.test(gc, gb): D = 0.0107833333333333, p = 0.122724812897942
        KolmogorovSmirnovResult large = KolmogorovSmirnovTest.test(of(modular(30000, 7919, 30011, 100, 0)),
                of(modular(20000, 104729, 30029, 100, 3)));
        assertEquals(0.0107833333333333, large.d(), 1e-14);
        assertRelative(0.122724812897942, large.test().pValue(), 1e-5);
        // R 4.2.2: ks.test(ac, ab): D = 0.0274, p = 1.59944391064926e-10
        KolmogorovSmirnovResult ages = KolmogorovSmirnovTest.test(of(ages(30000, 7919, 30011, 73)),
                of(ages(32000, 104729, 30029, 71)));
        assertEquals(0.0274, ages.d(), 1e-14);
        assertRelative(1.59944391064926e-10, ages.test().pValue(), 1e-5);
    }

    @Test
    void exactPValueEqualsEnumerationOfAllAssignmentsWithTies() {
        Random rnd = new Random(51);
        for (int rep = 0; rep < 8; rep++) {
            double[] b = gridSample(rnd, 4 + rnd.nextInt(4), 3 + rnd.nextInt(6), 0);
            double[] c = gridSample(rnd, 3 + rnd.nextInt(4), 3 + rnd.nextInt(6), 0.125);
            KolmogorovSmirnovResult r = KolmogorovSmirnovTest.test(of(b), of(c));
            assertTrue(r.exact());
            double[] pool = new double[b.length + c.length];
            System.arraycopy(b, 0, pool, 0, b.length);
            System.arraycopy(c, 0, pool, b.length, c.length);
            double d = bruteD(b, c);
            assertEquals(d, r.d(), 1e-12);
            int total = 0;
            int extreme = 0;
            for (int mask = 0; mask < (1 << pool.length); mask++) {
                if (Integer.bitCount(mask) != c.length) {
                    continue;
                }
                double[] cc = new double[c.length];
                double[] bb = new double[b.length];
                int ci = 0;
                int bi = 0;
                for (int t = 0; t < pool.length; t++) {
                    if ((mask & (1 << t)) != 0) {
                        cc[ci++] = pool[t];
                    } else {
                        bb[bi++] = pool[t];
                    }
                }
                total++;
                if (bruteD(bb, cc) >= d - 1e-12) {
                    extreme++;
                }
            }
            assertEquals((double) extreme / total, r.test().pValue(), 1e-12, "rep " + rep);
        }
    }

    @Test
    void frequencyTableStatisticEqualsEcdfsOnRawDataAndIgnoresOrderAndShift() {
        Random rnd = new Random(52);
        for (int rep = 0; rep < 30; rep++) {
            double[] b = gridSample(rnd, 20 + rnd.nextInt(200), 3 + rnd.nextInt(40), 0);
            double[] c = gridSample(rnd, 20 + rnd.nextInt(200), 3 + rnd.nextInt(40), 0.5);
            NumericDistribution tb = of(b);
            NumericDistribution tc = of(c);
            KolmogorovSmirnovResult r = KolmogorovSmirnovTest.test(tb, tc);
            assertEquals(bruteD(b, c), r.d(), 1e-12);
            KolmogorovSmirnovResult swapped = KolmogorovSmirnovTest.test(tc, tb);
            assertEquals(r.d(), swapped.d());
            assertEquals(r.test().pValue(), swapped.test().pValue(), 1e-12);
            assertEquals(r, KolmogorovSmirnovTest.test(of(shifted(b, 1024)), of(shifted(c, 1024))));
            assertTrue(r.d() >= 0 && r.d() <= 1);
        }
    }

    @Test
    void limitingDistributionMatchesKnownQuantile() {
        // R 4.2.2: stats:::psmirnov(x / sqrt(5e5), sizes = c(1e6, 1e6), exact = FALSE), the limiting distribution:
        // 0.94999998932 at x = 1.3580986 (the familiar 5% critical value) and 0.135717220949227 at x = 0.6
        assertEquals(0.94999998932, KolmogorovSmirnovTest.kolmogorovCdf(1.3580986), 1e-9);
        assertEquals(0.135717220949227, KolmogorovSmirnovTest.kolmogorovCdf(0.6), 1e-9);
        // both series agree where they meet
        assertEquals(KolmogorovSmirnovTest.kolmogorovCdf(Math.nextDown(1.0)), KolmogorovSmirnovTest.kolmogorovCdf(1.0), 1e-12);
    }

    private static double bruteD(double[] b, double[] c) {
        double d = 0;
        double[] all = new double[b.length + c.length];
        System.arraycopy(b, 0, all, 0, b.length);
        System.arraycopy(c, 0, all, b.length, c.length);
        for (double t : all) {
            d = Math.max(d, Math.abs(ecdf(c, t) - ecdf(b, t)));
        }
        return d;
    }

    static double ecdf(double[] x, double t) {
        return Arrays.stream(x).filter(v -> v <= t).count() / (double) x.length;
    }
}
