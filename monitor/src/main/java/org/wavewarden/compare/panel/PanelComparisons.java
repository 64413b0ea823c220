package org.wavewarden.compare.panel;

import org.wavewarden.compare.Change;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.Thresholds;
import org.wavewarden.compare.WaveEstimates;
import org.wavewarden.compare.location.CohensDz;
import org.wavewarden.compare.location.MeanDifference;
import org.wavewarden.compare.location.PairedTTest;
import org.wavewarden.compare.location.PairedTestChoice;
import org.wavewarden.compare.proportion.McNemarTest;
import org.wavewarden.compare.proportion.PairedProportions;
import org.wavewarden.compare.rank.MedianInterval;
import org.wavewarden.compare.rank.RankBiserial;
import org.wavewarden.compare.rank.SignedRankResult;
import org.wavewarden.compare.rank.WilcoxonSignedRankTest;
import org.wavewarden.config.Threshold;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.compare.panel.PairedPanel.BinaryPairs;
import org.wavewarden.compare.panel.PairedPanel.CategoricalPairs;
import org.wavewarden.compare.panel.PairedPanel.NumericPairs;
import org.wavewarden.compare.panel.PairedPanel.Panel;
import org.wavewarden.compare.panel.PairedPanel.VariablePairs;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.Function;
import java.util.stream.Collectors;

/**
 * Turns a panel's paired summaries ({@link PanelPairs}) into comparisons of kind
 * {@link FindingKind#PANEL_SHIFT}, without the database. They join the two-sample comparisons of the wave in one
 * false-discovery-rate family and are judged by the same verdict rule.
 *
 * <ul>
 *   <li>Continuous: the paired t test or the Wilcoxon signed-rank test, as {@link PairedTestChoice} decides on the
 *       differences; ordinal: always the signed-rank test (rank methods, as for two waves). After the paired t the
 *       effect is Cohen's d_z (default T 0.2, Cohen 1988), or with a raw-unit threshold the mean paired difference
 *       with its t interval; after the signed-rank test it is the matched-pairs rank-biserial r (Kerby 2014; default
 *       T 0.1, Cohen's (1988) small correlation, applied to r by common practice, no source), or with a raw-unit
 *       threshold the median paired difference with its sign-test interval. (The one-sample Hodges-Lehmann
 *       estimate, the median of the Walsh averages, would match the signed-rank test more closely; it needs a
 *       selection over n(n + 1)/2 averages that is not implemented.)</li>
 *   <li>Binary: McNemar's test without continuity correction, which Fagerland, Lydersen and Laake (2013, BMC
 *       Medical Research Methodology 13:91) recommend over the corrected and the exact conditional forms, and which
 *       is Stuart-Maxwell's test for two categories, so binary and categorical panels agree; the corrected X2 is in
 *       the detail. Effect: Cohen's h of the two shares with an interval for paired data (default T 0.2), or with a
 *       threshold in points the paired share difference with Newcombe's (1998) method 10 interval.</li>
 *   <li>Categorical: the Stuart-Maxwell test of marginal homogeneity; effect, the share that moved most with its
 *       paired Wald interval ({@link StuartMaxwellTest}), against the configured points threshold or 5 percentage
 *       points (common practice, no source); the churn table of who moved from which answer to which is in the
 *       detail, its largest flow in the sentence.</li>
 * </ul>
 * Every finding says how many respondents were paired, how many pairs were left out for an invalid answer, and how
 * many respondents were in one wave only.
 */
public final class PanelComparisons {

    /** Default T for the matched-pairs rank-biserial r: common practice, no source. */
    public static final double RANK_BISERIAL = 0.1;
    /** Default T for the paired share change of a categorical variable, in points: common practice, no source. */
    public static final double SHARE_POINTS = 5;
    /** Flows of the churn table kept in a finding's detail. */
    public static final int FLOWS_SHOWN = 10;

    static final String METHOD_NOTE = "each respondent counts once (unweighted)";

    private PanelComparisons() {
    }

    /** The comparisons, and a note for each variable that could not be compared paired. */
    public record Result(List<Comparison> comparisons, List<String> notes) {
        public Result {
            comparisons = List.copyOf(comparisons);
            notes = List.copyOf(notes);
        }
    }

    /**
     * What a paired finding carries besides its test and effect.
     *
     * @param method        the primary test and, for numbers, why it was chosen
     * @param pairs         respondents in both waves with a valid answer in each
     * @param pairsLeftOut  respondents in both waves left out for a NULL or excluded answer in either
     * @param onlyBaseline  respondents in the baseline wave only
     * @param onlyCurrent   respondents in the judged wave only
     * @param unmatchedRows rows of either wave whose respondent key is NULL or repeated, matched to no one
     * @param weighting     how respondents are counted
     * @param paired        the kind-specific detail
     * @param plot          what the finding's picture draws: the paired respondents' answers in each wave on their
     *                      own (the margins the sentence states), each with its interval
     */
    public record PanelDetail(String method, long pairs, long pairsLeftOut, long onlyBaseline, long onlyCurrent,
                              long unmatchedRows, String weighting, Object paired, WaveEstimates.Plotted plot) {
    }

    /** The paired differences of a number. */
    public record NumericDetail(double meanBaseline, double meanCurrent, double meanDifference, double sdDifference,
                                EffectSize meanDifferenceInterval, EffectSize cohensDz, EffectSize medianDifference,
                                EffectSize rankBiserial, Double signedRankZ, Boolean signedRankExact,
                                double differencesRelativeError) {
    }

    /** The paired 2 x 2 table of a binary answer. */
    public record BinaryDetail(String successValue, long bothYes, long yesNo, long noYes, long bothNo,
                               double shareBaseline, double shareCurrent, EffectSize riskDifference,
                               EffectSize cohensH, double continuityCorrectedStatistic,
                               double continuityCorrectedPValue) {
    }

    /** A category's share among the paired respondents at both waves, with its value label (null: none). */
    public record ShareRow(String category, String label, double shareBaseline, double shareCurrent) {
    }

    /**
     * The churn of a categorical answer.
     *
     * @param churn        rows the baseline answer, columns the judged wave's, in {@code categories} order
     * @param largestFlows up to {@value #FLOWS_SHOWN} flows between different answers, largest first
     * @param stayerShare  share of the paired respondents who gave the same answer at both waves
     * @param droppedNote  categories left out of the Stuart-Maxwell statistic, and why; empty when none
     */
    public record CategoricalDetail(List<ShareRow> categories, long[][] churn, List<ChurnTable.Flow> largestFlows,
                                    long stayers, long movers, double stayerShare, String droppedNote) {
    }

    /**
     * @param panel      the paired summaries
     * @param variables  the dataset's variables (declared and inferred), for kinds, thresholds and units
     * @param confidence level of every interval, in (0, 1)
     */
    public static Result compare(Panel panel, List<VariableConfig> variables, double confidence) {
        List<Comparison> out = new ArrayList<>();
        List<String> notes = new ArrayList<>(panel.notes());
        Map<String, VariableConfig> byName = variables.stream()
                .collect(Collectors.toMap(VariableConfig::name, Function.identity(), (a, b) -> a));
        for (VariablePairs p : panel.variables()) {
            VariableConfig v = byName.get(p.variable());
            if (v == null) {
                continue;
            }
            try {
                String why = p instanceof NumericPairs n ? numeric(panel, v, n, confidence, out)
                        : p instanceof BinaryPairs b ? binary(panel, v, b, confidence, out)
                        : categorical(panel, v, (CategoricalPairs) p, confidence, out);
                if (why != null) {
                    notes.add(v.name() + ": not compared paired: " + why);
                }
            } catch (RuntimeException e) {
                // As for two waves: a value no method foresaw costs one variable its comparison, never the run.
                notes.add(v.name() + ": not compared paired: the pairs could not be analysed ("
                        + e.getClass().getSimpleName() + ": " + String.valueOf(e.getMessage()).lines().findFirst()
                        .orElse("") + ")");
            }
        }
        return new Result(out, notes);
    }

    private static String numeric(Panel panel, VariableConfig v, NumericPairs p, double confidence,
                                  List<Comparison> out) {
        long n = p.pairs();
        if (n < 2) {
            return "fewer than 2 respondents with a valid answer in both waves (" + n + ")";
        }
        if (!(p.sdDifference() > 0)) {
            return p.meanDifference() == 0 ? "no respondent's answer changed (" + n + " pairs)"
                    : "every respondent's answer changed by the same amount (" + fmt(p.meanDifference()) + ")";
        }
        boolean ordinal = v.kind() == VariableKind.ORDINAL;
        PairedTestChoice.Choice choice = ordinal
                ? new PairedTestChoice.Choice(PairedTestChoice.PairedTest.SIGNED_RANK, "ordinal scale: rank methods")
                : PairedTestChoice.choose(p.differences());
        MeanDifference md = PairedTTest.ofDifferences(n, p.meanDifference(), p.sdDifference(), p.meanBaseline(),
                p.meanCurrent(), confidence);
        EffectSize meanDiff = new EffectSize("mean paired difference", md.difference(), md.ciLow(), md.ciHigh(),
                confidence);
        EffectSize dz = CohensDz.estimate(n, p.meanDifference(), p.sdDifference(), confidence);
        EffectSize median = MedianInterval.of(p.differences(), confidence);
        // Differences with spread include a non-zero one, so the rank-biserial r is defined.
        EffectSize rb = RankBiserial.estimate(p.differences(), confidence);
        double error = p.binning().relativeError();
        String measure = "mean " + v.name() + " of the respondents in both waves";
        TestResult test;
        EffectSize effect;
        Thresholds.Resolved t;
        Change change;
        SignedRankResult sr = null;
        String binned = error > 0 ? String.format(Locale.ROOT, "; the differences were summarised in bins, each"
                + " within %.2g%% of its value, for the ranks (the means and the t test are exact)", 100 * error) : "";
        if (choice.test() == PairedTestChoice.PairedTest.PAIRED_T) {
            test = md.test();
            t = Thresholds.resolve(v.threshold(), CohensDz.NAME, Thresholds.HEDGES_G, v.unit());
            effect = t.rawScale() ? meanDiff : dz;
            // The mean of the differences is the difference of the means; stated as such it reads as a plain change.
            change = new Change(measure, p.meanBaseline(), p.meanCurrent(), false, v.unit(),
                    p.meanCurrent() - p.meanBaseline(), md.ciLow(), md.ciHigh(), pairing(panel, p) + binned);
        } else {
            sr = WilcoxonSignedRankTest.oneSample(p.differences(), 0.0);
            test = sr.test();
            t = Thresholds.resolve(v.threshold(), RankBiserial.NAME, RANK_BISERIAL, v.unit());
            effect = t.rawScale() ? median : rb;
            change = new Change(measure, p.meanBaseline(), p.meanCurrent(), false, v.unit(), median.estimate(),
                    median.ciLow(), median.ciHigh(), "the shift is the median of the respondents' own changes; "
                    + pairing(panel, p) + binned);
        }
        NumericDetail nd = new NumericDetail(p.meanBaseline(), p.meanCurrent(), p.meanDifference(), p.sdDifference(),
                meanDiff, dz, median, rb, sr == null ? null : sr.z(), sr == null ? null : sr.exact(), error);
        // Each wave's mean of the same respondents with its own t interval: the margins the sentence states. The
        // interval of their difference, which uses the pairing, is the sentence's; these two ignore it.
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted(measure, WaveEstimates.Estimator.MEAN, v.unit(),
                List.of(WaveEstimates.mean(n, p.meanBaseline(), p.sdBaseline(), confidence)),
                List.of(WaveEstimates.mean(n, p.meanCurrent(), p.sdCurrent(), confidence)), null);
        out.add(new Comparison(v.name(), FindingKind.PANEL_SHIFT, test, effect, t.value(), t.source(), n, n, change,
                detail(panel, p, test.test() + ": " + choice.reason(), nd, plot)));
        return null;
    }

    private static String binary(Panel panel, VariableConfig v, BinaryPairs p, double confidence,
                                 List<Comparison> out) {
        long n = p.pairs();
        if (n < 2) {
            return "fewer than 2 respondents with a valid answer in both waves (" + n + ")";
        }
        TestResult test = McNemarTest.test(p.bothYes(), p.yesNo(), p.noYes(), p.bothNo(), false);
        TestResult corrected = McNemarTest.test(p.bothYes(), p.yesNo(), p.noYes(), p.bothNo(), true);
        EffectSize rd = PairedProportions.riskDifference(p.bothYes(), p.yesNo(), p.noYes(), p.bothNo(), confidence);
        EffectSize h = PairedProportions.cohensH(p.bothYes(), p.yesNo(), p.noYes(), p.bothNo(), confidence);
        Thresholds.Resolved t = Thresholds.resolve(v.threshold(), h.name(), Thresholds.COHENS_H, null);
        double pB = (double) (p.bothYes() + p.yesNo()) / n;
        double pC = (double) (p.bothYes() + p.noYes()) / n;
        org.wavewarden.codebook.CodeLabels labels = org.wavewarden.codebook.CodeLabels.of(v);
        Change change = new Change("share answering " + labels.quoted(p.successValue())
                + " among the respondents in both waves",
                pB, pC, true, null, pC - pB, rd.ciLow(), rd.ciHigh(), String.format(Locale.ROOT,
                "%,d moved to it, %,d away from it; ", p.noYes(), p.yesNo()) + pairing(panel, p));
        BinaryDetail bd = new BinaryDetail(p.successValue(), p.bothYes(), p.yesNo(), p.noYes(), p.bothNo(), pB, pC,
                rd, h, corrected.statistic(), corrected.pValue());
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted(change.measure(), WaveEstimates.Estimator.SHARE, null,
                List.of(WaveEstimates.share(p.successValue(), p.bothYes() + p.yesNo(), n, confidence)
                        .labelled(labels)),
                List.of(WaveEstimates.share(p.successValue(), p.bothYes() + p.noYes(), n, confidence)
                        .labelled(labels)), null);
        out.add(new Comparison(v.name(), FindingKind.PANEL_SHIFT, test, t.rawScale() ? rd : h, t.value(),
                t.source(), n, n, change, detail(panel, p, "McNemar test without continuity correction", bd,
                plot)));
        return null;
    }

    private static String categorical(Panel panel, VariableConfig v, CategoricalPairs p, double confidence,
                                      List<Comparison> out) {
        long n = p.pairs();
        if (n < 2) {
            return "fewer than 2 respondents with a valid answer in both waves (" + n + ")";
        }
        if (p.labels().size() < 2) {
            return "a single category";
        }
        long[][] table = p.counts();
        org.wavewarden.codebook.CodeLabels labels = org.wavewarden.codebook.CodeLabels.of(v);
        StuartMaxwellResult sm = StuartMaxwellTest.test(table, confidence);
        ChurnTable churn = new ChurnTable(p.labels(), table);
        int top = sm.largestShiftCategory();
        String category = p.labels().get(top);
        EffectSize points = sm.largestShift();
        EffectSize effect = new EffectSize("paired share difference of '" + category + "'", points.estimate() / 100,
                points.ciLow() / 100, points.ciHigh() / 100, confidence);
        Threshold configured = v.threshold();
        Thresholds.Resolved t;
        if (configured != null && configured.points() != null) {
            t = Thresholds.resolve(configured, effect.name(), SHARE_POINTS / 100, null);
        } else {
            t = new Thresholds.Resolved(SHARE_POINTS / 100, "default " + (int) SHARE_POINTS + " percentage points for"
                    + " the paired share difference (common practice, no source)" + (configured == null ? ""
                    : "; the configured effect-scale threshold is for Cramér's V, which a paired comparison does not"
                    + " use"), true);
        }
        double[] before = sm.sharesBefore();
        double[] after = sm.sharesAfter();
        List<ShareRow> rows = new ArrayList<>();
        for (int i = 0; i < before.length; i++) {
            rows.add(new ShareRow(p.labels().get(i), labels.label(p.labels().get(i)), before[i], after[i]));
        }
        List<ChurnTable.Flow> flows = churn.largestFlows(FLOWS_SHOWN);
        String flow = flows.isEmpty() ? "nobody changed answer" : String.format(Locale.ROOT, "largest flow: %,d"
                        + " moved from %s to %s (%.1f%% of %s)", flows.get(0).count(), labels.quoted(flows.get(0).from()),
                labels.quoted(flows.get(0).to()), 100 * flows.get(0).shareOfFrom(), labels.quoted(flows.get(0).from()));
        Change change = new Change("share answering " + labels.quoted(category) + " among the respondents in both waves",
                before[top], after[top], true, null, after[top] - before[top], effect.ciLow(), effect.ciHigh(),
                "the category whose share moved most; " + flow + "; " + pairing(panel, p));
        CategoricalDetail cd = new CategoricalDetail(rows, table, flows, churn.stayers(), churn.movers(),
                churn.stayerShare(), sm.droppedNote());
        // The category the sentence names first, then the others in table order; margins of the paired table.
        List<WaveEstimates.Estimate> shareB = new ArrayList<>();
        List<WaveEstimates.Estimate> shareC = new ArrayList<>();
        for (int k = -1; k < table.length; k++) {
            int i = k < 0 ? top : k;
            if (k >= 0 && i == top) {
                continue;
            }
            long row = 0;
            long col = 0;
            for (int j = 0; j < table.length; j++) {
                row += table[i][j];
                col += table[j][i];
            }
            shareB.add(WaveEstimates.share(p.labels().get(i), row, n, confidence).labelled(labels));
            shareC.add(WaveEstimates.share(p.labels().get(i), col, n, confidence).labelled(labels));
        }
        WaveEstimates.Plotted plot = new WaveEstimates.Plotted("share answering each category among the respondents"
                + " in both waves", WaveEstimates.Estimator.SHARE, null, shareB, shareC, null);
        out.add(new Comparison(v.name(), FindingKind.PANEL_SHIFT, sm.test(), effect, t.value(), t.source(), n, n,
                change, detail(panel, p, "Stuart-Maxwell test of marginal homogeneity", cd, plot)));
        return null;
    }

    private static PanelDetail detail(Panel panel, VariablePairs p, String method, Object paired,
                                      WaveEstimates.Plotted plot) {
        return new PanelDetail(method, p.pairs(), p.leftOut(), panel.onlyBaseline(), panel.onlyCurrent(),
                panel.unmatchedRows(true) + panel.unmatchedRows(false), METHOD_NOTE, paired, plot);
    }

    /** "10 respondents paired, 1 more in both waves left out ...; 3 only in wave w1, 2 only in wave w2". */
    static String pairing(Panel panel, VariablePairs p) {
        StringBuilder s = new StringBuilder(String.format(Locale.ROOT, "%,d respondent%s paired", p.pairs(),
                p.pairs() == 1 ? "" : "s"));
        if (p.leftOut() > 0) {
            s.append(String.format(Locale.ROOT, ", %,d more in both waves left out for a missing or excluded"
                    + " answer", p.leftOut()));
        }
        s.append(String.format(Locale.ROOT, "; %,d only in wave %s, %,d only in wave %s", panel.onlyBaseline(),
                panel.baselineWave(), panel.onlyCurrent(), panel.currentWave()));
        long unmatched = panel.unmatchedRows(true) + panel.unmatchedRows(false);
        if (unmatched > 0) {
            s.append(String.format(Locale.ROOT, "; %,d row%s with a missing or repeated respondent key matched to"
                    + " no one", unmatched, unmatched == 1 ? "" : "s"));
        }
        return s.toString();
    }

    private static String fmt(double x) {
        return String.format(Locale.ROOT, "%.4g", x);
    }
}
