package org.wavewarden.pipeline;

import org.wavewarden.compare.relation.RelationshipDetail;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.html.AlertView;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.Trend;
import org.wavewarden.deliver.html.VariablePlot;
import org.wavewarden.deliver.html.WaveSection;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.WaveInfo;

import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * Builds the HTML digest of judged waves: for each alert, a plot drawn from both waves' screened answers (the
 * stored summaries, never the source) and a trend of the variable across every wave up to the judged one.
 */
public final class DigestAssembler {

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(DigestAssembler.class);

    private final Session session;
    private final Map<String, Optional<WaveProfile>> summaries = new HashMap<>();

    public DigestAssembler(Session session) {
        this.session = session;
    }

    public String html(DatasetConfig d, List<FindingsReport> reports, Instant generatedAt) {
        List<WaveInfo> listed = new WaveJudge(session, java.time.Clock.systemUTC()).waves(d);
        List<String> order = listed.stream().map(WaveInfo::wave).toList();
        List<WaveSection> sections = new ArrayList<>();
        for (FindingsReport r : reports) {
            WaveProfile current = summary(d, r.wave()).orElse(null);
            WaveProfile baseline = baseline(d, listed, r);
            List<AlertView> views = new ArrayList<>();
            for (org.wavewarden.deliver.Alert alert : org.wavewarden.deliver.Alerts.group(r.findings())) {
                Finding f = alert.lead();
                VariableConfig v = variable(d, current, f.variable());
                VariablePlot plot;
                Trend trend;
                try {
                    FaultPoints.hit(FaultPoints.PLOT_VARIABLE + f.variable());
                    plot = f.detail() instanceof RelationshipDetail rd ? correlations(rd)
                            : v == null || current == null ? null : plot(v, f, baseline, current);
                    trend = v == null ? null : trend(d, order, r.wave(), v, f, baseline, current);
                } catch (RuntimeException e) {
                    // One alert's chart must never cost the digest: the alert is shown with a note instead.
                    LOG.warn("the chart of {} ({}) in {} wave {} could not be prepared: {}", f.variable(), f.kind(),
                            d.name(), r.wave(), e.toString(), e);
                    plot = new VariablePlot.Unavailable(e.getClass().getSimpleName());
                    trend = null;
                }
                views.add(new AlertView(alert, plot, trend));
            }
            sections.add(new WaveSection(r, views));
        }
        return HtmlDigest.render(d.name(), sections, generatedAt);
    }

    private Optional<WaveProfile> summary(DatasetConfig d, String wave) {
        return summaries.computeIfAbsent(wave, w -> session.store().latestSummary(d.name(), w)
                .map(s -> s.profile()));
    }

    private WaveProfile baseline(DatasetConfig d, List<WaveInfo> listed, FindingsReport r) {
        List<String> order = listed.stream().map(WaveInfo::wave).toList();
        if (r.againstWave() == null || !order.contains(r.wave())) {
            return null;
        }
        List<String> waves = order.contains(r.againstWave()) ? List.of(r.againstWave())
                : WaveJudge.baselinesWithRows(d, listed, r.wave(), null);
        List<WaveProfile> profiles = waves.stream().map(w -> summary(d, w)).flatMap(Optional::stream).toList();
        return profiles.isEmpty() ? null : profiles.size() == 1 ? profiles.get(0)
                : WaveProfile.pooled(r.againstWave(), profiles);
    }

    private static VariableConfig variable(DatasetConfig d, WaveProfile current, String name) {
        Optional<VariableConfig> declared = d.variables().stream().filter(v -> v.name().equals(name)).findFirst();
        if (declared.isPresent()) {
            return declared.get();
        }
        if (current == null || !current.columns().containsKey(name)) {
            return null;
        }
        return VariableInference.infer(current.columns().get(name)).variable();
    }

    /** A relationship alert's plot: both waves' Spearman rho and Pearson r with their intervals. */
    static VariablePlot correlations(RelationshipDetail d) {
        return new VariablePlot.CorrelationPlot(List.of("Spearman rho", "Pearson r"),
                new double[][] {row(d.spearmanBaseline()), row(d.pearsonBaseline())},
                new double[][] {row(d.spearmanCurrent()), row(d.pearsonCurrent())});
    }

    private static double[] row(org.wavewarden.compare.relation.CorrelationResult r) {
        return new double[] {r.estimate(), r.ciLow(), r.ciHigh()};
    }

    static VariablePlot plot(VariableConfig v, Finding f, WaveProfile baseline, WaveProfile current) {
        ColumnTally ct = current.columns().get(v.name());
        if (ct == null) {
            return null;
        }
        ScreenedVariable c = VariableScreen.screen(ct, v);
        ColumnTally bt = baseline == null ? null : baseline.columns().get(v.name());
        ScreenedVariable b = bt == null ? null : VariableScreen.screen(bt, v);
        boolean aboutValues = f.kind().isShift() || f.kind() == FindingKind.SHAPE_CHANGE
                || f.kind() == FindingKind.REFERENCE || f.kind() == FindingKind.HEAPING
                || f.kind() == FindingKind.DIGIT_PREFERENCE || f.kind() == FindingKind.CODE_APPEARED
                || f.kind() == FindingKind.CODE_VANISHED;
        if (aboutValues && c.numeric() != null) {
            var empty = org.wavewarden.profile.NumericDistribution.empty();
            return new VariablePlot.NumericPlot(v.unit(), b == null ? empty : b.numeric(), c.numeric());
        }
        if (aboutValues && c.categories() != null) {
            CategoryCounts bc = b == null ? new CategoryCounts(List.of(), new long[0]) : b.categories();
            List<String> cats = c.categories().unionOrder(bc);
            if (cats.isEmpty()) {
                return null;
            }
            return new VariablePlot.SharesPlot(cats, bc.alignedTo(cats), c.categories().alignedTo(cats));
        }
        Set<String> reasons = new LinkedHashSet<>(c.missingByReason().keySet());
        if (b != null) {
            reasons.addAll(b.missingByReason().keySet());
        }
        List<String> labels = new ArrayList<>(reasons);
        labels.add("NULL");
        long[] cb = new long[labels.size()];
        long[] cc = new long[labels.size()];
        for (int i = 0; i < reasons.size(); i++) {
            cb[i] = b == null ? 0 : b.missingByReason().getOrDefault(labels.get(i), 0L);
            cc[i] = c.missingByReason().getOrDefault(labels.get(i), 0L);
        }
        cb[labels.size() - 1] = b == null ? 0 : b.sqlNulls();
        cc[labels.size() - 1] = c.sqlNulls();
        return new VariablePlot.MissingPlot(labels, cb, b == null ? 0 : b.rows(), cc, c.rows());
    }

    private Trend trend(DatasetConfig d, List<String> order, String wave, VariableConfig v, Finding f,
                        WaveProfile baseline, WaveProfile current) {
        int end = order.indexOf(wave);
        if (end < 0) {
            return null;
        }
        List<String> waves = order.subList(0, end + 1);
        String category = f.kind().isShift() && current != null && v.kind() == VariableKind.CATEGORICAL
                ? movedMost(v, baseline, current) : null;
        boolean values = (f.kind().isShift() || f.kind() == FindingKind.SHAPE_CHANGE
                || f.kind() == FindingKind.REFERENCE) && v.kind() != VariableKind.TEXT && v.kind() != VariableKind.DATE;
        String measure = !values ? "share missing (any reason)" : v.kind().isNumericScale() ? "mean"
                : category != null ? "share '" + category + "'" : "share";
        List<Double> points = new ArrayList<>();
        for (String w : waves) {
            Optional<WaveProfile> p = summary(d, w);
            ColumnTally t = p.map(x -> x.columns().get(v.name())).orElse(null);
            if (t == null) {
                points.add(Double.NaN);
                continue;
            }
            ScreenedVariable s = VariableScreen.screen(t, v);
            double x;
            if (!values) {
                long missing = s.sqlNulls() + s.missingByReason().values().stream().mapToLong(Long::longValue).sum();
                x = s.rows() == 0 ? Double.NaN : (double) missing / s.rows();
            } else if (s.numeric() != null) {
                x = s.numeric().n() == 0 ? Double.NaN : s.numeric().mean();
            } else if (s.categories() != null && s.categories().n() > 0) {
                String c = category != null ? category : v.kind() == VariableKind.BINARY
                        ? VariableScreen.successValue(v, s.categories(), s.categories()) : null;
                x = c == null ? Double.NaN : (double) s.categories().count(c) / s.categories().n();
            } else {
                x = Double.NaN;
            }
            points.add(x);
        }
        return new Trend(measure, values && v.kind().isNumericScale() ? v.unit() : null, waves, points);
    }

    private static String movedMost(VariableConfig v, WaveProfile baseline, WaveProfile current) {
        ScreenedVariable c = VariableScreen.screen(current.columns().get(v.name()), v);
        ColumnTally bt = baseline == null ? null : baseline.columns().get(v.name());
        if (bt == null || c.categories() == null || c.categories().n() == 0) {
            return null;
        }
        ScreenedVariable b = VariableScreen.screen(bt, v);
        String best = null;
        double bestMove = -1;
        for (String cat : c.categories().unionOrder(b.categories())) {
            double move = Math.abs((double) c.categories().count(cat) / c.categories().n()
                    - (double) b.categories().count(cat) / Math.max(1, b.categories().n()));
            if (move > bestMove) {
                bestMove = move;
                best = cat;
            }
        }
        return best;
    }
}
