package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.moment.Variance;
import org.junit.jupiter.api.Test;

class KishTest {

    private static final double TOL = 1e-12;

    @Test
    void kishDesignEffectAndEffectiveSizeMatchRFormulaOnCommittedWeights() {
        // R 4.2.2 (Debian r-base-core), survey 4.1.1 loaded but not needed: n * sum(w^2) / sum(w)^2 and
        // sum(w)^2 / sum(w^2) on each wave
        DesignData.Wave a = DesignData.wave("weights_only", "A");
        assertEquals(1.38106291123683, Kish.designEffect(a.w()), TOL);
        assertEquals(159.297594780078, Kish.effectiveSampleSize(a.w()), 1e-10);
        DesignData.Wave b = DesignData.wave("weights_only", "B");
        assertEquals(1.52472344244596, Kish.designEffect(b.w()), TOL);
        assertEquals(157.405594561458, Kish.effectiveSampleSize(b.w()), 1e-10);
        DesignData.Wave s = DesignData.wave("stratified_clustered", "A");
        assertEquals(1.24403840963278, Kish.designEffect(s.w()), TOL);
        assertEquals(120.575055270421, Kish.effectiveSampleSize(s.w()), 1e-10);
    }

    @Test
    void kishDesignEffectDiffersFromTheDesignEffectRReportsForAVariable() {
        // Kish's deff_w depends on the weights only; svymean's deff is measured on y. On weights_only wave A:
        // R 4.2.2, survey 4.1.1: deff(svymean(~y, svydesign(ids = ~1, weights = ~w, data = A), deff = "replace"))
        DesignData.Wave a = DesignData.wave("weights_only", "A");
        DesignEstimate y = WeightedEstimates.mean(a.y(), a.weightsOnly());
        assertEquals(1.31728365336139, y.designEffect(), 1e-10);
        assertEquals(1.38106291123683, Kish.designEffect(a.w()), TOL);
        assertTrue(Math.abs(y.designEffect() - Kish.designEffect(a.w())) > 0.05);
    }

    @Test
    void kishDesignEffectEqualsRDesignEffectWhenSquaredResidualsAreConstant() {
        // Twin respondents with equal weights at y = 0 and y = 1 put the weighted mean at 1/2, so every squared
        // residual is 1/4 and svymean's deff = n sum w^2 e^2 / (sum w sum w e^2) reduces to Kish's.
        Random rnd = new Random(11);
        for (int rep = 0; rep < 20; rep++) {
            int half = 5 + rnd.nextInt(60);
            double[] w = new double[2 * half];
            double[] y = new double[2 * half];
            for (int i = 0; i < half; i++) {
                w[i] = w[i + half] = Math.exp(rnd.nextGaussian());
                y[i + half] = 1;
            }
            DesignEstimate m = WeightedEstimates.mean(y, SurveyDesign.weightsOnly(w));
            assertEquals(Kish.designEffect(w), m.designEffect(), 1e-10);
        }
    }

    @Test
    void equalWeightsGiveEffectiveSizeNAndDesignEffectOne() {
        for (int n : new int[] {1, 2, 7, 150}) {
            double[] w = new double[n];
            java.util.Arrays.fill(w, 25);
            assertEquals(n, Kish.effectiveSampleSize(w), 1e-9 * n);
            assertEquals(1, Kish.designEffect(w), 1e-12);
        }
    }

    @Test
    void designEffectIsOnePlusSquaredCoefficientOfVariationAndScaleFree() {
        Random rnd = new Random(5);
        for (int rep = 0; rep < 50; rep++) {
            double[] w = new double[2 + rnd.nextInt(200)];
            for (int i = 0; i < w.length; i++) {
                w[i] = 0.1 + 10 * rnd.nextDouble() * rnd.nextDouble();
            }
            // commons-math3 3.6.1: population variance (divisor n) and mean of the raw weights
            double mean = new Mean().evaluate(w);
            double cv2 = new Variance(false).evaluate(w) / (mean * mean);
            assertEquals(1 + cv2, Kish.designEffect(w), 1e-10);
            assertTrue(Kish.designEffect(w) >= 1 - 1e-12);
            double[] scaled = w.clone();
            for (int i = 0; i < w.length; i++) {
                scaled[i] *= 37.5;
            }
            assertEquals(Kish.effectiveSampleSize(w), Kish.effectiveSampleSize(scaled), 1e-9);
        }
    }

    @Test
    void rejectsNonPositiveWeightsNamingTheEntry() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Kish.designEffect(new double[] {1, 0, 2}));
        assertTrue(e.getMessage().contains("weights[1]"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> Kish.effectiveSampleSize(new double[0]));
    }
}
