package org.wavewarden.deliver.html;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.DateComparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.Judge;
import org.wavewarden.pipeline.DigestAssembler;
import org.wavewarden.profile.NumericDistribution;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A change of shape and a comparison of dates are drawn from their finding's own numbers, as the finding is judged
 * and as a stored run reads it back: the cumulative distributions the KS distance was measured on (weighted where
 * the finding is) with the gap marked, and each wave's median date with its interval and the span of its dates.
 * The demo has no alert led by either kind, so these findings are built here and held by the demo test's checks.
 */
class FindingPicturesTest {

    @Test
    void aChangeOfShapeDrawsBothCumulativeDistributionsWithTheFindingsGap() {
        NumericDistribution b = NumericDistribution.ofSample(1, 2, 2, 3, 3, 3, 4, 4, 5, 9, 10, 11, 12, 13, 14);
        NumericDistribution c = NumericDistribution.ofSample(5, 6, 6, 7, 7, 7, 7, 8, 8, 8, 9, 9, 20, 21, 22);
        Comparison shape = new VariableComparator(0.95).shape("score", b, c, "points");
        for (Finding f : asJudgedAndStored(shape)) {
            holdShape(f, false);
        }
    }

    @Test
    void aWeightedChangeOfShapeDrawsTheWeightedCurves() {
        WeightedTally b = new WeightedTally(new double[] {1, 2, 3, 4}, new long[] {10, 10, 10, 10},
                new double[] {10, 30, 10, 10}, new double[] {10, 90, 10, 10});
        WeightedTally c = new WeightedTally(new double[] {2, 3, 4, 5}, new long[] {10, 10, 10, 10},
                new double[] {10, 10, 30, 10}, new double[] {10, 10, 90, 10});
        Comparison shape = new WeightedComparator(0.95).shape("score", b, c);
        for (Finding f : asJudgedAndStored(shape)) {
            holdShape(f, true);
        }
    }

    @Test
    void aComparisonOfDatesDrawsEachWavesMedianDateAndSpanAndSaysThemInDates() {
        Comparison dates = DateComparison.compare(new VariableComparator(0.95), "moved_in",
                dates("2010-01-01", 400, 4), List.of(), dates("2010-03-01", 400, 4), List.of()).orElseThrow();
        for (Finding f : asJudgedAndStored(dates)) {
            String id = "d/w2/moved_in/SHIFT";
            String svg = HtmlDigest.plot("moved_in", DigestAssembler.findingPlot(f, id), "w1", "w2");
            JsonNode json = Json.mapper().valueToTree(f);
            DemoPlotsMatchFindingsTest.checkDates("dates", id, svg, json.path("detail"), "w1", "w2");
            assertTrue(f.sentence().startsWith("The median date of moved_in moved from 2010-07-19 to 2010-09-16"
                    + " (+59 days; 95% CI of the medians "), f.sentence());
            assertTrue(f.sentence().contains("of this wave's dates lie outside the baseline's span 2010-01-01 to"
                    + " 2011-02-04;"), f.sentence());
            assertFalse(f.sentence().contains("rose from"), f.sentence());
        }
    }

    private static void holdShape(Finding f, boolean weighted) {
        String id = "d/w2/score/SHAPE_CHANGE";
        VariablePlot plot = DigestAssembler.findingPlot(f, id);
        assertTrue(plot instanceof VariablePlot.CumulativePlot, String.valueOf(plot));
        assertEquals(weighted, ((VariablePlot.CumulativePlot) plot).shape().weighted());
        String svg = HtmlDigest.plot("score", plot, "w1", "w2");
        DemoPlotsMatchFindingsTest.checkShape("shape", id, svg, Json.mapper().valueToTree(f), "w1", "w2", false);
    }

    /** The judged finding, and the same finding as a stored run reads its detail back from JSON. */
    private static List<Finding> asJudgedAndStored(Comparison c) {
        Finding f = Judge.judge(List.of(c), 0.05, WardenConfig.FdrMethod.BENJAMINI_HOCHBERG).get(0);
        return List.of(f, f.withDetail(Json.read(Json.write(f.detail()), Object.class)));
    }

    /** {@code days} consecutive dates from {@code from}, each {@code each} times. */
    private static Map<String, Long> dates(String from, int days, long each) {
        Map<String, Long> out = new LinkedHashMap<>();
        LocalDate d = LocalDate.parse(from);
        for (int i = 0; i < days; i++) {
            out.put(d.plusDays(i).toString(), each);
        }
        return out;
    }
}
