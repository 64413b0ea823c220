package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.api.Test;

/**
 * Reference values: R 4.2.2 (Debian r-base-core), survey 4.1.1, {@code options(survey.lonely.psu = "adjust")}, on the
 * two waves stacked with strata wave x stratum:
 * <pre>
 * d$stratum2 &lt;- interaction(d$wave, d$stratum)
 * st &lt;- svydesign(ids = ~psu, strata = ~stratum2, weights = ~w, data = d, nest = TRUE)
 *   # weights only: svydesign(ids = ~1, strata = ~wave, weights = ~w, data = d)
 * t &lt;- svyttest(y ~ wave, st); c(t$estimate, t$statistic, t$parameter, t$p.value); degf(st)
 * </pre>
 * svyttest uses df = degf(st) - 1 (the residual df of {@code svyglm(y ~ wave, st)}, checked in the same R); this
 * class uses degf(st), so its p-value is checked by formula (commons-math3 3.6.1 t distribution), and the svyttest
 * p-value it states beside it ({@code svyttest()}) is held to R's.
 */
class DesignMeanDifferenceTest {

    private static void assertMatchesSvyttest(String file, boolean shares, double[] r, int degf) {
        DesignData.Wave a = DesignData.wave(file, "A");
        DesignData.Wave b = DesignData.wave(file, "B");
        boolean simple = file.equals("weights_only") || file.equals("equal_weights");
        SurveyDesign da = simple ? a.weightsOnly() : a.design();
        SurveyDesign db = simple ? b.weightsOnly() : b.design();
        DesignMeanDifferenceResult m = shares
                ? DesignMeanDifference.testShares(a.bin(), da, b.bin(), db, 0.95)
                : DesignMeanDifference.test(a.y(), da, b.y(), db, 0.95);
        assertEquals(r[0], m.difference().estimate(), 1e-10 * Math.abs(r[0]), "estimate");
        assertEquals(r[1], m.test().statistic(), 1e-9 * Math.abs(r[1]), "t");
        assertEquals(degf, m.test().df(), 0, "df");
        assertEquals(r[2] + 1, m.test().df(), 0, "svyttest df + 1");
        double t = m.test().statistic();
        double seFormula = Math.hypot(m.baseline().standardError(), m.current().standardError());
        assertEquals(seFormula, m.standardError(), 1e-15);
        // svyttest's p from our t on its df
        assertEquals(r[3], 2 * new TDistribution(r[2]).cumulativeProbability(-Math.abs(t)), 1e-9 * r[3], "p(df-1)");
        // what the result states for a reader checking with svyttest: R's df and p, beside its own df convention
        assertEquals(r[2], m.svyttest().df(), 0, "svyttest df as stated");
        assertEquals(r[3], m.svyttest().pValue(), 1e-9 * r[3], "svyttest p as stated");
        assertEquals(t, m.svyttest().statistic(), 0, "the same t");
        assertEquals(DesignMeanDifference.DF_DESIGN, m.test().dfConvention());
        TDistribution ours = new TDistribution(degf);
        assertEquals(2 * ours.cumulativeProbability(-Math.abs(t)), m.test().pValue(), 1e-12, "p");
        double half = ours.inverseCumulativeProbability(0.975) * seFormula;
        assertEquals(r[0] - half, m.difference().ciLow(), 1e-9);
        assertEquals(r[0] + half, m.difference().ciHigh(), 1e-9);
    }

    @Test
    void differenceOfWeightedMeansMatchesSvyttestUnderWeightsOnlyDesign() {
        // R 4.2.2, survey 4.1.1: svyttest(y ~ wave, st): estimate, t, df, p; degf(st) = 458
        assertMatchesSvyttest("weights_only", false,
                new double[] {2.66305734594593, 2.86581425354248, 457, 0.00435128743121889}, 458);
        assertMatchesSvyttest("weights_only", true,
                new double[] {0.0351635236323341, 0.627008792839461, 457, 0.530966580808352}, 458);
    }

    @Test
    void differenceOfWeightedMeansMatchesSvyttestUnderStratifiedClusterDesign() {
        // R 4.2.2, survey 4.1.1: svyttest(y ~ wave, st) and svyttest(bin ~ wave, st); degf(st) = 20
        assertMatchesSvyttest("stratified_clustered", false,
                new double[] {1.43423304148274, 1.00615830255124, 19, 0.326982215791645}, 20);
        assertMatchesSvyttest("stratified_clustered", true,
                new double[] {0.197397466815527, 1.97385403646389, 19, 0.0631192995317112}, 20);
        // single-PSU strata, "adjust": degf(st) = 11
        assertMatchesSvyttest("lonely_psu", false,
                new double[] {0.152340874783966, 0.0580497171170036, 10, 0.95485262731354}, 11);
        assertMatchesSvyttest("lonely_psu", true,
                new double[] {-0.120492099683565, -1.17189306436557, 10, 0.268403253201563}, 11);
        assertMatchesSvyttest("equal_weights", false,
                new double[] {0.148388235294114, 0.279728126671257, 317, 0.779868529806803}, 318);
    }

    @Test
    void wavePiecesMatchRPerWaveEstimates() {
        // R 4.2.2, survey 4.1.1: svymean(~y, des) per wave of stratified_clustered: SE 1.12597028804578 (A) and
        // 0.874134943429864 (B); the difference's SE is their root sum of squares
        DesignData.Wave a = DesignData.wave("stratified_clustered", "A");
        DesignData.Wave b = DesignData.wave("stratified_clustered", "B");
        DesignMeanDifferenceResult m = DesignMeanDifference.test(a.y(), a.design(), b.y(), b.design(), 0.9);
        assertEquals(1.12597028804578, m.baseline().standardError(), 1e-12);
        assertEquals(0.874134943429864, m.current().standardError(), 1e-12);
        assertEquals(Math.sqrt(1.12597028804578 * 1.12597028804578 + 0.874134943429864 * 0.874134943429864),
                m.standardError(), 1e-12);
        assertEquals(0.9, m.difference().confidence());
        assertEquals(55.9669785457092 - 54.5327455042265, m.difference().estimate(), 1e-11);
    }

    @Test
    void swappingWavesFlipsTheSignAndKeepsP() {
        Random rnd = new Random(29);
        for (int rep = 0; rep < 25; rep++) {
            DesignData.Wave a = DesignData.random(rnd, 1 + rnd.nextInt(4), 0);
            DesignData.Wave b = DesignData.random(rnd, 1 + rnd.nextInt(4), rnd.nextDouble());
            DesignMeanDifferenceResult ab = DesignMeanDifference.test(a.y(), a.design(), b.y(), b.design(), 0.95);
            DesignMeanDifferenceResult ba = DesignMeanDifference.test(b.y(), b.design(), a.y(), a.design(), 0.95);
            assertEquals(-ab.difference().estimate(), ba.difference().estimate(), 1e-12);
            assertEquals(-ab.test().statistic(), ba.test().statistic(), 1e-12);
            assertEquals(ab.test().pValue(), ba.test().pValue(), 1e-12);
            assertEquals(-ab.difference().ciHigh(), ba.difference().ciLow(), 1e-10);
            DesignMeanDifferenceResult s = DesignMeanDifference.testShares(a.bin(), a.design(), b.bin(), b.design(),
                    0.95);
            DesignMeanDifferenceResult r = DesignMeanDifference.testShares(b.bin(), b.design(), a.bin(), a.design(),
                    0.95);
            assertEquals(-s.difference().estimate(), r.difference().estimate(), 1e-12);
            assertEquals(s.test().pValue(), r.test().pValue(), 1e-12);
        }
    }

    @Test
    void aShiftedCurrentWaveIsPositiveAndDetected() {
        DesignData.Wave a = DesignData.wave("weights_only", "A");
        double[] shifted = a.y().clone();
        for (int i = 0; i < shifted.length; i++) {
            shifted[i] += 5;
        }
        DesignMeanDifferenceResult m = DesignMeanDifference.test(a.y(), a.weightsOnly(), shifted, a.weightsOnly(),
                0.95);
        assertEquals(5, m.difference().estimate(), 1e-10);
        assertTrue(m.test().pValue() < 1e-6);
        assertTrue(m.difference().ciLow() > 0);
    }

    @Test
    void rejectsBadConfidenceAndDesignsWithoutDegreesOfFreedom() {
        SurveyDesign d = SurveyDesign.weightsOnly(new double[] {1, 2, 3});
        double[] y = {1, 2, 4};
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> DesignMeanDifference.test(y, d, y, d, 1.0));
        assertTrue(e.getMessage().contains("confidence"), e.getMessage());
        // every respondent its own stratum: #PSU - #strata = 0
        SurveyDesign none = SurveyDesign.stratified(new double[] {1, 2, 3}, new long[] {1, 2, 3});
        e = assertThrows(IllegalArgumentException.class, () -> DesignMeanDifference.test(y, none, y, none, 0.95));
        assertTrue(e.getMessage().contains("degrees of freedom"), e.getMessage());
    }
}
