package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.compare.categorical.CramersV;

/**
 * Under a stratified cluster design, Cramér's V's interval and the weighted KS test take their effective sizes from
 * the design rather than from the weights alone (Kish).
 */
class WeightedDesignEffectsTest {

    static final WeightedComparator WEIGHTED = new WeightedComparator(0.95);

    static double[] positions(int[] cat) {
        return Arrays.stream(cat).mapToDouble(c -> c - 1).toArray();
    }

    /**
     * R 4.2.2, survey 4.1.1: the script test/resources/design/cramers-v-design.R on stratified_clustered.csv
     * (dbar from svychisq(~cat + wave, st, statistic = "Chisq"); V from the weighted shares at Kish's sizes,
     * chisq.test on that table; the noncentral chi-square limits by uniroot on pchisq(x, 3, ncp)).
     */
    @Test
    void cramersVUnderAClusterDesignTakesItsIntervalFromTheRaoScottDesignEffectAsInR() {
        DesignData.Wave a = DesignData.wave("stratified_clustered", "A");
        DesignData.Wave b = DesignData.wave("stratified_clustered", "B");
        double[] pa = positions(a.cat());
        double[] pb = positions(b.cat());
        WeightedTally ta = WeightedTally.ofSample(pa, a.w());
        WeightedTally tb = WeightedTally.ofSample(pb, b.w());
        WeightedComparator.Design design = new WeightedComparator.Design(PsuTally.ofSample(pa, a.design()),
                PsuTally.ofSample(pb, b.design()), null, null);
        EffectSize v = WEIGHTED.categorical("cat", List.of("1", "2", "3", "4"), ta, tb, design, null).effect();
        assertEquals("Cramér's V (weighted, Rao-Scott design effect)", v.name());
        // R: V 0.261630333069488; n 281, dbar 2.63933838031303; interval 0 to 0.423168739757462
        assertEquals(0.261630333069488, v.estimate(), 1e-12);
        assertEquals(0, v.ciLow(), 0);
        assertEquals(0.423168739757462, v.ciHigh(), 1e-8);
        // R: at Kish's sizes 120.575 and 106.329 the interval was 0.105321299193774 to 0.377689217195164, excluding
        // no association although the design-based test does not reject (first-order p 0.065)
        EffectSize kish = WEIGHTED.categorical("cat", List.of("1", "2", "3", "4"), ta, tb, null).effect();
        assertEquals(0.261630333069488, kish.estimate(), 1e-12);
        assertEquals(0.105321299193774, kish.ciLow(), 1e-8);
        assertEquals(0.377689217195164, kish.ciHigh(), 1e-8);
    }

    @Test
    void aDesignEffectOfOneLeavesTheIntervalAtTheAnswersCount() {
        EffectSize srs = CramersV.ofTwoWaveChiSquare("V", 30, 3, 500, 0.95);
        EffectSize same = CramersV.atEffectiveSize("V", srs.estimate(), 3, 500, 0.95);
        assertEquals(srs.ciLow(), same.ciLow(), 1e-12);
        assertEquals(srs.ciHigh(), same.ciHigh(), 1e-12);
        EffectSize clustered = CramersV.atEffectiveSize("V", srs.estimate(), 3, 500 / 3.0, 0.95);
        assertEquals(srs.estimate(), clustered.estimate(), 1e-15);
        assertTrue(clustered.ciHigh() - clustered.ciLow() > srs.ciHigh() - srs.ciLow());
    }

    /** One wave of a clustered population: 3 strata of 8 PSUs of 12, intraclass correlation 0.5, unequal weights. */
    static DesignData.Wave clusteredWave(Random r) {
        int n = 3 * 8 * 12;
        double[] w = new double[n];
        long[] s = new long[n];
        long[] c = new long[n];
        double[] y = new double[n];
        int i = 0;
        for (int h = 0; h < 3; h++) {
            for (int p = 0; p < 8; p++) {
                double u = r.nextGaussian();
                for (int j = 0; j < 12; j++, i++) {
                    s[i] = h;
                    c[i] = p;
                    w[i] = 1 + 2 * r.nextDouble();
                    y[i] = Math.round((50 + 6 * u + 6 * r.nextGaussian()) * 100) / 100.0;
                }
            }
        }
        return new DesignData.Wave(w, s, c, y, new boolean[n], new int[n]);
    }

    /**
     * A simulation in place of an outside reference, since R's survey package has no design-based KS test: 400
     * pairs of waves drawn from one clustered population (design effect about 1 + 11 x 0.5 = 6.5). With Kish's sizes
     * the test rejects far above its 5% level (measured 41%); with the design's effective sizes it stays below it
     * (measured 0.75%: conservative, as Anderson's inequality says it must be).
     */
    @Test
    void theWeightedKsTestKeepsItsLevelUnderClusteringWhereKishsSizesDoNot() {
        Random r = new Random(2026);
        int reps = 400;
        int designRejects = 0;
        int kishRejects = 0;
        for (int rep = 0; rep < reps; rep++) {
            DesignData.Wave a = clusteredWave(r);
            DesignData.Wave b = clusteredWave(r);
            WeightedTally ta = WeightedTally.ofSample(a.y(), a.w());
            WeightedTally tb = WeightedTally.ofSample(b.y(), b.w());
            WeightedComparator.Design design = new WeightedComparator.Design(PsuTally.ofSample(a.y(), a.design()),
                    PsuTally.ofSample(b.y(), b.design()), null, null);
            Comparison withDesign = WEIGHTED.shape("y", ta, tb, design);
            Comparison kish = WEIGHTED.shape("y", ta, tb);
            assertEquals(WeightedComparator.SHAPE_TEST_DESIGN, withDesign.test().test());
            designRejects += withDesign.test().pValue() < 0.05 ? 1 : 0;
            kishRejects += kish.test().pValue() < 0.05 ? 1 : 0;
        }
        double designRate = (double) designRejects / reps;
        double kishRate = (double) kishRejects / reps;
        // 0.05 + 4 binomial standard errors of 400 draws at 5%
        assertTrue(designRate <= 0.05 + 4 * Math.sqrt(0.05 * 0.95 / reps), "design " + designRate + ", Kish "
                + kishRate);
        assertTrue(kishRate > 0.25, "design " + designRate + ", Kish " + kishRate);
    }

    @Test
    void theLocationFindingsDetailReportsTheShapeFindingsKsTestUnderTheDesign() {
        Random r = new Random(7);
        DesignData.Wave a = clusteredWave(r);
        DesignData.Wave b = clusteredWave(r);
        WeightedTally ta = WeightedTally.ofSample(a.y(), a.w());
        WeightedTally tb = WeightedTally.ofSample(b.y(), b.w());
        PsuTally pa = PsuTally.ofSample(a.y(), a.design());
        PsuTally pb = PsuTally.ofSample(b.y(), b.design());
        WeightedComparator.Design design = new WeightedComparator.Design(pa, pb, pa.totals(), pb.totals());
        Comparison shape = WEIGHTED.shape("y", ta, tb, design);
        var detail = (WeightedComparator.LocationDetail) WEIGHTED.numeric("y", ta, tb, design, null, null).detail();
        assertEquals(WeightedComparator.SHAPE_TEST_DESIGN, detail.ksTest());
        assertEquals(shape.test().statistic(), detail.ksD(), 0);
        assertEquals(shape.test().pValue(), detail.ksPValue(), 0);
        // the weights alone would give another p for the same distance: the detail must not fall back to it
        double kish = WEIGHTED.shape("y", ta, tb).test().pValue();
        assertTrue(Math.abs(kish - detail.ksPValue()) > 0.01, "Kish " + kish + ", design " + detail.ksPValue());
        var weightsOnly = (WeightedComparator.LocationDetail) WEIGHTED.numeric("y", ta, tb, null, null).detail();
        assertEquals(WeightedComparator.SHAPE_TEST, weightsOnly.ksTest());
        assertEquals(kish, weightsOnly.ksPValue(), 0);
    }
}
