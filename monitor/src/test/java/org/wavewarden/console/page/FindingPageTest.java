package org.wavewarden.console.page;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.DateComparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.html.HtmlDigest;
import org.wavewarden.deliver.html.WaveSection;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.Judge;
import org.wavewarden.pipeline.DigestAssembler;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.review.Role;
import org.wavewarden.store.ConsoleReads;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.console.page.PageFixtures.byId;
import static org.wavewarden.console.page.PageFixtures.parse;
import static org.wavewarden.console.page.PageFixtures.select;

/**
 * A finding's page shows the very chart the HTML digest draws for the same finding, and its trend as a chart with
 * the same numbers in a table.
 */
class FindingPageTest {

    private static final Pattern PLOT = Pattern.compile("<svg class=\"plot .*?</svg>", Pattern.DOTALL);

    /**
     * Findings as a stored run reads them back (the detail is the JSON the results table holds), one per kind of
     * picture the digest draws from a finding's own numbers: a change of shape and a comparison of dates.
     */
    static Stream<Arguments> storedFindings() {
        NumericDistribution b = NumericDistribution.ofSample(1, 2, 2, 3, 3, 3, 4, 4, 5, 9, 10, 11, 12, 13, 14);
        NumericDistribution c = NumericDistribution.ofSample(5, 6, 6, 7, 7, 7, 7, 8, 8, 8, 9, 9, 20, 21, 22);
        Comparison shape = new VariableComparator(0.95).shape("rooms", b, c, "rooms");
        Comparison dates = DateComparison.compare(new VariableComparator(0.95), "moved_in",
                dates("2010-01-01", 400, 4), List.of(), dates("2010-03-01", 400, 4), List.of()).orElseThrow();
        return Stream.of(Arguments.of("cumulative", stored(shape)), Arguments.of("dates", stored(dates)));
    }

    private static Finding stored(Comparison comparison) {
        Finding f = Judge.judge(List.of(comparison), 0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG).get(0);
        return f.withDetail(Json.read(Json.write(f.detail()), Object.class));
    }

    private static Map<String, Long> dates(String from, int days, long each) {
        Map<String, Long> out = new LinkedHashMap<>();
        for (int i = 0; i < days; i++) {
            out.put(LocalDate.parse(from).plusDays(i).toString(), each);
        }
        return out;
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("storedFindings")
    void thePlotIsTheDigestsPlotForTheSameFinding(String plotKind, Finding f) {
        String dataset = "harrowmere-household";
        String id = DigestAssembler.findingId(dataset, "2025-Q4", f);
        FindingsReport report = new FindingsReport(dataset, "2025-Q4", "2025-Q3", PageFixtures.AT, 0.05,
                "BENJAMINI_HOCHBERG", List.of(), List.of(f));
        String digest = HtmlDigest.render(dataset, List.of(new WaveSection(report, List.of(
                new org.wavewarden.deliver.html.AlertView(f, DigestAssembler.findingPlot(f, id), null)))),
                PageFixtures.AT);
        ConsoleReads.FindingView view = new ConsoleReads.FindingView(5, 1, dataset, "2025-Q4", "2025-Q3", f, null,
                List.of(), List.of());
        String page = Pages.finding(PageFixtures.chrome(Role.VIEWER), view);

        String digestPlot = only(digest);
        assertTrue(digestPlot.startsWith("<svg class=\"plot " + plotKind), digestPlot);
        String section = page.substring(page.indexOf("<section id=\"plot\""), page.indexOf("</section>",
                page.indexOf("<section id=\"plot\"")));
        assertEquals(digestPlot, only(section));
        parse(page);
    }

    private static String only(String html) {
        Matcher m = PLOT.matcher(html);
        assertTrue(m.find(), "a plot");
        String svg = m.group();
        assertTrue(!m.find(), "one plot only");
        return svg;
    }

    @Test
    void aFindingWithoutAPictureOfItsOwnSaysWhy() {
        Document d = parse(Pages.finding(PageFixtures.chrome(Role.VIEWER),
                PageFixtures.findingView(null)));
        assertTrue(select(d, "//section[@id='plot']//*[local-name()='svg']").isEmpty());
        assertTrue(byId(d, "plot").getTextContent().contains("stores no picture of its own"));
    }

    @Test
    void theTrendDrawsEveryWaveAndWritesTheSameNumbersInATable() {
        Document d = parse(Pages.finding(PageFixtures.chrome(Role.VIEWER),
                PageFixtures.findingView(null)));
        List<ConsoleReads.TrendPoint> trend = PageFixtures.findingView(null).trend();
        assertEquals(trend.size(), select(d, "//svg[@id='trend-effect']/circle").size());
        assertEquals(trend.size(), select(d, "//svg[@id='trend-effect']/line[@class='whisker']").size());
        assertEquals(1, select(d, "//svg[@id='trend-effect']/rect[@class='band']").size(), "the threshold band");
        assertEquals(1, select(d, "//svg[@id='trend-effect']/circle[@class='point current']").size());
        assertEquals(trend.size(), select(d, "//svg[@id='trend-level']/circle").size(), "the level is drawn too");
        List<List<String>> rows = select(d, "//table[@id='trend-table']/tbody/tr").stream()
                .map(tr -> select(d, "//table[@id='trend-table']/tbody/tr[" + (indexOf(d, tr) + 1) + "]/*")
                        .stream().map(Element::getTextContent).toList())
                .toList();
        assertEquals(List.of(
                List.of("2025-Q2", "STABLE", "0.02000", "0.000 to 0.06000", "±0.1000", "0.3100",
                        "0.2900 to 0.3300"),
                List.of(PageFixtures.AGAINST, "UNCERTAIN", "0.05000", "0.000 to 0.1200", "±0.1000", "0.3200",
                        "0.3000 to 0.3400"),
                List.of(PageFixtures.WAVE + " (this wave)", "MATERIAL", "0.2100", "0.1500 to 0.2700", "±0.1000",
                        "0.3800", "0.3600 to 0.4000")), rows);
        assertEquals("/console/finding?id=101", select(d, "//table[@id='trend-table']//th/a").get(0)
                .getAttribute("href"));
    }

    @Test
    void aWaveWithoutAnEstimateIsLeftOutOfTheChartButKeptInTheTable() {
        var v = PageFixtures.findingView(null);
        List<ConsoleReads.TrendPoint> trend = List.of(v.trend().get(0),
                new ConsoleReads.TrendPoint("2025-Q3", 0, null, null, null, null, null, null, null, null, null,
                        null), v.trend().get(2));
        var view = new ConsoleReads.FindingView(v.findingId(), v.runId(), v.dataset(), v.wave(), v.againstWave(),
                v.finding(), null, List.of(), trend);
        Document d = parse(Pages.finding(PageFixtures.chrome(Role.VIEWER), view));
        assertEquals(2, select(d, "//svg[@id='trend-effect']/circle").size());
        assertEquals(3, select(d, "//table[@id='trend-table']/tbody/tr").size());
    }

    private static int indexOf(Document d, Element tr) {
        return select(d, "//table[@id='trend-table']/tbody/tr").indexOf(tr);
    }
}
