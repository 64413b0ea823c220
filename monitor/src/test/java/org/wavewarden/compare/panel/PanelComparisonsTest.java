package org.wavewarden.compare.panel;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.panel.ChurnTable;
import org.wavewarden.config.Threshold;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Judge;
import org.wavewarden.judge.Verdict;
import org.wavewarden.compare.panel.PanelComparisons.BinaryDetail;
import org.wavewarden.compare.panel.PanelComparisons.CategoricalDetail;
import org.wavewarden.compare.panel.PanelComparisons.NumericDetail;
import org.wavewarden.compare.panel.PanelComparisons.PanelDetail;
import org.wavewarden.compare.panel.PairedPanel.BinaryPairs;
import org.wavewarden.compare.panel.PairedPanel.CategoricalPairs;
import org.wavewarden.compare.panel.PairedPanel.NumericPairs;
import org.wavewarden.compare.panel.PairedPanel.Panel;
import org.wavewarden.compare.panel.PairedPanel.VariablePairs;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The paired summaries of a panel turned into comparisons, checked against values from outside the project:
 * Student's sleep data (CHECK-SOURCES: paired t = -4.0621, df 9, p = 0.002833; signed rank V = 0, p = 0.009091 by
 * the normal approximation with continuity correction), Agresti's approval table (CHECK-SOURCES: McNemar
 * 794 / 150 / 86 / 570, X2 = 17.36 without and 16.82 with continuity correction; the pipeline uses the uncorrected
 * form), and a committed 3 x 3 churn table against python3-statsmodels 0.13.5. Full-precision references: R 4.2.2
 * (Debian r-base-core) with the calls quoted beside each value.
 */
class PanelComparisonsTest {

    /** Student (1908) sleep data: group 2 as the baseline answers, group 1 as the current ones (R: sleep$extra). */
    static final double[] SLEEP_BASELINE = {1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4};
    static final double[] SLEEP_CURRENT = {0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0};

    /** How 1,600 panel members travelled to work at two waves (rows the baseline, columns the judged wave). */
    static final List<String> MODES = List.of("car", "bus", "bike");
    static final long[][] COMMUTE = {
        {650, 90, 20},
        {15, 400, 35},
        {5, 10, 375},
    };

    static final double CONFIDENCE = 0.95;

    /** The sleep pairs as the accumulator hands them on: the differences tabulated, their moments exact. */
    static NumericPairs sleep(String variable) {
        double[] d = new double[SLEEP_BASELINE.length];
        double sumB = 0;
        double sumC = 0;
        for (int i = 0; i < d.length; i++) {
            d[i] = SLEEP_CURRENT[i] - SLEEP_BASELINE[i];
            sumB += SLEEP_BASELINE[i];
            sumC += SLEEP_CURRENT[i];
        }
        NumericDistribution table = NumericDistribution.ofSample(d);
        return new NumericPairs(variable, d.length, 1, sumB / d.length, sumC / d.length, table.mean(),
                table.standardDeviation(), table, Binning.EXACT);
    }

    static Panel panel(VariablePairs... pairs) {
        return new Panel("w1", "w2", 1601, 3, 2, null, null, List.of(pairs), List.of());
    }

    static VariableConfig variable(String name, VariableKind kind, Threshold threshold) {
        return new VariableConfig(name, kind, "hours", null, List.of(), threshold, null, List.of(), null);
    }

    static Comparison only(PanelComparisons.Result r) {
        assertEquals(1, r.comparisons().size(), r.notes().toString());
        return r.comparisons().get(0);
    }

    @Test
    void sleepPairsGetThePairedTWithCohensDzMatchingR() {
        Comparison c = only(PanelComparisons.compare(panel(sleep("extra_sleep")),
                List.of(variable("extra_sleep", VariableKind.CONTINUOUS, null)), CONFIDENCE));
        assertEquals(FindingKind.PANEL_SHIFT, c.kind());
        // R 4.2.2: shapiro.test(g1 - g2)$p.value = 0.033341608630308141, above the 0.01 level: paired t
        PanelDetail detail = (PanelDetail) c.detail();
        assertEquals("paired t: the paired differences are consistent with a normal distribution (Shapiro-Wilk"
                + " p = 0.0333 on the differences, level 0.01)", detail.method());
        // CHECK-SOURCES; R 4.2.2 t.test(g1, g2, paired = TRUE): t = -4.0621276833820366, p = 0.0028328901973842702
        assertEquals("paired t", c.test().test());
        assertEquals(-4.0621, c.test().statistic(), 5e-5);
        assertEquals(9, c.test().df());
        assertEquals("pairs - 1", c.test().dfConvention());
        assertEquals(0.002833, c.test().pValue(), 5e-7);
        assertEquals(-4.0621276833820366, c.test().statistic(), 1e-10);
        assertEquals(0.0028328901973842702, c.test().pValue(), 1e-12);
        // Cohen's d_z = mean(d) / sd(d) with the noncentral t interval; R 4.2.2:
        //   t0 <- t.test(g1, g2, paired = TRUE)$statistic; f <- function(ncp, p) pt(t0, 9, ncp) - p
        //   uniroot(f, c(-30, 30), p = 0.975, tol = 1e-14)$root / sqrt(10)   # and p = 0.025
        assertEquals("Cohen's d_z", c.effect().name());
        assertEquals(-1.2845575625910546, c.effect().estimate(), 1e-12);
        assertEquals(-2.1180165139770666, c.effect().ciLow(), 1e-8);
        assertEquals(-0.41462775638014426, c.effect().ciHigh(), 1e-8);
        assertEquals(0.2, c.threshold());
        assertEquals(10, c.nBaseline());
        assertEquals(10, c.nCurrent());
        // The sentence's change: the pairs' means, and the t interval of the mean difference (R's conf.int).
        assertEquals(2.33, c.change().before(), 1e-12);
        assertEquals(0.75, c.change().after(), 1e-12);
        assertEquals(-1.58, c.change().estimate(), 1e-12);
        assertEquals(-2.45988576327698238, c.change().ciLow(), 1e-10);
        assertEquals(-0.70011423672301754, c.change().ciHigh(), 1e-10);
        assertEquals("10 respondents paired, 1 more in both waves left out for a missing or excluded answer; 3 only"
                + " in wave w1, 2 only in wave w2", c.change().note());
        assertEquals(10, detail.pairs());
        assertEquals(1, detail.pairsLeftOut());
        assertEquals(3, detail.onlyBaseline());
        assertEquals(2, detail.onlyCurrent());
        NumericDetail n = (NumericDetail) detail.paired();
        // R 4.2.2: median(g1 - g2) = -1.3; k <- qbinom(0.025, 10, 0.5) = 2; sort(d)[c(k, 10 - k + 1)] = -2.4, -0.8
        assertEquals(-1.3, n.medianDifference().estimate(), 1e-12);
        assertEquals(-2.4, n.medianDifference().ciLow(), 1e-12);
        assertEquals(-0.8, n.medianDifference().ciHigh(), 1e-12);
        assertNull(n.signedRankZ());
    }

    @Test
    void aRawThresholdJudgesTheMeanPairedDifference() {
        Comparison c = only(PanelComparisons.compare(panel(sleep("extra_sleep")),
                List.of(variable("extra_sleep", VariableKind.CONTINUOUS, new Threshold(1.0, null, null))),
                CONFIDENCE));
        // R 4.2.2: t.test(g1, g2, paired = TRUE)$conf.int
        assertEquals("mean paired difference", c.effect().name());
        assertEquals(-1.58, c.effect().estimate(), 1e-12);
        assertEquals(-2.45988576327698238, c.effect().ciLow(), 1e-10);
        assertEquals(-0.70011423672301754, c.effect().ciHigh(), 1e-10);
        assertEquals(1.0, c.threshold());
        assertEquals("configured 1 hours", c.thresholdSource());
    }

    @Test
    void ordinalPairsGetTheSignedRankTestWithTheRankBiserialCorrelation() {
        Comparison c = only(PanelComparisons.compare(panel(sleep("sleep_score")),
                List.of(variable("sleep_score", VariableKind.ORDINAL, null)), CONFIDENCE));
        // CHECK-SOURCES; R 4.2.2 wilcox.test(g1, g2, paired = TRUE, exact = FALSE): V = 0,
        // p-value = 0.0090906980159250559 (a zero and tied differences: normal approximation with continuity)
        assertEquals("Wilcoxon signed rank", c.test().test());
        assertEquals(0, c.test().statistic());
        assertEquals(0.009091, c.test().pValue(), 5e-7);
        assertEquals(0.0090906980159250559, c.test().pValue(), 1e-12);
        // Kerby's r = 4 V / (n (n + 1)) - 1 = -1 over the 9 non-zero differences: every respondent who changed
        // slept less. All kernel terms are equal, so the interval collapses to the estimate.
        assertEquals("matched-pairs rank-biserial r", c.effect().name());
        assertEquals(-1, c.effect().estimate(), 1e-12);
        assertEquals(-1, c.effect().ciLow(), 1e-12);
        assertEquals(-1, c.effect().ciHigh(), 1e-12);
        assertEquals(0.1, c.threshold());
        assertTrue(((PanelDetail) c.detail()).method().startsWith("Wilcoxon signed rank: ordinal scale"));
        // The sentence gives the median change with its sign-test interval (R as above).
        assertEquals(-1.3, c.change().estimate(), 1e-12);
        assertEquals(-2.4, c.change().ciLow(), 1e-12);
        assertEquals(-0.8, c.change().ciHigh(), 1e-12);
        assertTrue(c.change().note().startsWith("the shift is the median of the respondents' own changes; 10"
                + " respondents paired"), c.change().note());
        NumericDetail n = (NumericDetail) ((PanelDetail) c.detail()).paired();
        assertEquals(Boolean.FALSE, n.signedRankExact());
    }

    @Test
    void binaryPairsGetMcNemarWithoutCorrectionAndCohensHForPairedShares() {
        BinaryPairs approval = new BinaryPairs("approves", "1", 794, 150, 86, 570, 0);
        Comparison c = only(PanelComparisons.compare(panel(approval),
                List.of(variable("approves", VariableKind.BINARY, null)), CONFIDENCE));
        // CHECK-SOURCES (Agresti 2007, section 10.1): X2 = 17.36 without continuity correction, the pipeline's test;
        // R 4.2.2 mcnemar.test(matrix(c(794, 150, 86, 570), 2, byrow = TRUE), correct = FALSE)
        assertEquals("McNemar", c.test().test());
        assertEquals(17.36, c.test().statistic(), 0.005);
        assertEquals(17.35593220338983, c.test().statistic(), 1e-10);
        assertEquals(3.0992934410452182e-05, c.test().pValue(), 1e-14);
        BinaryDetail b = (BinaryDetail) ((PanelDetail) c.detail()).paired();
        // the corrected form, reported beside it: X2 = 16.82, p = 4.11e-05 (CHECK-SOURCES; R correct = TRUE)
        assertEquals(16.82, b.continuityCorrectedStatistic(), 0.005);
        assertEquals(4.1145622813459436e-05, b.continuityCorrectedPValue(), 1e-14);
        // Cohen's h of 880/1600 against 944/1600 with Newcombe's paired interval of the difference carried onto
        // the h scale: R 4.2.2, the script test/resources/proportion/paired-cohens-h.R (its first row)
        assertEquals("Cohen's h", c.effect().name());
        assertEquals(-0.080819030084987808, c.effect().estimate(), 1e-12);
        assertEquals(-0.1186493017913528, c.effect().ciLow(), 1e-10);
        assertEquals(-0.04288666659554341, c.effect().ciHigh(), 1e-10);
        assertEquals(0.2, c.threshold());
        assertEquals(0.59, c.change().before(), 1e-12);
        assertEquals(0.55, c.change().after(), 1e-12);
        assertEquals("86 moved to it, 150 away from it; 1,600 respondents paired; 3 only in wave w1, 2 only in"
                + " wave w2", c.change().note());
    }

    @Test
    void aPointsThresholdJudgesThePairedShareDifferenceWithNewcombesInterval() {
        BinaryPairs approval = new BinaryPairs("approves", "1", 794, 150, 86, 570, 0);
        Comparison c = only(PanelComparisons.compare(panel(approval),
                List.of(variable("approves", VariableKind.BINARY, new Threshold(null, 2.0, null))), CONFIDENCE));
        // Newcombe (1998) method 10; R 4.2.2 with prop.test(x, 1600, correct = FALSE)$conf.int as the Wilson
        // limits and psi as in PairedProportionsTest: -0.058703872895728836 to -0.021230423982877056
        assertEquals("paired share difference", c.effect().name());
        assertEquals(-0.04, c.effect().estimate(), 1e-12);
        assertEquals(-0.058703872895728836, c.effect().ciLow(), 1e-10);
        assertEquals(-0.021230423982877056, c.effect().ciHigh(), 1e-10);
        assertEquals(0.02, c.threshold(), 1e-15);
        assertEquals("configured 2 percentage points", c.thresholdSource());
    }

    @Test
    void labelledCategoriesAreNamedByTheirLabelsInTheChangeTheFlowAndTheDetail() {
        CategoricalPairs commute = new CategoricalPairs("commute_mode", MODES, COMMUTE, 0);
        VariableConfig v = new VariableConfig("commute_mode", VariableKind.CATEGORICAL, null, null, List.of(), null,
                null, List.of(), null, null, "Usual way to work", java.util.Map.of("car", "Car or van", "bus",
                "Bus or coach"), null);
        Comparison c = only(PanelComparisons.compare(panel(commute), List.of(v), CONFIDENCE));
        assertEquals("share answering 'Car or van' (car) among the respondents in both waves", c.change().measure());
        assertTrue(c.change().note().contains("largest flow: 90 moved from 'Car or van' (car) to 'Bus or coach' (bus)"
                + " (11.8% of 'Car or van' (car))"), c.change().note());
        CategoricalDetail d = (CategoricalDetail) ((PanelDetail) c.detail()).paired();
        assertEquals(java.util.Arrays.asList("Car or van", "Bus or coach", null),
                d.categories().stream().map(PanelComparisons.ShareRow::label).toList());
    }

    @Test
    void categoricalPairsGetStuartMaxwellAndTheChurnTable() {
        CategoricalPairs commute = new CategoricalPairs("commute_mode", MODES, COMMUTE, 0);
        Comparison c = only(PanelComparisons.compare(panel(commute),
                List.of(variable("commute_mode", VariableKind.CATEGORICAL, null)), CONFIDENCE));
        // python3-statsmodels 0.13.5 (Debian; scipy 1.10.1):
        //   SquareTable(np.array(COMMUTE), shift_zeros=False).homogeneity(method='stuart_maxwell')
        //   statistic 70.20648967551622, df 2; scipy.stats.chi2.sf(statistic, 2) = 5.686623429689494e-16
        assertEquals("Stuart-Maxwell", c.test().test());
        assertEquals(70.20648967551622, c.test().statistic(), 1e-9);
        assertEquals(2, c.test().df());
        assertEquals(5.686623429689494e-16, c.test().pValue(), 1e-25);
        // car fell from 760 to 670 of 1,600: -5.625 points, the largest move. R 4.2.2 with epibasix 1.5 on car
        // against the rest: X <- matrix(c(650, 110, 20, 820), 2); m <- mcNemar(X, alpha = 0.05, force = TRUE);
        // 100 * c(m$rd.CIL + 1/1600, m$rd.CIU - 1/1600) = -6.9942240352238407, -4.2557759647761593
        assertEquals("paired share difference of 'car'", c.effect().name());
        assertEquals(-0.05625, c.effect().estimate(), 1e-14);
        assertEquals(-0.069942240352238407, c.effect().ciLow(), 1e-12);
        assertEquals(-0.042557759647761593, c.effect().ciHigh(), 1e-12);
        assertEquals(0.05, c.threshold(), 1e-15);
        assertTrue(c.thresholdSource().startsWith("default 5 percentage points"), c.thresholdSource());
        assertEquals("the category whose share moved most; largest flow: 90 moved from 'car' to 'bus' (11.8% of"
                + " 'car'); 1,600 respondents paired; 3 only in wave w1, 2 only in wave w2", c.change().note());
        CategoricalDetail d = (CategoricalDetail) ((PanelDetail) c.detail()).paired();
        assertArrayEquals(COMMUTE, d.churn());
        assertEquals(List.of(new ChurnTable.Flow("car", "bus", 90, 90 / 760.0),
                new ChurnTable.Flow("bus", "bike", 35, 35 / 450.0),
                new ChurnTable.Flow("car", "bike", 20, 20 / 760.0),
                new ChurnTable.Flow("bus", "car", 15, 15 / 450.0),
                new ChurnTable.Flow("bike", "bus", 10, 10 / 390.0),
                new ChurnTable.Flow("bike", "car", 5, 5 / 390.0)), d.largestFlows());
        assertEquals(1425, d.stayers());
        assertEquals(175, d.movers());
        assertEquals(760 / 1600.0, d.categories().get(0).shareBaseline(), 1e-15);
        assertEquals(670 / 1600.0, d.categories().get(0).shareCurrent(), 1e-15);
    }

    @Test
    void theFourPanelsAreJudgedTogetherWithTheVerdictRule() {
        Panel p = panel(sleep("extra_sleep"), sleep("sleep_score"),
                new BinaryPairs("approves", "1", 794, 150, 86, 570, 0),
                new CategoricalPairs("commute_mode", MODES, COMMUTE, 0));
        PanelComparisons.Result r = PanelComparisons.compare(p, List.of(
                variable("extra_sleep", VariableKind.CONTINUOUS, null),
                variable("sleep_score", VariableKind.ORDINAL, null),
                variable("approves", VariableKind.BINARY, null),
                variable("commute_mode", VariableKind.CATEGORICAL, null)), CONFIDENCE);
        List<Finding> f = Judge.judge(r.comparisons(), 0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG);
        assertEquals(List.of(Verdict.MATERIAL, Verdict.MATERIAL, Verdict.MINOR, Verdict.MATERIAL),
                f.stream().map(Finding::verdict).toList());
        // Benjamini-Hochberg over the four p-values: the largest, 0.00909, is its own q-value.
        assertEquals(0.0090906980159250559, f.get(1).qValue(), 1e-12);
        assertTrue(f.get(0).sentence().startsWith("Mean extra_sleep of the respondents in both waves fell from 2.33"
                + " to 0.75 hours (-1.58, 95% CI -2.46 to -0.700 hours; 10 respondents paired"), f.get(0).sentence());
        assertTrue(f.get(0).sentence().endsWith("Cohen's d_z -1.285 (large, Cohen 1988), at or above the 0.200 threshold:"
                + " MATERIAL."), f.get(0).sentence());
    }

    @Test
    void variablesThatCannotBePairedAreNotedNotCompared() {
        NumericPairs one = new NumericPairs("x", 1, 0, 1, 2, 1, Double.NaN, NumericDistribution.ofSample(1),
                Binning.EXACT);
        NumericPairs same = new NumericPairs("y", 4, 0, 1, 1, 0, 0, NumericDistribution.ofSample(0, 0, 0, 0),
                Binning.EXACT);
        CategoricalPairs single = new CategoricalPairs("z", List.of("a"), new long[][] {{5}}, 0);
        PanelComparisons.Result r = PanelComparisons.compare(
                new Panel("w1", "w2", 5, 0, 0, null, null, List.of(one, same, single), List.of("kept note")),
                List.of(variable("x", VariableKind.CONTINUOUS, null), variable("y", VariableKind.CONTINUOUS, null),
                        variable("z", VariableKind.CATEGORICAL, null)), CONFIDENCE);
        assertTrue(r.comparisons().isEmpty());
        assertEquals(List.of("kept note",
                "x: not compared paired: fewer than 2 respondents with a valid answer in both waves (1)",
                "y: not compared paired: no respondent's answer changed (4 pairs)",
                "z: not compared paired: a single category"), r.notes());
    }

    @Test
    void swappingTheWavesFlipsEveryPairedEffect() {
        double[] d = new double[SLEEP_BASELINE.length];
        for (int i = 0; i < d.length; i++) {
            d[i] = SLEEP_BASELINE[i] - SLEEP_CURRENT[i];
        }
        NumericDistribution table = NumericDistribution.ofSample(d);
        NumericPairs swapped = new NumericPairs("extra_sleep", 10, 1, 0.75, 2.33, table.mean(),
                table.standardDeviation(), table, Binning.EXACT);
        long[][] back = new long[3][3];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                back[j][i] = COMMUTE[i][j];
            }
        }
        List<VariableConfig> vs = List.of(variable("extra_sleep", VariableKind.CONTINUOUS, null),
                variable("approves", VariableKind.BINARY, null),
                variable("commute_mode", VariableKind.CATEGORICAL, null));
        List<Comparison> forward = PanelComparisons.compare(panel(sleep("extra_sleep"),
                new BinaryPairs("approves", "1", 794, 150, 86, 570, 0),
                new CategoricalPairs("commute_mode", MODES, COMMUTE, 0)), vs, CONFIDENCE).comparisons();
        List<Comparison> reverse = PanelComparisons.compare(panel(swapped,
                new BinaryPairs("approves", "1", 794, 86, 150, 570, 0),
                new CategoricalPairs("commute_mode", MODES, back, 0)), vs, CONFIDENCE).comparisons();
        for (int i = 0; i < 3; i++) {
            Comparison f = forward.get(i);
            Comparison b = reverse.get(i);
            assertEquals(f.test().pValue(), b.test().pValue(), 1e-12, f.variable());
            assertEquals(-f.effect().estimate(), b.effect().estimate(), 1e-12, f.variable());
            assertEquals(-f.effect().ciHigh(), b.effect().ciLow(), 1e-8, f.variable());
            assertEquals(-f.effect().ciLow(), b.effect().ciHigh(), 1e-8, f.variable());
        }
    }
}
