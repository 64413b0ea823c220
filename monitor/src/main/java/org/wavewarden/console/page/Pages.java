package org.wavewarden.console.page;

import org.wavewarden.deliver.Cautions;
import org.wavewarden.deliver.ReviewText;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.WhereTables;
import org.wavewarden.deliver.html.VariablePlot;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.DigestAssembler;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewReason;
import org.wavewarden.review.Role;
import org.wavewarden.review.SignOff;
import org.wavewarden.store.ConsoleReads;
import org.wavewarden.store.ReleaseComparisons;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;

import static org.wavewarden.deliver.html.Html.esc;

/**
 * The console's pages as HTML text: pure functions of their records, every piece of data escaped, no script
 * needed, styles from {@code /console/static/console.css} only (the pages are served with a content security policy
 * that refuses inline styles and scripts). The element ids and form field names below are the console's contract
 * with its routes and its browser tests; see {@link org.wavewarden.console.ConsoleApp} for the routes.
 *
 * <p>The markup is written so that it is also well-formed XML (void elements closed with {@code />}, boolean
 * attributes given a value, only numeric character references besides the five XML ones): the tests read each page
 * with the JDK's XML parser, which catches an unclosed element or a stray ampersand that a browser would silently
 * repair.
 */
public final class Pages {

    private static final DateTimeFormatter WHEN = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm 'UTC'", Locale.ROOT)
            .withZone(ZoneOffset.UTC);

    /** The kind filter's and the grid's word for a finding without a verdict (a data-quality finding). */
    static final String NO_VERDICT = ConsoleReads.NO_VERDICT;

    private Pages() {
    }

    /** {@code GET /console}: table {@code #datasets}, one row per dataset. */
    public static String overview(Chrome chrome, List<OverviewRow> rows) {
        StringBuilder h = open(chrome, "Datasets");
        h.append("<h1>Datasets</h1>\n");
        if (rows.isEmpty()) {
            h.append("<p class=\"none\">No dataset has results yet: the first judged wave will appear here.</p>\n");
        }
        h.append("<div class=\"scroll\"><table id=\"datasets\"><caption>Each dataset's latest judged wave, its open"
                + " alerts and its sign-off</caption>\n<thead><tr><th scope=\"col\">Dataset</th>"
                + "<th scope=\"col\">Last wave judged</th><th scope=\"col\">Judged at</th>"
                + "<th scope=\"col\">Open MATERIAL</th><th scope=\"col\">Open UNCERTAIN</th>"
                + "<th scope=\"col\">Open, other</th><th scope=\"col\">Explained</th><th scope=\"col\">Muted</th>"
                + "<th scope=\"col\">Sign-off of the last wave</th><th scope=\"col\">Schedule</th>"
                + "<th scope=\"col\">Health</th></tr></thead>\n<tbody>\n");
        for (OverviewRow row : rows) {
            ConsoleReads.DatasetSummary s = row.summary();
            int material = s.openByVerdict().getOrDefault(Verdict.MATERIAL.name(), 0);
            int uncertain = s.openByVerdict().getOrDefault(Verdict.UNCERTAIN.name(), 0);
            int other = s.openByVerdict().values().stream().mapToInt(Integer::intValue).sum() - material - uncertain;
            h.append("<tr><th scope=\"row\"><a href=\"").append(datasetHref(s.dataset(), null)).append("\">")
                    .append(esc(s.dataset())).append("</a></th><td>");
            if (s.lastWave() == null) {
                h.append("none yet");
            } else {
                h.append("<a href=\"").append(waveHref(s.dataset(), s.lastWave())).append("\">")
                        .append(esc(s.lastWave())).append("</a>");
            }
            h.append("</td><td>").append(when(s.lastJudgedAt())).append("</td>");
            count(h, material, "count-material");
            count(h, uncertain, "count-uncertain");
            count(h, other, "count-other");
            count(h, s.byState().getOrDefault(AlertState.EXPLAINED, 0), "count-explained");
            count(h, s.byState().getOrDefault(AlertState.MUTED, 0), "count-muted");
            h.append("<td>");
            SignOff so = s.lastSignOff();
            if (s.lastWaveSignedOff() && so != null && Objects.equals(so.wave(), s.lastWave())) {
                h.append("<span class=\"signed\">&#10003; signed off by ").append(esc(so.actor())).append(" at ")
                        .append(when(so.signedAt()));
                if (so.release() != null && !so.release().isEmpty()) {
                    h.append(", release ").append(esc(so.release()));
                }
                h.append(so.forced() ? " (forced)" : "").append("</span>");
            } else if (so != null && Objects.equals(so.wave(), s.lastWave())) {
                // Signed on a run that has since been replaced: the release rests on other numbers.
                h.append("<span class=\"unsigned\">not signed off on these numbers (signed by ")
                        .append(esc(so.actor())).append(" at ").append(when(so.signedAt()))
                        .append(" on an earlier run)</span>");
            } else {
                h.append("<span class=\"unsigned\">not signed off</span>");
            }
            h.append("</td><td>").append(row.schedule() == null ? "none" : "<code>" + esc(row.schedule()) + "</code>")
                    .append("</td><td>").append(esc(row.health())).append("</td></tr>\n");
        }
        h.append("</tbody></table></div>\n");
        return close(h);
    }

    private static void count(StringBuilder h, int n, String cls) {
        h.append("<td class=\"num ").append(cls).append(n == 0 ? " zero" : "").append("\">").append(n).append("</td>");
    }

    /** {@code GET /console/dataset}: filter form {@code #grid-filter}, legend {@code #legend}, table {@code #grid}. */
    public static String grid(Chrome chrome, ConsoleReads.Grid grid, ConsoleReads.GridFilter filter) {
        ConsoleReads.GridFilter f = filter == null ? ConsoleReads.GridFilter.ANY : filter;
        StringBuilder h = open(chrome, "Dataset " + grid.dataset());
        String dataset = esc(grid.dataset());
        h.append("<h1>Dataset <code>").append(dataset).append("</code>: variables by waves</h1>\n");

        h.append("<form id=\"grid-filter\" class=\"filter\" method=\"get\" action=\"/console/dataset\">")
                .append("<input type=\"hidden\" name=\"name\" value=\"").append(dataset).append("\" />")
                .append("<label for=\"filter-kind\">Kind</label><select id=\"filter-kind\" name=\"kind\">")
                .append("<option value=\"\">any kind</option>");
        for (String k : grid.kinds()) {
            option(h, k, kindLabel(k), k.equals(f.kind()));
        }
        h.append("</select><label for=\"filter-verdict\">Verdict</label>")
                .append("<select id=\"filter-verdict\" name=\"verdict\"><option value=\"\">any verdict</option>");
        for (Verdict v : Verdict.values()) {
            option(h, v.name(), v.name(), v.name().equals(f.verdict()));
        }
        option(h, NO_VERDICT, "no verdict (data quality)", NO_VERDICT.equals(f.verdict()));
        h.append("</select><button type=\"submit\">Show</button></form>\n");

        legend(h);

        List<String> waves = grid.waves();
        if (grid.rows().isEmpty()) {
            h.append("<p class=\"none\" id=\"grid-empty\">No finding of this dataset matches the filter.</p>\n");
        }
        // Each wave's escaped name and link once, not once per cell: 300 rows x 40 waves is 12,000 cells.
        String[] waveText = new String[waves.size()];
        h.append("<div class=\"grid-scroll\"><table id=\"grid\"><caption>Each variable's most urgent finding per wave;"
                + " a cell links to that finding</caption>\n<thead><tr><th scope=\"col\">Variable</th>");
        for (int i = 0; i < waves.size(); i++) {
            waveText[i] = esc(waves.get(i));
            h.append("<th scope=\"col\"><a href=\"").append(waveHref(grid.dataset(), waves.get(i))).append("\">")
                    .append(waveText[i]).append("</a></th>");
        }
        h.append("</tr></thead>\n<tbody>\n");
        Map<String, String> kindText = new HashMap<>();
        for (ConsoleReads.GridRow row : grid.rows()) {
            String variable = esc(row.variable());
            h.append("<tr><th scope=\"row\"><code>").append(variable).append("</code>");
            if (row.label() != null && !row.label().isEmpty()) {
                h.append("<br /><span class=\"vlabel\">").append(esc(row.label())).append("</span>");
            }
            h.append("</th>");
            List<ConsoleReads.GridCell> cells = row.cells();
            for (int i = 0; i < waveText.length; i++) {
                ConsoleReads.GridCell c = i < cells.size() ? cells.get(i) : ConsoleReads.GridCell.EMPTY;
                if (c.empty()) {
                    h.append("<td class=\"empty\"><span class=\"sr\">no finding</span></td>");
                    continue;
                }
                Mark m = Mark.of(c.verdict());
                h.append("<td class=\"").append(m.cls);
                if (c.alertState() != null) {
                    h.append(" a-").append(stateKey(c.alertState()));
                }
                h.append("\"><a href=\"/console/finding?id=").append(c.findingId()).append("\" aria-label=\"")
                        .append(variable).append(", wave ").append(waveText[i]).append(", ")
                        .append(kindText.computeIfAbsent(c.kind() == null ? "" : c.kind(), k -> esc(kindLabel(k))))
                        .append(", ").append(m.word);
                if (c.findings() > 1) {
                    h.append(", ").append(c.findings()).append(" findings");
                }
                if (c.alertState() != null) {
                    h.append(", alert ").append(stateKey(c.alertState()));
                }
                h.append("\">").append(m.text).append("</a>");
                if (c.alertState() != null) {
                    h.append("<span class=\"state-mark\" aria-hidden=\"true\">").append(stateMark(c.alertState()))
                            .append("</span>");
                }
                h.append("</td>");
            }
            h.append("</tr>\n");
        }
        h.append("</tbody></table></div>\n");
        return close(h);
    }

    /** What each cell's symbol, word and colour mean, so that colour never carries the verdict alone. */
    private static void legend(StringBuilder h) {
        h.append("<section id=\"legend\" aria-labelledby=\"legend-title\"><h2 id=\"legend-title\">Legend</h2><ul>");
        for (Verdict v : Verdict.values()) {
            Mark m = Mark.of(v.name());
            h.append("<li data-verdict=\"").append(v.name()).append("\"><span class=\"key ").append(m.cls)
                    .append("\">").append(m.text).append("</span> ").append(v.name()).append(": ")
                    .append(esc(v.meaning())).append("</li>");
        }
        Mark q = Mark.of(null);
        h.append("<li data-verdict=\"").append(NO_VERDICT).append("\"><span class=\"key ").append(q.cls).append("\">")
                .append(q.text).append("</span> data quality: a problem in the answers themselves, no verdict</li>");
        for (AlertState s : AlertState.values()) {
            h.append("<li data-state=\"").append(s.name()).append("\"><span class=\"key state-mark\">")
                    .append(stateMark(s)).append("</span> alert ").append(stateKey(s)).append("</li>");
        }
        h.append("</ul></section>\n");
    }

    /** A verdict's cell: its colour class, its symbol with a three-letter abbreviation, and its word. */
    private record Mark(String cls, String text, String word) {
        private static final Map<Verdict, Mark> BY_VERDICT = new EnumMap<>(Verdict.class);
        private static final Mark QUALITY = new Mark("c-quality", "&#9632; DQ", "data quality");

        static {
            BY_VERDICT.put(Verdict.MATERIAL, new Mark("c-material", "&#9650; MAT", "MATERIAL"));
            BY_VERDICT.put(Verdict.MINOR, new Mark("c-minor", "&#9679; MIN", "MINOR"));
            BY_VERDICT.put(Verdict.UNCERTAIN, new Mark("c-uncertain", "&#9670; UNC", "UNCERTAIN"));
            BY_VERDICT.put(Verdict.STABLE, new Mark("c-stable", "&#9675; STA", "STABLE"));
            BY_VERDICT.put(Verdict.CLEARED, new Mark("c-cleared", "&#10003; CLR", "CLEARED"));
        }

        static Mark of(String verdict) {
            Verdict v = verdict(verdict);
            return v == null ? QUALITY : BY_VERDICT.get(v);
        }
    }

    private static Verdict verdict(String name) {
        if (name == null) {
            return null;
        }
        try {
            return Verdict.valueOf(name);
        } catch (IllegalArgumentException e) {
            return null;
        }
    }

    private static String stateKey(AlertState s) {
        return s.name().toLowerCase(Locale.ROOT);
    }

    /** A state's symbol beside the cell; the cell's accessible name says the state in words. */
    private static String stateMark(AlertState s) {
        return switch (s) {
            case OPEN -> "!";
            case EXPLAINED -> "&#10003;";
            case MUTED -> "~";
            case SUPERSEDED -> "&#215;";
        };
    }

    /**
     * {@code GET /console/finding}: {@code #sentence}, {@code #numbers}, {@code #plot}, {@code #trend},
     * {@code #history}, {@code #cautions}; forms {@code #explain-form}, {@code #mute-form}, {@code #unmute-form} when
     * the person may act and the finding has an alert.
     */
    public static String finding(Chrome chrome, ConsoleReads.FindingView finding) {
        return finding(chrome, finding, null);
    }

    /** The same with the finding's case list (null: it has none), linked as a CSV download with its count. */
    public static String finding(Chrome chrome, ConsoleReads.FindingView finding,
                                 org.wavewarden.store.CaseLists.CaseList cases) {
        Finding f = finding.finding();
        StringBuilder h = open(chrome, f.variable() + " in " + finding.wave());
        h.append("<h1><code>").append(esc(f.variable())).append("</code>");
        if (f.label() != null && !f.label().isEmpty()) {
            h.append(" <span class=\"vlabel\">").append(esc(f.label())).append("</span>");
        }
        h.append("</h1>\n<p class=\"meta\">").append(esc(kindLabel(f.kind() == null ? null : f.kind().name())))
                .append(f.verdict() == null ? "" : ", " + f.verdict().name()).append(" in dataset <a href=\"")
                .append(datasetHref(finding.dataset(), null)).append("\">").append(esc(finding.dataset()))
                .append("</a>, wave <a href=\"").append(waveHref(finding.dataset(), finding.wave())).append("\">")
                .append(esc(finding.wave())).append("</a>");
        // The finding's own baseline when the run judged several (the run's key names them all), else the run's.
        String against = f.against() != null ? org.wavewarden.judge.Against.wavesOf(f.against())
                : org.wavewarden.judge.Against.mainOf(finding.againstWave());
        if (against != null && !against.isEmpty()) {
            h.append(" against wave <a href=\"").append(waveHref(finding.dataset(), against)).append("\">")
                    .append(esc(against)).append("</a>");
            if (f.against() != null) {
                h.append(" (<span class=\"against\">").append(esc(org.wavewarden.judge.Against.rule(f.against())))
                        .append("</span>)");
            }
        }
        if (finding.alert() != null) {
            h.append("; alert ").append(finding.alert().alertId()).append(" <span class=\"state a-")
                    .append(stateKey(finding.alert().state())).append("\">")
                    .append(stateKey(finding.alert().state())).append("</span>");
        }
        h.append("</p>\n<p id=\"sentence\" class=\"sentence\">").append(esc(f.sentence())).append("</p>\n");
        if (cases != null) {
            h.append("<p id=\"cases\" class=\"cases\">Case list for the field team: <a href=\"/console/cases?finding=")
                    .append(cases.findingId()).append("\">").append(esc(cases.count())).append(" (CSV)</a></p>\n");
        }

        numbers(h, f, baselineName(against), finding.wave());
        if (!f.breakdowns().isEmpty()) {
            // The page does not know the run's alpha, so the intervals' heading names no level.
            h.append("<section id=\"where\" aria-label=\"Where it changed\">")
                    .append(WhereTables.html(f, baselineName(against), finding.wave(), Double.NaN))
                    .append("</section>\n");
        }

        h.append("<section id=\"plot\" aria-labelledby=\"plot-title\"><h2 id=\"plot-title\">Both waves</h2>\n")
                .append(plot(finding.dataset(), finding.wave(), against, f)).append("\n</section>\n");

        h.append("<section id=\"trend\" aria-labelledby=\"trend-title\"><h2 id=\"trend-title\">Across waves</h2>\n");
        TrendChart.render(h, f.variable(), finding.trend(), finding.wave());
        h.append("</section>\n");

        history(h, finding.history());
        cautions(h);
        forms(h, chrome, finding.alert());
        return close(h);
    }

    /**
     * The chart the HTML digest draws for this finding, by the digest's own code: the finding's picture as the digest
     * assembles it, drawn by the digest's function for that kind of picture. A finding whose numbers cannot be drawn
     * gets a note; the rest of the page still shows.
     */
    public static String plot(String dataset, String wave, String againstWave, Finding f) {
        try {
            VariablePlot p = DigestAssembler.findingPlot(f, DigestAssembler.findingId(dataset, wave, f));
            if (p == null) {
                return "<p class=\"note\">This finding stores no picture of its own: the digest draws a data-quality"
                        + " finding from the wave's answers, which the console does not read.</p>";
            }
            return HtmlDigest.plot(f.variable(), p, baselineName(againstWave), wave);
        } catch (RuntimeException e) {
            return "<p class=\"note\">The picture of this finding could not be drawn ("
                    + esc(e.getClass().getSimpleName()) + ").</p>";
        }
    }

    /** The digest's name for the baseline side when a wave has no comparison wave. */
    private static String baselineName(String againstWave) {
        return againstWave == null || againstWave.isEmpty() ? "baseline" : againstWave;
    }

    private static void numbers(StringBuilder h, Finding f, String baselineWave, String wave) {
        h.append("<section aria-labelledby=\"numbers-title\"><h2 id=\"numbers-title\">Numbers</h2>\n")
                .append("<dl id=\"numbers\" class=\"numbers\">");
        term(h, "Test", f.test() == null ? "none" : esc(f.test()));
        term(h, "Statistic", f.statistic() == null ? "none" : esc(fmt("%.4g", f.statistic())));
        if (f.df() != null) {
            term(h, "Degrees of freedom", esc(fmt("%.4g", f.df()))
                    + (f.dfConvention() == null ? "" : " (" + esc(f.dfConvention()) + ")"));
        }
        if (f.pValue() == null) {
            term(h, "p", f.effect() == null ? "none" : "judged by size: complete enumeration");
        } else {
            term(h, "p", esc(pValue(f.pValue())));
        }
        if (f.qValue() != null) {
            term(h, "q", esc(pValue(f.qValue())) + (f.fdrMethod() == null ? "" : " (" + esc(f.fdrMethod())
                    + (f.fdrFamilySize() == null ? "" : ", " + f.fdrFamilySize() + " p-values") + ")"));
        }
        Finding.Effect e = f.effect();
        if (e != null) {
            term(h, "Effect", esc(e.name()) + " " + esc(signed(e.estimate())) + ", interval "
                    + esc(signed(e.ciLow())) + " to " + esc(signed(e.ciHigh())));
            term(h, "Threshold", "&#177;" + esc(fmt("%.3g", e.threshold())));
            double mde = e.minimumDetectable();
            term(h, "Smallest detectable change", (Double.isFinite(mde) ? "&#177;" + esc(fmt("%.3g", mde)) : "n/a")
                    + (e.resolvable() ? " (resolves the threshold)" : " (too few answers to resolve the threshold)"));
        }
        term(h, "n, " + esc(baselineWave), f.nBaseline() == null ? "none" : String.valueOf(f.nBaseline()));
        term(h, "n, " + esc(wave), f.nCurrent() == null ? "none" : String.valueOf(f.nCurrent()));
        Finding.Repeat r = f.repeat();
        term(h, "Repeat", r == null ? "news: not a repeat" : esc(r.kind().name().toLowerCase(Locale.ROOT)
                .replace('_', ' ')) + " since wave " + esc(r.firstWave()) + ", as in wave " + esc(r.previousWave()));
        h.append("</dl></section>\n");
    }

    private static void term(StringBuilder h, String term, String escapedValue) {
        h.append("<dt>").append(term).append("</dt><dd>").append(escapedValue).append("</dd>");
    }

    private static void history(StringBuilder h, List<ReviewEntry> entries) {
        h.append("<section aria-labelledby=\"history-title\"><h2 id=\"history-title\">Alert history</h2>\n");
        if (entries.isEmpty()) {
            h.append("<p class=\"none\">No alert, so no history.</p>\n");
        }
        h.append("<table id=\"history\"><thead><tr><th scope=\"col\">When</th><th scope=\"col\">Who</th>"
                + "<th scope=\"col\">Action</th><th scope=\"col\">Reason</th><th scope=\"col\">Note</th>"
                + "<th scope=\"col\">Source</th></tr></thead><tbody>");
        for (ReviewEntry e : entries) {
            h.append("<tr><td>").append(when(e.at())).append("</td><td>").append(esc(e.actor())).append("</td><td>")
                    .append(e.action() == null ? "" : e.action().name().toLowerCase(Locale.ROOT));
            if (e.untilWave() != null) {
                h.append(" until wave ").append(esc(e.untilWave()));
            }
            if (e.untilDate() != null) {
                h.append(" until ").append(e.untilDate());
            }
            h.append("</td><td>").append(e.reason() == null ? "" : esc(e.reason().key())).append("</td><td>")
                    .append(esc(e.note())).append("</td><td>").append(esc(e.source())).append("</td></tr>");
        }
        h.append("</tbody></table></section>\n");
    }

    private static void cautions(StringBuilder h) {
        h.append("<aside id=\"cautions\" class=\"cautions\" role=\"note\" aria-labelledby=\"cautions-title\">")
                .append("<h2 id=\"cautions-title\">Read with care</h2><ul>");
        for (String line : Cautions.LINES) {
            h.append("<li>").append(esc(line)).append("</li>");
        }
        h.append("</ul></aside>\n");
    }

    /** A steward's forms: explain and mute an alert that a later run has not replaced, unmute a muted one. */
    private static void forms(StringBuilder h, Chrome chrome, AlertView alert) {
        if (alert == null || chrome == null || chrome.role() == null || !chrome.role().includes(Role.STEWARD)) {
            return;
        }
        h.append("<section id=\"actions\" aria-labelledby=\"actions-title\"><h2 id=\"actions-title\">Review this"
                + " alert</h2>\n");
        if (alert.state() == AlertState.SUPERSEDED) {
            h.append("<p class=\"none\">A later run replaced this alert; review the current one.</p></section>\n");
            return;
        }
        String id = String.valueOf(alert.alertId());
        h.append("<form id=\"explain-form\" class=\"action\" method=\"post\" action=\"/console/alert/explain\">")
                .append("<h3>Explain</h3>");
        hidden(h, "alert", id);
        csrf(h, chrome);
        reasons(h, "explain-reason");
        h.append("<label for=\"explain-note\">Note</label><textarea id=\"explain-note\" name=\"note\" rows=\"3\">")
                .append("</textarea><button type=\"submit\">Explain</button></form>\n");

        h.append("<form id=\"mute-form\" class=\"action\" method=\"post\" action=\"/console/alert/mute\">")
                .append("<h3>Mute</h3>");
        hidden(h, "alert", id);
        csrf(h, chrome);
        reasons(h, "mute-reason");
        h.append("<label for=\"mute-note\">Note</label><textarea id=\"mute-note\" name=\"note\" rows=\"3\">")
                .append("</textarea><label for=\"mute-until-wave\">Until wave (the last wave muted)</label>")
                .append("<input id=\"mute-until-wave\" name=\"untilWave\" type=\"text\" />")
                .append("<label for=\"mute-until-date\">Until date (the last day muted)</label>")
                .append("<input id=\"mute-until-date\" name=\"untilDate\" type=\"date\" />")
                .append("<button type=\"submit\">Mute</button></form>\n");

        if (alert.state() == AlertState.MUTED) {
            h.append("<form id=\"unmute-form\" class=\"action\" method=\"post\" action=\"/console/alert/unmute\">")
                    .append("<h3>Unmute</h3>");
            hidden(h, "alert", id);
            csrf(h, chrome);
            h.append("<label for=\"unmute-note\">Note</label><textarea id=\"unmute-note\" name=\"note\" rows=\"2\">")
                    .append("</textarea><button type=\"submit\">Unmute</button></form>\n");
        }
        h.append("</section>\n");
    }

    private static void reasons(StringBuilder h, String id) {
        h.append("<label for=\"").append(id).append("\">Reason</label><select id=\"").append(id)
                .append("\" name=\"reason\" required=\"required\">");
        for (ReviewReason r : ReviewReason.values()) {
            option(h, r.key(), r.key() + ": " + r.meaning(), false);
        }
        h.append("</select>");
    }

    /**
     * {@code GET /console/wave}: sections {@code #alerts-open}, {@code #alerts-explained}, {@code #alerts-muted},
     * {@code #alerts-superseded}; {@code #signoff-record}; form {@code #signoff-form} for a releaser;
     * {@code #release-comparison} when the wave was published more than once and compared; {@code #downloads}.
     * {@code refusal}, when not null, says why a sign-off was just refused (shown in
     * {@code #refusal}).
     */
    public static String wave(Chrome chrome, ConsoleReads.WaveView wave, String refusal) {
        return wave(chrome, wave, refusal, Map.of());
    }

    /**
     * The wave page with each alert linked to its lead finding's page: {@code findingOfAlert} maps an alert id to
     * its lead finding's id. An alert missing from the map links to the dataset's grid filtered to its kind, where
     * its cell leads on.
     */
    public static String wave(Chrome chrome, ConsoleReads.WaveView wave, String refusal,
                              Map<Long, Long> findingOfAlert) {
        StringBuilder h = open(chrome, "Wave " + wave.wave() + " of " + wave.dataset());
        h.append("<h1>Wave <code>").append(esc(wave.wave())).append("</code> of <a href=\"")
                .append(datasetHref(wave.dataset(), null)).append("\">").append(esc(wave.dataset()))
                .append("</a></h1>\n");
        if (refusal != null) {
            h.append("<p id=\"refusal\" class=\"refusal\" role=\"alert\"><strong>Sign-off refused.</strong> ")
                    .append(esc(refusal)).append("</p>\n");
        }
        h.append("<dl id=\"wave-summary\" class=\"numbers\">");
        if (wave.runId() == 0) {
            term(h, "Run", "this wave has no current run");
        } else {
            String against = wave.againstWave();
            term(h, "Against", against == null || against.isEmpty() ? "no comparison wave"
                    : "<a href=\"" + waveHref(wave.dataset(), against) + "\">" + esc(against) + "</a>");
            term(h, "Judged at", when(wave.judgedAt()));
            term(h, "Run", String.valueOf(wave.runId()));
            term(h, "Configuration fingerprint", "<code>" + esc(wave.configFingerprint()) + "</code>");
            term(h, "Tool version", esc(wave.toolVersion()));
            term(h, "Findings", String.valueOf(wave.findings()));
        }
        h.append("</dl>\n");

        Map<AlertState, List<AlertView>> byState = new EnumMap<>(AlertState.class);
        for (AlertView a : wave.alerts()) {
            byState.computeIfAbsent(a.state() == null ? AlertState.OPEN : a.state(), s -> new ArrayList<>()).add(a);
        }
        for (AlertState s : AlertState.values()) {
            List<AlertView> alerts = byState.getOrDefault(s, List.of());
            String key = stateKey(s);
            h.append("<section id=\"alerts-").append(key).append("\" class=\"alerts\" aria-labelledby=\"alerts-")
                    .append(key).append("-title\"><h2 id=\"alerts-").append(key).append("-title\">")
                    .append(Character.toUpperCase(key.charAt(0))).append(key.substring(1)).append(" alerts (")
                    .append(alerts.size()).append(")</h2>\n");
            if (alerts.isEmpty()) {
                h.append("<p class=\"none\">None.</p>\n");
            } else {
                h.append("<ul class=\"alert-list\">");
                for (AlertView a : alerts) {
                    alertItem(h, a, findingOfAlert.get(a.alertId()));
                }
                h.append("</ul>\n");
            }
            h.append("</section>\n");
        }

        signOffs(h, wave.signOffs());
        if (chrome != null && chrome.role() != null && chrome.role().includes(Role.RELEASER) && wave.runId() != 0) {
            h.append("<form id=\"signoff-form\" class=\"action\" method=\"post\" action=\"/console/signoff\">")
                    .append("<h2>Sign this wave off</h2>");
            hidden(h, "dataset", wave.dataset());
            hidden(h, "wave", wave.wave());
            // The run this page showed: a sign-off posted after the wave was judged again is refused.
            hidden(h, "run", String.valueOf(wave.runId()));
            csrf(h, chrome);
            h.append("<label for=\"signoff-release\">Release (revision), empty for none</label>")
                    .append("<input id=\"signoff-release\" name=\"release\" type=\"text\" />")
                    .append("<div class=\"check\"><input id=\"signoff-force\" name=\"force\" type=\"checkbox\"")
                    .append(" value=\"true\" /><label for=\"signoff-force\">Force: sign off although a MATERIAL")
                    .append(" alert is open</label></div>")
                    .append("<label for=\"signoff-reason\">Reason for forcing</label>")
                    .append("<textarea id=\"signoff-reason\" name=\"reason\" rows=\"2\"></textarea>")
                    .append("<button type=\"submit\">Sign off</button></form>\n");
        }

        releaseComparisons(h, wave);

        h.append("<section id=\"downloads\" aria-labelledby=\"downloads-title\"><h2 id=\"downloads-title\">")
                .append("Downloads</h2><ul>");
        for (String file : List.of("findings.json", "digest.md")) {
            h.append("<li><a href=\"/console/download?dataset=").append(q(wave.dataset())).append("&amp;wave=")
                    .append(q(wave.wave())).append("&amp;file=").append(file).append("\">").append(file)
                    .append("</a></li>");
        }
        h.append("</ul></section>\n");
        return close(h);
    }

    private static void alertItem(StringBuilder h, AlertView a, Long findingId) {
        String href = findingId != null ? "/console/finding?id=" + findingId
                : datasetHref(a.dataset(), a.kind());
        Mark m = Mark.of(a.verdict());
        h.append("<li class=\"alert-item\"><span class=\"key ").append(m.cls).append("\">")
                .append(m.text).append("</span> <a href=\"").append(href).append("\"><code>")
                .append(esc(a.variable())).append("</code></a> <span class=\"kind\">").append(esc(kindLabel(a.kind())))
                .append("</span> <span class=\"verdict\">").append(a.verdict() == null ? "no verdict"
                        : esc(a.verdict())).append("</span><br /><span class=\"sentence\">").append(esc(a.sentence()))
                .append("</span>");
        ReviewEntry last = a.last();
        if (last != null) {
            h.append("<br /><span class=\"last\">Last: ").append(last.action() == null ? ""
                            : last.action().name().toLowerCase(Locale.ROOT)).append(" by ").append(esc(last.actor()))
                    .append(" at ").append(when(last.at()));
            if (last.reason() != null) {
                h.append(" (").append(esc(last.reason().key())).append(")");
            }
            if (last.note() != null && !last.note().isEmpty()) {
                h.append(": ").append(esc(last.note()));
            }
            h.append("</span>");
        }
        h.append("</li>");
    }

    private static void signOffs(StringBuilder h, List<SignOff> signOffs) {
        h.append("<section aria-labelledby=\"signoff-title\"><h2 id=\"signoff-title\">Sign-offs</h2>\n");
        if (signOffs.isEmpty()) {
            h.append("<p class=\"none\">Not signed off.</p>\n");
        }
        h.append("<table id=\"signoff-record\"><thead><tr><th scope=\"col\">Who</th><th scope=\"col\">When</th>"
                + "<th scope=\"col\">Release</th><th scope=\"col\">Forced</th><th scope=\"col\">Run</th>"
                + "<th scope=\"col\">Alerts at sign-off</th></tr></thead><tbody>");
        for (SignOff so : signOffs) {
            h.append("<tr><td>").append(esc(so.actor())).append("</td><td>").append(when(so.signedAt()))
                    .append("</td><td>").append(so.release() == null || so.release().isEmpty() ? "none"
                            : esc(so.release())).append("</td><td>")
                    .append(so.forced() ? "forced: " + esc(so.forceReason()) : "no").append("</td><td>")
                    .append(so.runId()).append("</td><td>");
            Map<AlertState, Integer> n = new EnumMap<>(AlertState.class);
            for (AlertView a : so.alertsAtSignOff()) {
                n.merge(a.state() == null ? AlertState.OPEN : a.state(), 1, Integer::sum);
            }
            if (n.isEmpty()) {
                h.append("none");
            }
            List<String> parts = new ArrayList<>();
            n.forEach((s, c) -> parts.add(c + " " + stateKey(s)));
            h.append(String.join(", ", parts)).append("</td></tr>");
        }
        h.append("</tbody></table></section>\n");
    }

    /**
     * Section {@code #release-comparison}: every comparison of the wave's publications (table
     * {@code #release-comparisons}, latest first, with its counts), the latest one's {@code releases.md} as
     * preformatted text ({@code #release-markdown}, escaped: it carries labels and cell values from the data, so it
     * is text here, never markup) and links to its two files. Absent for a wave published once.
     */
    private static void releaseComparisons(StringBuilder h, ConsoleReads.WaveView wave) {
        List<ReleaseComparisons.Stored> comparisons = wave.releaseComparisons();
        if (comparisons.isEmpty()) {
            return;
        }
        h.append("<section id=\"release-comparison\" aria-labelledby=\"release-title\"><h2 id=\"release-title\">")
                .append("Release comparison</h2>\n");
        h.append("<div class=\"scroll\"><table id=\"release-comparisons\"><thead><tr>")
                .append("<th scope=\"col\">Release</th><th scope=\"col\">Against</th><th scope=\"col\">Compared at</th>")
                .append("<th scope=\"col\">Rows before</th><th scope=\"col\">Rows after</th>")
                .append("<th scope=\"col\">Matched</th><th scope=\"col\">Added</th><th scope=\"col\">Removed</th>")
                .append("<th scope=\"col\">Cells compared</th><th scope=\"col\">Cells changed</th>")
                .append("<th scope=\"col\">Variables changed</th><th scope=\"col\">Tool version</th>")
                .append("</tr></thead><tbody>");
        for (ReleaseComparisons.Stored c : comparisons) {
            h.append("<tr><td>").append(esc(c.release())).append("</td><td>").append(esc(c.againstRelease()))
                    .append("</td><td>").append(when(c.comparedAt())).append("</td>");
            for (long n : new long[]{c.rowsBefore(), c.rowsAfter(), c.matched(), c.rowsAdded(), c.rowsRemoved(),
                    c.cellsCompared(), c.cellsChanged(), c.variablesChanged()}) {
                h.append("<td class=\"num\">").append(n).append("</td>");
            }
            h.append("<td>").append(esc(c.toolVersion() == null ? "unknown" : c.toolVersion())).append("</td></tr>");
        }
        h.append("</tbody></table></div>\n");
        ReleaseComparisons.Stored latest = comparisons.get(0);
        h.append("<h3 id=\"release-markdown-title\">The latest comparison as written to releases.md</h3>\n")
                .append("<div class=\"scroll\"><pre id=\"release-markdown\" aria-labelledby=\"release-markdown-title\">")
                .append(esc(latest.markdown())).append("</pre></div>\n<ul>");
        for (String file : List.of("releases.md", "releases.json")) {
            h.append("<li><a href=\"/console/download?dataset=").append(q(wave.dataset())).append("&amp;wave=")
                    .append(q(wave.wave())).append("&amp;file=").append(file).append("\">").append(file)
                    .append(" of the latest comparison</a></li>");
        }
        h.append("</ul></section>\n");
    }

    /** {@code GET /console/search}: table {@code #search-results}. */
    public static String search(Chrome chrome, String query, List<ConsoleReads.SearchHit> hits) {
        StringBuilder h = open(chrome, "Search", query);
        h.append("<h1>Variables matching &#8220;<span id=\"query\">").append(esc(query)).append("</span>&#8221;</h1>\n");
        h.append("<p class=\"meta\">").append(hits.size()).append(hits.size() == 1 ? " variable" : " variables")
                .append(" found by name or label.</p>\n");
        if (hits.isEmpty()) {
            h.append("<p class=\"none\" id=\"search-none\">No variable's name or label contains this text.</p>\n");
        }
        h.append("<table id=\"search-results\"><thead><tr><th scope=\"col\">Dataset</th><th scope=\"col\">Variable"
                + "</th><th scope=\"col\">Label</th><th scope=\"col\">Last wave</th><th scope=\"col\">Verdict</th>"
                + "<th scope=\"col\">Finding</th></tr></thead><tbody>");
        for (ConsoleReads.SearchHit hit : hits) {
            Mark m = Mark.of(hit.verdict());
            h.append("<tr><td><a href=\"").append(datasetHref(hit.dataset(), null)).append("\">")
                    .append(esc(hit.dataset())).append("</a></td><th scope=\"row\"><code>").append(esc(hit.variable()))
                    .append("</code></th><td>").append(esc(hit.label())).append("</td><td>");
            if (hit.lastWave() != null) {
                h.append("<a href=\"").append(waveHref(hit.dataset(), hit.lastWave())).append("\">")
                        .append(esc(hit.lastWave())).append("</a>");
            }
            h.append("</td><td class=\"").append(m.cls).append("\">").append(m.text).append(" ").append(m.word)
                    .append("</td><td>");
            if (hit.findingId() != 0) {
                h.append("<a href=\"/console/finding?id=").append(hit.findingId()).append("\">finding ")
                        .append(hit.findingId()).append("</a>");
            }
            h.append("</td></tr>");
        }
        h.append("</tbody></table>\n");
        return close(h);
    }

    /** {@code GET /console/login}: form {@code #login-form}; {@code error} in {@code #login-error} when not null. */
    public static String login(String csrfToken, String error, String next) {
        StringBuilder h = open(null, "Log in");
        h.append("<h1>Log in</h1>\n");
        if (error != null) {
            h.append("<p id=\"login-error\" class=\"refusal\" role=\"alert\">").append(esc(error)).append("</p>\n");
        }
        h.append("<form id=\"login-form\" class=\"action login\" method=\"post\" action=\"/console/login\">");
        hidden(h, "csrf", csrfToken);
        hidden(h, "next", next == null ? "/console" : next);
        h.append("<label for=\"login-name\">Name</label><input id=\"login-name\" name=\"name\" type=\"text\"")
                .append(" autocomplete=\"username\" required=\"required\" />")
                .append("<label for=\"login-password\">Password</label><input id=\"login-password\" name=\"password\"")
                .append(" type=\"password\" autocomplete=\"current-password\" required=\"required\" />")
                .append("<button type=\"submit\">Log in</button></form>\n");
        return close(h);
    }

    /** A refusal or an error (403, 404, 409, ...): the message in {@code #problem}. */
    public static String problem(Chrome chrome, int status, String message) {
        StringBuilder h = open(chrome, "Problem " + status);
        h.append("<h1>").append(status).append(' ').append(reason(status)).append("</h1>\n<p id=\"problem\"")
                .append(" class=\"refusal\">").append(esc(message)).append("</p>\n<p><a href=\"/console\">Back to the")
                .append(" datasets</a></p>\n");
        return close(h);
    }

    private static String reason(int status) {
        return switch (status) {
            case 400 -> "Bad request";
            case 403 -> "Not allowed";
            case 404 -> "Not found";
            case 405 -> "Method not allowed";
            case 409 -> "Refused";
            case 500 -> "Server error";
            default -> "Problem";
        };
    }

    /** The console's style sheet, served at {@code /console/static/console.css}. */
    public static String css() {
        return CssHolder.CSS;
    }

    /**
     * The digest's rules first (its charts' classes, so a finding's plot looks as it does in the digest), then the
     * console's own, which override the digest's page layout where both name an element.
     */
    private static final class CssHolder {
        static final String CSS = "/* The digest's rules: its charts' classes. */\n" + HtmlDigest.CSS
                + "\n/* The console's own rules. */\n" + resource("/console/console.css");

        private static String resource(String name) {
            try (InputStream in = Pages.class.getResourceAsStream(name)) {
                if (in == null) {
                    throw new IllegalStateException("the console's style sheet " + name + " is not in the build");
                }
                return new String(in.readAllBytes(), StandardCharsets.UTF_8);
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
    }

    // ---- the frame every page shares -------------------------------------------------------------------------

    private static StringBuilder open(Chrome chrome, String title) {
        return open(chrome, title, null);
    }

    private static StringBuilder open(Chrome chrome, String title, String query) {
        StringBuilder h = new StringBuilder(8192);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\" />\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\" />\n<title>")
                .append(esc(title)).append(" &#8211; Wavewarden console</title>\n")
                .append("<link rel=\"icon\" href=\"data:,\" />\n") // else the browser asks /favicon.ico: a 404
                .append("<link rel=\"stylesheet\" href=\"/console/static/console.css\" />\n</head>\n<body>\n")
                .append("<a class=\"skip\" href=\"#main\">Skip to content</a>\n<header class=\"top\">")
                .append("<a class=\"brand\" href=\"/console\">Wavewarden</a>");
        boolean loggedIn = chrome != null && chrome.user() != null;
        if (loggedIn) {
            h.append("<form id=\"search-form\" class=\"search\" method=\"get\" action=\"/console/search\"")
                    .append(" role=\"search\"><label for=\"search-q\">Search variables</label>")
                    .append("<input id=\"search-q\" name=\"q\" type=\"search\" value=\"").append(esc(query))
                    .append("\" /><button type=\"submit\">Search</button></form>")
                    .append("<div class=\"who\"><span id=\"user\">").append(esc(chrome.user())).append("</span>");
            if (chrome.role() != null) {
                h.append(" <span id=\"role\" class=\"role\">").append(chrome.role().key()).append("</span>");
            }
            h.append("<form id=\"logout-form\" method=\"post\" action=\"/console/logout\">");
            csrf(h, chrome);
            h.append("<button id=\"logout\" type=\"submit\">Log out</button></form></div>");
        }
        h.append("</header>\n");
        if (chrome != null && chrome.notice() != null) {
            h.append("<p id=\"notice\" class=\"notice\" role=\"status\">").append(esc(chrome.notice())).append("</p>\n");
        }
        h.append("<main id=\"main\" tabindex=\"-1\">\n");
        return h;
    }

    private static String close(StringBuilder h) {
        return h.append("</main>\n</body>\n</html>\n").toString();
    }

    private static void csrf(StringBuilder h, Chrome chrome) {
        hidden(h, "csrf", chrome.csrfToken());
    }

    private static void hidden(StringBuilder h, String name, String value) {
        h.append("<input type=\"hidden\" name=\"").append(name).append("\" value=\"").append(esc(value)).append("\" />");
    }

    private static void option(StringBuilder h, String value, String text, boolean selected) {
        h.append("<option value=\"").append(esc(value)).append("\"").append(selected ? " selected=\"selected\"" : "")
                .append(">").append(esc(text)).append("</option>");
    }

    // ---- links and words ------------------------------------------------------------------------------------

    /** A query value as a URL encodes it; as it contains no quote, ampersand or angle bracket, it is attribute-safe. */
    /** A query value in a console address: the one encoder of the console's links, redirects and requests. */
    public static String q(String value) {
        return URLEncoder.encode(value == null ? "" : value, StandardCharsets.UTF_8);
    }

    static String datasetHref(String dataset, String kind) {
        return "/console/dataset?name=" + q(dataset) + (kind == null ? "" : "&amp;kind=" + q(kind));
    }

    static String waveHref(String dataset, String wave) {
        return "/console/wave?dataset=" + q(dataset) + "&amp;wave=" + q(wave);
    }

    static String when(Instant at) {
        return at == null ? "never" : WHEN.format(at);
    }

    /** A kind's words as the digests use them; a kind this version does not know is shown as stored. */
    static String kindLabel(String kind) {
        if (kind == null || kind.isEmpty()) {
            return "unknown kind";
        }
        try {
            return ReviewText.kindLabel(FindingKind.valueOf(kind));
        } catch (IllegalArgumentException e) {
            return kind;
        }
    }

    static String fmt(String pattern, double v) {
        return String.format(Locale.ROOT, pattern, v);
    }

    /** As the HTML digest writes a p- or q-value. */
    static String pValue(double p) {
        return HtmlDigest.pValue(p);
    }

    /** A signed estimate as the HTML digest writes it. */
    static String signed(double v) {
        return HtmlDigest.signed(v);
    }
}
