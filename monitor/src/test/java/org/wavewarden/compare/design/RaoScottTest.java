package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;

/**
 * Reference values: R 4.2.2 (Debian r-base-core), survey 4.1.1, {@code options(survey.lonely.psu = "adjust")}, the
 * two waves stacked with strata wave x stratum ({@code st} as in {@link DesignMeanDifferenceTest}):
 * <pre>
 * c1 &lt;- svychisq(~cat + wave, st, statistic = "Chisq"); c(c1$statistic, c1$parameter, c1$p.value)
 * c2 &lt;- svychisq(~cat + wave, st, statistic = "F"); c(c2$statistic, c2$parameter, c2$p.value)
 * # eigenvalues of Delta, rebuilt as inside svychisq:
 * mm &lt;- model.matrix(~interaction(factor(cat), factor(wave)) - 1, d); mean2 &lt;- svymean(mm, st); N &lt;- nrow(mm)
 * Cmat &lt;- qr.resid(qr(X1), X12[, -(1:5)]); iD &lt;- diag(1 / coef(mean2))
 * Delta &lt;- solve(t(Cmat) %*% (iD / N) %*% Cmat, t(Cmat) %*% iD %*% vcov(mean2) %*% iD %*% Cmat)
 * eigen(Delta)$values
 * </pre>
 * R's "Chisq" statistic is the unadjusted Pearson X2; its p-value is that of X2 / mean(eigenvalues).
 */
class RaoScottTest {

    private static final double REL = 1e-8;

    private static void rel(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.abs(expected), what);
    }

    /** chisq {X2, df, p}, F {F, ndf, ddf, p}, eigenvalues descending. */
    private static void assertMatches(String file, double[] chisq, double[] f, double[] eigen) {
        RaoScottResult r = run(file);
        rel(chisq[0], r.pearsonChiSquare(), "X2");
        assertEquals(chisq[1], r.firstOrder().df(), 0, "df");
        rel(chisq[2], r.firstOrder().pValue(), "first-order p");
        rel(chisq[0] / r.meanDesignEffect(), r.firstOrder().statistic(), "X2 / mean deff");
        rel(f[0], r.secondOrder().statistic(), "F");
        rel(f[1], r.secondOrder().df(), "ndf");
        rel(f[2], r.denominatorDf(), "ddf");
        rel(f[3], r.secondOrder().pValue(), "F p");
        double[] d = r.designEffects();
        assertEquals(eigen.length, d.length);
        for (int i = 0; i < eigen.length; i++) {
            rel(eigen[i], d[i], "eigenvalue " + i);
        }
        rel(Arrays.stream(eigen).average().orElseThrow(), r.meanDesignEffect(), "mean deff");
    }

    private static RaoScottResult run(String file) {
        DesignData.Wave a = DesignData.wave(file, "A");
        DesignData.Wave b = DesignData.wave(file, "B");
        boolean simple = file.equals("weights_only") || file.equals("equal_weights");
        return RaoScott.test(a.cat(), simple ? a.weightsOnly() : a.design(), b.cat(),
                simple ? b.weightsOnly() : b.design());
    }

    @Test
    void raoScottMatchesSvychisqUnderWeightsOnlyDesign() {
        // R 4.2.2, survey 4.1.1: svychisq on weights_only, st <- svydesign(ids = ~1, strata = ~wave, weights = ~w)
        assertMatches("weights_only", new double[] {5.00358513211711, 3, 0.324843602741127},
                new double[] {1.15623529083648, 2.99804152577325, 1373.10301880415, 0.32524092831739},
                new double[] {1.49380902514647, 1.42483178814982, 1.40883921760405});
    }

    @Test
    void raoScottMatchesSvychisqUnderStratifiedClusterDesign() {
        // R 4.2.2, survey 4.1.1: svychisq on stratified_clustered
        assertMatches("stratified_clustered", new double[] {19.0855134389227, 3, 0.0648833448015051},
                new double[] {2.41039112696861, 2.50918838838994, 50.1837677677989, 0.0879497990254807},
                new double[] {4.09533944873164, 2.58510434687922, 1.23757134532823});
    }

    @Test
    void raoScottMatchesSvychisqWithSinglePsuStrata() {
        // R 4.2.2, survey 4.1.1, survey.lonely.psu = "adjust": svychisq on lonely_psu
        assertMatches("lonely_psu", new double[] {7.46995505299719, 3, 0.16388121553937},
                new double[] {1.70350525417817, 2.60762492451335, 28.6838741696469, 0.193166866198833},
                new double[] {2.24775647837937, 1.20574661492801, 0.931546518177941});
    }

    @Test
    void equalWeightsWithoutClustersGivePearsonChiSquareAndDesignEffectsNearOne() {
        // R 4.2.2, survey 4.1.1: svychisq on equal_weights; the design effects exceed 1 only by the n/(n-1)
        // factor of the linearised variance
        assertMatches("equal_weights", new double[] {4.97576012519015, 3, 0.175923534021692},
                new double[] {1.6480909625522, 2.99999999499928, 953.99999840977, 0.176687726634613},
                new double[] {1.00641601105751, 1.00637351435616, 1.00631575351146});
        // commons-math3 3.6.1: Pearson chi-square of the 2 x 4 table of counts, from the raw categories
        RaoScottResult r = run("equal_weights");
        long[][] counts = new long[2][4];
        for (int c : DesignData.wave("equal_weights", "A").cat()) {
            counts[0][c - 1]++;
        }
        for (int c : DesignData.wave("equal_weights", "B").cat()) {
            counts[1][c - 1]++;
        }
        assertEquals(new ChiSquareTest().chiSquare(counts), r.pearsonChiSquare(), 1e-10);
    }

    @Test
    void permutingCategoryLabelsLeavesTheTestUnchanged() {
        Random rnd = new Random(41);
        int[] relabel = {0, 40, 7, 19, -2};
        for (int rep = 0; rep < 15; rep++) {
            DesignData.Wave a = DesignData.random(rnd, 2 + rnd.nextInt(3), 0);
            DesignData.Wave b = DesignData.random(rnd, 2 + rnd.nextInt(3), rnd.nextDouble());
            RaoScottResult r = RaoScott.test(a.cat(), a.design(), b.cat(), b.design());
            int[] ca = Arrays.stream(a.cat()).map(c -> relabel[c]).toArray();
            int[] cb = Arrays.stream(b.cat()).map(c -> relabel[c]).toArray();
            RaoScottResult p = RaoScott.test(ca, a.design(), cb, b.design());
            assertEquals(r.pearsonChiSquare(), p.pearsonChiSquare(), 1e-9);
            assertEquals(r.firstOrder().pValue(), p.firstOrder().pValue(), 1e-10);
            assertEquals(r.secondOrder().statistic(), p.secondOrder().statistic(), 1e-9);
            assertEquals(r.secondOrder().df(), p.secondOrder().df(), 1e-8);
            assertEquals(r.secondOrder().pValue(), p.secondOrder().pValue(), 1e-10);
            assertArrayEquals(r.designEffects(), p.designEffects(), 1e-8);
            assertArrayEquals(new int[] {-2, 7, 19, 40}, p.codes());
        }
    }

    @Test
    void swappingWavesLeavesTheTestUnchanged() {
        Random rnd = new Random(43);
        for (int rep = 0; rep < 15; rep++) {
            DesignData.Wave a = DesignData.random(rnd, 1 + rnd.nextInt(4), 0);
            DesignData.Wave b = DesignData.random(rnd, 1 + rnd.nextInt(4), 2 * rnd.nextDouble());
            RaoScottResult ab = RaoScott.test(a.cat(), a.design(), b.cat(), b.design());
            RaoScottResult ba = RaoScott.test(b.cat(), b.design(), a.cat(), a.design());
            assertEquals(ab.pearsonChiSquare(), ba.pearsonChiSquare(), 1e-9);
            assertEquals(ab.firstOrder().pValue(), ba.firstOrder().pValue(), 1e-10);
            assertEquals(ab.secondOrder().pValue(), ba.secondOrder().pValue(), 1e-10);
            assertEquals(ab.denominatorDf(), ba.denominatorDf(), 1e-8);
        }
    }

    @Test
    void aChangedDistributionIsDetectedAndIdenticalWavesAreNot() {
        DesignData.Wave a = DesignData.wave("stratified_clustered", "A");
        RaoScottResult same = RaoScott.test(a.cat(), a.design(), a.cat(), a.design());
        assertEquals(0, same.pearsonChiSquare(), 1e-9);
        assertEquals(1, same.firstOrder().pValue(), 1e-9);
        int[] moved = a.cat().clone();
        for (int i = 0; i < moved.length; i += 2) {
            moved[i] = 4;
        }
        RaoScottResult changed = RaoScott.test(a.cat(), a.design(), moved, a.design());
        assertTrue(changed.firstOrder().pValue() < 0.01, () -> "p = " + changed.firstOrder().pValue());
        assertTrue(changed.secondOrder().pValue() < 0.01, () -> "p = " + changed.secondOrder().pValue());
    }

    @Test
    void rejectsASingleCategoryAndMismatchedLengths() {
        SurveyDesign d = SurveyDesign.weightsOnly(new double[] {1, 2, 3});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> RaoScott.test(new int[] {1, 1, 1}, d, new int[] {1, 1, 1}, d));
        assertTrue(e.getMessage().contains("category"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> RaoScott.test(new int[] {1, 2}, d, new int[] {1, 2, 1}, d));
        assertTrue(e.getMessage().contains("baselineCategories"), e.getMessage());
    }
}
