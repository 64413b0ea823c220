package org.wavewarden.judge;

import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The rules that turn one run's comparisons into the findings a reader gets: every comparison of the run (the
 * variables', the relationships', the panel's) is one false-discovery-rate family, judged by {@link Judge}; then
 * one missing-rate finding per variable, shape findings only where the location test is quiet, and the bound on
 * the numbers of a summarised variable in its sentence.
 */
public final class WaveVerdicts {

    private WaveVerdicts() {
    }

    /**
     * The run's findings from its comparisons, all in one false-discovery-rate family.
     *
     * @param comparisons  every comparison of the run; each one counts in the family, kept as a finding or not
     * @param relativeError per summarised variable, the relative error bound of its binned values
     */
    public static List<Finding> judge(List<Comparison> comparisons, Map<String, Double> relativeError, double alpha,
                                      WardenConfig.FdrMethod fdr) {
        return judge(comparisons, relativeError, alpha, fdr, org.wavewarden.config.Population.SAMPLE);
    }

    /**
     * The same for a dataset observing {@code population}: a complete enumeration's comparisons are judged by size
     * ({@link Judge#bySize}) and form no false-discovery-rate family.
     */
    public static List<Finding> judge(List<Comparison> comparisons, Map<String, Double> relativeError, double alpha,
                                      WardenConfig.FdrMethod fdr, org.wavewarden.config.Population population) {
        return withSummaryError(MissingRateContext.apply(shapeOnlyWhereLocationIsQuiet(onePerVariableAndKind(
                Judge.judge(comparisons, alpha, fdr, population)))), relativeError);
    }

    /**
     * The findings of several baselines' comparisons judged alongside each other: every comparison of every group
     * in ONE false-discovery-rate family (the family counts them all, so judging a wave against a second baseline
     * costs each test its share of the error rate), then each group's findings made by the rules of
     * {@link #judge} on their own, since one missing-rate finding per variable and a shape finding beside its
     * location finding are rules about one pair of waves.
     *
     * @param groups        per baseline, its comparisons
     * @param relativeError per baseline, the relative error bound of each summarised variable
     * @return per baseline, its findings
     */
    public static List<List<Finding>> judgeAlongside(List<List<Comparison>> groups,
                                                     List<Map<String, Double>> relativeError, double alpha,
                                                     WardenConfig.FdrMethod fdr,
                                                     org.wavewarden.config.Population population) {
        List<Comparison> all = new ArrayList<>();
        groups.forEach(all::addAll);
        // Judge keeps the order of the comparisons it is given, one finding each, so the family splits back by size.
        List<Finding> judged = Judge.judge(all, alpha, fdr, population);
        List<List<Finding>> out = new ArrayList<>(groups.size());
        int from = 0;
        for (int g = 0; g < groups.size(); g++) {
            int to = from + groups.get(g).size();
            out.add(withSummaryError(MissingRateContext.apply(shapeOnlyWhereLocationIsQuiet(onePerVariableAndKind(
                    judged.subList(from, to)))), relativeError.get(g)));
            from = to;
        }
        return out;
    }

    /** Findings in reading order: most urgent verdict first, then by size relative to threshold, variable, kind. */
    public static List<Finding> ordered(List<Finding> findings) {
        return findings.stream().sorted(Comparator.comparingDouble(Finding::urgency)
                .thenComparing(Finding::variable).thenComparing(f -> f.kind().name())).toList();
    }

    /**
     * The missing rate of one reason, as the detail of the variable's MISSING_RATE_CHANGE finding lists it. In a
     * complete enumeration p and q are null and the difference's interval is the difference itself.
     */
    public record ReasonRate(String reason, double shareBaseline, double shareCurrent,
                             org.wavewarden.compare.EffectSize difference, Double pValue, Double qValue,
                             String verdict, String sentence, org.wavewarden.compare.WaveEstimates.Estimate baseline,
                             org.wavewarden.compare.WaveEstimates.Estimate current) {
    }

    /**
     * Every missing reason of a variable is tested (and counted by the false-discovery-rate control), but a reader
     * gets one MISSING_RATE_CHANGE finding per variable: the most urgent reason, with every reason in its detail.
     * This keeps the alert key (dataset, wave, against, variable, kind) one row per variable.
     *
     * <p>A reason whose share fell to none this wave is CLEARED ({@link #clearedIfGone}), so the variable's finding
     * is the most urgent reason still present, and only when every reason that moved is gone is the finding itself
     * CLEARED.
     */
    public static List<Finding> onePerVariableAndKind(List<Finding> judged) {
        Map<String, List<Finding>> rates = new LinkedHashMap<>();
        List<Finding> out = new ArrayList<>();
        for (Finding f : judged) {
            if (f.kind() == FindingKind.MISSING_RATE_CHANGE) {
                rates.computeIfAbsent(f.variable(), k -> new ArrayList<>()).add(clearedIfGone(f));
            } else {
                out.add(f);
            }
        }
        rates.forEach((variable, list) -> {
            List<Finding> ranked = ordered(list);
            Finding top = ranked.get(0);
            List<ReasonRate> detail = ranked.stream().map(f -> {
                var d = (VariableComparator.ProportionDetail) f.detail();
                // Judged by size (no test), the detail's intervals are already collapsed (Judge.bySize).
                return new ReasonRate(d.successValue().replaceFirst("^missing \\((.*)\\)$", "$1"), d.shareBaseline(),
                        d.shareCurrent(), d.riskDifference(), f.pValue(), f.qValue(), f.verdict().name(),
                        f.sentence(), d.plot().baseline().get(0), d.plot().current().get(0));
            }).toList();
            out.add(top.withDetail(detail));
        });
        return out;
    }

    /**
     * A missing reason (SQL NULL, a declared missing code, a blank, a sentinel the detector found) whose share fell
     * from some to none is good news: CLEARED with a sentence that says so, whatever the size of the fall, so that
     * the reason's disappearance is never alerted as a MATERIAL change. A rise from none, and any change that leaves
     * some rows with the reason, keep their verdict. Shares of ordinary categories are not missing reasons and never
     * come here.
     */
    static Finding clearedIfGone(Finding f) {
        if (f.kind() != FindingKind.MISSING_RATE_CHANGE || f.verdict() == null
                || !(f.detail() instanceof VariableComparator.ProportionDetail d)
                || !(d.shareCurrent() == 0 && d.shareBaseline() > 0)) {
            return f;
        }
        String measure = d.plot() == null ? "share " + d.successValue() : d.plot().statistic();
        return f.withVerdict(Verdict.CLEARED).withSentence(Sentences.cleared(measure, d.shareBaseline()));
    }

    /**
     * The KS test of every continuous variable is part of the run's false-discovery-rate family, but its finding is
     * kept only when it adds something: a MATERIAL change of shape where the location test found no change.
     */
    public static List<Finding> shapeOnlyWhereLocationIsQuiet(List<Finding> judged) {
        Map<String, Verdict> location = new LinkedHashMap<>();
        judged.stream().filter(f -> f.kind() == FindingKind.SHIFT).forEach(f -> location.put(f.variable(), f.verdict()));
        return judged.stream().filter(f -> f.kind() != FindingKind.SHAPE_CHANGE
                || (f.verdict() == Verdict.MATERIAL && (location.get(f.variable()) == Verdict.STABLE
                || location.get(f.variable()) == Verdict.UNCERTAIN))).toList();
    }

    /**
     * Says in each comparison of a summarised variable how far its numbers can be from the data: the bound holds
     * for every value, so for means, quantiles and shifts too (relative to their size).
     */
    public static List<Finding> withSummaryError(List<Finding> findings, Map<String, Double> relativeError) {
        List<Finding> out = new ArrayList<>(findings.size());
        for (Finding f : findings) {
            Double e = relativeError.get(f.variable());
            // Paired comparisons read the answers themselves and say so when they bin the differences.
            if (e == null || f.kind().isDataQuality() || f.kind() == FindingKind.PANEL_SHIFT) {
                out.add(f);
                continue;
            }
            String note = String.format(java.util.Locale.ROOT, " This variable has more distinct values than are"
                    + " counted exactly, so its values were summarised in bins: each stands within %.2g%% of its"
                    + " value, and so do the means, quantiles and shifts above.", 100 * e);
            out.add(f.withSentence(f.sentence() + note));
        }
        return out;
    }
}
