package org.wavewarden.pipeline;

import org.wavewarden.compare.DateComparison;
import org.wavewarden.compare.WaveEstimates;
import org.wavewarden.compare.shape.CumulativeGap;
import org.wavewarden.compare.DesignViews;
import org.wavewarden.compare.design.PsuTally;
import org.wavewarden.compare.design.PsuTotals;
import org.wavewarden.compare.relation.RelationshipDetail;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.deliver.DigestRecords;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.WaveStatus;
import org.wavewarden.deliver.html.AlertView;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.Trend;
import org.wavewarden.deliver.html.VariablePlot;
import org.wavewarden.deliver.html.WaveSection;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.read.WaveInfo;
import org.wavewarden.store.AlertReviews;
import org.wavewarden.store.SignOffs;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.missing.VariableInference;
import org.wavewarden.missing.ScreenedVariable;

import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * Builds the HTML digest of judged waves: for each alert, a plot of the estimates its finding was judged on, with
 * their intervals (the finding's own numbers, weighted and design-based where the finding is), and a trend of the
 * same statistic across every wave up to the judged one, each wave computed from its stored summary (never the
 * source) by the finding's estimator. Findings without estimates of their own (data quality) are drawn from both
 * waves' screened answers as counted.
 */
public final class DigestAssembler {

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(DigestAssembler.class);

    private final Session session;
    private final Map<String, Optional<WaveProfile>> summaries = new HashMap<>();
    /** Each wave's answers of a variable screened once per digest, keyed by wave and variable. */
    private final Map<List<Object>, ScreenedWave> screened = new HashMap<>();
    /** Each wave's report, from the digest's own or the store's latest run; empty when the wave was never judged. */
    private final Map<String, Optional<FindingsReport>> judged = new HashMap<>();
    /**
     * The HTML digest as the daemon writes it, in a folder of its own beside the waves' folders (its case-list links
     * lead up one folder).
     */
    public String html(DatasetConfig d, List<FindingsReport> reports, Instant generatedAt) {
        return html(d, reports, generatedAt, "../");
    }

    /** Each wave's dataset as it was judged, with the wave's own codebook merged under the configured variables. */
    private final Map<String, DatasetConfig> judgedAs = new HashMap<>();

    public DigestAssembler(Session session) {
        this.session = session;
    }

    public String html(DatasetConfig d, List<FindingsReport> reports, Instant generatedAt, String toDatasetFolder) {
        List<WaveInfo> listed = new WaveJudge(session, java.time.Clock.systemUTC()).waves(d);
        List<String> order = listed.stream().map(WaveInfo::wave).toList();
        List<WaveSection> sections = new ArrayList<>();
        for (FindingsReport r : reports) {
            judged.put(r.wave(), Optional.of(r));
        }
        for (FindingsReport r : reports) {
            WaveProfile current = summary(d, r.wave()).orElse(null);
            WaveProfile baseline = baseline(d, listed, r);
            List<AlertView> views = new ArrayList<>();
            for (org.wavewarden.deliver.Alert alert : org.wavewarden.deliver.Alerts.group(r.findings())) {
                Finding f = alert.lead();
                // As the wave was judged: its own codebook merged under the configured variables.
                VariableConfig v = VariableInference.variable(judgedAs.computeIfAbsent(r.wave(),
                                w -> WaveJudge.withWaveCodebook(session, d, w)), f.variable(),
                        current == null ? null : current.columns().get(f.variable()));
                String id = findingId(d.name(), r.wave(), f);
                VariablePlot plot;
                Trend trend;
                try {
                    FaultPoints.hit(FaultPoints.PLOT_VARIABLE + f.variable());
                    WaveEstimates.Plotted plotted = plotted(f);
                    VariablePlot own = findingPlot(f, id);
                    if (own instanceof VariablePlot.CorrelationPlot) {
                        plot = own;
                        trend = null;
                    } else if (own instanceof VariablePlot.CumulativePlot cp) {
                        plot = own;
                        trend = findingTrend(d, order, r, f, cp.shape().weighted() ? "weighted KS distance"
                                : "KS distance", null, false, null, g -> {
                            CumulativeGap.ShapeDetail x = detail(g, CumulativeGap.ShapeDetail.class, "cdfBaseline");
                            return x == null ? null : new WaveEstimates.Estimate(null, x.distance(),
                                    x.interval().ciLow(), x.interval().ciHigh());
                        }, null, id);
                    } else if (own instanceof VariablePlot.DatePlot) {
                        plot = own;
                        trend = null;
                    } else if (plotted != null && f.kind() == FindingKind.PANEL_SHIFT) {
                        plot = own;
                        String category = plotted.category();
                        trend = findingTrend(d, order, r, f, plotted.statistic() + ", each wave paired with the one"
                                + " before", plotted.unit(), plotted.estimator().percent(), category, g -> {
                            WaveEstimates.Plotted x = plotted(g);
                            return x == null ? null : x.current().stream().filter(e -> java.util.Objects.equals(
                                    category, e.category())).findFirst().orElse(null);
                        }, plotted.baseline().isEmpty() ? null : plotted.baseline().get(0), id);
                    } else if (plotted != null) {
                        plot = own;
                        trend = v == null ? null : trend(d, order, r.wave(), v, f, plotted, 1 - r.alpha(), id);
                    } else {
                        // Drawn against the baseline the finding was judged against (a pooled further
                        // baseline has no one summary, so it is not drawn).
                        WaveProfile against = f.against() == null ? baseline
                                : summary(d, org.wavewarden.judge.Against.wavesOf(f.against())).orElse(null);
                        plot = v == null || current == null ? null : plot(v, f, screened(d, against, v).orElse(null),
                                screened(d, current, v).orElse(null), id);
                        trend = v == null || !f.kind().isDataQuality() ? null
                                : missingTrend(d, order, r.wave(), v, 1 - r.alpha(), id);
                    }
                } catch (RuntimeException e) {
                    // One alert's chart must never cost the digest: the alert is shown with a note instead.
                    LOG.warn("the chart of {} ({}) in {} wave {} could not be prepared: {}", f.variable(), f.kind(),
                            d.name(), r.wave(), e.toString(), e);
                    plot = new VariablePlot.Unavailable(e.getClass().getSimpleName());
                    trend = null;
                }
                if (trend != null && d.population() != null && d.population().complete()) {
                    // Every wave of a complete enumeration counted every unit: the trend has no band either.
                    trend = trend.exact();
                }
                views.add(new AlertView(alert, plot, trend));
            }
            sections.add(new WaveSection(r, views));
        }
        return HtmlDigest.render(d.name(), sections, generatedAt, records(d, reports)
                .withCaseLinks(CaseListing.links(session, d.name(), reports, toDatasetFolder)));
    }

    /** The Markdown digest of judged waves, with their review status as the results schema holds it now. */
    public String markdown(DatasetConfig d, List<FindingsReport> reports) {
        return markdown(d, reports, "../");
    }

    /** The same from a digest whose way to the dataset's folder (holding the waves' folders) is given. */
    public String markdown(DatasetConfig d, List<FindingsReport> reports, String toDatasetFolder) {
        return org.wavewarden.deliver.MarkdownDigest.render(reports, records(d, reports)
                .withCaseLinks(CaseListing.links(session, d.name(), reports, toDatasetFolder)));
    }

    /**
     * What the digests show beyond the findings, read as it stands now: the dataset's population from its
     * configuration, and for each judged wave its alerts with their states (every run's: the status keeps only
     * those not superseded), the entry that explained or muted each, and the wave's latest sign-off.
     */
    public DigestRecords records(DatasetConfig d, List<FindingsReport> reports) {
        AlertReviews reviews = new AlertReviews(session.store().jdbi(), session.config().results().schema());
        SignOffs signOffs = new SignOffs(session.store().jdbi(), session.config().results().schema());
        List<WaveStatus> statuses = new ArrayList<>();
        Set<String> seen = new java.util.HashSet<>();
        for (FindingsReport r : reports) {
            if (!r.dataset().equals(d.name()) || !seen.add(r.wave())) {
                continue;
            }
            List<org.wavewarden.review.AlertView> alerts = reviews.list(new AlertReviews.Filter(d.name(), r.wave(),
                    null, null, null));
            // The entry that explained or muted an alert is its latest, read with the list: the results schema
            // derives both states from the latest entry's action, so no alert's history needs reading.
            statuses.add(WaveStatus.of(d.name(), r.wave(), alerts, org.wavewarden.review.AlertView::last,
                    signOffs.latest(d.name(), r.wave()).orElse(null)));
        }
        return new DigestRecords(Map.of(d.name(), d.population()), statuses);
    }

    /**
     * The stable id of a finding in a picture's data attributes: dataset, wave, variable and kind, the key under
     * which a run stores one alert.
     */
    public static String findingId(String dataset, String wave, Finding f) {
        // A finding against a further baseline is another finding of the same variable and kind.
        return dataset + "/" + wave + "/" + f.variable() + "/" + f.kind().name()
                + (f.against() == null ? "" : "/" + org.wavewarden.judge.Against.rule(f.against()));
    }

    /**
     * The estimates a finding was judged on, from its detail (the record of this run, or the JSON object a stored
     * run reads back): the detail's {@code plot}, or for a missing-rate finding every reason's rate with its
     * interval, the reason the sentence names first. Null when the finding has none.
     */
    static WaveEstimates.Plotted plotted(Finding f) {
        if (f.detail() == null) {
            return null;
        }
        com.fasterxml.jackson.databind.ObjectMapper json = org.wavewarden.deliver.Json.mapper();
        com.fasterxml.jackson.databind.JsonNode node = json.valueToTree(f.detail());
        try {
            if (f.kind() == FindingKind.MISSING_RATE_CHANGE && node.isArray() && !node.isEmpty()) {
                List<WaveEstimates.Estimate> before = new ArrayList<>();
                List<WaveEstimates.Estimate> after = new ArrayList<>();
                for (com.fasterxml.jackson.databind.JsonNode rate : node) {
                    if (!rate.hasNonNull("baseline") || !rate.hasNonNull("current")) {
                        return null;
                    }
                    before.add(json.treeToValue(rate.get("baseline"), WaveEstimates.Estimate.class));
                    after.add(json.treeToValue(rate.get("current"), WaveEstimates.Estimate.class));
                }
                return new WaveEstimates.Plotted("share of rows missing (" + after.get(0).category() + ")",
                        WaveEstimates.Estimator.SHARE, null, before, after, null);
            }
            com.fasterxml.jackson.databind.JsonNode p = node.get("plot");
            return p == null || p.isNull() ? null : json.treeToValue(p, WaveEstimates.Plotted.class);
        } catch (com.fasterxml.jackson.core.JsonProcessingException | IllegalArgumentException e) {
            throw new IllegalStateException("the plotted estimates of " + f.variable() + " cannot be read: "
                    + e.getMessage(), e);
        }
    }

    /**
     * The picture a finding's own numbers give, or null when it has none (a data-quality finding, drawn from the
     * screened answers instead): a relationship's correlations, a change of shape's cumulative distributions, a
     * date comparison's medians and spans, or the estimates of its {@code plot}.
     */
    public static VariablePlot findingPlot(Finding f, String findingId) {
        if (f.detail() instanceof RelationshipDetail rd) {
            return correlations(rd, findingId);
        }
        CumulativeGap.ShapeDetail shape = detail(f, CumulativeGap.ShapeDetail.class, "cdfBaseline");
        if (shape != null) {
            return new VariablePlot.CumulativePlot(findingId, shape);
        }
        DateComparison.DateDetail dates = detail(f, DateComparison.DateDetail.class, "medianShiftDays");
        if (dates != null) {
            return new VariablePlot.DatePlot(findingId, dates);
        }
        WaveEstimates.Plotted plotted = plotted(f);
        return plotted == null ? null : new VariablePlot.EstimatePlot(findingId, plotted);
    }

    /**
     * A finding's detail as the record {@code type}, whether it is that record (this run) or the JSON object a stored
     * run reads back, recognised by its field {@code marker}; null when it is neither.
     */
    static <T> T detail(Finding f, Class<T> type, String marker) {
        if (type.isInstance(f.detail())) {
            return type.cast(f.detail());
        }
        if (f.detail() == null || f.detail() instanceof org.wavewarden.compare.Comparison) {
            return null;
        }
        com.fasterxml.jackson.databind.JsonNode node = org.wavewarden.deliver.Json.mapper().valueToTree(f.detail());
        if (!node.isObject() || !node.has(marker)) {
            return null;
        }
        try {
            return org.wavewarden.deliver.Json.mapper().treeToValue(node, type);
        } catch (com.fasterxml.jackson.core.JsonProcessingException | IllegalArgumentException e) {
            throw new IllegalStateException("the detail of " + f.variable() + " cannot be read: " + e.getMessage(), e);
        }
    }

    /**
     * A statistic that only the findings hold (a paired estimate, a KS distance) across every wave up to the judged
     * one: each wave's value from the same variable's finding of the same kind in that wave's report (the digest's
     * own, or the store's latest run), a gap where there is none; {@code againstValue} stands at the baseline wave
     * when that wave has no such finding of its own (the first wave of a panel).
     */
    private Trend findingTrend(DatasetConfig d, List<String> order, FindingsReport r, Finding f, String measure,
                               String unit, boolean percent, String category,
                               java.util.function.Function<Finding, WaveEstimates.Estimate> value,
                               WaveEstimates.Estimate againstValue, String findingId) {
        return overWaves(order, r.wave(), w -> {
            WaveEstimates.Estimate e = null;
            Optional<FindingsReport> report = w.equals(r.wave()) ? Optional.of(r) : judged(d, w);
            Optional<Finding> same = report.flatMap(x -> x.findings().stream().filter(g -> g.kind() == f.kind()
                    && g.variable().equals(f.variable())).findFirst());
            if (same.isPresent()) {
                try {
                    e = value.apply(same.get());
                } catch (RuntimeException ex) {
                    // A stored finding whose detail cannot be read is a gap in the line, not a lost chart.
                    e = null;
                }
            }
            return e == null && w.equals(r.againstWave()) ? againstValue : e;
        }, measure, unit, percent, category, Double.NaN, findingId);
    }

    /**
     * A trend over every wave up to {@code wave}, each wave's estimate from {@code perWave} (null for a gap in the
     * line); null when {@code wave} is not listed.
     */
    private static Trend overWaves(List<String> order, String wave,
                                   java.util.function.Function<String, WaveEstimates.Estimate> perWave, String measure,
                                   String unit, boolean percent, String category, double reference,
                                   String findingId) {
        int end = order.indexOf(wave);
        if (end < 0) {
            return null;
        }
        List<String> waves = order.subList(0, end + 1);
        List<Double> values = new ArrayList<>();
        List<Double> lows = new ArrayList<>();
        List<Double> highs = new ArrayList<>();
        for (String w : waves) {
            WaveEstimates.Estimate e = perWave.apply(w);
            values.add(e == null ? Double.NaN : e.value());
            lows.add(e == null ? Double.NaN : e.low());
            highs.add(e == null ? Double.NaN : e.high());
        }
        return new Trend(measure, unit, waves, values, lows, highs, percent, category, reference, findingId);
    }

    private Optional<FindingsReport> judged(DatasetConfig d, String wave) {
        return judged.computeIfAbsent(wave, w -> session.store().currentRun(d.name(), w)
                .flatMap(run -> session.store().storedReport(run.runId())));
    }

    /** A wave's (or pooled baseline's) answers of one variable, screened once per digest; empty without them. */
    private Optional<ScreenedVariable> screened(DatasetConfig d, WaveProfile p, VariableConfig v) {
        return p == null ? Optional.empty() : screened.computeIfAbsent(List.of(p.wave(), v),
                k -> ScreenedWave.screen(p, d.weightColumn() != null, List.of(v), List.of())).get(v.name());
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

    /** A relationship alert's plot: both waves' Spearman rho and Pearson r with their intervals. */
    static VariablePlot correlations(RelationshipDetail d, String findingId) {
        return new VariablePlot.CorrelationPlot(List.of("Spearman rho", "Pearson r"),
                new double[][] {row(d.spearmanBaseline()), row(d.pearsonBaseline())},
                new double[][] {row(d.spearmanCurrent()), row(d.pearsonCurrent())}, findingId);
    }

    private static double[] row(org.wavewarden.compare.relation.CorrelationResult r) {
        return new double[] {r.estimate(), r.ciLow(), r.ciHigh()};
    }

    /**
     * The chart of a finding that has no estimates of its own (a data-quality finding, or a stored finding of an
     * earlier release whose detail has none): both waves' screened answers as counted, which is what data-quality
     * findings count. Without a baseline wave only the current wave is drawn.
     */
    static VariablePlot plot(VariableConfig v, Finding f, ScreenedVariable b, ScreenedVariable c,
                             String findingId) {
        if (c == null) {
            return null;
        }
        boolean aboutValues = f.kind().isShift() || f.kind() == FindingKind.SHAPE_CHANGE
                || f.kind() == FindingKind.REFERENCE || f.kind() == FindingKind.HEAPING
                || f.kind() == FindingKind.DIGIT_PREFERENCE || f.kind() == FindingKind.CODE_APPEARED
                || f.kind() == FindingKind.CODE_VANISHED || f.kind() == FindingKind.CODE_UNLABELLED
                || f.kind() == FindingKind.LABEL_CHANGED;
        if (aboutValues && c.numeric() != null) {
            var empty = org.wavewarden.profile.NumericDistribution.empty();
            return new VariablePlot.NumericPlot(v.unit(), b == null ? null : b.numeric() == null ? empty
                    : b.numeric(), c.numeric(), findingId);
        }
        if (aboutValues && c.categories() != null) {
            CategoryCounts bc = b == null || b.categories() == null ? new CategoryCounts(List.of(), new long[0])
                    : b.categories();
            List<String> cats = c.categories().unionOrder(bc);
            if (cats.isEmpty()) {
                return null;
            }
            return new VariablePlot.SharesPlot(cats, b == null ? null : bc.alignedTo(cats),
                    c.categories().alignedTo(cats), findingId);
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
        return new VariablePlot.MissingPlot(labels, b == null ? null : cb, b == null ? 0 : b.rows(), cc, c.rows(),
                findingId);
    }

    /**
     * The finding's statistic across every wave up to the judged one, each wave computed by the finding's own
     * estimator ({@link WaveEstimates}) from that wave's stored summary, weighted and under the design where the
     * finding is, for the category the sentence names.
     */
    private Trend trend(DatasetConfig d, List<String> order, String wave, VariableConfig v, Finding f,
                        WaveEstimates.Plotted plotted, double confidence, String findingId) {
        String category = plotted.category();
        boolean missing = f.kind() == FindingKind.MISSING_RATE_CHANGE;
        double reference = plotted.reference().isEmpty() ? Double.NaN : plotted.reference().get(0).value();
        return overWaves(order, wave, w -> {
            try {
                return estimate(d, w, v, plotted.estimator(), category, missing, confidence);
            } catch (RuntimeException ex) {
                // A wave whose answers give no estimate (fewer than two, no weight) is a gap in the line.
                return null;
            }
        }, plotted.statistic(), plotted.unit(), plotted.estimator().percent(), category, reference, findingId);
    }

    /** One wave's estimate of the statistic, or null when the wave has no summary or no such column. */
    private WaveEstimates.Estimate estimate(DatasetConfig d, String wave, VariableConfig v,
                                            WaveEstimates.Estimator estimator, String category, boolean missing,
                                            double confidence) {
        Optional<WaveProfile> p = summary(d, wave);
        ColumnTally t = p.map(x -> x.columns().get(v.name())).orElse(null);
        if (t == null) {
            return null;
        }
        ScreenedVariable s = screened(d, p.get(), v).orElse(null);
        if (s == null) {
            return null;
        }
        if (missing) {
            long count = "NULL".equals(category) ? s.sqlNulls() : s.missingByReason().getOrDefault(category, 0L);
            return WaveEstimates.share(category, count, s.rows(), confidence);
        }
        DesignSummary design = p.get().design();
        return switch (estimator) {
            case SHARE -> s.categories() == null ? null
                    : WaveEstimates.share(category, s.categories().count(category), s.categories().n(), confidence);
            case MEAN -> s.numeric() == null ? null : WaveEstimates.mean(s.numeric(), confidence);
            case MEDIAN -> s.numeric() == null ? null : WaveEstimates.median(s.numeric(), confidence);
            case WEIGHTED_SHARE, DESIGN_SHARE -> {
                if (s.categories() == null || s.weighted() == null) {
                    yield null;
                }
                List<String> own = s.categories().categories();
                PsuTally psu = null;
                if (estimator == WaveEstimates.Estimator.DESIGN_SHARE && design != null) {
                    DesignViews.View view = DesignViews.categories(design, t.column(), s, own);
                    psu = view.unavailable() == null ? view.tally() : null;
                }
                yield WaveEstimates.weightedShare(category, s.weighted(), psu, own.indexOf(category), confidence);
            }
            case WEIGHTED_MEAN, DESIGN_MEAN -> {
                if (s.numeric() == null || s.weighted() == null) {
                    yield null;
                }
                PsuTotals totals = null;
                if (estimator == WaveEstimates.Estimator.DESIGN_MEAN && design != null) {
                    DesignViews.View view = DesignViews.numeric(design, t, s, v);
                    totals = view.unavailable() == null ? view.totals() : null;
                }
                yield WaveEstimates.weightedMean(s.weighted(), totals, confidence);
            }
        };
    }

    /** A data-quality finding's trend: the share of rows missing for any reason, with Wilson's interval. */
    private Trend missingTrend(DatasetConfig d, List<String> order, String wave, VariableConfig v,
                               double confidence, String findingId) {
        return overWaves(order, wave, w -> {
            ScreenedVariable s = summary(d, w).flatMap(p -> screened(d, p, v)).orElse(null);
            if (s == null) {
                return null;
            }
            long missing = s.sqlNulls() + s.missingByReason().values().stream().mapToLong(Long::longValue).sum();
            return WaveEstimates.share(null, missing, s.rows(), confidence);
        }, "share missing (any reason)", null, true, null, Double.NaN, findingId);
    }
}
