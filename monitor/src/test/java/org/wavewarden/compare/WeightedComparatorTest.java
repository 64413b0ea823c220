package org.wavewarden.compare;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.categorical.CramersV;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.compare.shape.DistanceInterval;
import org.wavewarden.compare.shape.KolmogorovSmirnovTest;
import org.wavewarden.config.Threshold;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The weighted comparisons assemble design-based tests (checked against R's survey package in
 * {@code compare.design} and in {@code WeightedJudgeIntegrationTest}); here: their Kish-based parts reduce to the
 * unweighted methods under equal weights, and signed effects flip with the waves.
 */
class WeightedComparatorTest {

    private final WeightedComparator comparator = new WeightedComparator(0.95);

    private static WeightedTally tally(double[] y, double[] w) {
        return WeightedTally.ofSample(y, w);
    }

    private static double[] ones(int n, double c) {
        double[] w = new double[n];
        java.util.Arrays.fill(w, c);
        return w;
    }

    @Test
    void kishApproximationsEqualTheUnweightedMethodsUnderEqualWeights() {
        Random r = new Random(13);
        for (int rep = 0; rep < 20; rep++) {
            int n = 120 + r.nextInt(400);
            int m = 120 + r.nextInt(400);
            double[] y = new double[n];
            double[] z = new double[m];
            for (int i = 0; i < n; i++) {
                y[i] = r.nextInt(30);
            }
            for (int i = 0; i < m; i++) {
                z[i] = r.nextInt(30) + r.nextInt(3);
            }
            WeightedTally ty = tally(y, ones(n, 2.5));
            WeightedTally tz = tally(z, ones(m, 2.5));
            // KS p-value at n_eff = n: the limiting p of the unweighted test, used there once n m >= 10000
            var ks = KolmogorovSmirnovTest.test(NumericDistribution.ofSample(y), NumericDistribution.ofSample(z));
            Comparison shape = comparator.shape("y", ty, tz);
            assertEquals(ks.d(), shape.test().statistic(), 1e-12);
            assertEquals(ks.test().pValue(), shape.test().pValue(), 1e-9);
            EffectSize dkw = DistanceInterval.of(ks.d(), n, m, 0.95);
            assertEquals(dkw.ciHigh(), shape.effect().ciHigh(), 1e-9);
            // Cramér's V on the shares scaled to n_eff = n is Cramér's V of the count table
            long[][] table = new long[2][4];
            double[] cy = new double[n];
            double[] cz = new double[m];
            for (int i = 0; i < n; i++) {
                cy[i] = (int) y[i] % 4;
                table[0][(int) cy[i]]++;
            }
            for (int i = 0; i < m; i++) {
                cz[i] = (int) z[i] % 4;
                table[1][(int) cz[i]]++;
            }
            Comparison cat = comparator.categorical("c", List.of("a", "b", "c", "d"), tally(cy, ones(n, 0.7)),
                    tally(cz, ones(m, 0.7)), null);
            EffectSize v = CramersV.estimate(table, 0.95);
            assertEquals(v.estimate(), cat.effect().estimate(), 1e-9);
            assertEquals(v.ciLow(), cat.effect().ciLow(), 1e-6);
            assertEquals(v.ciHigh(), cat.effect().ciHigh(), 1e-6);
        }
    }

    @Test
    void aLabelledWeightedComparisonNamesTheCategoryByItsLabelAndKeepsEveryNumber() {
        double[] b = {0, 0, 0, 1, 1, 1, 2, 2, 2, 3, 3, 3, 0, 1, 2, 3};
        double[] c = {0, 0, 0, 0, 0, 0, 0, 1, 1, 2, 2, 3, 0, 0, 0, 3};
        List<String> codes = List.of("OWN", "COUN", "HA", "PRIV");
        WeightedComparator plain = new WeightedComparator(0.95);
        WeightedComparator labelled = plain.labelled(new org.wavewarden.codebook.CodeLabels("Tenure",
                java.util.Map.of("OWN", "Owner occupier", "HA", "Housing association")));
        Comparison p = plain.categorical("tenure", codes, tally(b, ones(b.length, 1.3)), tally(c, ones(c.length, 1.3)),
                null);
        Comparison l = labelled.categorical("tenure", codes, tally(b, ones(b.length, 1.3)),
                tally(c, ones(c.length, 1.3)), null);
        assertEquals("weighted share answering 'OWN'", p.change().measure());
        assertEquals("weighted share answering 'Owner occupier' (OWN)", l.change().measure());
        assertEquals(p.test(), l.test());
        assertEquals(p.effect(), l.effect());
        var rows = ((WeightedComparator.CategoryDetail) l.detail()).categories();
        assertEquals(java.util.Arrays.asList("Owner occupier", null, "Housing association", null),
                rows.stream().map(WeightedComparator.CategoryRow::label).toList());
    }

    @Test
    void signedEffectsFlipWhenTheWavesSwap() {
        Random r = new Random(29);
        double[] y = new double[300];
        double[] z = new double[260];
        double[] wy = new double[300];
        double[] wz = new double[260];
        for (int i = 0; i < y.length; i++) {
            y[i] = r.nextInt(10);
            wy[i] = Math.exp(r.nextGaussian() / 2);
        }
        for (int i = 0; i < z.length; i++) {
            z[i] = r.nextInt(10) + (r.nextDouble() < 0.3 ? 1 : 0);
            wz[i] = Math.exp(r.nextGaussian() / 2);
        }
        Comparison ab = comparator.numeric("y", tally(y, wy), tally(z, wz), null, null);
        Comparison ba = comparator.numeric("y", tally(z, wz), tally(y, wy), null, null);
        assertEquals(-ab.effect().estimate(), ba.effect().estimate(), 1e-12);
        assertEquals(ab.test().pValue(), ba.test().pValue(), 1e-12);
        assertEquals("Cohen's d (weighted)", ab.effect().name());
        Comparison raw = comparator.numeric("y", tally(y, wy), tally(z, wz), new Threshold(0.5, null, null), "pt");
        assertEquals("difference of weighted means", raw.effect().name());
        assertEquals(ab.change().estimate(), raw.effect().estimate(), 1e-12);
        double[] by = new double[y.length];
        double[] bz = new double[z.length];
        for (int i = 0; i < y.length; i++) {
            by[i] = y[i] < 4 ? 1 : 0;
        }
        for (int i = 0; i < z.length; i++) {
            bz[i] = z[i] < 4 ? 1 : 0;
        }
        Comparison pab = comparator.proportion("b", "answering '1'", tally(by, wy), tally(bz, wz), null);
        Comparison pba = comparator.proportion("b", "answering '1'", tally(bz, wz), tally(by, wy), null);
        assertEquals(-pab.effect().estimate(), pba.effect().estimate(), 1e-12);
        assertEquals(-pab.effect().ciLow(), pba.effect().ciHigh(), 1e-12);
        assertTrue(pab.change().note().startsWith("weighted: Kish effective sample sizes"), pab.change().note());
    }
}
