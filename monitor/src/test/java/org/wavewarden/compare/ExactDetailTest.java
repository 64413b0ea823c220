package org.wavewarden.compare;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.panel.PanelComparisons;
import org.wavewarden.compare.relation.CorrelationDifferenceResult;
import org.wavewarden.compare.relation.CorrelationMethod;
import org.wavewarden.compare.relation.CorrelationResult;
import org.wavewarden.compare.relation.RelationshipDetail;

import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;

/**
 * A complete enumeration's detail: every interval in it, however deeply nested, collapses onto its estimate, and
 * everything else stays as it was.
 */
class ExactDetailTest {

    static final EffectSize G = new EffectSize("Hedges' g", 0.31, 0.12, 0.50, 0.95);

    static WaveEstimates.Estimate share(String category, double value, double low, double high) {
        return new WaveEstimates.Estimate(category, "label of " + category, value, low, high);
    }

    /** A detail of this package that is not public, as some comparators' details are. */
    record Hidden(String note, EffectSize effect) {
    }

    @ParameterizedTest(name = "{0} {1} ({2} to {3}) -> {1} ({1} to {1})")
    @CsvSource({
            "Hedges' g,      0.31,  0.12, 0.50",
            "Cliff's delta, -0.04, -0.09, 0.01",
            "risk difference, 0,   -0.02, 0.02",
    })
    void anEffectKeepsItsEstimateNameAndLevelAndLosesItsInterval(String name, double estimate, double low,
                                                                 double high) {
        EffectSize exact = (EffectSize) ExactDetail.of(new EffectSize(name, estimate, low, high, 0.9));
        assertEquals(new EffectSize(name, estimate, estimate, estimate, 0.9), exact);
    }

    @Test
    void thePlottedEstimatesOfEveryWaveAndTheReferenceCollapseAndStayInOrder() {
        var plot = new WaveEstimates.Plotted("share answering 'let'", WaveEstimates.Estimator.SHARE, null,
                List.of(share("let", 0.25, 0.22, 0.28), share("owned", 0.5, 0.46, 0.54)),
                List.of(share("let", 0.5, 0.46, 0.54), share("owned", 0.25, 0.22, 0.28)),
                List.of(share("let", 0.3, 0.3, 0.3), share("owned", 0.45, 0.45, 0.45)));
        var detail = new VariableComparator.ProportionDetail("answering 'let'", 0.25, 0.5, G, G, "note", plot);
        var exact = (VariableComparator.ProportionDetail) ExactDetail.of(detail);
        assertEquals(G.exact(), exact.riskDifference());
        assertEquals(G.exact(), exact.cohensH());
        assertEquals(List.of(share("let", 0.25, 0.25, 0.25), share("owned", 0.5, 0.5, 0.5)), exact.plot().baseline());
        assertEquals(List.of(share("let", 0.5, 0.5, 0.5), share("owned", 0.25, 0.25, 0.25)), exact.plot().current());
        assertEquals(plot.reference(), exact.plot().reference());
        assertEquals("note", exact.primaryTestNote());
        assertEquals(plot.statistic(), exact.plot().statistic());
    }

    @Test
    void aPanelDetailsPairedPartHeldAsAnObjectCollapsesToo() {
        var paired = new PanelComparisons.NumericDetail(10, 12, 2, 1.5, G, G, null, G, 3.1, false, 0);
        var plot = new WaveEstimates.Plotted("mean rent", WaveEstimates.Estimator.MEAN, "pounds",
                List.of(new WaveEstimates.Estimate(null, 10, 9, 11)), List.of(new WaveEstimates.Estimate(null, 12,
                Double.NaN, Double.NaN)), null);
        var detail = new PanelComparisons.PanelDetail("paired t", 400, 3, 2, 1, 0, "none", paired, plot);
        var exact = (PanelComparisons.PanelDetail) ExactDetail.of(detail);
        var exactPaired = (PanelComparisons.NumericDetail) exact.paired();
        assertEquals(G.exact(), exactPaired.meanDifferenceInterval());
        assertEquals(G.exact(), exactPaired.rankBiserial());
        assertNull(exactPaired.medianDifference(), "a missing effect stays missing");
        assertEquals(3.1, exactPaired.signedRankZ());
        assertEquals(new WaveEstimates.Estimate(null, 10, 10, 10), exact.plot().baseline().get(0));
        assertEquals(new WaveEstimates.Estimate(null, 12, 12, 12), exact.plot().current().get(0),
                "an estimate without an interval (one answer) has none of any width either");
        assertEquals(400, exact.pairs());
    }

    @Test
    void correlationsAndTheirDifferenceCollapseOntoTheirEstimates() {
        var rho = new CorrelationResult(CorrelationMethod.SPEARMAN, 0.6, 300, 0.52, 0.67, 0.95);
        var r = new CorrelationResult(CorrelationMethod.PEARSON, 0.2, 300, 0.09, 0.31, 0.95);
        var diff = new CorrelationDifferenceResult(CorrelationMethod.PEARSON, 0.6, 0.2, 300, 300, -6.1, 1e-9, -0.4,
                -0.52, -0.28, 0.95, "Fisher z (Pearson r), Zou interval");
        var exact = (RelationshipDetail) ExactDetail.of(new RelationshipDetail("floor_area", "rooms", rho, rho, r, r,
                diff, 4, 5, 0));
        assertEquals(new CorrelationResult(CorrelationMethod.SPEARMAN, 0.6, 300, 0.6, 0.6, 0.95),
                exact.spearmanBaseline());
        assertEquals(new CorrelationResult(CorrelationMethod.PEARSON, 0.2, 300, 0.2, 0.2, 0.95),
                exact.pearsonCurrent());
        assertEquals(-0.4, exact.pearsonDifference().ciLow());
        assertEquals(-0.4, exact.pearsonDifference().ciHigh());
        assertEquals(-6.1, exact.pearsonDifference().z());
        assertEquals(4, exact.screenedBaseline());
    }

    @Test
    void listsMapsAndRecordsThatAreNotPublicAreWalkedAndNullEntriesKept() {
        Map<String, Object> byReason = new LinkedHashMap<>();
        byReason.put("refused", new Hidden("refused", G));
        byReason.put("none", null);
        @SuppressWarnings("unchecked")
        var exact = (Map<String, Object>) ExactDetail.of(byReason);
        assertEquals(new Hidden("refused", G.exact()), exact.get("refused"));
        assertNull(exact.get("none"));
        assertEquals(List.of("refused", "none"), List.copyOf(exact.keySet()));
        @SuppressWarnings("unchecked")
        var list = (List<Object>) ExactDetail.of(Arrays.asList(new Hidden("a", G), null, "text"));
        assertEquals(Arrays.asList(new Hidden("a", G.exact()), null, "text"), list);
    }

    @Test
    void aDetailWithoutAnIntervalIsTheSameObject() {
        var weighting = new WeightedComparator.Weighting(400, 1234.5, 310.2, 1.29);
        assertSame(weighting, ExactDetail.of(weighting));
        List<String> codes = List.of("-9", "-8");
        assertSame(codes, ExactDetail.of(codes));
        assertNull(ExactDetail.of(null));
    }
}
