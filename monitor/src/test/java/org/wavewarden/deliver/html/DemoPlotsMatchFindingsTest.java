package org.wavewarden.deliver.html;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.OutputPaths;
import org.wavewarden.demo.DemoRun;
import org.wavewarden.judge.Against;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * Every alert's picture in both demo digests holds the numbers of its finding in {@code findings.json}: each plotted
 * baseline and current value and its interval equal the finding's estimates exactly (the SVG writes them at full
 * precision), the category drawn first is the one the sentence names, a reference finding draws its reference, the
 * trend's point at the judged wave is the finding's current estimate, and no legend speaks of a baseline of 0 rows.
 */
class DemoPlotsMatchFindingsTest {

    @TempDir
    static Path dir;
    static DemoRun.Outcome outcome;
    static final ObjectMapper JSON = new ObjectMapper();

    @BeforeAll
    static void runTheDemo() {
        outcome = DemoRun.run(dir.resolve("demo"), new PrintWriter(new StringWriter()));
    }

    @Test
    void everyHouseholdAlertIsDrawnFromItsFindingsNumbers() throws Exception {
        int held = checkDataset("harrowmere-household", outcome.outDir());
        assertTrue(held > 5, "alerts held to their estimates: " + held);
    }

    @Test
    void everyPanelAlertIsDrawnFromItsFindingsNumbers() throws Exception {
        int held = checkDataset("harrowmere-panel", outcome.outDir().resolve(DemoRun.PANEL_FOLDER));
        assertTrue(held > 3, "alerts held to their estimates: " + held);
    }

    /**
     * Paired alerts are held like the others, to the paired respondents' estimates; an alert led by a change of
     * shape or a comparison of dates would be held to its curves or dates ({@code checkShape}, {@code checkDates}),
     * but the demo has none, so FindingPicturesTest holds those pictures on findings built for them.
     */
    @Test
    void pairedAlertsAreDrawnFromThePairedRespondentsEstimates() throws Exception {
        heldByKind.clear();
        checkDataset("harrowmere-panel", outcome.outDir().resolve(DemoRun.PANEL_FOLDER));
        assertTrue(heldByKind.getOrDefault("PANEL_SHIFT", 0) > 0, "paired alerts held: " + heldByKind);
    }

    /** Alerts held to their finding's numbers, by the kind of picture: PANEL_SHIFT, SHAPE_CHANGE, DATE, others. */
    static final Map<String, Integer> heldByKind = new java.util.concurrent.ConcurrentHashMap<>();

    /** Checks every alert of one dataset's digest; returns how many were held to estimates. */
    private int checkDataset(String dataset, Path folder) throws Exception {
        String html = Files.readString(folder.resolve("digest.html"));
        Map<String, String> sections = sections(html);
        int held = 0;
        int alerts = 0;
        for (String wave : sections.keySet()) {
            JsonNode report = JSON.readTree(Files.readString(OutputPaths.under(folder, wave).resolve("findings.json")));
            // The run's key names every baseline ("2024-Q4 + 2024-Q1 (4 waves back)"); its main one comes first.
            String runAgainst = report.path("againstWave").isNull() ? null
                    : Against.mainOf(report.path("againstWave").asText(null));
            List<String[]> articles = articles(sections.get(wave));
            for (String[] a : articles) {
                alerts++;
                String variable = a[0];
                String kind = a[1];
                String body = a[2];
                String where = dataset + " wave " + wave + ", " + variable + " (" + kind + ")";
                assertFalse(Pattern.compile("\\b0 rows").matcher(body).find(), where + ": a legend speaks of 0 rows");
                // An alert of a further baseline names it in its header; its numbers are that baseline's.
                Matcher header = AGAINST.matcher(body);
                String phrase = header.find() ? unescape(header.group(1)) : null;
                JsonNode finding = finding(report, variable, kind, phrase);
                assertNotNull(finding, where + ": no such finding in findings.json");
                String further = finding.path("against").isTextual() ? finding.path("against").asText() : null;
                String against = further == null ? runAgainst : Against.wavesOf(further);
                String id = dataset + "/" + wave + "/" + variable + "/" + kind
                        + (further == null ? "" : "/" + Against.rule(further));
                if (kind.equals("RELATIONSHIP_CHANGE") && finding.path("detail").has("spearmanBaseline")) {
                    checkCorrelations(where, id, body, finding.path("detail"), against, wave);
                    held++;
                    continue;
                }
                if (kind.equals("SHAPE_CHANGE")) {
                    checkShape(where, id, body, finding, against, wave, true);
                    heldByKind.merge(kind, 1, Integer::sum);
                    held++;
                    continue;
                }
                if (finding.path("detail").has("medianShiftDays")) {
                    checkDates(where, id, body, finding.path("detail"), against, wave);
                    heldByKind.merge("DATE", 1, Integer::sum);
                    held++;
                    continue;
                }
                JsonNode plot = plotted(finding, kind);
                if (kind.equals("SHIFT") || kind.equals("REFERENCE") || kind.equals("MISSING_RATE_CHANGE")
                        || kind.equals("PANEL_SHIFT")) {
                    assertNotNull(plot, where + ": the finding carries no plotted estimates");
                }
                if (plot == null) {
                    continue;
                }
                held++;
                heldByKind.merge(kind, 1, Integer::sum);
                String svg = svg(body, "estimates");
                assertNotNull(svg, where + ": no plot of estimates");
                List<Map<String, String>> drawn = elements(svg, id, "data-value");
                JsonNode current = plot.path("current");
                JsonNode baseline = plot.path("baseline");
                String named = current.get(0).path("category").isNull() ? null
                        : current.get(0).path("category").asText();
                if (named != null) {
                    assertEquals(named, drawn.get(0).get("data-category"), where + ": the first category drawn");
                    String sentence = finding.path("sentence").asText();
                    assertTrue(sentence.contains("'" + named + "'") || sentence.contains("(" + named + ")"),
                            where + ": the sentence names '" + named + "': " + sentence);
                }
                for (int i = 0; i < current.size(); i++) {
                    holds(where, drawn, current.get(i), wave);
                    if (!baseline.isEmpty()) {
                        holds(where, drawn, baseline.get(i), against);
                    }
                }
                JsonNode reference = plot.path("reference");
                List<Map<String, String>> refs = elements(svg, id, "data-reference");
                assertEquals(reference.size(), refs.size(), where + ": references drawn");
                for (int i = 0; i < reference.size(); i++) {
                    assertEquals(reference.get(i).path("value").asDouble(),
                            Double.parseDouble(refs.get(i).get("data-reference")), where + ": reference " + i);
                }
                if (kind.equals("REFERENCE")) {
                    assertFalse(reference.isEmpty(), where + ": a reference finding draws its reference");
                }
                String trend = svg(body, "trend");
                assertNotNull(trend, where + ": no trend");
                List<Map<String, String>> points = elements(trend, id, "data-value");
                Map<String, String> now = points.stream().filter(p -> wave.equals(p.get("data-wave"))).findFirst()
                        .orElseThrow(() -> new AssertionError(where + ": the trend has no point at the judged wave"));
                assertEquals(current.get(0).path("value").asDouble(), Double.parseDouble(now.get("data-value")),
                        where + ": the trend's point at the judged wave");
                assertEquals(number(current.get(0).path("low")), Double.parseDouble(now.getOrDefault("data-low",
                        "NaN")), 1e-12, where + ": the trend's interval at the judged wave");
                // A paired trend's earlier points are other pairings (each wave with the one before), so only a
                // two-sample trend's baseline point is this finding's baseline.
                if (!baseline.isEmpty() && against != null && !kind.equals("PANEL_SHIFT")) {
                    // The trend computes each earlier wave with the finding's own estimator: the baseline wave's point
                    // is the finding's baseline (to rounding, as the trend sums that wave's categories on their own).
                    double expected = number(baseline.get(0).path("value"));
                    points.stream().filter(p -> against.equals(p.get("data-wave"))).findFirst().ifPresent(p ->
                            assertEquals(expected, Double.parseDouble(p.get("data-value")),
                                    1e-12 * Math.max(1, Math.abs(expected)), where + ": the trend's baseline point"));
                }
                if (plot.path("estimator").asText().contains("SHARE")) {
                    assertTrue(trend.contains("(%)"), where + ": a share's trend is drawn in percent");
                }
                if (named != null) {
                    assertEquals(named, now.get("data-category"), where + ": the trend's category");
                }
            }
        }
        assertTrue(alerts > 0, dataset + ": no alerts at all");
        return held;
    }

    /**
     * A change of shape: the gap drawn is the finding's KS distance with its interval, joining the two curves' shares
     * at the value where they lie furthest apart; every step drawn is a step of the finding's curves; the trend's
     * point at the judged wave is the same distance.
     */
    static void checkShape(String where, String id, String body, JsonNode finding, String against, String wave,
                           boolean withTrend) {
        String svg = svg(body, "cumulative");
        assertNotNull(svg, where + ": no cumulative distributions drawn");
        JsonNode detail = finding.path("detail");
        JsonNode effect = finding.path("effect");
        List<Map<String, String>> gaps = elements(svg, id, "data-baseline");
        assertEquals(1, gaps.size(), where + ": one largest gap");
        Map<String, String> gap = gaps.get(0);
        assertEquals(effect.path("estimate").asDouble(), Double.parseDouble(gap.get("data-value")), where + ": gap");
        assertEquals(effect.path("ciLow").asDouble(), Double.parseDouble(gap.get("data-low")), where + ": gap low");
        assertEquals(effect.path("ciHigh").asDouble(), Double.parseDouble(gap.get("data-high")), where + ": gap high");
        assertEquals(detail.path("at").asDouble(), Double.parseDouble(gap.get("data-at")), where + ": gap at");
        // The gap between the curves as drawn is the distance the verdict was on (to the rounding of two sums).
        assertEquals(effect.path("estimate").asDouble(), Math.abs(Double.parseDouble(gap.get("data-current"))
                - Double.parseDouble(gap.get("data-baseline"))), 1e-12, where + ": the curves' gap at its value");
        int steps = 0;
        for (String[] side : new String[][] {{"baseline", against}, {"current", wave}}) {
            JsonNode curve = detail.path(side[0]);
            assertFalse(curve.isEmpty(), where + ": no " + side[0] + " curve in the finding");
            List<Map<String, String>> drawn = elements(svg, id, "data-value").stream()
                    .filter(e -> side[1].equals(e.get("data-wave")) && e.containsKey("data-at")).toList();
            assertEquals(curve.size(), drawn.size(), where + ": steps of the " + side[0] + " curve");
            for (int i = 0; i < curve.size(); i++) {
                assertEquals(curve.get(i).path("value").asDouble(), Double.parseDouble(drawn.get(i).get("data-at")),
                        where + ": step " + i + " of " + side[0]);
                assertEquals(curve.get(i).path("cumulative").asDouble(),
                        Double.parseDouble(drawn.get(i).get("data-value")), where + ": share at step " + i);
                steps++;
            }
        }
        assertTrue(steps > 2, where + ": steps drawn " + steps);
        if (!withTrend) {
            return;
        }
        String trend = svg(body, "trend");
        assertNotNull(trend, where + ": no trend");
        Map<String, String> now = elements(trend, id, "data-value").stream().filter(p -> wave.equals(
                p.get("data-wave"))).findFirst().orElseThrow(() -> new AssertionError(where + ": no trend point"));
        assertEquals(effect.path("estimate").asDouble(), Double.parseDouble(now.get("data-value")),
                where + ": the trend's point at the judged wave");
    }

    /** Dates: each wave's median date with its interval and the span of its dates, as the finding's detail holds. */
    static void checkDates(String where, String id, String body, JsonNode detail, String against,
                                   String wave) {
        String svg = svg(body, "dates");
        assertNotNull(svg, where + ": no picture of the dates");
        List<Map<String, String>> drawn = elements(svg, id, "data-value");
        String[][] sides = {{against, "medianBaseline", "medianBaselineInterval", "earliestBaseline", "latestBaseline"},
                {wave, "medianCurrent", "medianCurrentInterval", "earliestCurrent", "latestCurrent"}};
        for (String[] side : sides) {
            Map<String, String> median = drawn.stream().filter(e -> side[0].equals(e.get("data-wave"))
                    && "median date".equals(e.get("data-category"))).findFirst()
                    .orElseThrow(() -> new AssertionError(where + ": no median date drawn for " + side[0]));
            assertEquals(detail.path(side[1]).asText(), median.get("data-date"), where + ": median date " + side[0]);
            JsonNode interval = detail.path(side[2]);
            assertEquals(number(interval.path("estimate")), Double.parseDouble(median.get("data-value")), where);
            assertEquals(number(interval.path("ciLow")), Double.parseDouble(median.getOrDefault("data-low", "NaN")),
                    where + ": median's low " + side[0]);
            assertEquals(number(interval.path("ciHigh")), Double.parseDouble(median.getOrDefault("data-high",
                    "NaN")), where + ": median's high " + side[0]);
            Map<String, String> span = drawn.stream().filter(e -> side[0].equals(e.get("data-wave"))
                    && "span".equals(e.get("data-category"))).findFirst()
                    .orElseThrow(() -> new AssertionError(where + ": no span drawn for " + side[0]));
            assertEquals(detail.path(side[3]).asText(), span.get("data-from"), where + ": earliest " + side[0]);
            assertEquals(detail.path(side[4]).asText(), span.get("data-to"), where + ": latest " + side[0]);
        }
    }

    private static void holds(String where, List<Map<String, String>> drawn, JsonNode e, String wave) {
        String category = e.path("category").isNull() ? null : e.path("category").asText();
        Map<String, String> el = drawn.stream().filter(d -> wave.equals(d.get("data-wave"))
                        && java.util.Objects.equals(category, d.get("data-category"))).findFirst()
                .orElseThrow(() -> new AssertionError(where + ": nothing drawn for " + category + " in " + wave));
        assertEquals(number(e.path("value")), Double.parseDouble(el.get("data-value")), where + ": value of "
                + category + " in " + wave);
        assertEquals(number(e.path("low")), Double.parseDouble(el.getOrDefault("data-low", "NaN")), where
                + ": low of " + category + " in " + wave);
        assertEquals(number(e.path("high")), Double.parseDouble(el.getOrDefault("data-high", "NaN")), where
                + ": high of " + category + " in " + wave);
    }

    private static void checkCorrelations(String where, String id, String body, JsonNode d, String against,
                                          String wave) {
        String svg = svg(body, "correlation");
        assertNotNull(svg, where + ": no correlation plot");
        List<Map<String, String>> drawn = elements(svg, id, "data-value");
        String[][] rows = {{"spearmanBaseline", against, "Spearman rho"}, {"spearmanCurrent", wave, "Spearman rho"},
                {"pearsonBaseline", against, "Pearson r"}, {"pearsonCurrent", wave, "Pearson r"}};
        for (String[] r : rows) {
            JsonNode e = d.path(r[0]);
            Map<String, String> el = drawn.stream().filter(x -> r[1].equals(x.get("data-wave"))
                    && r[2].equals(x.get("data-category"))).findFirst().orElseThrow(() -> new AssertionError(where
                    + ": no " + r[2] + " drawn for " + r[1]));
            assertEquals(e.path("estimate").asDouble(), Double.parseDouble(el.get("data-value")), where + " " + r[0]);
            assertEquals(e.path("ciLow").asDouble(), Double.parseDouble(el.get("data-low")), where + " " + r[0]);
            assertEquals(e.path("ciHigh").asDouble(), Double.parseDouble(el.get("data-high")), where + " " + r[0]);
        }
    }

    /** The plotted estimates as findings.json holds them; for a missing rate, assembled from its reasons. */
    private static JsonNode plotted(JsonNode finding, String kind) {
        JsonNode detail = finding.path("detail");
        if (kind.equals("MISSING_RATE_CHANGE") && detail.isArray()) {
            var node = JSON.createObjectNode();
            var b = node.putArray("baseline");
            var c = node.putArray("current");
            node.putArray("reference");
            node.put("estimator", "SHARE");
            for (JsonNode r : detail) {
                if (r.path("current").isMissingNode() || r.path("current").isNull()) {
                    return null;
                }
                b.add(r.path("baseline"));
                c.add(r.path("current"));
            }
            return node;
        }
        JsonNode p = detail.path("plot");
        return p.isMissingNode() || p.isNull() ? null : p;
    }

    private static double number(JsonNode n) {
        return n.isMissingNode() || n.isNull() ? Double.NaN : n.isTextual() ? Double.parseDouble(n.asText())
                : n.asDouble();
    }

    static final Pattern AGAINST = Pattern.compile("<span class=\"against\">([^<]*)</span>");

    /** The finding of a variable and kind against the run's baseline (phrase null) or the further one named. */
    private static JsonNode finding(JsonNode report, String variable, String kind, String phrase) {
        for (JsonNode f : report.path("findings")) {
            String further = f.path("against").isTextual() ? f.path("against").asText() : null;
            if (f.path("variable").asText().equals(variable) && f.path("kind").asText().equals(kind)
                    && java.util.Objects.equals(phrase, further == null ? null : Against.phrase(further))) {
                return f;
            }
        }
        return null;
    }

    /**
     * Each wave's section, from its opening tag to the next wave's: a wave's section holds sections of its own (an
     * alert's "Where it changed" tables), so the first closing tag is not the wave's.
     */
    private static Map<String, String> sections(String html) {
        Map<String, String> out = new LinkedHashMap<>();
        Matcher m = Pattern.compile("<section class=\"wave\" id=\"wave-\\d+\" data-wave=\"([^\"]*)\">")
                .matcher(html);
        String wave = null;
        int from = -1;
        while (m.find()) {
            if (wave != null) {
                out.put(wave, html.substring(from, m.start()));
            }
            wave = unescape(m.group(1));
            from = m.end();
        }
        if (wave != null) {
            out.put(wave, html.substring(from));
        }
        return out;
    }

    /** {variable, kind, body} of every alert article. */
    private static List<String[]> articles(String section) {
        List<String[]> out = new ArrayList<>();
        Matcher m = Pattern.compile("<article class=\"alert[^\"]*\" data-variable=\"([^\"]*)\" data-kind=\"([^\"]*)\""
                + "[^>]*>(.*?)</article>", Pattern.DOTALL).matcher(section);
        while (m.find()) {
            out.add(new String[] {unescape(m.group(1)), m.group(2), m.group(3)});
        }
        return out;
    }

    private static String svg(String body, String kindClass) {
        Matcher m = Pattern.compile("<svg class=\"plot [^\"]*\\b" + kindClass + "\\b[^\"]*\".*?</svg>", Pattern.DOTALL)
                .matcher(body);
        return m.find() ? m.group() : null;
    }

    /** The attributes of every element of the finding that carries {@code attribute}, in document order. */
    static List<Map<String, String>> elements(String svg, String id, String attribute) {
        List<Map<String, String>> out = new ArrayList<>();
        Matcher tag = Pattern.compile("<[a-z]+(\\s[^>]*)>").matcher(svg);
        while (tag.find()) {
            Map<String, String> attrs = new LinkedHashMap<>();
            Matcher a = Pattern.compile("([a-z-]+)=\"([^\"]*)\"").matcher(tag.group(1));
            while (a.find()) {
                attrs.put(a.group(1), unescape(a.group(2)));
            }
            if (attrs.containsKey(attribute) && id.equals(attrs.get("data-finding"))) {
                out.add(attrs);
            }
        }
        if (out.isEmpty() && attribute.equals("data-value")) {
            fail("no element of " + id + " carries " + attribute);
        }
        return out;
    }

    static String unescape(String s) {
        return s.replace("&lt;", "<").replace("&gt;", ">").replace("&quot;", "\"").replace("&#39;", "'")
                .replace("&amp;", "&");
    }
}
