package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.shape.KolmogorovSmirnovTest;
import org.wavewarden.profile.NumericDistribution;

/**
 * The weights-only estimates from per-value sums ({@link WeightedTally}) against R and against the row-level
 * classes on the same respondents.
 *
 * <p>Reference values: R 4.2.2 (Debian r-base-core) with survey 4.1.1 (Debian r-cran-survey). The committed
 * {@code design/weighted_tally.csv} (waves A of 300 and B of 340 respondents, lognormal weights rounded to cents,
 * y in whole numbers 0 to 20 so that values repeat) was written by this script, whose printed output gives the
 * constants below:
 * <pre>
 * suppressMessages(library(survey))
 * set.seed(20240715)
 * wave &lt;- function(label, n, shift) {
 *   w &lt;- round(exp(rnorm(n, 3, 0.6)), 2)
 *   y &lt;- pmin(20, pmax(0, round(8 + shift + 0.08 * (w - 25) + rnorm(n, 0, 3))))
 *   bin &lt;- rbinom(n, 1, plogis(-0.3 + 0.03 * (w - 25) + shift / 4))
 *   cat &lt;- sample(1:4, n, TRUE, c(0.3, 0.3 + shift / 10, 0.25, 0.15))
 *   data.frame(wave = label, w = w, y = y, bin = bin, cat = cat)
 * }
 * d &lt;- rbind(wave("A", 300, 0), wave("B", 340, 1))
 * d &lt;- data.frame(wave = d$wave, stratum = 1, psu = ave(seq_along(d$wave), d$wave, FUN = seq_along), d[, -1])
 * write.csv(d, "weighted_tally.csv", row.names = FALSE, quote = FALSE)
 * options(digits = 15)
 * for (s in c("A", "B")) {
 *   x &lt;- d[d$wave == s, ]
 *   des &lt;- svydesign(ids = ~1, weights = ~w, data = x)
 *   m &lt;- svymean(~y, des, deff = TRUE); print(c(coef(m), SE(m), deff(m), deff(svymean(~y, des, deff = "replace"))))
 *   m &lt;- svymean(~bin, des, deff = TRUE); print(c(coef(m), SE(m), deff(m), deff(svymean(~bin, des, deff = "replace"))))
 *   m &lt;- svymean(~factor(cat), des, deff = "replace"); print(coef(m)); print(SE(m)); print(deff(m)); print(vcov(m))
 *   print(coef(svyvar(~y, des)))
 *   print(coef(svyquantile(~y, des, c(0.1, 0.25, 0.5, 0.75, 0.9))))
 *   print(coef(svyquantile(~w, des, c(0.1, 0.5, 0.9))))
 *   print(c(sum(x$w)^2 / sum(x$w^2), nrow(x) * sum(x$w^2) / sum(x$w)^2))
 * }
 * st &lt;- svydesign(ids = ~1, strata = ~wave, weights = ~w, data = d)
 * t &lt;- svyttest(y ~ wave, st); print(c(t$estimate, t$statistic, t$parameter, t$p.value)); print(degf(st))
 * t &lt;- svyttest(bin ~ wave, st); print(c(t$estimate, t$statistic, t$parameter, t$p.value))
 * c1 &lt;- svychisq(~cat + wave, st, statistic = "Chisq"); print(c(c1$statistic, c1$parameter, c1$p.value))
 * c2 &lt;- svychisq(~cat + wave, st, statistic = "F"); print(c(c2$statistic, c2$parameter, c2$p.value))
 * Fa &lt;- svycdf(~y, svydesign(ids = ~1, weights = ~w, data = d[d$wave == "A", ]))[[1]]
 * Fb &lt;- svycdf(~y, svydesign(ids = ~1, weights = ~w, data = d[d$wave == "B", ]))[[1]]
 * u &lt;- sort(unique(d$y)); print(max(abs(Fb(u) - Fa(u))))
 * </pre>
 */
class TallyEstimatesTest {

    private static final double REL = 1e-9;

    private static void rel(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.abs(expected) + 1e-15, what);
    }

    /** {mean, SE, deff = TRUE, deff = "replace"} from R. */
    private static void assertMatches(double[] r, DesignEstimate e, String what) {
        rel(r[0], e.estimate(), what + " estimate");
        rel(r[1], e.standardError(), what + " SE");
        rel(r[2], e.designEffectWithoutReplacement(), what + " deff TRUE");
        rel(r[3], e.designEffect(), what + " deff replace");
    }

    static WeightedTally y(DesignData.Wave w) {
        return WeightedTally.ofSample(w.y(), w.w());
    }

    static WeightedTally bin(DesignData.Wave w) {
        double[] b = new double[w.bin().length];
        for (int i = 0; i < b.length; i++) {
            b[i] = w.bin()[i] ? 1 : 0;
        }
        return WeightedTally.ofSample(b, w.w());
    }

    static WeightedTally cat(DesignData.Wave w) {
        return WeightedTally.ofSample(java.util.Arrays.stream(w.cat()).asDoubleStream().toArray(), w.w());
    }

    private static final DesignData.Wave A = DesignData.wave("weighted_tally", "A");
    private static final DesignData.Wave B = DesignData.wave("weighted_tally", "B");

    @Test
    void theCommittedWavesCollapseToFewValues() {
        assertEquals(300, y(A).n());
        assertTrue(y(A).size() <= 21, "y takes whole numbers 0 to 20");
        assertEquals(340, cat(B).n());
        assertEquals(4, cat(B).size());
    }

    @Test
    void weightedMeanShareAndVarianceFromTheTallyMatchSvymean() {
        // R 4.2.2, survey 4.1.1: svymean(~y | ~bin, svydesign(ids = ~1, weights = ~w, data = x), deff = ...)
        assertMatches(new double[] {8.876904333996880, 0.286113428114248, 2.258338178081266, 2.167335600003991},
                TallyEstimates.mean(y(A)), "A y");
        assertMatches(new double[] {0.5383217414430896, 0.0343953193264401, 1.4830348217813027, 1.4232740678471267},
                TallyEstimates.mean(bin(A)), "A bin");
        assertMatches(new double[] {9.323017850851137, 0.235090076556007, 1.599261628443086, 1.529341000092271},
                TallyEstimates.mean(y(B)), "B y");
        assertMatches(new double[] {0.5531732131789225, 0.0312085034119188, 1.3968842699515731, 1.3358116948636132},
                TallyEstimates.mean(bin(B)), "B bin");
        // svyvar(~y, des)
        rel(11.3310869457138, TallyEstimates.weightedVariance(y(A)), "A svyvar");
        rel(12.2869242315503, TallyEstimates.weightedVariance(y(B)), "B svyvar");
        // the share of value 1 through the indicator is the mean of the 0/1 variable
        assertMatches(new double[] {0.5383217414430896, 0.0343953193264401, 1.4830348217813027, 1.4232740678471267},
                TallyEstimates.mean(bin(A).indicator(1)), "A bin indicator");
    }

    @Test
    void kishEffectiveSizeAndDesignEffectFromTheTallyMatchR() {
        // R 4.2.2: sum(x$w)^2 / sum(x$w^2) and nrow(x) * sum(x$w^2) / sum(x$w)^2
        rel(205.35373501406389, y(A).effectiveSampleSize(), "A n_eff");
        rel(1.46089380833251, y(A).weightingDesignEffect(), "A deff_w");
        rel(244.41302140479891, cat(B).effectiveSampleSize(), "B n_eff");
        rel(1.39108791358906, cat(B).weightingDesignEffect(), "B deff_w");
        // and the row-level class agrees
        rel(Kish.effectiveSampleSize(A.w()), y(A).effectiveSampleSize(), "row-level n_eff");
        rel(Kish.designEffect(B.w()), y(B).weightingDesignEffect(), "row-level deff_w");
    }

    @Test
    void categorySharesAndTheirCovarianceFromTheTallyMatchSvymean() {
        // R 4.2.2, survey 4.1.1: svymean(~factor(cat), des, deff = "replace"): coef, SE, deff, vcov
        CategoryShares a = TallyEstimates.shares(cat(A));
        assertArrayEquals(new int[] {1, 2, 3, 4}, a.codes());
        double[] shares = {0.329576378870791, 0.235831164051440, 0.239968246548626, 0.194624210529144};
        double[] se = {0.0327675272236765, 0.0274977956634582, 0.0305808500550107, 0.0294684144855882};
        double[] deff = {1.45295826913654, 1.25451665667036, 1.53315046736655, 1.65649181330186};
        double[] row1 = {0.001073710840354380, -0.000298105119711939, -0.000410220702188888, -0.000365385018453552};
        for (int j = 0; j < 4; j++) {
            rel(shares[j], a.shares()[j], "share " + j);
            rel(se[j], a.estimates()[j].standardError(), "SE " + j);
            rel(deff[j], a.estimates()[j].designEffect(), "deff " + j);
            rel(row1[j], a.covariance()[0][j], "vcov[1," + j + "]");
        }
        CategoryShares b = TallyEstimates.shares(cat(B));
        double[] seB = {0.0291623912986090, 0.0312548757476525, 0.0273917918056168, 0.0174402764731160};
        double[] row4 = {-9.52260741460234e-05, -1.29875429408256e-04, -7.90617399044442e-05, 3.04163243458723e-04};
        for (int j = 0; j < 4; j++) {
            rel(seB[j], b.estimates()[j].standardError(), "B SE " + j);
            rel(row4[j], b.covariance()[3][j], "B vcov[4," + j + "]");
        }
    }

    @Test
    void weightedQuantilesMatchSvyquantileDefaultRule() {
        // R 4.2.2, survey 4.1.1: svyquantile(~y, des, c(0.1, 0.25, 0.5, 0.75, 0.9)) (qrule = "math", the default)
        double[] p = {0.1, 0.25, 0.5, 0.75, 0.9};
        double[] qa = {5, 7, 9, 11, 13};
        double[] qb = {5, 7, 9, 11, 14};
        for (int i = 0; i < p.length; i++) {
            assertEquals(qa[i], WeightedDistribution.quantile(y(A), p[i]), 0, "A q" + p[i]);
            assertEquals(qb[i], WeightedDistribution.quantile(y(B), p[i]), 0, "B q" + p[i]);
        }
        // svyquantile(~w, des, c(0.1, 0.5, 0.9)): the weight itself as a variable with many distinct values
        WeightedTally wa = WeightedTally.ofSample(A.w(), A.w());
        WeightedTally wb = WeightedTally.ofSample(B.w(), B.w());
        assertArrayEquals(new double[] {13.55, 30.73, 66.79}, new double[] {WeightedDistribution.quantile(wa, 0.1),
                WeightedDistribution.quantile(wa, 0.5), WeightedDistribution.quantile(wa, 0.9)}, 0);
        assertArrayEquals(new double[] {12.44, 27.71, 57.47}, new double[] {WeightedDistribution.quantile(wb, 0.1),
                WeightedDistribution.quantile(wb, 0.5), WeightedDistribution.quantile(wb, 0.9)}, 0);
    }

    @Test
    void twoWaveDifferencesFromTalliesMatchSvyttest() {
        // R 4.2.2, survey 4.1.1: svyttest(y ~ wave, st): estimate, t, df, p; degf(st) = 638. svyttest's df is one
        // fewer than the design df used here (see DesignMeanDifference), so its p is reproduced on its df.
        double[][] r = {{0.446113516854259, 1.204708389100430, 637, 0.228763288965916},
                {0.014851471735833, 0.319774292699075, 637, 0.749244286906148}};
        DesignMeanDifferenceResult[] m = {DesignMeanDifference.test(y(A), y(B), 0.95),
                DesignMeanDifference.testShares(bin(A), bin(B), 0.95)};
        for (int i = 0; i < 2; i++) {
            rel(r[i][0], m[i].difference().estimate(), "difference " + i);
            rel(r[i][1], m[i].test().statistic(), "t " + i);
            assertEquals(638, m[i].test().df(), 0);
            double t = m[i].test().statistic();
            rel(r[i][3], 2 * new TDistribution(r[i][2]).cumulativeProbability(-Math.abs(t)), "p on df 637");
            double half = new TDistribution(638).inverseCumulativeProbability(0.975) * m[i].standardError();
            rel(r[i][0] - half, m[i].difference().ciLow(), "ci low");
        }
        assertEquals("difference of weighted shares", m[1].difference().name());
    }

    @Test
    void raoScottFromTalliesMatchesSvychisq() {
        // R 4.2.2, survey 4.1.1: svychisq(~cat + wave, st, statistic = "Chisq" | "F")
        RaoScottResult r = RaoScott.test(cat(A), cat(B));
        rel(15.3125103888404670, r.pearsonChiSquare(), "X2");
        assertEquals(3, r.firstOrder().df(), 0);
        rel(0.0108611702886604, r.firstOrder().pValue(), "first-order p");
        rel(3.72200834133325, r.secondOrder().statistic(), "F");
        rel(2.98853465697384, r.secondOrder().df(), "ndf");
        rel(1906.68511114931, r.denominatorDf(), "ddf");
        rel(0.0111106543610504, r.secondOrder().pValue(), "F p");
    }

    @Test
    void weightedKolmogorovSmirnovDistanceMatchesSvycdf() {
        // R 4.2.2, survey 4.1.1: max(abs(Fb(u) - Fa(u))) with svycdf of each wave at the pooled values
        rel(0.0936772254739092, WeightedDistribution.cdfDistance(y(A), y(B)), "D");
        assertEquals(WeightedDistribution.cdfDistance(y(A), y(B)), WeightedDistribution.cdfDistance(y(B), y(A)),
                1e-15);
    }

    @Test
    void zeroWeightsCountAsRespondentsAsInR() {
        // R 4.2.2, survey 4.1.1: z <- data.frame(y = c(1, 2, 2, 3, 4, 5, 5, 6), w = c(1, 2, 1, 0, 3, 1, 2, 2))
        // m <- svymean(~y, svydesign(ids = ~1, weights = ~w, data = z)): 3.833333333333333, SE 0.634126487474228
        // (without the zero-weight row, SE is 0.6406979); svyquantile(~y, dz, c(0.25, 0.5, 0.75)) = 2, 4, 5
        WeightedTally t = WeightedTally.ofSample(new double[] {1, 2, 2, 3, 4, 5, 5, 6},
                new double[] {1, 2, 1, 0, 3, 1, 2, 2});
        DesignEstimate m = TallyEstimates.mean(t);
        rel(3.833333333333333, m.estimate(), "mean");
        rel(0.634126487474228, m.standardError(), "SE");
        assertEquals(2, WeightedDistribution.quantile(t, 0.25), 0);
        assertEquals(4, WeightedDistribution.quantile(t, 0.5), 0);
        assertEquals(5, WeightedDistribution.quantile(t, 0.75), 0);
        assertEquals(8, t.n());
    }

    @Test
    void talliesEqualTheRowLevelClassesOnTheSameRespondents() {
        Random rnd = new Random(41);
        for (int rep = 0; rep < 40; rep++) {
            DesignData.Wave a = DesignData.random(rnd, 1 + rnd.nextInt(4), 0);
            DesignData.Wave b = DesignData.random(rnd, 1 + rnd.nextInt(4), 1);
            double[] ya = rounded(a.y());
            double[] yb = rounded(b.y());
            SurveyDesign da = a.weightsOnly();
            SurveyDesign db = b.weightsOnly();
            WeightedTally ta = WeightedTally.ofSample(ya, a.w());
            WeightedTally tb = WeightedTally.ofSample(yb, b.w());
            same(WeightedEstimates.mean(ya, da), TallyEstimates.mean(ta));
            same(WeightedEstimates.share(a.bin(), da), TallyEstimates.mean(bin(a)));
            CategoryShares rows = WeightedEstimates.shares(a.cat(), da);
            CategoryShares tally = TallyEstimates.shares(cat(a));
            assertArrayEquals(rows.codes(), tally.codes());
            for (int j = 0; j < rows.codes().length; j++) {
                same(rows.estimates()[j], tally.estimates()[j]);
                for (int k = 0; k < rows.codes().length; k++) {
                    assertEquals(rows.covariance()[j][k], tally.covariance()[j][k], 1e-13);
                }
            }
            DesignMeanDifferenceResult dr = DesignMeanDifference.test(ya, da, yb, db, 0.9);
            DesignMeanDifferenceResult dt = DesignMeanDifference.test(ta, tb, 0.9);
            assertEquals(dr.test().statistic(), dt.test().statistic(), 1e-9 * Math.abs(dr.test().statistic()));
            assertEquals(dr.test().df(), dt.test().df(), 0);
            assertEquals(dr.difference().ciLow(), dt.difference().ciLow(), 1e-10);
            RaoScottResult rr = RaoScott.test(a.cat(), da, b.cat(), db);
            RaoScottResult rt = RaoScott.test(cat(a), cat(b));
            assertArrayEquals(rr.codes(), rt.codes());
            assertEquals(rr.pearsonChiSquare(), rt.pearsonChiSquare(), 1e-9 * rr.pearsonChiSquare() + 1e-12);
            assertEquals(rr.secondOrder().statistic(), rt.secondOrder().statistic(),
                    1e-8 * rr.secondOrder().statistic() + 1e-12);
            assertEquals(rr.secondOrder().df(), rt.secondOrder().df(), 1e-8);
            assertEquals(rr.denominatorDf(), rt.denominatorDf(), 1e-6);
            assertEquals(rr.firstOrder().pValue(), rt.firstOrder().pValue(), 1e-9);
        }
    }

    @Test
    void equalWeightsGiveTheUnweightedStatistics() {
        Random rnd = new Random(5);
        Percentile type1 = new Percentile().withEstimationType(Percentile.EstimationType.R_1);
        for (int rep = 0; rep < 30; rep++) {
            int n = 2 + rnd.nextInt(200);
            int m = 2 + rnd.nextInt(200);
            double[] y = new double[n];
            double[] z = new double[m];
            for (int i = 0; i < n; i++) {
                y[i] = rnd.nextInt(12);
            }
            for (int i = 0; i < m; i++) {
                z[i] = rnd.nextInt(12) + (rnd.nextBoolean() ? 1 : 0);
            }
            double c = 0.5 + 40 * rnd.nextDouble();
            WeightedTally ty = WeightedTally.ofSample(y, constant(n, c));
            WeightedTally tz = WeightedTally.ofSample(z, constant(m, c));
            assertEquals(n, ty.effectiveSampleSize(), 1e-9 * n);
            assertEquals(1, ty.weightingDesignEffect(), 1e-12);
            // commons-math3 3.6.1: sd / sqrt(n), and the R type 1 quantile (inverse of the empirical distribution)
            assertEquals(new StandardDeviation().evaluate(y) / Math.sqrt(n), TallyEstimates.mean(ty).standardError(),
                    1e-10);
            for (double p : new double[] {0.1, 0.25, 0.5, 0.75, 0.9}) {
                assertEquals(type1.evaluate(y, 100 * p), WeightedDistribution.quantile(ty, p), 0, "p " + p);
            }
            // the Kolmogorov-Smirnov distance of the unweighted test, itself checked against R's ks.test
            double d = KolmogorovSmirnovTest.test(NumericDistribution.ofSample(y), NumericDistribution.ofSample(z))
                    .d();
            assertEquals(d, WeightedDistribution.cdfDistance(ty, tz), 1e-12);
        }
    }

    @Test
    void swappingWavesFlipsTheDifferenceAndKeepsTheChiSquare() {
        DesignMeanDifferenceResult ab = DesignMeanDifference.test(y(A), y(B), 0.95);
        DesignMeanDifferenceResult ba = DesignMeanDifference.test(y(B), y(A), 0.95);
        assertEquals(-ab.difference().estimate(), ba.difference().estimate(), 1e-14);
        assertEquals(-ab.difference().ciHigh(), ba.difference().ciLow(), 1e-12);
        assertEquals(ab.test().pValue(), ba.test().pValue(), 1e-14);
        assertEquals(RaoScott.test(cat(A), cat(B)).secondOrder().statistic(),
                RaoScott.test(cat(B), cat(A)).secondOrder().statistic(), 1e-9);
    }

    @Test
    void rejectsTalliesThatCannotBeEstimatedNamingTheInput() {
        WeightedTally one = WeightedTally.ofSample(new double[] {3}, new double[] {2});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> TallyEstimates.mean(one));
        assertTrue(e.getMessage().contains("at least 2"), e.getMessage());
        WeightedTally none = WeightedTally.ofSample(new double[] {1, 2}, new double[] {0, 0});
        e = assertThrows(IllegalArgumentException.class, () -> TallyEstimates.mean(none));
        assertTrue(e.getMessage().contains("no weight"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new WeightedTally(new double[] {2, 1},
                new long[] {1, 1}, new double[] {1, 1}, new double[] {1, 1}));
        assertTrue(e.getMessage().contains("ascending"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> DesignMeanDifference.testShares(y(A), y(B), 0.95));
        assertTrue(e.getMessage().contains("0 and 1"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> TallyEstimates.shares(
                WeightedTally.ofSample(new double[] {1.5, 2}, new double[] {1, 1})));
        assertTrue(e.getMessage().contains("integer"), e.getMessage());
    }

    private static void same(DesignEstimate rows, DesignEstimate tally) {
        assertEquals(rows.estimate(), tally.estimate(), 1e-12 * Math.abs(rows.estimate()) + 1e-14);
        assertEquals(rows.standardError(), tally.standardError(), 1e-10 * rows.standardError() + 1e-15);
        assertEquals(rows.designEffect(), tally.designEffect(), 1e-9 * rows.designEffect());
    }

    /** Whole numbers, so that respondents share values and the tally is smaller than the wave. */
    private static double[] rounded(double[] y) {
        double[] out = new double[y.length];
        for (int i = 0; i < y.length; i++) {
            out[i] = Math.rint(y[i]);
        }
        return out;
    }

    private static double[] constant(int n, double c) {
        double[] w = new double[n];
        java.util.Arrays.fill(w, c);
        return w;
    }
}
