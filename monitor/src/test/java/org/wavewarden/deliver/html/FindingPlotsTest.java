package org.wavewarden.deliver.html;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.WaveEstimates.Estimate;
import org.wavewarden.compare.WaveEstimates.Estimator;
import org.wavewarden.compare.WaveEstimates.Plotted;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Each kind of plot drawn from a hand-built finding's estimates: its numbers are on its elements, exactly. */
class FindingPlotsTest {

    static final String ID = "panel/2025-01/employment_status/SHIFT";

    @Test
    void weightedSharesAreDrawnWithTheirIntervalsAndTheCategoryTheSentenceNamesFirst() {
        Plotted p = new Plotted("weighted share answering 'SELF'", Estimator.DESIGN_SHARE, null,
                List.of(new Estimate("SELF", 0.092, 0.06, 0.13), new Estimate("EMP", 0.498, 0.44, 0.55)),
                List.of(new Estimate("SELF", 0.215, 0.17, 0.27), new Estimate("EMP", 0.374, 0.32, 0.43)), null);
        String svg = SvgChart.estimates("employment_status", new VariablePlot.EstimatePlot(ID, p), "2024-12",
                "2025-01");
        List<Map<String, String>> drawn = DemoPlotsMatchFindingsTest.elements(svg, ID, "data-value");
        assertEquals(4, drawn.size());
        assertEquals(Map.of("data-value", "0.092", "data-low", "0.06", "data-high", "0.13", "data-wave", "2024-12",
                "data-category", "SELF", "data-finding", ID), without(drawn.get(0), "class"));
        assertEquals("0.215", drawn.get(1).get("data-value"));
        assertEquals("2025-01", drawn.get(1).get("data-wave"));
        assertEquals("EMP", drawn.get(2).get("data-category"));
        assertTrue(svg.contains("class=\"ci b\"") && svg.contains("class=\"ci c\""), "error bars on both waves");
        assertTrue(svg.contains("weighted share (%)"), "the axis is in percent, as the sentence");
        assertTrue(svg.contains(">21.5%<"), "the bar's label is the finding's share");
    }

    @Test
    void aMedianFindingIsDrawnAsBothWavesMediansWithTheirIntervals() {
        Plotted p = new Plotted("median income_monthly", Estimator.MEDIAN, "GBP",
                List.of(new Estimate(null, 2100, 1950, 2250)), List.of(new Estimate(null, 2400, 2210, 2600)), null);
        String svg = SvgChart.estimates("income_monthly", new VariablePlot.EstimatePlot(ID, p), "2024-12",
                "2025-01");
        List<Map<String, String>> drawn = DemoPlotsMatchFindingsTest.elements(svg, ID, "data-value");
        assertEquals(2, drawn.size());
        assertEquals(List.of("2100.0", "1950.0", "2250.0", "2024-12"), List.of(drawn.get(0).get("data-value"),
                drawn.get(0).get("data-low"), drawn.get(0).get("data-high"), drawn.get(0).get("data-wave")));
        assertEquals(List.of("2400.0", "2210.0", "2600.0", "2025-01"), List.of(drawn.get(1).get("data-value"),
                drawn.get(1).get("data-low"), drawn.get(1).get("data-high"), drawn.get(1).get("data-wave")));
        assertTrue(svg.contains("Median income_monthly (GBP)"), "the axis names the statistic of the verdict");
        assertFalse(svg.contains("mean"), "no mean beside a median verdict");
    }

    @Test
    void aReferenceFindingDrawsEachReferenceBesideTheWavesShareAndNoBaseline() {
        Plotted p = new Plotted("share answering '2'", Estimator.SHARE, null, null,
                List.of(new Estimate("2", 0.41, 0.36, 0.46), new Estimate("1", 0.28, 0.24, 0.33)),
                List.of(new Estimate("2", 0.34, 0.34, 0.34), new Estimate("1", 0.30, 0.30, 0.30)));
        String svg = SvgChart.estimates("household_size", new VariablePlot.EstimatePlot(ID, p), "baseline",
                "2025-01");
        List<Map<String, String>> refs = DemoPlotsMatchFindingsTest.elements(svg, ID, "data-reference");
        assertEquals(List.of("0.34", "0.3"), refs.stream().map(r -> r.get("data-reference")).toList());
        assertEquals(List.of("2", "1"), refs.stream().map(r -> r.get("data-category")).toList());
        assertTrue(DemoPlotsMatchFindingsTest.elements(svg, ID, "data-value").stream()
                .allMatch(e -> e.get("data-wave").equals("2025-01")), "only the judged wave is drawn");
        assertFalse(svg.contains("baseline"), "no baseline is named where there is none");
    }

    @Test
    void aShareTrendIsDrawnInPercentWithItsBandAndItsReference() {
        Trend t = new Trend("weighted share answering 'SELF'", null, List.of("a", "b", "c"), List.of(0.09, Double.NaN,
                0.215), List.of(0.06, Double.NaN, 0.17), List.of(0.13, Double.NaN, 0.27), true, "SELF", 0.1, ID);
        String svg = SvgChart.sparkline("employment_status", t, "c");
        assertTrue(svg.contains("weighted share answering &#39;SELF&#39; (%)"), svg);
        assertTrue(svg.contains("<polygon class=\"band\""), "the interval band");
        List<Map<String, String>> points = DemoPlotsMatchFindingsTest.elements(svg, ID, "data-value");
        assertEquals(List.of("a", "c"), points.stream().map(e -> e.get("data-wave")).toList(), "no point without data");
        assertEquals(List.of("0.215", "0.17", "0.27", "SELF"), List.of(points.get(1).get("data-value"),
                points.get(1).get("data-low"), points.get(1).get("data-high"), points.get(1).get("data-category")));
        assertEquals("0.1", DemoPlotsMatchFindingsTest.elements(svg, ID, "data-reference").get(0)
                .get("data-reference"));
        assertTrue(svg.contains(">21.5<"), "the judged wave's value is labelled in percent");
    }

    @Test
    void aFirstWavesMissingPlotNamesNoBaselineOfZeroRows() {
        VariablePlot.MissingPlot p = new VariablePlot.MissingPlot(List.of("-9", "NULL"), null, 0, new long[] {4, 2},
                120, ID);
        String svg = SvgChart.missing("income_monthly", p, "baseline", "2024-01");
        assertFalse(java.util.regex.Pattern.compile("\\b0 rows").matcher(svg).find(), svg);
        assertFalse(svg.contains("baseline"), svg);
        assertEquals(List.of("2024-01", "2024-01"), DemoPlotsMatchFindingsTest.elements(svg, ID, "data-value")
                .stream().map(e -> e.get("data-wave")).toList());
    }

    @Test
    void aRelationshipPlotCarriesBothWavesCorrelationsAsData() {
        VariablePlot.CorrelationPlot p = new VariablePlot.CorrelationPlot(List.of("Spearman rho"),
                new double[][] {{0.41, 0.3, 0.5}}, new double[][] {{0.12, 0.01, 0.23}}, ID);
        List<Map<String, String>> drawn = DemoPlotsMatchFindingsTest.elements(SvgChart.correlation("a and b", p,
                "w1", "w2"), ID, "data-value");
        assertEquals(List.of("0.41", "0.3", "0.5", "w1"), List.of(drawn.get(0).get("data-value"),
                drawn.get(0).get("data-low"), drawn.get(0).get("data-high"), drawn.get(0).get("data-wave")));
        assertEquals("0.12", drawn.get(1).get("data-value"));
    }

    @Test
    void categoriesAndIdsFromTheDataStayInertText() {
        String hostile = "\"><script>alert(1)</script>'";
        Plotted p = new Plotted("share answering '" + hostile + "'", Estimator.SHARE, null,
                List.of(new Estimate(hostile, 0.2, 0.1, 0.3)), List.of(new Estimate(hostile, 0.4, 0.3, 0.5)), null);
        String svg = SvgChart.estimates(hostile, new VariablePlot.EstimatePlot("d/w/" + hostile + "/SHIFT", p),
                hostile, hostile);
        assertFalse(svg.contains("<script>"), svg);
        List<Map<String, String>> drawn = DemoPlotsMatchFindingsTest.elements(svg, "d/w/" + hostile + "/SHIFT",
                "data-value");
        assertEquals(hostile, drawn.get(0).get("data-category"));
    }

    @Test
    void anEstimateWithoutAnIntervalIsDrawnWithoutOne() {
        Plotted p = new Plotted("mean x", Estimator.MEAN, null, List.of(new Estimate(null, 3, Double.NaN,
                Double.NaN)), List.of(new Estimate(null, 4, 3.5, 4.5)), null);
        List<Map<String, String>> drawn = DemoPlotsMatchFindingsTest.elements(SvgChart.estimates("x",
                new VariablePlot.EstimatePlot(ID, p), "a", "b"), ID, "data-value");
        assertFalse(drawn.get(0).containsKey("data-low"));
        assertEquals("3.5", drawn.get(1).get("data-low"));
    }

    private static Map<String, String> without(Map<String, String> m, String key) {
        Map<String, String> out = new java.util.HashMap<>(m);
        out.remove(key);
        return out;
    }
}
