package org.wavewarden.pipeline;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.compare.WaveEstimates;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.CategoryCounts;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

/**
 * The digest reads a finding's plotted estimates alike from the run's records and from the JSON a stored run reads
 * back, so that the daemon's digest and the demo's draw the same numbers.
 */
class DigestAssemblerPlottedTest {

    @Test
    void theEstimatesAreReadAlikeFromTheRecordAndFromItsStoredJson() {
        var c = new VariableComparator(0.95).categorical("tenure",
                new CategoryCounts(List.of("OWN", "MORT", "PRIV"), new long[] {40, 35, 25}),
                new CategoryCounts(List.of("OWN", "MORT", "PRIV"), new long[] {30, 30, 40}), null);
        Finding inMemory = new Finding("tenure", FindingKind.SHIFT, null, null, null, null, null, null, 100L, 100L,
                "", c.detail());
        Object stored = Json.read(Json.write(c.detail()), Object.class);
        Finding readBack = new Finding("tenure", FindingKind.SHIFT, null, null, null, null, null, null, 100L, 100L,
                "", stored);
        WaveEstimates.Plotted a = DigestAssembler.plotted(inMemory);
        assertEquals(a, DigestAssembler.plotted(readBack));
        assertEquals("PRIV", a.category(), "the category whose share moved most, as the sentence names it");
        assertEquals(c.change().before(), a.baseline().get(0).value());
        assertEquals(c.change().after(), a.current().get(0).value());
    }

    @Test
    void aMissingRateFindingIsPlottedFromEveryReasonTheSentenceNamesFirst() {
        var e1 = WaveEstimates.share("NULL", 4, 31, 0.95);
        var e2 = WaveEstimates.share("NULL", 0, 30, 0.95);
        var f1 = WaveEstimates.share("-9", 1, 31, 0.95);
        var f2 = WaveEstimates.share("-9", 3, 30, 0.95);
        List<org.wavewarden.judge.WaveVerdicts.ReasonRate> rates = List.of(
                new org.wavewarden.judge.WaveVerdicts.ReasonRate("NULL", e1.value(), e2.value(), null, 0.04, 0.05, "MATERIAL", "s", e1, e2),
                new org.wavewarden.judge.WaveVerdicts.ReasonRate("-9", f1.value(), f2.value(), null, 0.3, 0.4, "STABLE", "t", f1, f2));
        Finding f = new Finding("x", FindingKind.MISSING_RATE_CHANGE, null, null, null, null, null, null, 31L, 30L,
                "s", Json.read(Json.write(rates), Object.class));
        WaveEstimates.Plotted p = DigestAssembler.plotted(f);
        assertEquals(List.of(e1, f1), p.baseline());
        assertEquals(List.of(e2, f2), p.current());
        assertEquals("NULL", p.category());
    }

    @Test
    void anEstimateWithoutAnIntervalSurvivesTheStoredJson() {
        WaveEstimates.Plotted p = new WaveEstimates.Plotted("mean x", WaveEstimates.Estimator.MEAN, "kg",
                List.of(new WaveEstimates.Estimate(null, 3, Double.NaN, Double.NaN)),
                List.of(new WaveEstimates.Estimate(null, 4, 3.5, 4.5)), null);
        Object stored = Json.read(Json.write(java.util.Map.of("plot", p)), Object.class);
        assertEquals(p, DigestAssembler.plotted(new Finding("x", FindingKind.SHIFT, null, null, null, null, null,
                null, 1L, 9L, "", stored)));
    }

    @Test
    void aFindingWithoutEstimatesHasNothingToPlot() {
        assertNull(DigestAssembler.plotted(Finding.dataQuality("x", FindingKind.PLACEHOLDER, 1L, 1L, "s", null)));
    }
}
