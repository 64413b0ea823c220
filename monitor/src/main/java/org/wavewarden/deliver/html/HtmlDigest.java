package org.wavewarden.deliver.html;

import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Cautions;
import org.wavewarden.deliver.DigestRecords;
import org.wavewarden.deliver.ReviewText;
import org.wavewarden.deliver.StandingFindings;
import org.wavewarden.deliver.WaveStatus;
import org.wavewarden.deliver.FindingsFiles;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.EnumMap;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;

import static org.wavewarden.deliver.html.Html.esc;

/**
 * The digest as one self-contained HTML page: inline CSS and inline SVG only, no script, no font, no image and no
 * request to any network, so it opens the same from a mail attachment, a file share or an offline laptop. A
 * Content-Security-Policy forbids every fetch and every script, so even a mistake elsewhere cannot make the page
 * call out. All text from the data is escaped.
 *
 * <p>Layout: the cautions first, then per wave a header, the verdict counts and the alerts in the project's
 * reading order ({@link FindingsFiles#ordered}), each with its chart and trend; the cautions again at the end.
 */
public final class HtmlDigest {

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(HtmlDigest.class);

    private static final DateTimeFormatter STAMP =
            DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm 'UTC'", Locale.ROOT).withZone(ZoneOffset.UTC);

    private HtmlDigest() {
    }

    /**
     * Renders the page.
     *
     * @param dataset     the dataset's name, for the title
     * @param sections    the judged waves in wave order
     * @param generatedAt when the digest was made (passed in: rendering reads no clock)
     */
    public static String render(String dataset, List<WaveSection> sections, Instant generatedAt) {
        return render(dataset, sections, generatedAt, DigestRecords.NONE);
    }

    /**
     * Renders the page with what the results schema says beyond the findings: each wave's review status, its
     * explained and muted alerts, and whether the dataset is a complete enumeration.
     *
     * @param records the review records of the waves and the dataset's population; {@link DigestRecords#NONE}
     *                for none
     */
    public static String render(String dataset, List<WaveSection> sections, Instant generatedAt,
                                DigestRecords records) {
        Objects.requireNonNull(dataset, "dataset");
        Objects.requireNonNull(records, "records");
        Objects.requireNonNull(sections, "sections");
        Objects.requireNonNull(generatedAt, "generatedAt");
        StringBuilder h = new StringBuilder(64 * 1024);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; ")
                .append("style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
                .append("<title>Wavewarden digest: ").append(esc(dataset)).append("</title>\n")
                .append("<style>").append(CSS).append("</style>\n</head>\n<body>\n<main>\n");
        h.append("<header><h1>Wavewarden change digest</h1><p class=\"meta\">Dataset <strong>").append(esc(dataset))
                .append("</strong> &middot; ").append(sections.size()).append(" judged wave(s) &middot; generated ")
                .append(esc(STAMP.format(generatedAt))).append("</p></header>\n");
        cautions(h, "cautions-top", "Read this first: screening aids, not findings");
        boolean complete = records.complete(dataset);
        if (complete) {
            // Said once for the dataset: no wave of it carries a test.
            h.append("<aside class=\"population\" id=\"complete-enumeration\" role=\"note\"><h2>Complete")
                    .append(" enumeration</h2><p>").append(esc(ReviewText.completeEnumeration(
                            records.population(dataset)))).append("</p></aside>\n");
        }
        if (sections.isEmpty()) {
            h.append("<p class=\"none\">No waves were judged, so there is nothing to report.</p>\n");
        } else {
            contents(h, sections);
        }
        for (int i = 0; i < sections.size(); i++) {
            WaveSection s = sections.get(i);
            wave(h, s, i, complete, records.status(s.report().dataset(), s.report().wave()).orElse(null),
                    records.caseLinks(s.report().dataset(), s.report().wave()));
        }
        tooFewAnswers(h, StandingFindings.tooFewAnswers(sections.stream().map(WaveSection::report).toList()));
        cautions(h, "cautions-end", "Cautions");
        h.append("<footer id=\"end-of-digest\">End of digest for ").append(esc(dataset)).append(".</footer>\n");
        h.append("</main>\n</body>\n</html>\n");
        return h.toString();
    }

    private static void cautions(StringBuilder h, String id, String heading) {
        h.append("<aside class=\"cautions\" id=\"").append(id).append("\" role=\"note\"><h2>").append(esc(heading))
                .append("</h2><ul>");
        for (String line : Cautions.LINES) {
            h.append("<li>").append(esc(line)).append("</li>");
        }
        h.append("</ul></aside>\n");
    }

    private static void contents(StringBuilder h, List<WaveSection> sections) {
        h.append("<nav class=\"contents\" aria-label=\"Waves\"><ol>");
        for (int i = 0; i < sections.size(); i++) {
            WaveSection s = sections.get(i);
            int n = s.alerts().size();
            h.append("<li><a href=\"#wave-").append(i).append("\">").append(esc(waveTitle(s.report()))).append("</a> ")
                    .append("<span class=\"count").append(n == 0 ? " zero" : "").append("\">").append(n)
                    .append(n == 1 ? " alert" : " alerts").append("</span></li>");
        }
        h.append("</ol></nav>\n");
    }

    static String waveTitle(FindingsReport r) {
        return "wave " + r.wave() + (r.againstWave() == null ? " (first wave, screened alone)"
                : " against " + r.againstWave());
    }

    private static void wave(StringBuilder h, WaveSection s, int index, boolean complete, WaveStatus status,
                             List<org.wavewarden.deliver.CaseLink> caseLinks) {
        FindingsReport r = s.report();
        h.append("<section class=\"wave\" id=\"wave-").append(index).append("\" data-wave=\"").append(esc(r.wave()))
                .append("\">\n<h2>").append(esc(capitalised(waveTitle(r)))).append("</h2>\n");
        h.append("<p class=\"summary\">").append(summary(r, s.alerts().size(), complete)).append("</p>\n");
        if (status != null) {
            h.append("<p class=\"review-status").append(status.signOff() == null ? "" : " signed")
                    .append("\"><b>Review status:</b> ").append(esc(ReviewText.statusLine(status))).append("</p>\n");
        }
        for (Finding changed : StandingFindings.signedWaveChanged(r)) {
            h.append("<p class=\"signed-changed\" role=\"alert\"><b>Signed-off wave changed.</b> ")
                    .append(esc(ReviewText.signedWaveChanged(changed, status == null ? null : status.signOff())))
                    .append("</p>\n");
        }
        if (!r.inference().isEmpty()) {
            // How the run read its data: kinds it inferred, baselines it read again, waves it passed over.
            h.append("<details class=\"notes\"><summary>Notes on this run (").append(r.inference().size())
                    .append(")</summary><ul>");
            r.inference().forEach(n -> h.append("<li>").append(esc(n)).append("</li>"));
            h.append("</ul></details>\n");
        }
        if (s.alerts().isEmpty()) {
            h.append("<p class=\"none\">No alerts for this wave: nothing needs attention.</p>\n");
        }
        String baselineWave = r.againstWave() == null ? "baseline" : org.wavewarden.judge.Against.mainOf(r.againstWave());
        for (AlertView a : ordered(s.alerts())) {
            alert(h, a, baselineWave, r.wave(), r.alpha(), status == null ? null : status.reviewed(
                    a.finding().variable(), a.finding().kind().name()).orElse(null));
        }
        if (status != null) {
            list(h, "explained", "Explained", status.explained().stream().map(ReviewText::explained).toList());
            list(h, "muted", "Muted: recorded, not delivered", status.muted().stream().map(ReviewText::muted)
                    .toList());
        }
        list(h, "still-present", "Still present, not alerted again", StandingFindings.stillPresent(r).stream()
                .map(ReviewText::stillPresent).toList());
        list(h, "cleared", "Cleared", StandingFindings.cleared(r).stream().map(ReviewText::cleared).toList());
        caseLists(h, caseLinks);
        h.append("</section>\n");
    }

    /** The wave's case lists, each a relative link to its CSV file beside the findings, with its count. */
    private static void caseLists(StringBuilder h, List<org.wavewarden.deliver.CaseLink> links) {
        if (links.isEmpty()) {
            return;
        }
        h.append("<div class=\"review-list case-lists\"><h3>Case lists for the field team (").append(links.size())
                .append(")</h3><ul>");
        links.forEach(c -> h.append("<li>").append(esc(c.subject())).append(": <a href=\"").append(esc(c.file()))
                .append("\" download>").append(esc(c.count())).append("</a></li>"));
        h.append("</ul></div>\n");
    }

    /** A titled list of sentences, each escaped whole, or nothing when there are none. */
    private static void list(StringBuilder h, String cssClass, String title, List<String> items) {
        if (items.isEmpty()) {
            return;
        }
        h.append("<div class=\"review-list ").append(cssClass).append("\"><h3>").append(esc(title)).append(" (")
                .append(items.size()).append(")</h3><ul>");
        items.forEach(i -> h.append("<li>").append(esc(i)).append("</li>"));
        h.append("</ul></div>\n");
    }

    /** The standing list of variables too few answers can judge: once for the dataset, not per wave. */
    private static void tooFewAnswers(StringBuilder h, List<StandingFindings.TooFewAnswers> standing) {
        if (standing.isEmpty()) {
            return;
        }
        h.append("<section class=\"too-few\" id=\"too-few-answers\"><h2>Too few answers to judge</h2><p>")
                .append(esc(ReviewText.TOO_FEW_ANSWERS_INTRO)).append("</p><ul>");
        standing.forEach(t -> h.append("<li data-variable=\"").append(esc(t.variable())).append("\">")
                .append(esc(ReviewText.tooFewAnswers(t))).append("</li>"));
        h.append("</ul></section>\n");
    }

    /** The given alerts in the order {@link FindingsFiles#ordered} puts their findings. */
    static List<AlertView> ordered(List<AlertView> alerts) {
        Map<Finding, Deque<AlertView>> byFinding = new IdentityHashMap<>();
        alerts.forEach(a -> byFinding.computeIfAbsent(a.finding(), k -> new ArrayDeque<>()).add(a));
        return FindingsFiles.ordered(alerts.stream().map(AlertView::finding).toList()).stream()
                .map(f -> byFinding.get(f).poll()).toList();
    }

    private static String summary(FindingsReport r, int alerts, boolean complete) {
        Map<Verdict, Integer> counts = new EnumMap<>(Verdict.class);
        Map<Verdict, Integer> relations = new EnumMap<>(Verdict.class);
        int quality = 0;
        int skipped = 0;
        for (Finding f : r.findings()) {
            if (f.kind().isShift() && f.verdict() != null) {
                counts.merge(f.verdict(), 1, Integer::sum);
            } else if (f.kind() == FindingKind.RELATIONSHIP_CHANGE && f.verdict() != null) {
                relations.merge(f.verdict(), 1, Integer::sum);
            } else if (f.kind() == FindingKind.SKIPPED) {
                skipped++;
            } else if (f.kind().isDataQuality()) {
                quality++;
            }
        }
        StringBuilder sb = new StringBuilder("Shift verdicts: ");
        tallies(sb, counts);
        if (!relations.isEmpty()) {
            sb.append("&middot; relationship verdicts: ");
            tallies(sb, relations);
        }
        sb.append("&middot; data-quality findings <b>").append(quality).append("</b>");
        if (skipped > 0) {
            sb.append(" &middot; not compared <b>").append(skipped).append("</b>");
        }
        sb.append(" &middot; alerts shown <b>").append(alerts).append("</b> &middot; ");
        if (complete) {
            return sb.append("judged by size of change alone").toString();
        }
        sb.append("q-values at false discovery rate ")
                .append(esc(java.math.BigDecimal.valueOf(r.alpha()).stripTrailingZeros().toPlainString()));
        if (r.fdrMethod() != null && !r.fdrMethod().isBlank()) {
            sb.append(" (").append(esc(methodName(r.fdrMethod()))).append(")");
        }
        return sb.toString();
    }

    /** Every outcome of the verdict rule, and CLEARED (not one of its outcomes) only when a finding has it. */
    private static void tallies(StringBuilder sb, Map<Verdict, Integer> counts) {
        for (Verdict v : Verdict.values()) {
            if (v == Verdict.CLEARED && !counts.containsKey(v)) {
                continue;
            }
            int n = counts.getOrDefault(v, 0);
            sb.append("<span class=\"tally v-").append(v.name().toLowerCase(Locale.ROOT)).append(n == 0 ? " zero" : "")
                    .append("\">").append(v.name()).append(" <b>").append(n).append("</b></span> ");
        }
    }

    /** @param reviewed EXPLAINED or MUTED when someone explained or muted the alert, else null */
    private static void alert(StringBuilder h, AlertView a, String runBaseline, String currentWave, double alpha,
                              org.wavewarden.review.AlertState reviewed) {
        Finding f = a.finding();
        // A finding judged against a further baseline names it, and its numbers are that baseline's.
        String baselineWave = f.against() == null ? runBaseline : org.wavewarden.judge.Against.wavesOf(f.against());
        String badge = f.verdict() != null ? f.verdict().name() : f.kind() == FindingKind.SKIPPED ? "SKIPPED" : "DATA QUALITY";
        String badgeClass = f.verdict() != null ? "v-" + f.verdict().name().toLowerCase(Locale.ROOT) : "v-quality";
        h.append("<article class=\"alert ").append(badgeClass).append("\" data-variable=\"").append(esc(f.variable()))
                .append("\" data-kind=\"").append(esc(f.kind().name())).append("\"")
                .append(f.verdict() == null ? "" : " data-verdict=\"" + f.verdict().name() + "\"")
                .append(reviewed == null ? "" : " data-state=\"" + reviewed.name() + "\"").append(">\n");
        h.append("<header><span class=\"badge ").append(badgeClass).append("\"");
        if (f.verdict() != null) {
            h.append(" title=\"").append(esc(f.verdict().meaning())).append("\"");
        }
        h.append(">").append(esc(badge)).append("</span> <code class=\"variable\">").append(esc(f.variable()))
                .append("</code> <span class=\"kind\">").append(esc(kindLabel(f.kind()))).append("</span>");
        if (f.against() != null) {
            h.append(" <span class=\"against\">").append(esc(org.wavewarden.judge.Against.phrase(f.against())))
                    .append("</span>");
        }
        if (reviewed != null) {
            h.append(" <span class=\"state\">").append(reviewed.name().toLowerCase(Locale.ROOT)).append("</span>");
        }
        if (f.label() != null) {
            h.append("<br><span class=\"vlabel\">").append(esc(f.label())).append("</span>");
        }
        h.append("</header>\n");
        h.append("<p class=\"sentence\">").append(esc(f.sentence())).append("</p>\n");
        String stats = stats(f, alpha, baselineWave, currentWave);
        if (!stats.isEmpty()) {
            h.append("<p class=\"stats\">").append(stats).append("</p>\n");
        }
        h.append(WhereTables.html(f, baselineWave, currentWave, 1 - alpha));
        facets(h, a.alert(), alpha, baselineWave, currentWave);
        if (a.plot() != null || a.trend() != null) {
            h.append("<div class=\"charts\">");
            if (a.plot() != null) {
                h.append(contained(f, "plot", () -> plot(f.variable(), a.plot(), baselineWave, currentWave)));
            }
            if (a.trend() != null) {
                h.append(contained(f, "trend", () -> SvgChart.sparkline(f.variable(), a.trend(), currentWave)));
            }
            h.append("</div>\n");
        }
        h.append("</article>\n");
    }

    /**
     * The event's other findings under its lead, each with its verdict or kind, its sentence and its numbers; the
     * card's charts stay the lead's.
     */
    private static void facets(StringBuilder h, Alert alert, double alpha, String baselineWave, String currentWave) {
        List<Finding> others = alert.facets().subList(1, alert.facets().size());
        if (others.isEmpty()) {
            return;
        }
        h.append("<ul class=\"facets\" aria-label=\"Also seen in this event\">");
        for (Finding o : others) {
            h.append("<li class=\"facet\" data-kind=\"").append(esc(o.kind().name())).append("\" data-facet=\"")
                    .append(esc(Alert.Facet.of(o.kind()).name())).append("\"")
                    .append(o.verdict() == null ? "" : " data-verdict=\"" + o.verdict().name() + "\"").append(">")
                    .append("<span class=\"facet-name\">").append(esc(o.verdict() == null ? "" : o.verdict().name()
                            + " ")).append(esc(kindLabel(o.kind()))).append("</span> ")
                    .append("<span class=\"sentence\">").append(esc(o.sentence())).append("</span>");
            String stats = stats(o, alpha, baselineWave, currentWave);
            if (!stats.isEmpty()) {
                h.append("<span class=\"stats\">").append(stats).append("</span>");
            }
            h.append(WhereTables.html(o, baselineWave, currentWave, 1 - alpha));
            h.append("</li>");
        }
        h.append("</ul>\n");
    }

    /**
     * A chart of one alert, or a note in its place when drawing it fails: one chart must never cost the digest
     * (the alert's sentence and numbers are already written above it).
     */
    static String contained(Finding f, String what, java.util.function.Supplier<String> chart) {
        try {
            return chart.get();
        } catch (RuntimeException e) {
            LOG.warn("the {} of {} ({}) could not be drawn: {}", what, f.variable(), f.kind(), e.toString(), e);
            return notDrawn(what, e.getClass().getSimpleName());
        }
    }

    private static String notDrawn(String what, String error) {
        return "<p class=\"note\">The " + what + " of this alert could not be drawn (" + esc(error) + ").</p>";
    }

    public static String plot(String variable, VariablePlot p, String baselineWave, String currentWave) {
        if (p instanceof VariablePlot.Unavailable u) {
            return notDrawn("plot", u.error());
        }
        if (p instanceof VariablePlot.NumericPlot n) {
            return SvgChart.numeric(variable, n, baselineWave, currentWave);
        }
        if (p instanceof VariablePlot.SharesPlot s) {
            return SvgChart.shares(variable, s, baselineWave, currentWave);
        }
        if (p instanceof VariablePlot.CorrelationPlot c) {
            return SvgChart.correlation(variable, c, baselineWave, currentWave);
        }
        if (p instanceof VariablePlot.EstimatePlot e) {
            return SvgChart.estimates(variable, e, baselineWave, currentWave);
        }
        if (p instanceof VariablePlot.CumulativePlot c) {
            return SvgChart.cumulative(variable, c, baselineWave, currentWave);
        }
        if (p instanceof VariablePlot.DatePlot d) {
            return SvgChart.dates(variable, d, baselineWave, currentWave);
        }
        return SvgChart.missing(variable, (VariablePlot.MissingPlot) p, baselineWave, currentWave);
    }

    /**
     * The numbers behind the sentence. The interval's level is {@code 1 - alpha}: the comparison stage builds
     * its intervals at the run's alpha.
     */
    private static String stats(Finding f, double alpha, String baselineWave, String currentWave) {
        StringBuilder sb = new StringBuilder();
        if (f.test() != null) {
            sb.append("<span>").append(esc(f.test()));
            if (f.statistic() != null && Double.isFinite(f.statistic())) {
                sb.append(" = ").append(esc(String.format(Locale.ROOT, "%.4g", f.statistic())));
            }
            sb.append("</span>");
        }
        if (f.pValue() != null) {
            sb.append("<span>p ").append(esc(pValue(f.pValue()))).append("</span>");
        }
        if (f.qValue() != null) {
            sb.append("<span>q ").append(esc(pValue(f.qValue()))).append("</span>");
        }
        if (f.effect() != null) {
            Finding.Effect e = f.effect();
            sb.append("<span>").append(esc(e.name())).append(' ').append(esc(signed(e.estimate())))
                    .append(" (").append(esc(String.format(Locale.ROOT, "%.0f", 100 * (1 - alpha)))).append("% CI ")
                    .append(esc(signed(e.ciLow()))).append(" to ").append(esc(signed(e.ciHigh())))
                    .append("), threshold &plusmn;").append(esc(String.format(Locale.ROOT, "%.3g", e.threshold())))
                    .append("</span>");
            double mde = e.minimumDetectable();
            if (Double.isFinite(mde) && mde > 0) {
                // The smallest change these samples could show: when it reaches the threshold, no wave of this
                // size can settle the verdict, which the card says beside the numbers.
                sb.append("<span class=\"mde").append(e.resolvable() ? "" : " unresolvable")
                        .append("\">smallest detectable change &plusmn;")
                        .append(esc(String.format(Locale.ROOT, "%.3g", mde)))
                        .append(e.resolvable() ? "" : ": too few answers to judge").append("</span>");
            }
        }
        List<String> ns = new java.util.ArrayList<>();
        if (f.nBaseline() != null) {
            ns.add(f.nBaseline() + " (" + esc(baselineWave) + ")");
        }
        if (f.nCurrent() != null) {
            ns.add(f.nCurrent() + " (" + esc(currentWave) + ")");
        }
        if (!ns.isEmpty()) {
            sb.append("<span>n ").append(String.join(", ", ns)).append("</span>");
        }
        return sb.toString();
    }

    public static String pValue(double p) {
        if (Double.isNaN(p)) {
            return "not available";
        }
        if (p < 0.0001) {
            return "< 0.0001";
        }
        return "= " + String.format(Locale.ROOT, "%.4f", p);
    }

    public static String signed(double v) {
        if (!Double.isFinite(v)) {
            return v > 0 ? "+\u221e" : v < 0 ? "\u2212\u221e" : "n/a";
        }
        String s = String.format(Locale.ROOT, "%+.3f", v);
        return s.startsWith("-") ? "\u2212" + s.substring(1) : s;
    }

    /** BENJAMINI_HOCHBERG as Benjamini-Hochberg. */
    static String methodName(String constant) {
        StringBuilder sb = new StringBuilder();
        for (String w : constant.toLowerCase(Locale.ROOT).split("_")) {
            if (!w.isEmpty()) {
                sb.append(sb.length() == 0 ? "" : "-").append(Character.toUpperCase(w.charAt(0))).append(w.substring(1));
            }
        }
        return sb.toString();
    }

    static String kindLabel(FindingKind k) {
        return ReviewText.kindLabel(k);
    }

    private static String capitalised(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }

    /** Colours: baseline slate, current orange (distinct in the common colour-vision deficiencies). */
    public static final String CSS = """
            :root{--b:#5b7089;--bf:rgba(91,112,137,.28);--c:#d4570b;--cf:rgba(212,87,11,.18);--ink:#1d232b;\
            --muted:#5d6875;--line:#d9dee4;--bg:#f5f6f8}
            *{box-sizing:border-box}
            body{margin:0;background:var(--bg);color:var(--ink);font:15px/1.45 system-ui,-apple-system,"Segoe UI",\
            Roboto,"Helvetica Neue",Arial,sans-serif}
            main{max-width:1080px;margin:0 auto;padding:24px 28px 48px}
            h1{font-size:26px;margin:0 0 4px}
            h2{font-size:20px;margin:0 0 6px}
            .meta{color:var(--muted);margin:0 0 16px}
            .cautions{background:#fff8e1;border:1px solid #e6c35c;border-left:6px solid #d19a00;border-radius:6px;\
            padding:12px 18px;margin:0 0 20px}
            .cautions h2{font-size:16px;margin:0 0 4px}
            .cautions ul{margin:0;padding-left:20px}
            .cautions li{margin:2px 0}
            .contents{background:#fff;border:1px solid var(--line);border-radius:6px;padding:8px 18px;margin:0 0 20px}
            .contents ol{margin:0;padding-left:20px;columns:2}
            .contents a{color:#1f4f8f}
            .count{font-size:12px;background:#fde3d2;color:#8a3000;border-radius:9px;padding:0 7px}
            .count.zero{background:#e3efe3;color:#2f6b2f}
            .wave{background:#fff;border:1px solid var(--line);border-radius:8px;padding:18px 22px;margin:0 0 22px}
            .summary{color:var(--muted);margin:0 0 12px;font-size:14px}
            .tally{display:inline-block;border-radius:4px;padding:0 6px;margin-right:2px;color:#fff}
            .tally.zero{opacity:.45}
            .none{font-style:italic;color:#2f6b2f}
            .alert{border-top:1px solid var(--line);padding:14px 0 8px;border-left:4px solid transparent;padding-left:12px}
            .alert.v-material{border-left-color:#b3261e}
            .alert.v-uncertain{border-left-color:#b07b00}
            .alert.v-quality{border-left-color:#5b4b9a}
            .alert header{display:flex;gap:10px;align-items:baseline;flex-wrap:wrap}
            .badge{font-size:12px;font-weight:700;letter-spacing:.04em;color:#fff;border-radius:4px;padding:2px 8px}
            .v-material.badge,.tally.v-material{background:#b3261e}
            .v-minor.badge,.tally.v-minor{background:#4f6f96}
            .v-uncertain.badge,.tally.v-uncertain{background:#b07b00}
            .v-stable.badge,.tally.v-stable{background:#2f7d32}
            .v-cleared.badge,.tally.v-cleared{background:#3d8a8a}
            .review-status{margin:0 0 10px;font-size:14px}
            .signed-changed{background:#fdecea;border:2px solid #b3261e;border-radius:6px;padding:8px 12px;\
            font-weight:600;color:#7a1410}
            .population{background:#eef4fb;border:1px solid #9db8d9;border-radius:6px;padding:10px 18px;margin:0 0 20px}
            .population h2{font-size:16px;margin:0 0 4px}.population p{margin:0}
            .review-list{border-top:1px solid var(--line);padding:8px 0 0;margin:8px 0 0}
            .review-list h3{font-size:15px;margin:0 0 4px}.review-list ul{margin:0;padding-left:20px}
            .review-list.cleared h3{color:#2f6b2f}.review-list.muted{color:var(--muted)}
            .too-few{background:#fff;border:1px solid var(--line);border-left:6px solid #b07b00;border-radius:8px;\
            padding:14px 22px;margin:0 0 22px}
            .v-quality.badge{background:#5b4b9a}
            .variable{font-size:17px;font-weight:700;background:none}
            .kind{color:var(--muted)}
            .sentence{margin:6px 0 4px;max-width:76ch}
            .stats{font-size:13px;color:var(--muted);margin:0 0 8px;display:flex;flex-wrap:wrap;gap:4px 14px}
            .facets{margin:4px 0 8px;padding-left:18px}.facet{margin:2px 0}.facet .sentence{margin:0 0 0 4px}
            .facet-name{font-weight:600;font-size:13px}
            .where h3{font-size:15px;margin:8px 0 2px}
            .where-table{border-collapse:collapse;font-size:13px;margin:4px 0}
            .where-table caption{text-align:left;color:var(--muted);padding:2px 0}
            .where-table th,.where-table td{border:1px solid var(--line);padding:2px 8px;text-align:left}
            .where-table td.num{text-align:right;font-variant-numeric:tabular-nums}
            .where-table[data-differs] caption{color:var(--ink);font-weight:600}
            .where-test,.where-overall{font-size:13px;margin:2px 0;max-width:90ch}
            .where-method{color:var(--muted)}
            .where-notes{font-size:13px;color:var(--muted);margin:2px 0 8px;padding-left:18px}
            .stats .mde.unresolvable{color:#8a5a00;font-weight:600}
            .state{font-size:12px;border:1px solid var(--muted);color:var(--muted);border-radius:4px;padding:0 6px}
            .charts{display:flex;flex-wrap:wrap;gap:14px;align-items:flex-start}
            svg.plot{background:#fff;border:1px solid var(--line);border-radius:4px;max-width:100%;height:auto}
            svg.plot text{font-size:11px;fill:#39424e;font-family:inherit}
            svg.plot .axis-title,svg.plot .chart-title{font-size:12px;fill:#1d232b}
            svg.plot .chart-title{font-weight:600}
            svg.plot .note{fill:var(--muted);font-style:italic}
            svg.plot .axis{stroke:#7b8490;stroke-width:1}
            svg.plot .grid{stroke:#eceff2;stroke-width:1}
            svg.plot rect.b{fill:var(--b)}
            svg.plot rect.c{fill:var(--c)}
            svg.plot .hist.b{fill:var(--bf);stroke:var(--b);stroke-width:1.5}
            svg.plot .hist.c{fill:var(--cf);stroke:var(--c);stroke-width:2}
            svg.plot text.val.b{fill:var(--b)}
            svg.plot text.val.c{fill:var(--c);font-weight:600}
            svg.plot .line{fill:none;stroke:var(--b);stroke-width:2}
            svg.plot .pt{fill:var(--b)}
            svg.plot .pt.cur{fill:var(--c)}
            svg.plot .pt.c{fill:var(--c)}
            svg.plot line.ci.b{stroke:var(--b);stroke-width:2}
            svg.plot line.ci.c{stroke:var(--c);stroke-width:2.5}
            svg.plot.estimates.shares line.ci{stroke:#222;stroke-width:1.5}
            svg.plot .band{fill:var(--cf);stroke:none}
            svg.plot line.ref{stroke:#222;stroke-width:1.5;stroke-dasharray:4 3}
            svg.plot .cdf.b{fill:none;stroke:var(--b);stroke-width:1.5}
            svg.plot .cdf.c{fill:none;stroke:var(--c);stroke-width:2}
            svg.plot circle.step{fill:none;stroke:none}
            svg.plot line.gap{stroke:#222;stroke-width:3}
            svg.plot line.span.b{stroke:var(--bf);stroke-width:6}
            svg.plot line.span.c{stroke:var(--cf);stroke-width:6}
            footer{color:var(--muted);font-size:13px;text-align:center}
            @media print{body{background:#fff}.wave{break-inside:auto;border:none}.alert{break-inside:avoid}}
            """;
}
