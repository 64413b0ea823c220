package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.TDistribution;
import org.junit.jupiter.api.Test;

/**
 * Estimates from PSU sums ({@link PsuTotals}, {@link PsuTally}) against R on a stratified cluster sample with
 * missing answers.
 *
 * <p>Reference values: R 4.2.2 (Debian r-base-core) with survey 4.1.1 (Debian r-cran-survey). The committed
 * {@code design/psu_sums.csv} (wave A: 4 strata of 3, 2, 4 and 5 PSUs; wave B: 5 strata of 4, 3, 1, 2 and 3 PSUs,
 * so B has a single-PSU stratum; 6 to 12 respondents per PSU; y missing for about one answer in ten and for every
 * respondent of PSU 1 of stratum 3 in A and of stratum 4 in B; cat missing for about one in twenty and for every
 * respondent of PSU 3 of stratum 1 in B) was written by this script, whose printed output gives the constants below:
 * <pre>
 * suppressMessages(library(survey))
 * options(survey.lonely.psu = "adjust", digits = 15)
 * set.seed(20240801)
 * wave &lt;- function(label, psus, shift) {
 *   rows &lt;- list()
 *   for (h in seq_along(psus)) for (j in seq_len(psus[h])) {
 *     m &lt;- sample(6:12, 1); u &lt;- rnorm(1, 0, 3); v &lt;- rnorm(1, 0, 0.7)
 *     w &lt;- round(runif(m, 15, 45) * (1 + h / 4), 2)
 *     y &lt;- round(40 + 1.5 * h + shift + u + rnorm(m, 0, 5), 2)
 *     pr &lt;- exp(c(0, 0.2 * h + v, 0.3 - v, shift / 3))
 *     cat &lt;- sample(1:4, m, TRUE, pr / sum(pr))
 *     y[runif(m) &lt; 0.1] &lt;- NA
 *     cat[runif(m) &lt; 0.05] &lt;- NA
 *     rows[[length(rows) + 1]] &lt;- data.frame(wave = label, stratum = h, psu = j, w = w, y = y, cat = cat)
 *   }
 *   do.call(rbind, rows)
 * }
 * d &lt;- rbind(wave("A", c(3, 2, 4, 5), 0), wave("B", c(4, 3, 1, 2, 3), 1.5))
 * d$y[d$wave == "A" &amp; d$stratum == 3 &amp; d$psu == 1] &lt;- NA
 * d$y[d$wave == "B" &amp; d$stratum == 4] &lt;- NA
 * d$cat[d$wave == "B" &amp; d$stratum == 1 &amp; d$psu == 3] &lt;- NA
 * write.csv(d, "psu_sums.csv", row.names = FALSE, quote = FALSE)
 * se &lt;- c()
 * for (s in c("A", "B")) {
 *   x &lt;- d[d$wave == s, ]
 *   des &lt;- svydesign(ids = ~psu, strata = ~stratum, weights = ~w, data = x, nest = TRUE)
 *   dy &lt;- subset(des, !is.na(y))
 *   m &lt;- svymean(~y, des, na.rm = TRUE, deff = TRUE)
 *   stopifnot(all.equal(c(coef(m), SE(m)), c(coef(svymean(~y, dy)), SE(svymean(~y, dy)))))
 *   print(c(coef(m), SE(m), deff(m), deff(svymean(~y, dy, deff = "replace")))); se &lt;- c(se, SE(m))
 *   print(c(degf(des), degf(dy)))
 *   print(SE(svymean(~y, svydesign(ids = ~psu, strata = ~stratum, weights = ~w, data = x[!is.na(x$y), ],
 *                                  nest = TRUE))))
 *   dc &lt;- subset(des, !is.na(cat))
 *   m &lt;- svymean(~factor(cat), dc, deff = "replace"); print(coef(m)); print(SE(m)); print(deff(m)); print(vcov(m))
 *   m &lt;- svymean(~as.numeric(cat == 2), dc, deff = TRUE)
 *   print(c(coef(m), SE(m), deff(m), deff(svymean(~as.numeric(cat == 2), dc, deff = "replace")), degf(dc)))
 * }
 * print(sqrt(sum(se^2)))
 * d$stratum2 &lt;- interaction(d$wave, d$stratum)
 * st &lt;- svydesign(ids = ~psu, strata = ~stratum2, weights = ~w, data = d, nest = TRUE)
 * t &lt;- svyttest(y ~ wave, st); print(c(t$estimate, t$statistic, t$parameter, t$p.value))
 * print(degf(subset(st, !is.na(y))))
 * sc &lt;- subset(st, !is.na(cat))
 * t &lt;- svyttest(as.numeric(cat == 2) ~ wave, sc); print(c(t$estimate, t$statistic, t$parameter, t$p.value))
 * print(degf(sc))
 * c1 &lt;- svychisq(~cat + wave, sc, statistic = "Chisq"); print(c(c1$statistic, c1$parameter, c1$p.value))
 * c2 &lt;- svychisq(~cat + wave, sc, statistic = "F"); print(c(c2$statistic, c2$parameter, c2$p.value))
 * c3 &lt;- svychisq(~cat + wave, st, statistic = "F"); print(c(c3$statistic, c3$parameter, c3$p.value))
 * c4 &lt;- svychisq(~cat + wave, st, statistic = "Chisq"); print(c(c4$statistic, c4$parameter, c4$p.value))
 * </pre>
 * The domain rule shows in wave A: rebuilding the design from the respondents who answered y loses PSU 1 of
 * stratum 3 and gives SE 0.714752167613545 instead of the domain SE 0.705576025284035. In wave B the whole of
 * stratum 4 is lost either way, so both give the same SE.
 */
class PsuTotalsTest {

    private static final double REL = 1e-10;

    private static final DesignData.Answers A = DesignData.answers("psu_sums", "A");
    private static final DesignData.Answers B = DesignData.answers("psu_sums", "B");

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

    private static PsuTotals y(DesignData.Answers wave) {
        return PsuTotals.ofSample(wave.y(), wave.design());
    }

    private static PsuTally cat(DesignData.Answers wave) {
        return PsuTally.ofSample(wave.cat(), wave.design());
    }

    @Test
    void theCommittedWavesHaveMissingAnswersAndPsusWithoutAny() {
        assertEquals(125, A.y().length);
        assertEquals(111, B.y().length);
        PsuTotals a = y(A);
        assertEquals(14, a.psuCount());
        assertEquals(4, a.strataCount());
        long emptyPsus = java.util.Arrays.stream(a.weight()).filter(w -> w == 0).count();
        assertEquals(1, emptyPsus);
        assertTrue(a.n() < A.y().length);
        assertEquals(13, cat(B).psuCount());
    }

    @Test
    void domainMeanAndDesignEffectsMatchSvymeanWithMissingAnswers() {
        // R 4.2.2, survey 4.1.1: svymean(~y, des, na.rm = TRUE, deff = TRUE), deff = "replace" on the subset
        assertMatches(new double[] {44.662861897077804, 0.705576025284035, 1.664881709414526, 1.633468734077952},
                y(A).mean(), "A y");
        assertMatches(new double[] {44.63436340226809, 1.25399695675781, 3.12459893973519, 3.06095824642626},
                y(B).mean(), "B y");
        // the numeric variable through an exact tally of its values gives the same
        assertMatches(new double[] {44.662861897077804, 0.705576025284035, 1.664881709414526, 1.633468734077952},
                PsuTally.ofSample(A.y(), A.design()).totals().mean(), "A y via tally");
    }

    @Test
    void rebuildingTheDesignFromTheAnsweringRowsIsNotTheDomainEstimate() {
        // R 4.2.2, survey 4.1.1: svymean(~y, svydesign(..., data = x[!is.na(x$y), ])): SE 0.714752167613545 in A;
        // the row-level class on those rows agrees with R, and differs from the domain SE
        SurveyDesign answering = A.answering(A.y());
        double[] y = java.util.Arrays.stream(A.y()).filter(v -> !Double.isNaN(v)).toArray();
        rel(0.714752167613545, WeightedEstimates.mean(y, answering).standardError(), "rows-only SE");
        rel(0.705576025284035, y(A).mean().standardError(), "domain SE");
        rel(y(A).mean().estimate(), WeightedEstimates.mean(y, answering).estimate(), "same mean");
    }

    @Test
    void degreesOfFreedomCountPsusAndStrataWithAnswersAsDegf() {
        // R 4.2.2, survey 4.1.1: degf(des) = 10 (A) and 8 (B); degf(subset(des, !is.na(y))) = 9 and 7;
        // degf(subset(des, !is.na(cat))) = 10 and 7
        assertEquals(10, A.design().degreesOfFreedom());
        assertEquals(8, B.design().degreesOfFreedom());
        assertEquals(9, y(A).degreesOfFreedom());
        assertEquals(7, y(B).degreesOfFreedom());
        assertEquals(10, cat(A).degreesOfFreedom());
        assertEquals(7, cat(B).degreesOfFreedom());
    }

    @Test
    void domainSharesAndTheirCovarianceMatchSvymean() {
        // R 4.2.2, survey 4.1.1: svymean(~factor(cat), subset(des, !is.na(cat)), deff = "replace"): coef, SE, deff,
        // vcov
        CategoryShares a = cat(A).shares();
        assertArrayEquals(new int[] {1, 2, 3, 4}, a.codes());
        double[] shares = {0.192002291174258, 0.320073581942526, 0.280418642856918, 0.207505484026298};
        double[] se = {0.0399800692646191, 0.0535880762946572, 0.0589327294698387, 0.0401245598568380};
        double[] deff = {1.22607632166167, 1.57025993426883, 2.04820436312316, 1.16504226241084};
        double[] row1 = {0.001598405938403737, -1.55752518488722e-03, -0.000294878922208828, 2.53998168692306e-04};
        double[] row2 = {-0.001557525184887215, 2.87168192096201e-03, -0.001314182972116936, 2.62360421464435e-08};
        for (int j = 0; j < 4; j++) {
            rel(shares[j], a.shares()[j], "A share " + j);
            rel(se[j], a.estimates()[j].standardError(), "A SE " + j);
            rel(deff[j], a.estimates()[j].designEffect(), "A deff " + j);
            assertEquals(row1[j], a.covariance()[0][j], 1e-10 * 0.0016, "A vcov[1," + j + "]");
            assertEquals(row2[j], a.covariance()[1][j], 1e-10 * 0.0029, "A vcov[2," + j + "]");
        }
        CategoryShares b = cat(B).shares();
        double[] sharesB = {0.188156554402496, 0.364912936907112, 0.318233908448462, 0.128696600241930};
        double[] seB = {0.0529133621048644, 0.0554652711256341, 0.0575744824151860, 0.0386422344637658};
        double[] deffB = {1.79624325451724, 1.30090573961656, 1.49728443721522, 1.30501064811454};
        double[] row4 = {-1.11344474374814e-03, -3.38908324787388e-04, -4.08692158171211e-05, 1.49322228435265e-03};
        for (int j = 0; j < 4; j++) {
            rel(sharesB[j], b.shares()[j], "B share " + j);
            rel(seB[j], b.estimates()[j].standardError(), "B SE " + j);
            rel(deffB[j], b.estimates()[j].designEffect(), "B deff " + j);
            assertEquals(row4[j], b.covariance()[3][j], 1e-10 * 0.0015, "B vcov[4," + j + "]");
        }
    }

    @Test
    void theIndicatorOfACategoryGivesItsShareAsAMean() {
        // R 4.2.2, survey 4.1.1: svymean(~as.numeric(cat == 2), subset(des, !is.na(cat)), deff = TRUE | "replace")
        assertMatches(new double[] {0.3200735819425256, 0.0535880762946572, 1.6004823291594978, 1.5702599342688262},
                cat(A).indicator(2).totals().mean(), "A cat == 2");
        assertMatches(new double[] {0.3649129369071115, 0.0554652711256341, 1.3270440377757833, 1.3009057396165624},
                cat(B).indicator(2).totals().mean(), "B cat == 2");
        assertEquals(cat(A).n(), cat(A).indicator(2).n());
        assertEquals(cat(A).degreesOfFreedom(), cat(A).indicator(2).degreesOfFreedom());
    }

    @Test
    void twoWaveDifferenceOfMeansMatchesTheWavesSvymeanAndSvyttest() {
        // R 4.2.2, survey 4.1.1: the waves' svymean SEs combined, sqrt(0.705576025284035^2 + 1.25399695675781^2)
        // = 1.43886965879939; svyttest(y ~ wave, st): estimate -0.0284984948097199, t -0.0198061684291121 on
        // df 15 (p 0.9844590581617081), one fewer than degf(subset(st, !is.na(y))) = 16 used here
        DesignMeanDifferenceResult m = DesignMeanDifference.test(y(A), y(B), 0.95);
        rel(1.43886965879939, m.standardError(), "SE of the difference");
        rel(-0.0284984948097199, m.difference().estimate(), "difference");
        rel(-0.0198061684291121, m.test().statistic(), "t");
        assertEquals(16, m.test().df(), 0);
        double t = m.test().statistic();
        rel(0.9844590581617081, 2 * new TDistribution(15).cumulativeProbability(-Math.abs(t)), "svyttest p on df 15");
        // commons-math3 3.6.1 t distribution on the design df
        TDistribution student = new TDistribution(16);
        assertEquals(2 * student.cumulativeProbability(-Math.abs(t)), m.test().pValue(), 1e-12);
        double half = student.inverseCumulativeProbability(0.975) * 1.43886965879939;
        rel(-0.0284984948097199 - half, m.difference().ciLow(), "ci low");
        rel(-0.0284984948097199 + half, m.difference().ciHigh(), "ci high");
        assertEquals("difference of weighted means", m.difference().name());
    }

    @Test
    void twoWaveDifferenceOfSharesMatchesSvyttest() {
        // R 4.2.2, survey 4.1.1: svyttest(as.numeric(cat == 2) ~ wave, subset(st, !is.na(cat))): estimate
        // 0.0448393549645859, t 0.5813946362931096 on df 16 (p 0.5690754074414865); degf(subset) = 17 used here
        DesignMeanDifferenceResult m = DesignMeanDifference.testShares(cat(A).indicator(2), cat(B).indicator(2),
                0.95);
        rel(0.0448393549645859, m.difference().estimate(), "difference");
        rel(0.5813946362931096, m.test().statistic(), "t");
        assertEquals(17, m.test().df(), 0);
        rel(0.5690754074414865, 2 * new TDistribution(16).cumulativeProbability(-m.test().statistic()), "p df 16");
        rel(Math.hypot(0.0535880762946572, 0.0554652711256341), m.standardError(), "SE from the waves' svymean");
        assertEquals("difference of weighted shares", m.difference().name());
    }

    @Test
    void raoScottFromPsuTalliesMatchesSvychisqOnTheAnsweringDomain() {
        // R 4.2.2, survey 4.1.1: sc <- subset(st, !is.na(cat)); svychisq(~cat + wave, sc, statistic = "Chisq" | "F")
        RaoScottResult r = RaoScott.test(cat(A), cat(B));
        assertArrayEquals(new int[] {1, 2, 3, 4}, r.codes());
        rel(2.525716568691518, r.pearsonChiSquare(), "X2");
        assertEquals(3, r.firstOrder().df(), 0);
        rel(0.640694305180398, r.firstOrder().pValue(), "first-order p");
        rel(0.561038205121842, r.secondOrder().statistic(), "F");
        rel(2.883880923977351, r.secondOrder().df(), "ndf");
        rel(49.025975707614968, r.denominatorDf(), "ddf = ndf x 17");
        rel(0.636559942828191, r.secondOrder().pValue(), "F p");
        // svychisq(~cat + wave, st) without the subset: the same F, ndf and first-order p, but X2 2.721776758955244
        // scaled to all 236 rows instead of the 219 answers, and ddf 51.909856631592305 = ndf x 18, counting the PSU
        // of B in which nobody answered cat
        assertEquals(219, cat(A).n() + cat(B).n());
        rel(2.721776758955244 / 236 * 219, r.pearsonChiSquare(), "X2 of the unsubsetted call rescaled");
        rel(51.909856631592305 / 18 * 17, r.denominatorDf(), "ddf of the unsubsetted call rescaled");
    }

    @Test
    void swappingWavesFlipsTheDifferenceAndKeepsTheChiSquare() {
        DesignMeanDifferenceResult ab = DesignMeanDifference.test(y(A), y(B), 0.9);
        DesignMeanDifferenceResult ba = DesignMeanDifference.test(y(B), y(A), 0.9);
        assertEquals(-ab.difference().estimate(), ba.difference().estimate(), 1e-14);
        assertEquals(-ab.difference().ciHigh(), ba.difference().ciLow(), 1e-12);
        assertEquals(ab.test().pValue(), ba.test().pValue(), 1e-14);
        RaoScottResult rab = RaoScott.test(cat(A), cat(B));
        RaoScottResult rba = RaoScott.test(cat(B), cat(A));
        assertEquals(rab.pearsonChiSquare(), rba.pearsonChiSquare(), 1e-10);
        assertEquals(rab.secondOrder().pValue(), rba.secondOrder().pValue(), 1e-12);
        assertEquals(rab.denominatorDf(), rba.denominatorDf(), 1e-9);
    }

    @Test
    void rejectsSumsThatCannotBeEstimatedNamingTheInput() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new PsuTotals(
                new int[] {0, 2}, new double[] {1, 1}, new double[] {1, 1}, new double[] {1, 1}, 2));
        assertTrue(e.getMessage().contains("stratum 1"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PsuTotals(
                new int[] {0, 0}, new double[] {1, -1}, new double[] {1, 1}, new double[] {1, 1}, 2));
        assertTrue(e.getMessage().contains("weight[1]"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PsuTotals(
                new int[] {0, 0}, new double[] {1, 1}, new double[] {1}, new double[] {1, 1}, 2));
        assertTrue(e.getMessage().contains("weightedSum"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PsuTotals(
                new int[] {0, 0}, new double[] {1, 1}, new double[] {1, 1}, new double[] {1, 1}, 1));
        assertTrue(e.getMessage().contains("n is 1"), e.getMessage());
        PsuTotals silent = new PsuTotals(new int[] {0, 0}, new double[] {0, 0}, new double[] {0, 0},
                new double[] {0, 0}, 0);
        e = assertThrows(IllegalArgumentException.class, silent::mean);
        assertTrue(e.getMessage().contains("at least 2"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PsuTally(new double[] {2, 1}, new long[] {1, 1},
                new int[] {0}, new double[][] {{1}, {1}}));
        assertTrue(e.getMessage().contains("ascending"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new PsuTally(new double[] {1, 2}, new long[] {1, 1},
                new int[] {0, 0}, new double[][] {{1, 0}, {1}}));
        assertTrue(e.getMessage().contains("weight[1]"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> DesignMeanDifference.testShares(cat(A), cat(B), 0.95));
        assertTrue(e.getMessage().contains("0 and 1"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> PsuTally.ofSample(A.y(), A.design()).shares());
        assertTrue(e.getMessage().contains("integer"), e.getMessage());
        // every respondent its own stratum: no design degrees of freedom
        SurveyDesign none = SurveyDesign.stratified(new double[] {1, 2, 3}, new long[] {1, 2, 3});
        PsuTotals t = PsuTotals.ofSample(new double[] {1, 2, 4}, none);
        e = assertThrows(IllegalArgumentException.class, () -> DesignMeanDifference.test(t, t, 0.95));
        assertTrue(e.getMessage().contains("degrees of freedom"), e.getMessage());
        PsuTally k = PsuTally.ofSample(new double[] {1, 2, 1}, none);
        e = assertThrows(IllegalArgumentException.class, () -> RaoScott.test(k, k));
        assertTrue(e.getMessage().contains("degrees of freedom"), e.getMessage());
    }
}
