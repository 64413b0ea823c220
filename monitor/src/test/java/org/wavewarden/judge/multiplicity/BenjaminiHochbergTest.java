package org.wavewarden.judge.multiplicity;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

class BenjaminiHochbergTest {

    private static final double[] BH_EXAMPLE = {0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344,
        0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000};

    @Test
    void adjustmentMatchesBenjaminiHochbergWorkedExample() {
        double[] q = BenjaminiHochberg.adjust(BH_EXAMPLE);
        // Benjamini & Hochberg (1995), JRSS B 57, the worked example: at 0.05 the first 4 are rejected
        int rejected = 0;
        int bonferroni = 0;
        for (int i = 0; i < q.length; i++) {
            rejected += q[i] <= 0.05 ? 1 : 0;
            bonferroni += BH_EXAMPLE[i] * BH_EXAMPLE.length <= 0.05 ? 1 : 0;
        }
        assertEquals(4, rejected);
        assertEquals(3, bonferroni);
        double[] published = {0.0015, 0.0030, 0.0095, 0.0356, 0.0603};
        for (int i = 0; i < published.length; i++) {
            assertEquals(published[i], q[i], 0.00005);
        }
        // R 4.2.2: p.adjust(p, "BH")
        double[] r = {0.0015, 0.0030000000000000001, 0.0094999999999999998, 0.0356249999999999969,
            0.0602999999999999994, 0.0638571428571428623, 0.0638571428571428623, 0.0645000000000000018,
            0.0765000000000000124, 0.4859999999999999876, 0.5811818181818181328, 0.7148749999999999272,
            0.7532307692307692593, 0.8132142857142856673, 1.0};
        assertArrayEquals(r, q, 1e-15);
    }

    @Test
    void byAdjustmentMatchesRPAdjust() {
        // R 4.2.2: p.adjust(p, "BY") on the Benjamini & Hochberg (1995) example
        double[] r = {0.0049773434898434899, 0.0099546869796869799, 0.0315231754356754337, 0.1182119078837828852,
            0.2000892082917082870, 0.2118926228533371536, 0.2118926228533371536, 0.2140257700632700599,
            0.2538445179820180142, 1, 1, 1, 1, 1, 1};
        assertArrayEquals(r, BenjaminiYekutieli.adjust(BH_EXAMPLE), 1e-15);
    }

    @Test
    void tiesAndNaNFollowRPAdjustWithNaNLeftOutOfTheCount() {
        double nan = Double.NaN;
        double[] p = {0.04, 0.01, 0.03, nan, 0.03, 0.5, 0.002, 0.2, 0.03, 0.011, nan, 0.07};
        // R 4.2.2: p.adjust(c(0.04, 0.01, 0.03, NA, 0.03, 0.5, 0.002, 0.2, 0.03, 0.011, NA, 0.07), "BH")
        double[] bh = {0.057142857142857148, 0.036666666666666667, 0.050000000000000003, nan, 0.050000000000000003,
            0.5, 0.02, 0.222222222222222238, 0.050000000000000003, 0.036666666666666667, nan, 0.087500000000000008};
        // same, method "BY"
        double[] by = {0.167369614512471648, 0.107395502645502627, 0.146448412698412689, nan, 0.146448412698412689,
            1, 0.058579365079365078, 0.650881834215167543, 0.146448412698412689, 0.107395502645502627, nan,
            0.256284722222222205};
        assertArrayEquals(bh, BenjaminiHochberg.adjust(p), 1e-15);
        assertArrayEquals(by, BenjaminiYekutieli.adjust(p), 1e-15);
    }

    @Test
    void adjustmentIsOrderEquivariantMonotoneAndNeverBelowP() {
        Random random = new Random(59L);
        for (int rep = 0; rep < 200; rep++) {
            int m = 1 + random.nextInt(40);
            double[] p = new double[m];
            for (int i = 0; i < m; i++) {
                p[i] = random.nextInt(4) == 0 ? Math.round(random.nextDouble() * 20) / 20.0
                        : Math.pow(random.nextDouble(), 3);
            }
            double[] q = BenjaminiHochberg.adjust(p);
            double[] y = BenjaminiYekutieli.adjust(p);
            int[] perm = new int[m];
            for (int i = 0; i < m; i++) {
                perm[i] = i;
            }
            for (int i = m - 1; i > 0; i--) {
                int k = random.nextInt(i + 1);
                int t = perm[i];
                perm[i] = perm[k];
                perm[k] = t;
            }
            double[] shuffled = new double[m];
            for (int i = 0; i < m; i++) {
                shuffled[i] = p[perm[i]];
            }
            double[] qs = BenjaminiHochberg.adjust(shuffled);
            for (int i = 0; i < m; i++) {
                assertEquals(q[perm[i]], qs[i], 0.0, "equivariant");
                assertTrue(q[i] >= p[i] && q[i] <= 1, "p <= q <= 1");
                assertTrue(y[i] >= q[i], "BY is at least BH");
                for (int j = 0; j < m; j++) {
                    if (p[i] < p[j]) {
                        assertTrue(q[i] <= q[j], "monotone");
                    }
                }
            }
        }
    }

    @Test
    void invalidPIsRejectedByIndexAndAllNaNGivesAllNaN() {
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> BenjaminiHochberg.adjust(new double[] {0.1, 1.2})).getMessage().startsWith("p[1]"));
        double[] q = BenjaminiHochberg.adjust(new double[] {Double.NaN, Double.NaN});
        assertTrue(Double.isNaN(q[0]) && Double.isNaN(q[1]));
        assertEquals(0, BenjaminiHochberg.adjust(new double[0]).length);
    }
}
