package org.wavewarden.compare.shape;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.ReferenceWaves.*;

import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

/**
 * Wasserstein, PSI and Jensen-Shannon. References computed in R 4.2.2 (Debian r-base-core) with the formulas
 * written out on the raw data:
 * <pre>
 * w1  &lt;- function(a, b) { u &lt;- sort(unique(c(a, b))); sum(abs(ecdf(a)(u) - ecdf(b)(u))[-length(u)] * diff(u)) }
 * psi &lt;- function(b, c, eps = 1e-4) { q &lt;- unique(quantile(b, 1:9/10, type = 1, names = FALSE)); q &lt;- q[q &lt; max(b)]
 *   br &lt;- c(-Inf, q, Inf); pb &lt;- pmax(as.numeric(table(cut(b, br))) / length(b), eps)
 *   pc &lt;- pmax(as.numeric(table(cut(c, br))) / length(c), eps); sum((pc - pb) * log(pc / pb)) }
 * js  &lt;- function(p, q) { p &lt;- p / sum(p); q &lt;- q / sum(q); m &lt;- (p + q) / 2
 *   kl &lt;- function(a, b) sum(ifelse(a &gt; 0, a * log2(a / b), 0)); sqrt(kl(p, m) / 2 + kl(q, m) / 2) }
 * </pre>
 * The Wasserstein values were also recomputed by the quantile-function form, integral_0^1 |Q_c(t) - Q_b(t)| dt, with
 * the same result.
 */
class DistributionDistancesTest {

    record Case(String name, NumericDistribution baseline, NumericDistribution current, double w1, double psi,
                double js) {
    }

    private static List<Case> cases() {
        return List.of(
                new Case("Hollander-Wolfe", of(HW_Y), of(HW_X), 0.349, 2.0974947532417, 1.0),
                new Case("five-point", likertBaseline(), likertCurrent(), 0.360714285714286, 0.0873518995064514,
                        0.125128946706963),
                new Case("unbalanced", of(modular(4000, 37, 101, 1, 0)), of(modular(40, 53, 97, 1, 5)), 2.17075,
                        0.0313854117197591, 0.63184555629568),
                new Case("49 each", of(modular(49, 17, 101, 1, 0)), of(modular(49, 23, 103, 1, 0.5)),
                        4.45918367346939, 0.756795293874172, 1.0),
                new Case("small tied", of(1, 2, 2, 3, 3, 3, 4, 5), of(2, 3, 4, 4, 5, 5, 6), 1.26785714285714,
                        1.68154740884712, 0.479693068242453),
                new Case("large", of(modular(30000, 7919, 30011, 100, 0)), of(modular(20000, 104729, 30029, 100, 3)),
                        3.12275783333333, 0.00217397631038733, 0.46174275120847),
                new Case("ages", of(ages(30000, 7919, 30011, 73)), of(ages(32000, 104729, 30029, 71)), 1.001175,
                        0.00870163930382216, 0.117642662395256));
    }

    @Test
    void wassersteinMatchesEcdfIntegralInR() {
        for (Case c : cases()) {
            // R 4.2.2: w1(current, baseline)
            assertEquals(c.w1(), Wasserstein.distance(c.baseline(), c.current()), 1e-12 * Math.max(1, c.w1()), c.name());
        }
    }

    @Test
    void psiMatchesFormulaInROnTheSameBins() {
        for (Case c : cases()) {
            // R 4.2.2: psi(baseline, current)
            assertEquals(c.psi(), PopulationStabilityIndex.compute(c.baseline(), c.current()).psi(), 1e-12, c.name());
        }
    }

    @Test
    void jensenShannonMatchesFormulaInR() {
        for (Case c : cases()) {
            // R 4.2.2: js over the counts on the union of values
            assertEquals(c.js(), JensenShannon.distance(c.baseline(), c.current()), 1e-12, c.name());
        }
    }

    @Test
    void psiBinsMergeCoincidentDecilesOfDiscreteData() {
        PsiResult r = PopulationStabilityIndex.compute(likertBaseline(), likertCurrent());
        // R 4.2.2: unique(quantile(lb, 1:9/10, type = 1)) = 1 2 3 4 5; 5 is the maximum and is dropped
        assertEquals(5, r.bins().size());
        assertEquals(Double.NEGATIVE_INFINITY, r.bins().get(0).lower());
        assertEquals(1.0, r.bins().get(0).upper());
        assertEquals(4.0, r.bins().get(4).lower());
        assertEquals(Double.POSITIVE_INFINITY, r.bins().get(4).upper());
        assertEquals(30, r.bins().get(0).baselineCount());
        assertEquals(40, r.bins().get(4).currentCount());
        assertEquals(r.psi(), r.bins().stream().mapToDouble(PsiBin::contribution).sum(), 1e-15);
        // Hollander-Wolfe baseline deciles (R 4.2.2 type 1): 0.74 0.88 0.9 1.15, the 1.21 maximum dropped
        List<PsiBin> hw = PopulationStabilityIndex.compute(of(HW_Y), of(HW_X)).bins();
        assertEquals(List.of(0.74, 0.88, 0.9, 1.15), hw.stream().skip(1).map(PsiBin::lower).toList());
        assertEquals(0, hw.get(2).currentCount()); // (0.88, 0.9]: no current value
        assertEquals(PopulationStabilityIndex.EMPTY_SHARE, hw.get(2).currentShare());
    }

    @Test
    void distancesAreSymmetricShiftInvariantAndAgreeWithRawData() {
        Random rnd = new Random(61);
        for (int rep = 0; rep < 30; rep++) {
            double[] b = gridSample(rnd, 5 + rnd.nextInt(100), 2 + rnd.nextInt(40), 0);
            double[] c = gridSample(rnd, 5 + rnd.nextInt(100), 2 + rnd.nextInt(40), rnd.nextInt(8) / 8.0);
            NumericDistribution tb = of(b);
            NumericDistribution tc = of(c);
            double w = Wasserstein.distance(tb, tc);
            assertEquals(quantileFormW1(b, c), w, 1e-9);
            assertEquals(w, Wasserstein.distance(tc, tb), 1e-12);
            assertEquals(w, Wasserstein.distance(of(shifted(b, 1024)), of(shifted(c, 1024))), 1e-9);
            double js = JensenShannon.distance(tb, tc);
            assertEquals(js, JensenShannon.distance(tc, tb), 1e-12);
            assertEquals(js, JensenShannon.distance(of(shifted(b, 1024)), of(shifted(c, 1024))), 1e-12);
            assertTrue(js >= 0 && js <= 1);
            assertEquals(PopulationStabilityIndex.compute(tb, tc), PopulationStabilityIndex.compute(tb, tc));
            assertEquals(PopulationStabilityIndex.compute(tb, tc).psi(),
                    PopulationStabilityIndex.compute(of(shifted(b, 1024)), of(shifted(c, 1024))).psi(), 1e-12);
        }
    }

    @Test
    void jensenShannonIsZeroForIdenticalOneForDisjointAndIgnoresRelabelling() {
        assertEquals(0.0, JensenShannon.distance(new double[] {0.2, 0.3, 0.5}, new double[] {2, 3, 5}), 1e-15);
        assertEquals(1.0, JensenShannon.distance(new long[] {4, 0, 0}, new long[] {0, 3, 7}), 1e-15);
        // R 4.2.2: js(c(1, 2, 3), c(3, 2, 1)) = 0.354703515198132 (same formula written out)
        double d = JensenShannon.distance(new long[] {1, 2, 3}, new long[] {3, 2, 1});
        assertEquals(0.354703515198132, d, 1e-12);
        assertEquals(d, JensenShannon.distance(new long[] {3, 1, 2}, new long[] {1, 3, 2}), 1e-15);
        assertThrows(IllegalArgumentException.class, () -> JensenShannon.distance(new double[] {1}, new double[] {1, 2}));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> JensenShannon.distance(new double[] {1, -1}, new double[] {1, 2}));
        assertTrue(e.getMessage().contains("p[1]"));
    }

    /** integral_0^1 |Q_c(t) - Q_b(t)| dt with the left-continuous empirical quantile functions, on raw data. */
    private static double quantileFormW1(double[] b, double[] c) {
        double[] sb = b.clone();
        double[] sc = c.clone();
        Arrays.sort(sb);
        Arrays.sort(sc);
        double[] t = new double[sb.length + sc.length + 2];
        int k = 0;
        for (int i = 0; i <= sb.length; i++) {
            t[k++] = (double) i / sb.length;
        }
        for (int i = 1; i <= sc.length; i++) {
            t[k++] = (double) i / sc.length;
        }
        double[] grid = Arrays.stream(t, 0, k).sorted().distinct().toArray();
        double sum = 0;
        for (int i = 0; i + 1 < grid.length; i++) {
            double mid = (grid[i] + grid[i + 1]) / 2;
            double qb = sb[(int) Math.ceil(mid * sb.length) - 1];
            double qc = sc[(int) Math.ceil(mid * sc.length) - 1];
            sum += (grid[i + 1] - grid[i]) * Math.abs(qc - qb);
        }
        return sum;
    }
}
