package org.wavewarden.compare;

import org.wavewarden.compare.categorical.ChiSquareHomogeneity;
import org.wavewarden.compare.categorical.ChiSquareResult;
import org.wavewarden.compare.categorical.CramersV;
import org.wavewarden.compare.categorical.FisherExact;
import org.wavewarden.compare.categorical.MonteCarloExactTest;
import org.wavewarden.compare.location.HedgesG;
import org.wavewarden.compare.location.LocationTestChoice;
import org.wavewarden.compare.location.MeanDifference;
import org.wavewarden.compare.location.WelchTTest;
import org.wavewarden.compare.proportion.CohensH;
import org.wavewarden.compare.proportion.TwoProportionResult;
import org.wavewarden.compare.proportion.TwoProportionZTest;
import org.wavewarden.compare.rank.CliffsDelta;
import org.wavewarden.compare.rank.HodgesLehmann;
import org.wavewarden.compare.rank.MannWhitneyTest;
import org.wavewarden.compare.rank.RankSumResult;
import org.wavewarden.compare.shape.JensenShannon;
import org.wavewarden.compare.shape.KolmogorovSmirnovResult;
import org.wavewarden.compare.shape.PopulationStabilityIndex;
import org.wavewarden.compare.shape.PsiResult;
import org.wavewarden.compare.shape.KolmogorovSmirnovTest;
import org.wavewarden.compare.shape.Wasserstein;
import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.config.Threshold;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.profile.Quantiles;

import java.util.ArrayList;
import java.util.List;

/**
 * Picks the right test and effect size for a variable's kind and runs them on two waves' frequency tables.
 * Each method here only chooses and assembles; every number is computed by the cited classes it calls.
 */
public final class VariableComparator {

    /** Monte Carlo replicates for tables that fail Cochran's rule; the seed makes the p-value reproducible. */
    static final int MONTE_CARLO_REPLICATES = 20_000;
    static final long MONTE_CARLO_SEED = 20_061_975L;
    /**
     * Cells drawn by the Monte Carlo test at most (table cells x replicates, about five seconds of drawing): a
     * table of many sparse categories draws fewer tables, down to {@link #MONTE_CARLO_MIN_REPLICATES}; beyond that
     * the chi-square approximation stands, and the note says so. Common practice, no source.
     */
    static final long MONTE_CARLO_BUDGET = 10_000_000L;
    /** Fewest replicates worth drawing: p-values resolve to 0.001, still below any usual alpha. */
    static final int MONTE_CARLO_MIN_REPLICATES = 1_000;

    private final double confidence;
    private final CodeLabels labels;

    public VariableComparator(double confidence) {
        this(confidence, CodeLabels.NONE);
    }

    private VariableComparator(double confidence, CodeLabels labels) {
        Checks.confidence(confidence);
        this.confidence = confidence;
        this.labels = labels;
    }

    /** The same comparator naming one variable's codes by their labels in what it writes. */
    public VariableComparator labelled(CodeLabels variableLabels) {
        return new VariableComparator(confidence, variableLabels == null ? CodeLabels.NONE : variableLabels);
    }

    /** The labels this comparator names codes with. */
    public CodeLabels labels() {
        return labels;
    }

    /** Location detail of a continuous or ordinal comparison. */
    public record LocationDetail(String testChoice, double meanBaseline, double meanCurrent, double medianBaseline,
                                 double medianCurrent, double sdBaseline, double sdCurrent, EffectSize standardized,
                                 EffectSize rawShift, double ksD, double ksPValue, double wasserstein,
                                 double psi, String psiBand, double jensenShannon, BothTests bothTests,
                                 LocationTestChoice.Normality normality, WaveEstimates.Plotted plot) {
    }

    /**
     * Both location tests and all four effects of a continuous variable, whichever is primary, so that a reader can
     * see what the other choice would have said. A method the data do not allow (Welch's t on two constant waves)
     * is null.
     *
     * @param primary        the test the finding reports, "Welch t" or "Mann-Whitney U"
     * @param welch          Welch's t with its Welch-Satterthwaite df and p
     * @param mannWhitney    the rank-sum W (Wilcoxon form) and its p
     * @param hedgesG        Hedges' g with its interval
     * @param cliffsDelta    Cliff's delta with its interval
     * @param meanDifference the difference of means with its Welch interval
     * @param hodgesLehmann  the Hodges-Lehmann shift with its interval
     */
    public record BothTests(String primary, TestResult welch, TestResult mannWhitney, EffectSize hedgesG,
                            EffectSize cliffsDelta, EffectSize meanDifference, EffectSize hodgesLehmann) {
    }

    /**
     * One category's row of a categorical comparison.
     *
     * @param label the category's value label, or null when it has none
     */
    public record CategoryRow(String category, String label, long countBaseline, long countCurrent,
                              double shareBaseline, double shareCurrent, double adjustedResidual) {
    }

    public record CategoryDetail(List<CategoryRow> categories, boolean cochranSatisfied, String cochranNote,
                                 double cramersVBiasCorrected, double jensenShannon, String primaryTestNote,
                                 EffectSize movedShareDifference, WaveEstimates.Plotted plot) {
    }

    /**
     * Detail of a REFERENCE finding: the reference, the wave's estimate and their difference, beside the estimates
     * as plotted.
     *
     * @param plot the wave's estimates and the references, as plotted
     */
    public record ReferenceDetail(double reference, double estimate, EffectSize difference,
                                  WaveEstimates.Plotted plot) {
    }

    public record ProportionDetail(String successValue, double shareBaseline, double shareCurrent,
                                   EffectSize riskDifference, EffectSize cohensH, String primaryTestNote,
                                   WaveEstimates.Plotted plot) {
    }

    /** The category a share's label names: 'x' of "answering 'x'", the reason of "missing (reason)". */
    static String categoryOf(String label) {
        return label.replaceFirst("^answering '(.*)'$", "$1").replaceFirst("^missing \\((.*)\\)$", "$1");
    }

    /** "answering 'x'" with the code named by its label ("answering 'Council tenant' (COUN)"); others as given. */
    static String shownSuccess(String successLabel, CodeLabels labels) {
        return successLabel.matches("^answering '.*'$") ? "answering " + labels.quoted(categoryOf(successLabel))
                : successLabel;
    }

    /**
     * Continuous variables: Welch t with Hedges' g, or Mann-Whitney with Cliff's delta, as
     * {@link LocationTestChoice} decides. Ordinal variables: always the rank methods.
     */
    public Comparison numeric(String variable, boolean ordinal, NumericDistribution baseline,
                              NumericDistribution current, Threshold configured, String unit) {
        return numeric(variable, ordinal, baseline, current, configured, unit, null);
    }

    /**
     * The same with a continuous variable's test already chosen ({@link LocationTestChoice#fromHistory} or
     * {@link LocationTestChoice#pinned}); null applies {@link LocationTestChoice#choose} to the two waves.
     */
    public Comparison numeric(String variable, boolean ordinal, NumericDistribution baseline,
                              NumericDistribution current, Threshold configured, String unit,
                              LocationTestChoice.Choice chosen) {
        LocationTestChoice.Choice choice = ordinal
                ? new LocationTestChoice.Choice(LocationTestChoice.LocationTest.MANN_WHITNEY, "ordinal scale: rank methods")
                : chosen != null ? chosen : LocationTestChoice.choose(baseline, current);
        KolmogorovSmirnovResult ks = KolmogorovSmirnovTest.test(baseline, current);
        double w1 = Wasserstein.distance(baseline, current);
        PsiResult psi = PopulationStabilityIndex.compute(baseline, current);
        double js = JensenShannon.distance(baseline, current);
        double medB = Quantiles.median(baseline);
        double medC = Quantiles.median(current);
        String shownName = labels.named(variable);
        boolean welchPrimary = choice.test() == LocationTestChoice.LocationTest.WELCH_T;
        // The primary methods must succeed; the other pair is computed for the detail when the data allow it.
        MeanDifference md = welchPrimary ? WelchTTest.test(baseline, current, confidence)
                : ordinal ? null : orNull(() -> WelchTTest.test(baseline, current, confidence));
        EffectSize g = welchPrimary ? HedgesG.estimate(baseline, current, confidence)
                : ordinal ? null : orNull(() -> HedgesG.estimate(baseline, current, confidence));
        RankSumResult mw = welchPrimary ? orNull(() -> MannWhitneyTest.test(baseline, current))
                : MannWhitneyTest.test(baseline, current);
        EffectSize delta = welchPrimary ? orNull(() -> CliffsDelta.estimate(baseline, current, confidence))
                : CliffsDelta.estimate(baseline, current, confidence);
        EffectSize hl = welchPrimary ? orNull(() -> HodgesLehmann.estimate(baseline, current, confidence))
                : HodgesLehmann.estimate(baseline, current, confidence);
        EffectSize meanDiff = md == null ? null
                : new EffectSize("mean difference", md.difference(), md.ciLow(), md.ciHigh(), confidence);
        BothTests both = ordinal ? null : new BothTests(welchPrimary ? WelchTTest.NAME : "Mann-Whitney U",
                md == null ? null : md.test(), mw == null ? null : mw.test(), g, delta, meanDiff, hl);
        if (welchPrimary) {
            EffectSize raw = meanDiff;
            Thresholds.Resolved t = Thresholds.resolve(configured, g.name(), Thresholds.HEDGES_G, unit);
            WaveEstimates.Plotted plot = new WaveEstimates.Plotted("mean " + shownName, WaveEstimates.Estimator.MEAN, unit,
                    List.of(WaveEstimates.mean(baseline, confidence)), List.of(WaveEstimates.mean(current, confidence)),
                    null);
            LocationDetail d = new LocationDetail(choice.reason(), md.meanBaseline(), md.meanCurrent(), medB, medC,
                    baseline.standardDeviation(), current.standardDeviation(), g, raw, ks.d(), ks.test().pValue(), w1,
                    psi.psi(), Magnitude.psi(psi.psi()), js, both, choice.normality(), plot);
            Change change = new Change("mean " + shownName, plot.baseline().get(0).value(), plot.current().get(0).value(),
                    false, unit,
                    md.difference(), md.ciLow(), md.ciHigh(), "");
            return new Comparison(variable, FindingKind.SHIFT, md.test(), t.rawScale() ? raw : g, t.value(), t.source(),
                    baseline.n(), current.n(), change, d);
        }
        Thresholds.Resolved t = Thresholds.resolve(configured, delta.name(), Thresholds.CLIFFS_DELTA, unit);
        // The sentence of an ordinal variable speaks of its mean, that of a continuous one of its median: the plot
        // draws the statistic the sentence names.
        WaveEstimates.Plotted plot = ordinal
                ? new WaveEstimates.Plotted("mean " + shownName, WaveEstimates.Estimator.MEAN, unit,
                List.of(WaveEstimates.mean(baseline, confidence)), List.of(WaveEstimates.mean(current, confidence)),
                null)
                : new WaveEstimates.Plotted("median " + shownName, WaveEstimates.Estimator.MEDIAN, unit,
                List.of(WaveEstimates.median(baseline, confidence)),
                List.of(WaveEstimates.median(current, confidence)), null);
        double before = plot.baseline().get(0).value();
        double after = plot.current().get(0).value();
        LocationDetail d = new LocationDetail(choice.reason(), baseline.mean(), current.mean(), medB, medC,
                baseline.standardDeviation(), current.standardDeviation(), delta, hl, ks.d(), ks.test().pValue(), w1,
                psi.psi(), Magnitude.psi(psi.psi()), js, both, choice.normality(), plot);
        Change change = ordinal
                ? new Change("mean " + shownName, before, after, false, unit, after - before, Double.NaN, Double.NaN, "")
                : new Change("median " + shownName, before, after, false, unit, hl.estimate(), hl.ciLow(), hl.ciHigh(),
                "the shift is the Hodges-Lehmann estimate");
        return new Comparison(variable, FindingKind.SHIFT, mw.test(), t.rawScale() ? hl : delta, t.value(), t.source(),
                baseline.n(), current.n(), change, d);
    }

    /**
     * The shape check beside the location test: the two-sample Kolmogorov-Smirnov test with the KS distance as its
     * effect (distribution-free interval, {@link org.wavewarden.compare.shape.DistanceInterval}) and the
     * Wasserstein-1 distance in raw units for the sentence. Threshold: KS distance 0.1 (common practice, no source).
     */
    public Comparison shape(String variable, NumericDistribution baseline, NumericDistribution current, String unit) {
        KolmogorovSmirnovResult ks = KolmogorovSmirnovTest.test(baseline, current);
        EffectSize d = org.wavewarden.compare.shape.DistanceInterval.of(ks.d(), baseline.n(), current.n(), confidence);
        double w1 = Wasserstein.distance(baseline, current);
        Change change = new Change("largest gap between the two waves' cumulative distributions of " + variable, 0,
                ks.d(), true, null, ks.d(), d.ciLow(), d.ciHigh(), "Wasserstein distance " + String.format(java.util.Locale.ROOT,
                "%.3g", w1) + (unit == null ? "" : " " + unit));
        return new Comparison(variable, FindingKind.SHAPE_CHANGE, ks.test(), d, Thresholds.KS_DISTANCE,
                "default " + Thresholds.KS_DISTANCE + " for the KS distance", baseline.n(), current.n(), change,
                org.wavewarden.compare.shape.CumulativeGap.of(baseline, current, d, unit));
    }

    /**
     * One wave against a reference mean: the one-sample t-test, with the mean difference and its t interval as the
     * effect. Without a raw threshold, T is 0.2 standard deviations of the wave (Cohen's d 0.2, Cohen 1988, in the
     * variable's units).
     */
    public Comparison referenceMean(String variable, NumericDistribution current, double mu, Threshold configured,
                                    String unit) {
        org.wavewarden.compare.location.MeanDifference md =
                org.wavewarden.compare.location.OneSampleTTest.test(current, mu, confidence);
        EffectSize raw = new EffectSize("mean difference from the reference", md.difference(), md.ciLow(), md.ciHigh(),
                confidence);
        double t;
        String source;
        if (configured != null && configured.raw() != null) {
            t = configured.raw();
            source = "configured " + Thresholds.trim(t) + (unit == null ? "" : " " + unit);
        } else {
            double sd = current.standardDeviation();
            t = (configured != null && configured.effect() != null ? configured.effect() : Thresholds.HEDGES_G) * sd;
            source = "configured " + String.format(java.util.Locale.ROOT, "%.3g", t) + (unit == null ? "" : " " + unit)
                    + " (d " + (configured != null && configured.effect() != null ? configured.effect()
                    : Thresholds.HEDGES_G) + " times the wave's SD)";
        }
        WaveEstimates.Estimate now = WaveEstimates.mean(current, confidence);
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("mean " + labels.named(variable), WaveEstimates.Estimator.MEAN, unit,
                null, List.of(now), List.of(new WaveEstimates.Estimate(null, mu, mu, mu)));
        Change change = new Change("mean " + labels.named(variable) + " against its reference", mu, now.value(), false, unit,
                md.difference(), md.ciLow(), md.ciHigh(), "the first value is the reference");
        return new Comparison(variable, FindingKind.REFERENCE, md.test(), raw, t, source, 0, current.n(), change,
                new ReferenceDetail(mu, now.value(), raw, plot));
    }

    /**
     * One wave against reference shares: the chi-square goodness-of-fit test with Cohen's w (noncentral
     * chi-square interval); answers not listed share the remaining proportion. The sentence reports the category
     * furthest from its reference share, with its Wilson interval shifted by the reference.
     */
    public Comparison referenceShares(String variable, CategoryCounts current, java.util.Map<String, Double> shares,
                                      Threshold configured) {
        List<String> cats = new ArrayList<>(shares.keySet());
        double listed = shares.values().stream().mapToDouble(Double::doubleValue).sum();
        long[] observed = new long[cats.size() + (listed < 1 - 1e-9 ? 1 : 0)];
        double[] expected = new double[observed.length];
        for (int i = 0; i < cats.size(); i++) {
            observed[i] = current.count(cats.get(i));
            expected[i] = shares.get(cats.get(i));
        }
        long other = current.n() - java.util.Arrays.stream(observed).sum();
        if (observed.length > cats.size()) {
            observed[cats.size()] = other;
            expected[cats.size()] = 1 - listed;
        }
        TestResult gof = org.wavewarden.compare.categorical.ChiSquareGoodnessOfFit.test(observed, expected);
        EffectSize w = org.wavewarden.compare.categorical.ChiSquareGoodnessOfFit.cohensW(observed, expected, confidence);
        int worst = 0;
        long n = current.n();
        for (int i = 1; i < cats.size(); i++) {
            if (Math.abs((double) observed[i] / n - expected[i]) > Math.abs((double) observed[worst] / n - expected[worst])) {
                worst = i;
            }
        }
        var wilson = org.wavewarden.compare.proportion.WilsonInterval.of(observed[worst], n, confidence);
        List<WaveEstimates.Estimate> now = new ArrayList<>();
        List<WaveEstimates.Estimate> references = new ArrayList<>();
        for (int i : namedFirst(worst, cats.size())) {
            now.add(WaveEstimates.share(cats.get(i), observed[i], n, confidence).labelled(labels));
            references.add(new WaveEstimates.Estimate(cats.get(i), labels.label(cats.get(i)), expected[i],
                    expected[i], expected[i]));
        }
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("share answering " + labels.quoted(cats.get(worst)),
                WaveEstimates.Estimator.SHARE, null, null, now, references);
        double share = now.get(0).value();
        Thresholds.Resolved t = Thresholds.resolve(configured, w.name(), Thresholds.CRAMERS_V, null);
        Change change = new Change("share answering " + labels.quoted(cats.get(worst)) + " against its reference",
                expected[worst],
                share, true, null, share - expected[worst], wilson.lower() - expected[worst],
                wilson.upper() - expected[worst], "the first value is the reference");
        return new Comparison(variable, FindingKind.REFERENCE, gof, w, t.value(), t.source(), 0, n, change,
                new ReferenceDetail(expected[worst], share, new EffectSize("difference from the reference share",
                        share - expected[worst], wilson.lower() - expected[worst], wilson.upper() - expected[worst],
                        confidence), plot));
    }

    /**
     * Categorical variables: Pearson's chi-square of homogeneity with Cramér's V; when Cochran's rule fails,
     * Fisher's exact test (2 x 2) or a seeded Monte Carlo exact p-value (larger tables) replaces its p-value.
     */
    public Comparison categorical(String variable, CategoryCounts baseline, CategoryCounts current,
                                  Threshold configured) {
        List<String> order = baseline.unionOrder(current);
        long[] b = baseline.alignedTo(order);
        long[] c = current.alignedTo(order);
        long[][] table = {b, c};
        ChiSquareResult chi = ChiSquareHomogeneity.test(b, c);
        TestResult primary = chi.test();
        String note = "Pearson chi-square";
        if (!chi.cochranSatisfied()) {
            if (chi.keptColumns().length == 2) {
                int i = chi.keptColumns()[0];
                int j = chi.keptColumns()[1];
                primary = FisherExact.twoByTwo(b[i], b[j], c[i], c[j]);
                note = "Fisher's exact test, since " + chi.cochranNote();
            } else {
                int replicates = monteCarloReplicates(2L * chi.keptColumns().length);
                if (replicates > 0) {
                    primary = MonteCarloExactTest.test(table, replicates, MONTE_CARLO_SEED);
                    note = "Monte Carlo exact p-value (" + replicates + " tables, fixed seed), since "
                            + chi.cochranNote();
                } else {
                    note = "Pearson chi-square approximation, since a Monte Carlo p-value over "
                            + chi.keptColumns().length + " categories would exceed its budget of "
                            + MONTE_CARLO_BUDGET + " drawn cells; " + chi.cochranNote();
                }
            }
        }
        EffectSize v = CramersV.estimate(table, confidence);
        long nB = baseline.n();
        long nC = current.n();
        List<CategoryRow> rows = new ArrayList<>();
        double[][] res = chi.adjustedResiduals();
        int[] kept = chi.keptColumns();
        int top = -1;
        for (int k = 0; k < kept.length; k++) {
            int col = kept[k];
            double r = res[1][k];
            rows.add(new CategoryRow(order.get(col), labels.label(order.get(col)), b[col], c[col], (double) b[col] / nB,
                    (double) c[col] / nC, r));
            if (top < 0 || Math.abs(r) > Math.abs(rows.get(top).adjustedResidual())) {
                top = rows.size() - 1;
            }
        }
        CategoryRow moved = rows.get(top);
        Thresholds.Resolved t = Thresholds.resolve(configured, v.name(), Thresholds.CRAMERS_V, null);
        // The share of the category that moved most, with Newcombe's interval, is what the sentence reports; with
        // a threshold in percentage points it is also the effect the verdict is judged on.
        TwoProportionResult share = TwoProportionZTest.test(moved.countBaseline(), nB, moved.countCurrent(), nC,
                confidence);
        double lo = share.riskDifference().ciLow();
        double hi = share.riskDifference().ciHigh();
        EffectSize effect = t.rawScale()
                ? new EffectSize("share difference of '" + moved.category() + "'", share.riskDifference().estimate(),
                lo, hi, confidence)
                : v;
        List<WaveEstimates.Estimate> plotB = new ArrayList<>();
        List<WaveEstimates.Estimate> plotC = new ArrayList<>();
        for (int col : namedFirst(order.indexOf(moved.category()), order.size())) {
            plotB.add(WaveEstimates.share(order.get(col), b[col], nB, confidence).labelled(labels));
            plotC.add(WaveEstimates.share(order.get(col), c[col], nC, confidence).labelled(labels));
        }
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("share answering " + labels.quoted(moved.category()),
                WaveEstimates.Estimator.SHARE, null, plotB, plotC, null);
        Change change = new Change("share answering " + labels.quoted(moved.category()), plotB.get(0).value(),
                plotC.get(0).value(), true, null, share.riskDifference().estimate(), lo, hi, "the category that moved most (adjusted residual "
                + signed(moved.adjustedResidual(), 1) + ")");
        CategoryDetail d = new CategoryDetail(rows, chi.cochranSatisfied(), chi.cochranNote(),
                CramersV.biasCorrected(table), JensenShannon.distance(b, c), note, share.riskDifference(), plot);
        return new Comparison(variable, FindingKind.SHIFT, primary, effect, t.value(), t.source(), nB, nC, change, d);
    }

    /**
     * Replicates of the Monte Carlo test for a table of {@code cells} cells within {@link #MONTE_CARLO_BUDGET}, or 0
     * when even {@link #MONTE_CARLO_MIN_REPLICATES} would exceed it.
     */
    static int monteCarloReplicates(long cells) {
        long affordable = MONTE_CARLO_BUDGET / Math.max(1, cells);
        return affordable >= MONTE_CARLO_REPLICATES ? MONTE_CARLO_REPLICATES
                : affordable >= MONTE_CARLO_MIN_REPLICATES ? (int) affordable : 0;
    }

    /**
     * Binary variables (and missing rates): the two-proportion z-test with Cohen's h and the risk difference
     * (Newcombe's hybrid score interval); Fisher's exact test when an expected count is below 5.
     */
    public Comparison proportion(String variable, FindingKind kind, String successLabel, long sB, long nB, long sC,
                                 long nC, Threshold configured) {
        TwoProportionResult z = TwoProportionZTest.test(sB, nB, sC, nC, confidence);
        EffectSize h = CohensH.estimate(sB, nB, sC, nC, confidence);
        TestResult primary = z.test();
        String note = "two-proportion z-test";
        double pooled = (double) (sB + sC) / (nB + nC);
        double minExpected = Math.min(Math.min(nB, nC) * pooled, Math.min(nB, nC) * (1 - pooled));
        if (minExpected < 5) {
            primary = FisherExact.twoByTwo(sB, nB - sB, sC, nC - sC);
            note = "Fisher's exact test, since an expected count is below 5";
        }
        Thresholds.Resolved t = Thresholds.resolve(configured, h.name(), Thresholds.COHENS_H, null);
        EffectSize rd = z.riskDifference();
        String category = categoryOf(successLabel);
        String shown = shownSuccess(successLabel, labels);
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("share " + shown, WaveEstimates.Estimator.SHARE,
                null, List.of(WaveEstimates.share(category, sB, nB, confidence).labelled(labels)),
                List.of(WaveEstimates.share(category, sC, nC, confidence).labelled(labels)), null);
        ProportionDetail d = new ProportionDetail(successLabel, z.proportionBaseline(), z.proportionCurrent(), rd, h,
                note, plot);
        Change change = new Change("share " + shown, plot.baseline().get(0).value(),
                plot.current().get(0).value(), true, null, rd.estimate(), rd.ciLow(), rd.ciHigh(), "");
        return new Comparison(variable, kind, primary, t.rawScale() ? rd : h, t.value(), t.source(), nB, nC, change, d);
    }

    /** The value, or null when the data do not allow the method (it throws IllegalArgumentException). */
    private static <T> T orNull(java.util.function.Supplier<T> method) {
        try {
            return method.get();
        } catch (IllegalArgumentException e) {
            return null;
        }
    }

    /** Positions 0 .. size - 1 with {@code first} moved to the front: the category a sentence names is drawn first. */
    static int[] namedFirst(int first, int size) {
        int[] out = new int[size];
        out[0] = first;
        for (int i = 0, k = 1; i < size; i++) {
            if (i != first) {
                out[k++] = i;
            }
        }
        return out;
    }

    static String signed(double v, int digits) {
        return (v >= 0 ? "+" : "") + String.format(java.util.Locale.ROOT, "%." + digits + "f", v);
    }
}
