package org.wavewarden.compare.rank;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.wavewarden.compare.ReferenceWaves.*;

import java.util.Random;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * References computed in R 4.2.2 (Debian r-base-core) by the same formulas written out on the raw data, as no
 * packaged implementation was at hand:
 * <pre>
 * cliff &lt;- function(cur, base, conf = 0.95) {
 *   dm &lt;- sign(outer(cur, base, "-")); d &lt;- mean(dm); m &lt;- length(cur); n &lt;- length(base)
 *   di &lt;- rowMeans(dm); dj &lt;- colMeans(dm)
 *   s2 &lt;- (n^2 * sum((di - d)^2) + m^2 * sum((dj - d)^2) - sum((dm - d)^2)) / (m * n * (m - 1) * (n - 1))
 *   s2 &lt;- max(s2, (1 - d^2) / (m * n - 1)); z &lt;- qnorm(1 - (1 - conf) / 2); s &lt;- sqrt(s2)
 *   c(d, (d - d^3 + c(-1, 1) * z * s * sqrt((1 - d^2)^2 + z^2 * s2)) / (1 - d^2 + z^2 * s2))
 * }
 * </pre>
 */
class CliffsDeltaTest {

    private static void assertDelta(double d, double lo, double hi, EffectSize e) {
        assertEquals(d, e.estimate(), 1e-12, "estimate");
        assertEquals(lo, e.ciLow(), 1e-12, "ciLow");
        assertEquals(hi, e.ciHigh(), 1e-12, "ciHigh");
    }

    @Test
    void deltaMatchesFormulaInROnHollanderWolfeData() {
        // R 4.2.2: cliff(x, y)
        assertDelta(0.4, -0.178387901511348, 0.772950017636005, CliffsDelta.estimate(of(HW_Y), of(HW_X), 0.95));
    }

    @Test
    void deltaMatchesFormulaInRWithHeavyTiesOnFivePointScale() {
        // R 4.2.2: cliff(lc, lb)
        assertDelta(0.164880952380952, 0.0562481245059763, 0.269655554335578,
                CliffsDelta.estimate(likertBaseline(), likertCurrent(), 0.95));
    }

    @Test
    void deltaMatchesFormulaInRForUnbalancedAndSmallWaves() {
        // R 4.2.2: cliff(uc, ub)
        assertDelta(0.02301875, -0.147332718714531, 0.192043926592555,
                CliffsDelta.estimate(of(modular(4000, 37, 101, 1, 0)), of(modular(40, 53, 97, 1, 5)), 0.95));
        // R 4.2.2: cliff(sc, sb)
        assertDelta(0.0828821324448147, -0.144897508330771, 0.302319025355055,
                CliffsDelta.estimate(of(modular(49, 17, 101, 1, 0)), of(modular(49, 23, 103, 1, 0.5)), 0.95));
        // R 4.2.2: cliff(c(2,3,4,4,5,5,6), c(1,2,2,3,3,3,4,5))
        assertDelta(0.517857142857143, -0.0610950888927449, 0.836074234865648,
                CliffsDelta.estimate(of(1, 2, 2, 3, 3, 3, 4, 5), of(2, 3, 4, 4, 5, 5, 6), 0.95));
    }

    @Test
    void frequencyTableResultEqualsDominanceMatrixOnRawData() {
        Random rnd = new Random(31);
        for (int rep = 0; rep < 40; rep++) {
            double[] b = gridSample(rnd, 2 + rnd.nextInt(60), 2 + rnd.nextInt(20), 0);
            double[] c = gridSample(rnd, 2 + rnd.nextInt(60), 2 + rnd.nextInt(20), rnd.nextInt(6) / 8.0);
            double conf = rep % 2 == 0 ? 0.95 : 0.9;
            EffectSize e = CliffsDelta.estimate(of(b), of(c), conf);
            double[] ref = dominanceMatrixReference(b, c, conf);
            assertDelta(ref[0], ref[1], ref[2], e);
        }
    }

    @Test
    void swappingWavesFlipsDeltaAndMirrorsInterval() {
        Random rnd = new Random(32);
        for (int rep = 0; rep < 30; rep++) {
            NumericDistribution b = of(gridSample(rnd, 5 + rnd.nextInt(80), 3 + rnd.nextInt(20), 0));
            NumericDistribution c = of(gridSample(rnd, 5 + rnd.nextInt(80), 3 + rnd.nextInt(20), 0.25));
            EffectSize f = CliffsDelta.estimate(b, c, 0.95);
            EffectSize r = CliffsDelta.estimate(c, b, 0.95);
            assertDelta(-f.estimate(), -f.ciHigh(), -f.ciLow(), r);
        }
    }

    @Test
    void addingAConstantToBothWavesChangesNothing() {
        Random rnd = new Random(33);
        for (int rep = 0; rep < 20; rep++) {
            double[] b = gridSample(rnd, 10 + rnd.nextInt(50), 12, 0);
            double[] c = gridSample(rnd, 10 + rnd.nextInt(50), 12, 0.5);
            assertEquals(CliffsDelta.estimate(of(b), of(c), 0.95),
                    CliffsDelta.estimate(of(shifted(b, 1024)), of(shifted(c, 1024)), 0.95));
        }
    }

    @Test
    void completeSeparationAndSingleObservationsAreDocumentedEdgeCases() {
        EffectSize separated = CliffsDelta.estimate(of(1, 2, 3), of(4, 5), 0.95);
        assertDelta(1, 1, 1, separated);
        EffectSize single = CliffsDelta.estimate(of(1), of(4, 5), 0.95);
        assertDelta(1, -1, 1, single);
    }

    /** The estimator written plainly on the n1 x n2 dominance matrix. */
    private static double[] dominanceMatrixReference(double[] b, double[] c, double conf) {
        int m = c.length;
        int n = b.length;
        double[][] dm = new double[m][n];
        double d = 0;
        for (int i = 0; i < m; i++) {
            for (int j = 0; j < n; j++) {
                dm[i][j] = Math.signum(c[i] - b[j]);
                d += dm[i][j];
            }
        }
        d /= m * n;
        if (m < 2 || n < 2) {
            return new double[] {d, -1, 1};
        }
        double rows = 0;
        for (int i = 0; i < m; i++) {
            double s = 0;
            for (int j = 0; j < n; j++) {
                s += dm[i][j];
            }
            rows += Math.pow(s / n - d, 2);
        }
        double cols = 0;
        for (int j = 0; j < n; j++) {
            double s = 0;
            for (int i = 0; i < m; i++) {
                s += dm[i][j];
            }
            cols += Math.pow(s / m - d, 2);
        }
        double cells = 0;
        for (int i = 0; i < m; i++) {
            for (int j = 0; j < n; j++) {
                cells += Math.pow(dm[i][j] - d, 2);
            }
        }
        double s2 = ((double) n * n * rows + (double) m * m * cols - cells) / ((double) m * n * (m - 1) * (n - 1));
        s2 = Math.max(s2, (1 - d * d) / (m * n - 1.0));
        if (d * d >= 1) {
            return new double[] {d, d, d};
        }
        double z = new NormalDistribution(0, 1).inverseCumulativeProbability(1 - (1 - conf) / 2);
        double s = Math.sqrt(s2);
        double half = z * s * Math.sqrt(Math.pow(1 - d * d, 2) + z * z * s2);
        double den = 1 - d * d + z * z * s2;
        return new double[] {d, (d - d * d * d - half) / den, (d - d * d * d + half) / den};
    }
}
