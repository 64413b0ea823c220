package org.wavewarden.compare;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.design.PsuTally;
import org.wavewarden.compare.design.PsuTotals;
import org.wavewarden.compare.design.SurveyDesign;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.profile.NumericDistribution;

import java.util.HashMap;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Each wave's estimate and interval, the numbers a finding states and its plot and trend draw, against R 4.2.2
 * (stats) and R survey 4.1.1 on the rows below. The R calls:
 *
 * <pre>
 * y &lt;- c(1,0,0,1,0,0,0,1,0,0,1,0,0,0,0,1,0,0,0,0)
 * x &lt;- c(3.1,4.2,5.0,2.2,6.1,3.3,4.4,5.5,2.9,3.8,4.1,5.2,6.3,2.5,3.6,4.7,5.8,2.1,3.2,4.3)
 * w &lt;- c(1.2,0.8,2.5,1.0,1.7,0.6,3.1,1.4,0.9,2.2,1.1,1.9,0.7,2.8,1.3,1.6,0.5,2.0,1.5,1.05)
 * st &lt;- rep(1:2, each = 10); psu &lt;- c(1,1,2,2,3,3,4,4,5,5, 6,6,6,7,7,7,8,8,9,9)
 * a &lt;- svydesign(ids = ~1, weights = ~w, data = d)
 * b &lt;- svydesign(ids = ~psu, strata = ~st, weights = ~w, data = d, nest = TRUE)
 * svyciprop(~y, a or b, method = "logit")            # weighted share and its interval
 * confint(svymean(~x, a or b), df = degf(a or b))    # weighted mean and its interval
 * t.test(x)$conf.int; prop.test(4, 31, correct = FALSE)$conf.int; prop.test(0, 30, correct = FALSE)$conf.int
 * </pre>
 */
class WaveEstimatesTest {

    static final double[] Y = {1, 0, 0, 1, 0, 0, 0, 1, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0};
    static final double[] X = {3.1, 4.2, 5.0, 2.2, 6.1, 3.3, 4.4, 5.5, 2.9, 3.8, 4.1, 5.2, 6.3, 2.5, 3.6, 4.7, 5.8,
            2.1, 3.2, 4.3};
    static final double[] W = {1.2, 0.8, 2.5, 1.0, 1.7, 0.6, 3.1, 1.4, 0.9, 2.2, 1.1, 1.9, 0.7, 2.8, 1.3, 1.6, 0.5,
            2.0, 1.5, 1.05};
    static final long[] STRATA = {1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 2, 2, 2, 2};
    static final long[] PSUS = {1, 1, 2, 2, 3, 3, 4, 4, 5, 5, 6, 6, 6, 7, 7, 7, 8, 8, 9, 9};

    @Test
    void weightedShareIsSvycipropLogitUnderTheWeightsOnlyDesign() {
        // R survey 4.1.1: svyciprop(~y, a, method = "logit") = 0.211055276381913 (0.0776408060928375, 0.459511153707142)
        WaveEstimates.Estimate e = WaveEstimates.weightedShare("yes", WeightedTally.ofSample(Y, W), null, 1, 0.95);
        assertEquals(0.211055276381913, e.value(), 1e-12);
        assertEquals(0.0776408060928375, e.low(), 1e-9);
        assertEquals(0.459511153707142, e.high(), 1e-9);
        assertEquals("yes", e.category());
    }

    @Test
    void weightedShareIsSvycipropLogitUnderTheStratifiedClusterDesign() {
        // R survey 4.1.1: svyciprop(~y, b, method = "logit") = 0.211055276381913 (0.10558746586395, 0.377417316803142),
        // degf(b) = 7
        SurveyDesign design = SurveyDesign.stratifiedClustered(W, STRATA, PSUS);
        PsuTally psu = PsuTally.ofSample(Y, design);
        assertEquals(7, psu.indicator(1).degreesOfFreedom());
        WaveEstimates.Estimate e = WaveEstimates.weightedShare("yes", WeightedTally.ofSample(Y, W), psu, 1, 0.95);
        assertEquals(0.211055276381913, e.value(), 1e-12);
        assertEquals(0.10558746586395, e.low(), 1e-9);
        assertEquals(0.377417316803142, e.high(), 1e-9);
    }

    @ParameterizedTest(name = "{0}: {1} ({2}, {3})")
    @CsvSource({
            // design, R survey 4.1.1 confint(svymean(~x, design), df = degf(design))
            "weights, 4.04874371859296, 3.42748274740291, 4.67000468978302",
            "clusters, 4.04874371859296, 3.37768592634038, 4.71980151084555"})
    void weightedMeanIsSvymeanWithItsIntervalOnTheDesignsDegreesOfFreedom(String design, double mean, double low,
                                                                          double high) {
        WeightedTally tally = WeightedTally.ofSample(X, W);
        PsuTotals totals = design.equals("weights") ? null
                : PsuTotals.ofSample(X, SurveyDesign.stratifiedClustered(W, STRATA, PSUS));
        WaveEstimates.Estimate e = WaveEstimates.weightedMean(tally, totals, 0.95);
        assertEquals(mean, e.value(), 1e-12);
        assertEquals(low, e.low(), 1e-9);
        assertEquals(high, e.high(), 1e-9);
    }

    @Test
    void meanHasStudentsTInterval() {
        // R 4.2.2: mean(x) = 4.115; t.test(x)$conf.int = (3.52100585970314, 4.70899414029686)
        WaveEstimates.Estimate e = WaveEstimates.mean(distribution(X), 0.95);
        assertEquals(4.115, e.value(), 1e-12);
        assertEquals(3.52100585970314, e.low(), 1e-9);
        assertEquals(4.70899414029686, e.high(), 1e-9);
    }

    @ParameterizedTest(name = "{0} of {1}")
    @CsvSource({
            // count, n, R 4.2.2 prop.test(count, n, correct = FALSE)$conf.int
            "4, 31, 0.0513428437462915, 0.288524062563064",
            "0, 30, 0, 0.113513393173969"})
    void shareHasWilsonsIntervalAlsoAtZeroCounts(long count, long n, double low, double high) {
        WaveEstimates.Estimate e = WaveEstimates.share("NULL", count, n, 0.95);
        assertEquals((double) count / n, e.value());
        assertEquals(low, e.low(), 1e-9);
        assertEquals(high, e.high(), 1e-9);
    }

    @Test
    void weightedShareOfZeroHasAnIntervalFromZeroUpwards() {
        // At p = 0 the design-based standard error is 0; the interval is Wilson's at Kish's effective size, which
        // reaches above 0 as an interval for a share must.
        double[] none = new double[Y.length];
        WaveEstimates.Estimate e = WaveEstimates.weightedShare("yes", WeightedTally.ofSample(none, W), null, 1, 0.95);
        assertEquals(0, e.value());
        assertEquals(0, e.low());
        assertTrue(e.high() > 0.05 && e.high() < 0.3, "upper limit " + e.high());
    }

    @Test
    void medianIsTheMiddleAnswerWithTheOrderStatisticInterval() {
        // Median of x (R 4.2.2: median(x) = 4.15); the sign-test interval of 20 values is (x_(6), x_(15)) at 95%:
        // qbinom(0.025, 20, 0.5) = 6, so sort(x)[6] = 3.2 and sort(x)[15] = 5.0.
        WaveEstimates.Estimate e = WaveEstimates.median(distribution(X), 0.95);
        assertEquals(4.15, e.value(), 1e-12);
        assertEquals(3.2, e.low());
        assertEquals(5.0, e.high());
    }

    static NumericDistribution distribution(double[] values) {
        Map<Double, Long> tally = new HashMap<>();
        for (double v : values) {
            tally.merge(v, 1L, Long::sum);
        }
        return NumericDistribution.ofTally(tally);
    }
}
