package org.wavewarden.deliver.html;

import org.junit.jupiter.api.Test;
import org.wavewarden.deliver.Cautions;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class HtmlDigestTest {

    private static final Pattern ARTICLE = Pattern.compile("<article class=\"alert[^>]*>.*?</article>", Pattern.DOTALL);

    private static String busyPage() {
        return HtmlDigest.render("harrowmere-household", List.of(DigestFixtures.quietWave(), DigestFixtures.busyWave()),
                DigestFixtures.AT);
    }

    private static List<String> articles(String html) {
        List<String> out = new ArrayList<>();
        Matcher m = ARTICLE.matcher(html);
        while (m.find()) {
            out.add(m.group());
        }
        return out;
    }

    @Test
    void aCategoryNamedLikeAScriptRendersAsText() {
        String html = busyPage();
        assertFalse(html.toLowerCase(Locale.ROOT).contains("<script"), "no script element may reach the page");
        assertTrue(html.contains("&lt;script&gt;alert(1)&lt;/script&gt;"), "the label is shown, escaped");
    }

    @Test
    void aHostileVariableNameCannotLeaveItsAttribute() {
        String name = "x\" onmouseover=\"alert(1)";
        Finding f = Finding.dataQuality(name, FindingKind.BLANK, 10L, 10L, "<img src=x onerror=alert(1)>", null);
        FindingsReport r = new FindingsReport("d<b>", "w'1", "w&0", DigestFixtures.AT, 0.05, "BENJAMINI_HOCHBERG",
                List.of(), List.of(f));
        String html = HtmlDigest.render("d<b>", List.of(new WaveSection(r, List.of(new AlertView(f, null, null)))),
                DigestFixtures.AT);
        assertFalse(html.contains("\" onmouseover=\""), html);
        assertFalse(html.contains("<img") || html.contains("d<b>"), html);
        assertTrue(html.contains("d&lt;b&gt;"));
        assertTrue(html.contains("data-variable=\"x&quot; onmouseover=&quot;alert(1)\""));
        assertTrue(html.contains("w&#39;1") && html.contains("w&amp;0"));
    }

    @Test
    void everyAlertGivenAPlotShowsItAndAnAlertWithoutOneShowsNone() {
        List<String> arts = articles(busyPage());
        assertEquals(4, arts.size());
        for (String a : arts) {
            assertTrue(a.contains("<svg class=\"plot "), "plot in " + a.substring(0, 120));
            assertTrue(a.matches("(?s)<article class=\"alert [^\"]+\" data-variable=\"[^\"]+\" data-kind=\"[A-Z_]+\".*"));
        }
        Finding f = Finding.dataQuality("occupation", FindingKind.BLANK, 10L, 10L, "blank answers", null);
        FindingsReport r = new FindingsReport("d", "w2", "w1", DigestFixtures.AT, 0.05, "BENJAMINI_HOCHBERG",
                List.of(), List.of(f));
        String bare = HtmlDigest.render("d", List.of(new WaveSection(r, List.of(new AlertView(f, null, null)))),
                DigestFixtures.AT);
        assertEquals(1, articles(bare).size());
        assertFalse(articles(bare).get(0).contains("<svg"));
    }

    @Test
    void everyChartLegendNamesBothWaves() {
        String html = busyPage();
        Matcher m = Pattern.compile("<svg class=\"plot (numeric|shares|missing)\".*?</svg>", Pattern.DOTALL)
                .matcher(html);
        int charts = 0;
        while (m.find()) {
            charts++;
            String legend = m.group().replaceFirst("(?s).*?<g class=\"legend\">(.*?)</g>.*", "$1");
            assertTrue(legend.contains(">2024-Q4 ") && legend.contains(">2025-Q1 "), legend);
            assertTrue(legend.contains("baseline") && legend.contains("current"), legend);
        }
        assertEquals(4, charts);
    }

    @Test
    void everyChartHasATitleAnAriaLabelAndAxisTitles() {
        Matcher m = Pattern.compile("<svg class=\"plot [^\"]+\".*?</svg>", Pattern.DOTALL).matcher(busyPage());
        int n = 0;
        while (m.find()) {
            n++;
            String svg = m.group();
            assertTrue(svg.contains(" aria-label=\"") && svg.contains("role=\"img\""), svg.substring(0, 200));
            assertTrue(svg.matches("(?s)<svg[^>]*><title>[^<]+</title>.*"), "title first");
            assertTrue(svg.contains("class=\"axis-title\""), "axis title");
        }
        assertEquals(6, n, "four charts and two trends");
        assertTrue(busyPage().contains(">commute_minutes (minutes)</text>"), "x axis names variable and unit");
    }

    @Test
    void theCautionsStandAtTheTopAndAgainAtTheEnd() {
        String html = busyPage();
        int firstSection = html.indexOf("<section");
        for (String line : Cautions.LINES) {
            String escaped = Html.esc(line);
            int first = html.indexOf(escaped);
            assertTrue(first >= 0 && first < firstSection, "before the waves: " + line);
            assertTrue(html.indexOf(escaped, html.lastIndexOf("</section>")) > 0, "after the waves: " + line);
        }
        assertTrue(html.contains("screening aids, not findings"));
    }

    @Test
    void aWaveWithoutAlertsSaysSo() {
        String html = busyPage();
        assertTrue(html.contains("Wave 2024-Q1 (first wave, screened alone)"));
        String quiet = html.substring(html.indexOf("data-wave=\"2024-Q1\""), html.indexOf("data-wave=\"2025-Q1\""));
        assertTrue(quiet.contains("No alerts for this wave: nothing needs attention."));
        assertFalse(html.substring(html.indexOf("data-wave=\"2025-Q1\"")).contains("No alerts for this wave"));
        String empty = HtmlDigest.render("d", List.of(), DigestFixtures.AT);
        assertTrue(empty.contains("No waves were judged"));
        assertTrue(articles(empty).isEmpty());
    }

    @Test
    void alertsFollowTheReadingOrderWhateverOrderTheyCameIn() {
        List<String> vars = articles(busyPage()).stream()
                .map(a -> a.replaceFirst("(?s).*?data-variable=\"([^\"]+)\".*", "$1")).toList();
        // MATERIAL first, larger effect relative to threshold first (6.2, 1.9, 1.4), then UNCERTAIN
        assertEquals(List.of("interview_mode", "commute_minutes", "height_cm", "mooring_fee"), vars);
    }

    @Test
    void theWaveHeaderNamesBothWavesAndTheSummaryCountsVerdicts() {
        String html = busyPage();
        assertTrue(html.contains("<h2>Wave 2025-Q1 against 2024-Q4</h2>"));
        String summary = html.substring(html.indexOf("data-wave=\"2025-Q1\""));
        summary = summary.substring(summary.indexOf("<p class=\"summary\">"), summary.indexOf("</p>"));
        assertTrue(summary.contains("MATERIAL <b>2</b>") && summary.contains("MINOR <b>0</b>")
                && summary.contains("UNCERTAIN <b>1</b>") && summary.contains("STABLE <b>1</b>"), summary);
        assertTrue(summary.contains("data-quality findings <b>1</b>") && summary.contains("alerts shown <b>4</b>"));
        assertTrue(summary.contains("Benjamini-Hochberg"));
    }

    @Test
    void eachAlertShowsBadgeSentencePQAndTheEffectWithItsInterval() {
        String a = articles(busyPage()).get(1);
        assertTrue(a.contains("<span class=\"badge v-material\""));
        assertTrue(a.contains("<code class=\"variable\">commute_minutes</code>"));
        assertTrue(a.contains("distribution shift"));
        assertTrue(a.contains("Median commute_minutes rose from 24.00 to 32.00 minutes"));
        assertTrue(a.contains("p &lt; 0.0001") && a.contains("q &lt; 0.0001"), a);
        assertTrue(a.contains("Cliff&#39;s delta +0.276 (95% CI +0.245 to +0.306), threshold &plusmn;0.147"), a);
    }

    @Test
    void thePageIsSelfContained() {
        String html = busyPage();
        String withoutNamespace = html.replace("xmlns=\"http://www.w3.org/2000/svg\"", "");
        for (String outside : List.of("http:", "https:", "//", "<link", "<img", "<iframe", " src=", "url(", "@import",
                "<script")) {
            assertFalse(withoutNamespace.contains(outside), "page refers outside itself: " + outside);
        }
        assertTrue(html.contains("Content-Security-Policy\" content=\"default-src 'none'"));
        assertEquals(html, busyPage(), "rendering is deterministic");
    }

    @Test
    void plotInputsRejectMisalignedData() {
        assertThrows(IllegalArgumentException.class,
                () -> new VariablePlot.SharesPlot(List.of("a", "b"), new long[]{1}, new long[]{1, 2}));
        assertThrows(IllegalArgumentException.class,
                () -> new VariablePlot.MissingPlot(List.of("NULL"), new long[]{5}, 4, new long[]{1}, 10));
        assertThrows(IllegalArgumentException.class,
                () -> new Trend("m", null, List.of("w1", "w2"), List.of(1.0)));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new VariablePlot.SharesPlot(List.of("a"), new long[]{-1}, new long[]{1}));
        assertTrue(e.getMessage().contains("baseline[0]"));
    }
}
