package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.junit.jupiter.api.Test;

/**
 * Reference values: R 4.2.2 (Debian r-base-core) with survey 4.1.1 and {@code options(survey.lonely.psu =
 * "adjust")}, per wave {@code s}:
 * <pre>
 * des &lt;- svydesign(ids = ~psu, strata = ~stratum, weights = ~w, data = s, nest = TRUE)  # or ids = ~1, weights = ~w
 * m &lt;- svymean(~y, des, deff = TRUE); c(coef(m), SE(m), deff(m))
 * deff(svymean(~y, des, deff = "replace"))
 * m &lt;- svymean(~factor(cat), des); coef(m); SE(m); vcov(m)
 * </pre>
 */
class WeightedEstimatesTest {

    private static final double REL = 1e-9;

    private static void assertRel(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.abs(expected) + 1e-15, what);
    }

    /** {mean, SE, deff = TRUE, deff = "replace"} from R. */
    private static void assertMatches(double[] r, DesignEstimate e) {
        assertRel(r[0], e.estimate(), "estimate");
        assertRel(r[1], e.standardError(), "SE");
        assertRel(r[2], e.designEffectWithoutReplacement(), "deff TRUE");
        assertRel(r[3], e.designEffect(), "deff replace");
    }

    @Test
    void weightedMeanAndShareMatchRUnderWeightsOnlyDesign() {
        // R 4.2.2, survey 4.1.1: svydesign(ids = ~1, weights = ~w, data = weights_only[wave == "A", ])
        DesignData.Wave a = DesignData.wave("weights_only", "A");
        assertMatches(new double[] {42.8050488897989, 0.608052064653098, 1.35109483542919, 1.31728365336139},
                WeightedEstimates.mean(a.y(), a.weightsOnly()));
        assertMatches(new double[] {0.408088770588771, 0.0390423146950796, 1.41745910491514, 1.38198715534269},
                WeightedEstimates.share(a.bin(), a.weightsOnly()));
        DesignData.Wave b = DesignData.wave("weights_only", "B");
        assertMatches(new double[] {45.4681062357448, 0.702693313642717, 1.7842011358936, 1.73539207087182},
                WeightedEstimates.mean(b.y(), b.weightsOnly()));
        assertMatches(new double[] {0.443252294221105, 0.0402594061865328, 1.61387318322171, 1.56972365346742},
                WeightedEstimates.share(b.bin(), b.weightsOnly()));
    }

    @Test
    void weightedMeanAndShareMatchRUnderStratifiedClusterDesign() {
        // R 4.2.2, survey 4.1.1: svydesign(ids = ~psu, strata = ~stratum, weights = ~w, nest = TRUE)
        DesignData.Wave a = DesignData.wave("stratified_clustered", "A");
        assertMatches(new double[] {54.5327455042265, 1.12597028804578, 3.90788560653963, 3.86824890351588},
                WeightedEstimates.mean(a.y(), a.design()));
        assertMatches(new double[] {0.447481183510054, 0.0714782405157849, 3.11056696801436, 3.07901726785416},
                WeightedEstimates.share(a.bin(), a.design()));
        assertEquals(10, a.design().degreesOfFreedom()); // R: degf(des)
        DesignData.Wave b = DesignData.wave("stratified_clustered", "B");
        assertMatches(new double[] {55.9669785457092, 0.874134943429864, 1.96471812060209, 1.94201495460798},
                WeightedEstimates.mean(b.y(), b.design()));
        assertMatches(new double[] {0.644878650325581, 0.0699434304712349, 2.80950694114038, 2.77704187565466},
                WeightedEstimates.share(b.bin(), b.design()));
    }

    @Test
    void singlePsuStrataFollowRAdjustPolicy() {
        // R 4.2.2, survey 4.1.1 with options(survey.lonely.psu = "adjust"); wave A has one stratum of one PSU
        DesignData.Wave a = DesignData.wave("lonely_psu", "A");
        assertMatches(new double[] {54.3123179648011, 2.34889786754313, 6.26689289310511, 6.19218791379024},
                WeightedEstimates.mean(a.y(), a.design()));
        assertMatches(new double[] {0.615077194953049, 0.079367787432884, 2.58502446592393, 2.55420948271786},
                WeightedEstimates.share(a.bin(), a.design()));
        assertEquals(5, a.design().degreesOfFreedom());
        DesignData.Wave b = DesignData.wave("lonely_psu", "B");
        assertMatches(new double[] {54.4646588395851, 1.17035033579166, 3.29689114977716, 3.25844838015891},
                WeightedEstimates.mean(b.y(), b.design()));
        assertEquals(6, b.design().degreesOfFreedom());
    }

    @Test
    void categorySharesAndTheirCovarianceMatchR() {
        // R 4.2.2, survey 4.1.1: svymean(~factor(cat), des, deff = "replace"): coef, SE, deff, vcov rows 1 and 3
        DesignData.Wave a = DesignData.wave("stratified_clustered", "A");
        CategoryShares s = WeightedEstimates.shares(a.cat(), a.design());
        assertEquals(4, s.codes().length);
        double[] shares = {0.1102658820236, 0.402390578332789, 0.37775857417291, 0.109584965470701};
        double[] se = {0.0335176078096329, 0.0883576053900277, 0.0798649407420846, 0.0449096124065803};
        double[] deff = {1.70620377348855, 4.83736551151048, 4.04320130220761, 3.07979225634671};
        double[] row1 = {0.00112343003328037, -0.0012153388372807, 0.000365164875576744, -0.000273256071576406};
        double[] row3 = {0.000365164875576744, -0.00579584200667985, 0.00637840875973669, -0.000947731628633581};
        for (int j = 0; j < 4; j++) {
            assertRel(shares[j], s.shares()[j], "share " + j);
            assertRel(se[j], s.of(j + 1).standardError(), "SE " + j);
            assertRel(deff[j], s.of(j + 1).designEffect(), "deff " + j);
            assertRel(row1[j], s.covariance()[0][j], "vcov[1," + j + "]");
            assertRel(row3[j], s.covariance()[2][j], "vcov[3," + j + "]");
        }
        // Same under the weights-only design of weights_only wave B and the lonely_psu wave B
        CategoryShares w = WeightedEstimates.shares(DesignData.wave("weights_only", "B").cat(),
                DesignData.wave("weights_only", "B").weightsOnly());
        double[] wse = {0.0374485899102649, 0.0326667421069434, 0.0325660068786462, 0.034926151687004};
        double[] wrow3 = {-0.000438353602232718, -0.00028068411252653, 0.00106054480402003, -0.00034150708926078};
        DesignData.Wave lb = DesignData.wave("lonely_psu", "B");
        CategoryShares l = WeightedEstimates.shares(lb.cat(), lb.design());
        double[] lse = {0.049954381343042, 0.0595001398689901, 0.0615380870966874, 0.0284061885607986};
        for (int j = 0; j < 4; j++) {
            assertRel(wse[j], w.estimates()[j].standardError(), "weights-only SE " + j);
            assertRel(wrow3[j], w.covariance()[2][j], "weights-only vcov[3," + j + "]");
            assertRel(lse[j], l.estimates()[j].standardError(), "lonely SE " + j);
        }
    }

    @Test
    void equalWeightsWithoutClustersGiveOrdinaryMeanAndSrsStandardError() {
        // R 4.2.2, survey 4.1.1: svydesign(ids = ~1, weights = ~w, data = equal_weights[wave == "A", ]) with w = 25:
        // mean 30.4882, SE 0.398988364477981 = sd(y) / sqrt(n) (the n/(n-1) factor turns the 1/n^2 sum of squares
        // into var(y) / n); deff = TRUE is 1/(1 - n/N) = 25/24 because N = sum(w) = 25 n; deff = "replace" is 1
        DesignData.Wave a = DesignData.wave("equal_weights", "A");
        DesignEstimate m = WeightedEstimates.mean(a.y(), a.weightsOnly());
        assertMatches(new double[] {30.4882, 0.398988364477981, 1.04166666666667, 1}, m);
        // The same against commons-math3 3.6.1 on the raw values
        assertRel(new StandardDeviation().evaluate(a.y()) / Math.sqrt(a.y().length), m.standardError(), "sd/sqrt(n)");
        assertRel(new org.apache.commons.math3.stat.descriptive.moment.Mean().evaluate(a.y()), m.estimate(), "mean");
        DesignEstimate p = WeightedEstimates.share(a.bin(), a.weightsOnly());
        assertRel(0.0409288136309238, p.standardError(), "share SE");
        // sqrt(p (1 - p) / (n - 1)) for a share under SRS with the n/(n-1) factor
        assertRel(Math.sqrt(0.48 * 0.52 / 149), p.standardError(), "share SE formula");
    }

    @Test
    void equalWeightsOnRandomDataGiveOrdinaryMeanAndSrsStandardError() {
        Random rnd = new Random(3);
        for (int rep = 0; rep < 30; rep++) {
            int n = 2 + rnd.nextInt(300);
            double[] y = new double[n];
            double[] w = new double[n];
            double c = 0.5 + 100 * rnd.nextDouble();
            for (int i = 0; i < n; i++) {
                y[i] = rnd.nextGaussian() * 3 + rnd.nextInt(4);
                w[i] = c;
            }
            DesignEstimate m = WeightedEstimates.mean(y, SurveyDesign.weightsOnly(w));
            // commons-math3 3.6.1 on the raw values
            assertEquals(new StandardDeviation().evaluate(y) / Math.sqrt(n), m.standardError(), 1e-10);
            assertEquals(1, m.designEffect(), 1e-9);
        }
    }

    @Test
    void weightsOnlyEqualsOneStratumWithEachRespondentItsOwnPsu() {
        DesignData.Wave a = DesignData.wave("weights_only", "A");
        // the committed file codes stratum 1 and psu = row number for this data set
        DesignEstimate viaIds = WeightedEstimates.mean(a.y(), a.design());
        DesignEstimate direct = WeightedEstimates.mean(a.y(), a.weightsOnly());
        assertEquals(direct.standardError(), viaIds.standardError(), 1e-14);
        assertEquals(direct.standardError(),
                WeightedEstimates.mean(a.y(), SurveyDesign.stratified(a.w(), new long[a.w().length])).standardError(),
                1e-14);
    }

    @Test
    void resultsDoNotDependOnRowOrderIdLabelsOrWeightScale() {
        Random rnd = new Random(17);
        for (int rep = 0; rep < 25; rep++) {
            DesignData.Wave d = DesignData.random(rnd, 1 + rnd.nextInt(5), 0);
            DesignEstimate m = WeightedEstimates.mean(d.y(), d.design());
            int n = d.w().length;
            int[] perm = permutation(rnd, n);
            double[] w = new double[n];
            double[] y = new double[n];
            long[] s = new long[n];
            long[] c = new long[n];
            double scale = 0.01 + 50 * rnd.nextDouble();
            for (int i = 0; i < n; i++) {
                int j = perm[i];
                w[i] = d.w()[j] * scale;
                y[i] = d.y()[j];
                s[i] = 1000 - 7 * d.strata()[j];
                c[i] = d.psus()[j] * 31 + 5;
            }
            DesignEstimate p = WeightedEstimates.mean(y, SurveyDesign.stratifiedClustered(w, s, c));
            assertEquals(m.estimate(), p.estimate(), 1e-10);
            assertEquals(m.standardError(), p.standardError(), 1e-10);
            assertEquals(m.designEffect(), p.designEffect(), 1e-8);
        }
    }

    @Test
    void clusteringChangesTheStandardErrorAndSharesSumToOne() {
        Random rnd = new Random(23);
        for (int rep = 0; rep < 20; rep++) {
            DesignData.Wave d = DesignData.random(rnd, 2 + rnd.nextInt(3), 0);
            double clustered = WeightedEstimates.mean(d.y(), d.design()).standardError();
            double unclustered = WeightedEstimates.mean(d.y(), d.weightsOnly()).standardError();
            assertNotEquals(unclustered, clustered, 1e-9);
            CategoryShares s = WeightedEstimates.shares(d.cat(), d.design());
            double total = 0;
            for (int j = 0; j < s.codes().length; j++) {
                total += s.shares()[j];
                double rowSum = 0;
                for (int k = 0; k < s.codes().length; k++) {
                    rowSum += s.covariance()[j][k];
                }
                // the shares sum to 1, so their covariance rows sum to 0
                assertEquals(0, rowSum, 1e-12);
            }
            assertEquals(1, total, 1e-12);
        }
    }

    @Test
    void rejectsMismatchedLengthsAndBadWeightsNamingTheArgument() {
        SurveyDesign d = SurveyDesign.weightsOnly(new double[] {1, 2, 3});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> WeightedEstimates.mean(new double[] {1, 2}, d));
        assertTrue(e.getMessage().contains("values"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> WeightedEstimates.mean(new double[] {1, Double.NaN, 3}, d));
        assertTrue(e.getMessage().contains("values[1]"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> SurveyDesign.stratifiedClustered(new double[] {1, 2}, new long[] {1, 1}, new long[] {1}));
        assertTrue(e.getMessage().contains("psus"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> SurveyDesign.weightsOnly(new double[] {1, -2}));
        assertTrue(e.getMessage().contains("weights[1]"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> WeightedEstimates.shares(new int[] {1, 2, 3}, null));
    }

    static int[] permutation(Random rnd, int n) {
        int[] p = new int[n];
        for (int i = 0; i < n; i++) {
            p[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rnd.nextInt(i + 1);
            int t = p[i];
            p[i] = p[j];
            p[j] = t;
        }
        return p;
    }
}
