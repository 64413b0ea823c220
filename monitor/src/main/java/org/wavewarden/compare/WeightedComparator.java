package org.wavewarden.compare;

import org.wavewarden.compare.categorical.CohensW;
import org.wavewarden.compare.categorical.CramersV;
import org.wavewarden.compare.design.BinnedDesignEffect;
import org.wavewarden.compare.design.DesignEstimate;
import org.wavewarden.compare.design.DesignGoodnessOfFit;
import org.wavewarden.compare.design.DesignMeanDifference;
import org.wavewarden.compare.design.DesignMeanDifferenceResult;
import org.wavewarden.compare.design.PsuTally;
import org.wavewarden.compare.design.PsuTotals;
import org.wavewarden.compare.design.RaoScott;
import org.wavewarden.compare.design.RaoScottResult;
import org.wavewarden.compare.design.TallyEstimates;
import org.wavewarden.compare.design.WeightedDistribution;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.compare.shape.DistanceInterval;
import org.wavewarden.compare.shape.KolmogorovSmirnovTest;
import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.config.Threshold;
import org.wavewarden.judge.FindingKind;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * The weighted counterpart of {@link VariableComparator}, for a dataset with a weight column: every mean, share,
 * quantile and distribution is weighted, and tests are design-based.
 *
 * <p>Design: the monitor reads no strata or cluster columns, so each wave is taken as a weights-only design, each
 * respondent its own PSU, drawn with replacement, which is also the design Kish's effective sample size assumes.
 * Under it the Taylor-linearised variances of {@link org.wavewarden.compare.design} are exact functions of each
 * value's sums of weights and squared weights ({@link WeightedTally}), equal to R's {@code survey} package on the
 * rows. A design with strata or clusters would usually have larger variances; reading such columns is future work.
 *
 * <ul>
 *   <li>Continuous and ordinal: the design-based t on the weighted means ({@link DesignMeanDifference}, df = n_b +
 *   n_c - 2). Effect: the difference of weighted means with its t interval when the threshold is in raw units;
 *   otherwise that difference and its interval divided by the pooled weighted SD (each wave's {@code svyvar}
 *   pooled with weights n - 1), a weighted Cohen's d (Cohen 1988), default threshold 0.2. The SD is treated as
 *   known in the interval. An effect-scale threshold configured for the variable is read on this d scale.</li>
 *   <li>Binary: the design-based t on the weighted shares. Effect: Cohen's h (Cohen 1988) of the weighted shares,
 *   its interval from the delta method on the design standard errors ({@code var h = SE_b^2 / (p_b (1 - p_b)) +
 *   SE_c^2 / (p_c (1 - p_c))}, Kish's {@code 1 / n_eff} for a share of 0 or 1); or, with a threshold in points,
 *   the difference of weighted shares with its t interval.</li>
 *   <li>Categorical: the Rao-Scott second-order F ({@link RaoScott}); the first-order corrected chi-square is in the
 *   detail. Effect: Cramér's V of the weighted shares with each wave scaled to its Kish effective sample size
 *   (noncentral chi-square interval on that scale: a Kish approximation), under strata and clusters with the
 *   interval at the effective size n / dbar of the Rao-Scott first-order correction ({@link CramersV#atEffectiveSize});
 *   or, with a threshold in points, the
 *   difference of weighted shares of the category whose design-based t is largest.</li>
 *   <li>Shape of a continuous variable: the largest gap between the weighted distribution functions, with the
 *   limiting Kolmogorov p-value and the DKW interval at Kish's effective sample sizes, under strata and clusters
 *   at the sizes the largest design effect of the binned distributions leaves (an approximation, conservative;
 *   there is no design-based KS test in common use).</li>
 * </ul>
 * Every weighted finding names the weighting in its test, and states each wave's Kish effective sample size
 * {@code n_eff = W^2 / sum w^2} and design effect due to weighting {@code deff_w = n sum w^2 / W^2} (Kish, L.
 * (1965), Survey Sampling, Wiley, Section 11.7) in its sentence and detail.
 */
public final class WeightedComparator {

    public static final String MEANS_TEST = "design-based t on weighted means";
    public static final String SHARES_TEST = "design-based t on weighted shares";
    public static final String CATEGORIES_TEST = "Rao-Scott F (second order) on weighted shares";
    /** The df of the Rao-Scott F as a finding reports it; the F's denominator df is in its detail. */
    public static final String RAO_SCOTT_DF = "numerator df of the Rao-Scott second-order F, tr(Delta)^2 /"
            + " tr(Delta^2); denominator df in detail (denominatorDf)";
    /** The df of the design-based one-sample t under the weights-only design. */
    public static final String DF_ONE_SAMPLE_WEIGHTS_ONLY = "n - 1: each respondent its own PSU, one stratum (R survey"
            + " degf)";
    public static final String SHAPE_TEST = "Kolmogorov-Smirnov on weighted distributions (Kish effective sizes)";
    public static final String SHAPE_TEST_DESIGN = "Kolmogorov-Smirnov on weighted distributions (effective sizes"
            + " from the design effect)";

    /** What a test name says when strata and clusters, not the weights alone, give its variance. */
    public static final String WITH_DESIGN = " (stratified cluster design, Taylor linearisation)";

    private final double confidence;

    /**
     * Both waves' sampling designs as PSU sums of the variable's valid answers: {@code tally} for categories (and
     * numeric variables whose every value's sums are kept), {@code totals} for numeric variables. With a design the
     * variances come from the PSUs (Wolter 2007, Chapter 6) instead of the weights-only design; the estimates, the
     * Kish figures and the effect sizes stay those of the weights.
     */
    public record Design(PsuTally baselineTally, PsuTally currentTally, PsuTotals baselineTotals,
                         PsuTotals currentTotals) {
    }

    private final CodeLabels labels;

    public WeightedComparator(double confidence) {
        this(confidence, CodeLabels.NONE);
    }

    private WeightedComparator(double confidence, CodeLabels labels) {
        Checks.confidence(confidence);
        this.confidence = confidence;
        this.labels = labels;
    }

    /** The same comparator naming one variable's codes by their labels in what it writes. */
    public WeightedComparator labelled(CodeLabels variableLabels) {
        return new WeightedComparator(confidence, variableLabels == null ? CodeLabels.NONE : variableLabels);
    }

    /**
     * Kish's figures for one wave of one variable's valid answers.
     *
     * @param n                   respondents (a weight of zero counts)
     * @param sumOfWeights        W
     * @param effectiveSampleSize {@code W^2 / sum w^2}
     * @param designEffect        {@code n sum w^2 / W^2}, the design effect due to weighting
     */
    public record Weighting(long n, double sumOfWeights, double effectiveSampleSize, double designEffect) {

        public static Weighting of(WeightedTally t) {
            return new Weighting(t.n(), t.totalWeight(), t.effectiveSampleSize(), t.weightingDesignEffect());
        }
    }

    /**
     * Detail of a weighted continuous or ordinal comparison. The design effects are those of the weighted means
     * (R's {@code deff(svymean(..., deff = "replace"))}), which depend on the variable; the Kish figures in
     * {@code weighting*} depend on the weights only. {@code ksD}, {@code ksPValue} and {@code ksTest} are those of
     * the variable's shape finding ({@link #shape}), effective sizes and all, so the two never disagree.
     */
    public record LocationDetail(Weighting weightingBaseline, Weighting weightingCurrent, double meanBaseline,
                                 double meanCurrent, double standardErrorBaseline, double standardErrorCurrent,
                                 double meanDesignEffectBaseline, double meanDesignEffectCurrent,
                                 double[] quartilesBaseline, double[] quartilesCurrent, double sdBaseline,
                                 double sdCurrent, EffectSize standardized, EffectSize rawShift, double ksD,
                                 double ksPValue, String ksTest, Reproduce reproduce, WaveEstimates.Plotted plot) {
    }

    /**
     * What a reader needs to reproduce a weighted location or share test with R's {@code survey}: the design-based
     * t with its df and their convention, and the p-value R's two-group {@code svyttest} gives for the same t, with
     * why it differs. There is no weighted rank test here: the weighted comparison is of means and shares only.
     *
     * @param designT      the test the finding reports (t, df, p, dfConvention)
     * @param svyttest     the same t on {@code svyttest}'s df, or null when that leaves no df
     * @param svyttestNote why the two p-values differ
     */
    public record Reproduce(TestResult designT, TestResult svyttest, String svyttestNote) {

        static Reproduce of(TestResult designT, DesignMeanDifferenceResult r) {
            return new Reproduce(designT, r.svyttest(), r.svyttest() == null ? null
                    : DesignMeanDifference.SVYTTEST_NOTE);
        }
    }

    /** Detail of a weighted binary comparison. */
    public record ProportionDetail(String successValue, Weighting weightingBaseline, Weighting weightingCurrent,
                                   double shareBaseline, double shareCurrent, double standardErrorBaseline,
                                   double standardErrorCurrent, EffectSize shareDifference, EffectSize cohensH,
                                   Reproduce reproduce, WaveEstimates.Plotted plot) {
    }

    /**
     * One category of a weighted categorical comparison, with the design-based t of its share difference.
     *
     * @param label the category's value label, or null when it has none
     */
    public record CategoryRow(String category, String label, long countBaseline, long countCurrent, double shareBaseline,
                              double shareCurrent, double designT) {
    }

    /**
     * Detail of a weighted categorical comparison: the Rao-Scott corrections (first-order statistic, df and p;
     * the generalized design effects; the F's denominator df) beside the per-category weighted shares.
     */
    public record CategoryDetail(Weighting weightingBaseline, Weighting weightingCurrent, List<CategoryRow> categories,
                                 double pearsonChiSquare, double[] generalizedDesignEffects,
                                 TestResult firstOrder, double denominatorDf, EffectSize movedShareDifference, WaveEstimates.Plotted plot) {
    }

    /**
     * Detail of a weighted reference comparison: the wave's weighting, its distance from the reference, and for
     * reference shares the Satterthwaite scale and df of the goodness-of-fit test (NaN for a reference mean).
     */
    public record ReferenceDetail(Weighting weighting, double reference, double estimate, EffectSize difference,
                                 double satterthwaiteScale, double df, WaveEstimates.Plotted plot) {
    }

    /** Continuous and ordinal variables: the design-based t on weighted means. */
    public Comparison numeric(String variable, WeightedTally baseline, WeightedTally current, Threshold configured,
                              String unit) {
        return numeric(variable, baseline, current, null, configured, unit);
    }

    /** The same with the waves' designs (null: weights only). */
    public Comparison numeric(String variable, WeightedTally baseline, WeightedTally current, Design design,
                              Threshold configured, String unit) {
        DesignMeanDifferenceResult md = design == null ? DesignMeanDifference.test(baseline, current, confidence)
                : DesignMeanDifference.test(design.baselineTotals(), design.currentTotals(), confidence);
        EffectSize diff = md.difference();
        double sdB = Math.sqrt(TallyEstimates.weightedVariance(baseline));
        double sdC = Math.sqrt(TallyEstimates.weightedVariance(current));
        long nb = baseline.n();
        long nc = current.n();
        double pooled = Math.sqrt(((nb - 1) * sdB * sdB + (nc - 1) * sdC * sdC) / (nb + nc - 2));
        EffectSize d = pooled > 0
                ? new EffectSize("Cohen's d (weighted)", diff.estimate() / pooled, diff.ciLow() / pooled,
                diff.ciHigh() / pooled, confidence)
                : new EffectSize("Cohen's d (weighted)", 0, 0, 0, confidence);
        EffectSize raw = new EffectSize("difference of weighted means", diff.estimate(), diff.ciLow(), diff.ciHigh(),
                confidence);
        Thresholds.Resolved t = Thresholds.resolve(configured, d.name(), Thresholds.HEDGES_G, unit);
        Weighting wb = Weighting.of(baseline);
        Weighting wc = Weighting.of(current);
        ShapeTest ks = shapeTest(baseline, current, design, wb, wc);
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("weighted mean " + labels.named(variable), design == null
                ? WaveEstimates.Estimator.WEIGHTED_MEAN : WaveEstimates.Estimator.DESIGN_MEAN, unit,
                List.of(WaveEstimates.weightedMean(baseline, design == null ? null : design.baselineTotals(),
                        confidence)),
                List.of(WaveEstimates.weightedMean(current, design == null ? null : design.currentTotals(),
                        confidence)), null);
        TestResult test = new TestResult(MEANS_TEST + (design == null ? "" : WITH_DESIGN), md.test().statistic(),
                md.test().df(), md.test().pValue(), md.test().dfConvention());
        LocationDetail detail = new LocationDetail(wb, wc, md.baseline().estimate(), md.current().estimate(),
                md.baseline().standardError(), md.current().standardError(), md.baseline().designEffect(),
                md.current().designEffect(), quartiles(baseline), quartiles(current), sdB, sdC, d, raw, ks.distance(),
                ks.pValue(), ks.test(), Reproduce.of(test, md), plot);
        Change change = new Change("weighted mean " + labels.named(variable), plot.baseline().get(0).value(),
                plot.current().get(0).value(), false, unit, diff.estimate(), diff.ciLow(), diff.ciHigh(),
                weightingNote(wb, wc));
        return new Comparison(variable, FindingKind.SHIFT, test, t.rawScale() ? raw : d, t.value(), t.source(), nb,
                nc, change, detail);
    }

    /** The shape check of a weighted continuous variable. Threshold: KS distance 0.1 (common practice, no source). */
    public Comparison shape(String variable, WeightedTally baseline, WeightedTally current) {
        return shape(variable, baseline, current, null);
    }

    /**
     * The same with the waves' designs (null: weights only). With every value's PSU sums ({@link Design} tallies),
     * the limiting Kolmogorov p-value and the DKW interval take each wave's answers divided by the largest
     * generalised design effect of the binned distributions ({@link BinnedDesignEffect}) as its effective size, so
     * that clustering, which Kish's sizes ignore, cannot make a chance gap look like a changed shape (the test is
     * conservative); without them, Kish's sizes stand. There is no design-based KS test in R's survey package; a
     * simulation of clustered waves drawn from one population checks the level (WeightedDesignEffectsTest).
     */
    public Comparison shape(String variable, WeightedTally baseline, WeightedTally current, Design design) {
        Weighting wb = Weighting.of(baseline);
        Weighting wc = Weighting.of(current);
        ShapeTest ks = shapeTest(baseline, current, design, wb, wc);
        EffectSize d = DistanceInterval.ofEffectiveSizes(ks.distance(), ks.baselineSize(), ks.currentSize(),
                confidence);
        Change change = new Change("largest gap between the two waves' weighted cumulative distributions of "
                + variable, 0, ks.distance(), true, null, ks.distance(), d.ciLow(), d.ciHigh(), ks.note());
        return new Comparison(variable, FindingKind.SHAPE_CHANGE, TestResult.withoutDf(ks.test(), ks.distance(),
                ks.pValue()), d, Thresholds.KS_DISTANCE, "default " + Thresholds.KS_DISTANCE + " for the KS distance",
                baseline.n(), current.n(), change,
                org.wavewarden.compare.shape.CumulativeGap.of(baseline, current, d, null));
    }

    /**
     * The weighted KS test of one variable, which the shape finding states and the location finding's detail
     * repeats.
     *
     * @param baselineSize the baseline's effective size the p-value and interval take (Kish's, or the design's)
     * @param note         the weighting note, with the design effect when the design set the sizes
     */
    private record ShapeTest(double distance, double baselineSize, double currentSize, double pValue, String test,
                             String note) {
    }

    private static ShapeTest shapeTest(WeightedTally baseline, WeightedTally current, Design design, Weighting wb,
                                       Weighting wc) {
        double ks = WeightedDistribution.cdfDistance(baseline, current);
        double nb = wb.effectiveSampleSize();
        double nc = wc.effectiveSampleSize();
        String test = SHAPE_TEST;
        String note = weightingNote(wb, wc);
        if (design != null && design.baselineTally() != null && design.currentTally() != null) {
            double deff = BinnedDesignEffect.largest(design.baselineTally(), design.currentTally());
            nb = design.baselineTally().n() / deff;
            nc = design.currentTally().n() / deff;
            test = SHAPE_TEST_DESIGN;
            note += String.format(Locale.ROOT, "; under the design, largest design effect %.2f of the binned"
                    + " distributions, effective sizes %.0f and %.0f", deff, nb, nc);
        }
        return new ShapeTest(ks, nb, nc, KolmogorovSmirnovTest.asymptoticPValue(ks, nb, nc), test, note);
    }

    /**
     * Binary variables: the design-based t on weighted shares; the tallies hold 0 and 1, 1 for {@code successLabel}
     * ({@link WeightedTally#indicator}).
     */
    public Comparison proportion(String variable, String successLabel, WeightedTally baseline, WeightedTally current,
                                 Threshold configured) {
        return proportion(variable, successLabel, baseline, current, null, configured);
    }

    /** The same with the waves' designs, whose tallies hold the 0/1 indicator (null: weights only). */
    public Comparison proportion(String variable, String successLabel, WeightedTally baseline, WeightedTally current,
                                 Design design, Threshold configured) {
        DesignMeanDifferenceResult r = design == null ? DesignMeanDifference.testShares(baseline, current, confidence)
                : DesignMeanDifference.testShares(design.baselineTally(), design.currentTally(), confidence);
        Weighting wb = Weighting.of(baseline);
        Weighting wc = Weighting.of(current);
        EffectSize h = cohensH(r.baseline(), r.current(), wb, wc);
        Thresholds.Resolved t = Thresholds.resolve(configured, h.name(), Thresholds.COHENS_H, null);
        EffectSize rd = r.difference();
        String category = VariableComparator.categoryOf(successLabel);
        String shown = VariableComparator.shownSuccess(successLabel, labels);
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("weighted share " + shown,
                design == null ? WaveEstimates.Estimator.WEIGHTED_SHARE : WaveEstimates.Estimator.DESIGN_SHARE, null,
                List.of(WaveEstimates.weightedShare(category, baseline, design == null ? null
                        : design.baselineTally(), 1, confidence).labelled(labels)),
                List.of(WaveEstimates.weightedShare(category, current, design == null ? null
                        : design.currentTally(), 1, confidence).labelled(labels)), null);
        TestResult test = new TestResult(SHARES_TEST + (design == null ? "" : WITH_DESIGN), r.test().statistic(),
                r.test().df(), r.test().pValue(), r.test().dfConvention());
        ProportionDetail d = new ProportionDetail(successLabel, wb, wc, r.baseline().estimate(),
                r.current().estimate(), r.baseline().standardError(), r.current().standardError(), rd, h,
                Reproduce.of(test, r), plot);
        Change change = new Change("weighted share " + shown, plot.baseline().get(0).value(),
                plot.current().get(0).value(), true, null, rd.estimate(), rd.ciLow(), rd.ciHigh(),
                weightingNote(wb, wc));
        return new Comparison(variable, FindingKind.SHIFT, test, t.rawScale() ? rd : h, t.value(), t.source(),
                baseline.n(), current.n(), change, d);
    }

    /**
     * Categorical variables: the Rao-Scott second-order F on the weighted shares. The tallies' values are the
     * positions of the categories in {@code categories}, the same for both waves.
     */
    public Comparison categorical(String variable, List<String> categories, WeightedTally baseline,
                                  WeightedTally current, Threshold configured) {
        return categorical(variable, categories, baseline, current, null, configured);
    }

    /** The same with the waves' designs, whose tallies' values are the same category positions (null: weights). */
    public Comparison categorical(String variable, List<String> categories, WeightedTally baseline,
                                  WeightedTally current, Design design, Threshold configured) {
        RaoScottResult rs = design == null ? RaoScott.test(baseline, current)
                : RaoScott.test(design.baselineTally(), design.currentTally());
        Weighting wb = Weighting.of(baseline);
        Weighting wc = Weighting.of(current);
        int[] codes = rs.codes();
        int k = codes.length;
        double[] sb = new double[k];
        double[] sc = new double[k];
        long[] nb = new long[k];
        long[] nc = new long[k];
        fill(baseline, codes, sb, nb);
        fill(current, codes, sc, nc);
        List<CategoryRow> rows = new ArrayList<>();
        DesignMeanDifferenceResult top = null;
        int topIndex = -1;
        for (int j = 0; j < k; j++) {
            DesignMeanDifferenceResult m = shareDifference(baseline, current, design, codes[j]);
            double tj = m == null ? 0 : m.test().statistic();
            rows.add(new CategoryRow(categories.get(codes[j]), labels.label(categories.get(codes[j])), nb[j], nc[j], sb[j], sc[j], tj));
            if (m != null && (top == null || Math.abs(tj) > Math.abs(top.test().statistic()))) {
                top = m;
                topIndex = j;
            }
        }
        if (top == null) {
            throw new IllegalArgumentException("no category's weighted share varies within a wave");
        }
        double x2 = pearson(sb, sc, wb.effectiveSampleSize(), wc.effectiveSampleSize());
        EffectSize v = CramersV.ofTwoWaveChiSquare("Cramér's V (weighted, Kish effective sizes)", x2, k - 1,
                wb.effectiveSampleSize() + wc.effectiveSampleSize(), confidence);
        if (design != null) {
            // Under strata and clusters the interval takes the design's own effect on the shares, not Kish's.
            v = CramersV.atEffectiveSize("Cramér's V (weighted, Rao-Scott design effect)", v.estimate(), k - 1,
                    (design.baselineTally().n() + design.currentTally().n()) / rs.meanDesignEffect(), confidence);
        }
        Thresholds.Resolved t = Thresholds.resolve(configured, v.name(), Thresholds.CRAMERS_V, null);
        String moved = categories.get(codes[topIndex]);
        EffectSize share = top.difference();
        EffectSize effect = t.rawScale()
                ? new EffectSize("difference of weighted shares of '" + moved + "'", share.estimate(), share.ciLow(),
                share.ciHigh(), confidence)
                : v;
        WaveEstimates.Estimator estimator = design == null ? WaveEstimates.Estimator.WEIGHTED_SHARE
                : WaveEstimates.Estimator.DESIGN_SHARE;
        List<WaveEstimates.Estimate> plotB = new ArrayList<>();
        List<WaveEstimates.Estimate> plotC = new ArrayList<>();
        for (int j : VariableComparator.namedFirst(topIndex, k)) {
            String label = categories.get(codes[j]);
            plotB.add(WaveEstimates.weightedShare(label, baseline, design == null ? null : design.baselineTally(),
                    codes[j], confidence).labelled(labels));
            plotC.add(WaveEstimates.weightedShare(label, current, design == null ? null : design.currentTally(),
                    codes[j], confidence).labelled(labels));
        }
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("weighted share answering " + labels.quoted(moved), estimator,
                null, plotB, plotC, null);
        Change change = new Change("weighted share answering " + labels.quoted(moved), plotB.get(0).value(),
                plotC.get(0).value(), true, null, share.estimate(), share.ciLow(), share.ciHigh(), "the category that"
                + " moved most (design-based t " + VariableComparator.signed(top.test().statistic(), 1) + "); "
                + weightingNote(wb, wc));
        CategoryDetail d = new CategoryDetail(wb, wc, rows, rs.pearsonChiSquare(), rs.designEffects(),
                rs.firstOrder(), rs.denominatorDf(), share, plot);
        TestResult second = rs.secondOrder();
        TestResult test = new TestResult(CATEGORIES_TEST + (design == null ? "" : WITH_DESIGN), second.statistic(),
                second.df(), second.pValue(), RAO_SCOTT_DF);
        return new Comparison(variable, FindingKind.SHIFT, test, effect, t.value(), t.source(), baseline.n(),
                current.n(), change, d);
    }

    /**
     * One wave's weighted shares against configured reference shares (benchmark margins): R's {@code svygofchisq}
     * ({@link DesignGoodnessOfFit}), under the weights-only design or, with {@code design}, the stratified cluster
     * design. The effect is Cohen's w of the weighted shares, {@code sqrt(sum (p_j - pi_j)^2 / pi_j)}, with the
     * noncentral chi-square interval taken on the Satterthwaite scale ({@code X2 / scale} on its df, the effective
     * size chosen so that its point estimate is w). The tally's values are the positions of {@code categories}.
     *
     * @param expected the reference share of each category, summing to 1
     * @param design   the wave's PSU view over the same positions, or null for weights only
     */
    public Comparison referenceShares(String variable, List<String> categories, WeightedTally current,
                                      double[] expected, PsuTally design, Threshold configured) {
        DesignGoodnessOfFit.Result r = design == null ? DesignGoodnessOfFit.test(current, expected)
                : DesignGoodnessOfFit.test(design, expected);
        double w2 = 0;
        int worst = 0;
        double[] p = r.shares();
        for (int j = 0; j < expected.length; j++) {
            w2 += (p[j] - expected[j]) * (p[j] - expected[j]) / expected[j];
            if (Math.abs(p[j] - expected[j]) > Math.abs(p[worst] - expected[worst])) {
                worst = j;
            }
        }
        Weighting wc = Weighting.of(current);
        double scaled = r.scaledStatistic();
        double effectiveN = w2 > 0 ? scaled / w2 : wc.effectiveSampleSize();
        EffectSize ws = CohensW.fromStatistic(scaled, r.test().df(), effectiveN, confidence);
        EffectSize w = new EffectSize("Cohen's w (weighted shares)", ws.estimate(), ws.ciLow(), ws.ciHigh(),
                confidence);
        Thresholds.Resolved t = Thresholds.resolve(configured, w.name(), Thresholds.CRAMERS_V, null);
        DesignEstimate share = design == null ? TallyEstimates.mean(current.indicator(worst))
                : design.indicator(worst).totals().mean();
        double half = StandardNormal.twoSidedQuantile(confidence)
                * share.standardError();
        List<WaveEstimates.Estimate> now = new ArrayList<>();
        List<WaveEstimates.Estimate> references = new ArrayList<>();
        for (int j : VariableComparator.namedFirst(worst, expected.length)) {
            now.add(WaveEstimates.weightedShare(categories.get(j), current, design, j, confidence).labelled(labels));
            references.add(new WaveEstimates.Estimate(categories.get(j), labels.label(categories.get(j)), expected[j],
                    expected[j], expected[j]));
        }
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("weighted share answering " + labels.quoted(categories.get(worst)), design == null ? WaveEstimates.Estimator.WEIGHTED_SHARE : WaveEstimates.Estimator.DESIGN_SHARE,
                null, null, now, references);
        double d = now.get(0).value() - expected[worst];
        Change change = new Change("weighted share answering " + labels.quoted(categories.get(worst)) + " against its reference",
                expected[worst], now.get(0).value(), true, null, d, d - half, d + half, "the first value is the"
                + " reference; " + String.format(Locale.ROOT, "Satterthwaite scale %.3g on %.3g df; ", r.scale(),
                r.test().df()) + "Kish effective sample size " + String.format(Locale.ROOT, "%.0f",
                wc.effectiveSampleSize()) + ", design effect due to weighting " + String.format(Locale.ROOT, "%.2f",
                wc.designEffect()));
        TestResult test = new TestResult(DesignGoodnessOfFit.NAME + (design == null ? "" : WITH_DESIGN),
                r.test().statistic(), r.test().df(), r.test().pValue(), r.test().dfConvention());
        return new Comparison(variable, FindingKind.REFERENCE, test, w, t.value(), t.source(), 0, current.n(), change,
                new ReferenceDetail(wc, expected[worst], share.estimate(), new EffectSize("difference from the"
                        + " reference share", d, d - half, d + half, confidence), r.scale(), r.test().df(), plot));
    }

    /**
     * One wave against a reference mean: the design-based one-sample t, {@code (ybar_w - mu) / SE} on n - 1 df,
     * with the difference and its t interval as the effect. Without a raw threshold, T is 0.2 weighted standard
     * deviations of the wave (Cohen's d 0.2, Cohen 1988, in the variable's units).
     */
    public Comparison referenceMean(String variable, WeightedTally current, double mu, Threshold configured,
                                    String unit) {
        DesignEstimate m = TallyEstimates.mean(current);
        if (!(m.standardError() > 0)) {
            throw new IllegalArgumentException("the weighted mean has standard error 0: the wave does not vary");
        }
        double df = current.n() - 1;
        double d = m.estimate() - mu;
        double tStat = d / m.standardError();
        double p = StudentT.twoSidedP(tStat, df);
        double half = StudentT.twoSidedQuantile(df, confidence) * m.standardError();
        EffectSize raw = new EffectSize("difference of the weighted mean from the reference", d, d - half, d + half,
                confidence);
        double threshold;
        String source;
        if (configured != null && configured.raw() != null) {
            threshold = configured.raw();
            source = "configured " + Thresholds.trim(threshold) + (unit == null ? "" : " " + unit);
        } else {
            double e = configured != null && configured.effect() != null ? configured.effect() : Thresholds.HEDGES_G;
            threshold = e * Math.sqrt(TallyEstimates.weightedVariance(current));
            source = "configured " + String.format(Locale.ROOT, "%.3g", threshold) + (unit == null ? "" : " " + unit)
                    + " (d " + e + " times the wave's weighted SD)";
        }
        Weighting w = Weighting.of(current);
        WaveEstimates.Estimate now = WaveEstimates.weightedMean(current, null, confidence);
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("weighted mean " + labels.named(variable),
                WaveEstimates.Estimator.WEIGHTED_MEAN, unit, null, List.of(now),
                List.of(new WaveEstimates.Estimate(null, mu, mu, mu)));
        Change change = new Change("weighted mean " + labels.named(variable) + " against its reference", mu, now.value(), false,
                unit, d, d - half, d + half, "the first value is the reference; " + String.format(Locale.ROOT,
                "weighted: Kish effective sample size %.0f, design effect due to weighting %.2f",
                w.effectiveSampleSize(), w.designEffect()));
        return new Comparison(variable, FindingKind.REFERENCE, new TestResult("design-based one-sample t on the"
                + " weighted mean", tStat, df, p, DF_ONE_SAMPLE_WEIGHTS_ONLY), raw, threshold, source, 0, current.n(),
                change, new ReferenceDetail(w, mu, m.estimate(), raw, Double.NaN, df, plot));
    }

    /** "weighted: Kish effective sample sizes 205 and 244, design effects due to weighting 1.46 and 1.39". */
    static String weightingNote(Weighting b, Weighting c) {
        return String.format(Locale.ROOT, "weighted: Kish effective sample sizes %.0f (baseline) and %.0f (current),"
                        + " design effects due to weighting %.2f and %.2f", b.effectiveSampleSize(),
                c.effectiveSampleSize(), b.designEffect(), c.designEffect());
    }

    private EffectSize cohensH(DesignEstimate b, DesignEstimate c, Weighting wb, Weighting wc) {
        double h = 2 * Math.asin(Math.sqrt(c.estimate())) - 2 * Math.asin(Math.sqrt(b.estimate()));
        double var = arcsineVariance(b, wb) + arcsineVariance(c, wc);
        double half = StandardNormal.twoSidedQuantile(confidence) * Math.sqrt(var);
        return new EffectSize("Cohen's h (weighted shares)", h, h - half, h + half, confidence);
    }

    /** Delta method: d(2 asin sqrt p)/dp = 1 / sqrt(p (1 - p)); at p = 0 or 1, Kish's 1 / n_eff instead. */
    private static double arcsineVariance(DesignEstimate p, Weighting w) {
        double q = p.estimate() * (1 - p.estimate());
        return q > 0 ? p.standardError() * p.standardError() / q : 1 / w.effectiveSampleSize();
    }

    private DesignMeanDifferenceResult shareDifference(WeightedTally b, WeightedTally c, Design design, int code) {
        try {
            return design == null ? DesignMeanDifference.testShares(b.indicator(code), c.indicator(code), confidence)
                    : DesignMeanDifference.testShares(design.baselineTally().indicator(code),
                    design.currentTally().indicator(code), confidence);
        } catch (IllegalArgumentException e) {
            return null; // a category with no spread in either wave (standard error 0) has no t
        }
    }

    /** Weighted lower quartile, median and upper quartile ({@link WeightedDistribution#quantile}). */
    private static double[] quartiles(WeightedTally t) {
        return new double[] {WeightedDistribution.quantile(t, 0.25), WeightedDistribution.quantile(t, 0.5),
                WeightedDistribution.quantile(t, 0.75)};
    }

    private static void fill(WeightedTally t, int[] codes, double[] shares, long[] counts) {
        double total = t.totalWeight();
        double[] v = t.values();
        double[] w = t.weights();
        long[] n = t.counts();
        for (int i = 0; i < v.length; i++) {
            int j = java.util.Arrays.binarySearch(codes, (int) v[i]);
            if (j >= 0) {
                shares[j] = w[i] / total;
                counts[j] = n[i];
            }
        }
    }

    /** Pearson's X2 of the 2 x k table whose waves hold their weighted shares times their effective sizes. */
    private static double pearson(double[] sb, double[] sc, double nb, double nc) {
        double n = nb + nc;
        double x2 = 0;
        for (int j = 0; j < sb.length; j++) {
            double col = sb[j] * nb + sc[j] * nc;
            if (col <= 0) {
                continue;
            }
            double eb = col * nb / n;
            double ec = col * nc / n;
            x2 += (sb[j] * nb - eb) * (sb[j] * nb - eb) / eb + (sc[j] * nc - ec) * (sc[j] * nc - ec) / ec;
        }
        return x2;
    }
}
