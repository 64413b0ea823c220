package org.wavewarden.deliver.html;

import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;
import java.util.Random;
import java.util.stream.IntStream;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class SvgChartTest {

    @Test
    void niceTicksFollowHeckbertsWorkedRule() {
        // Heckbert (1990): range nice(78.5, floor) = 100, step nice(100 / 5, round) = 20
        assertArrayEquals(new double[]{0, 20, 40, 60, 80}, SvgChart.niceTicks(0, 78.5, 6), 1e-12);
        // range nice(0.857) = 1, step nice(0.25, round) = 0.2
        assertArrayEquals(new double[]{0, 0.2, 0.4, 0.6, 0.8, 1.0}, SvgChart.niceTicks(0.013, 0.87, 5), 1e-12);
        assertArrayEquals(new double[]{-10, -5, 0, 5, 10}, SvgChart.niceTicks(-7.3, 8.1, 5), 1e-12);
    }

    @Test
    void niceTicksCoverTheRangeWithStepsOfOneTwoOrFiveOnRandomRanges() {
        Random rnd = new Random(7);
        for (int k = 0; k < 2000; k++) {
            double scale = Math.pow(10, rnd.nextInt(12) - 6);
            double a = (rnd.nextDouble() - 0.5) * 100 * scale;
            double b = a + rnd.nextDouble() * 50 * scale + 1e-3 * scale;
            int wanted = 2 + rnd.nextInt(8);
            double[] t = SvgChart.niceTicks(a, b, wanted);
            assertTrue(t[0] <= a + 1e-9 * scale && t[t.length - 1] >= b - 1e-9 * scale, "cover " + a + ".." + b);
            assertTrue(t.length >= 2 && t.length <= 2 * wanted + 2, "count " + t.length + " for " + wanted);
            double step = t[1] - t[0];
            double mantissa = step / Math.pow(10, Math.floor(Math.log10(step) + 1e-9));
            assertTrue(List.of(1.0, 2.0, 5.0, 10.0).stream().anyMatch(m -> Math.abs(m - mantissa) < 1e-6),
                    "step " + step);
        }
    }

    @Test
    void niceTicksRejectBadArguments() {
        assertThrows(IllegalArgumentException.class, () -> SvgChart.niceTicks(2, 1, 5));
        assertThrows(IllegalArgumentException.class, () -> SvgChart.niceTicks(0, Double.NaN, 5));
        double[] single = SvgChart.niceTicks(5, 5, 5);
        assertTrue(single.length >= 2 && single[0] < 5 && single[single.length - 1] > 5, "a single value gets an axis");
    }

    @Test
    void freedmanDiaconisWidthMatchesR() {
        // R 4.2.2 (Debian r-base-core): x <- qnorm(((1:1000) - 0.5)/1000) * 10 + 50; 2*IQR(x)/1000^(1/3)
        double[] x = IntStream.rangeClosed(1, 1000).mapToDouble(i -> 50 + 10
                * new org.apache.commons.math3.distribution.NormalDistribution().inverseCumulativeProbability(
                (i - 0.5) / 1000)).toArray();
        assertEquals(2.69481547288561, SvgChart.freedmanDiaconisWidth(NumericDistribution.ofSample(x)), 1e-6);
        // R 4.2.2: 2*IQR(1:100)/100^(1/3)
        double[] y = IntStream.rangeClosed(1, 100).asDoubleStream().toArray();
        assertEquals(21.3289034313157, SvgChart.freedmanDiaconisWidth(NumericDistribution.ofSample(y)), 1e-9);
    }

    @Test
    void histogramCountsMatchRsLeftClosedHistogram() {
        // R 4.2.2: hist(1:100, breaks = seq(0, 120, 20), right = FALSE, plot = FALSE)$counts -> 19 20 20 20 20 1
        double[] y = IntStream.rangeClosed(1, 100).asDoubleStream().toArray();
        NumericDistribution d = NumericDistribution.ofSample(y);
        SvgChart.Bins bins = SvgChart.histogramBins(d, d);
        assertEquals(new SvgChart.Bins(0, 20, 6), bins, "FD width 21.3 rounds to 20; 100 opens its own bin");
        double[] shares = SvgChart.binShares(d, bins);
        assertArrayEquals(new double[]{.19, .20, .20, .20, .20, .01}, shares, 1e-12);
    }

    @Test
    void binsAreSharedByBothWavesAndHoldEveryObservation() {
        Random rnd = new Random(11);
        for (int k = 0; k < 200; k++) {
            double[] a = rnd.doubles(5 + rnd.nextInt(400), -50, 50).map(v -> v * (1 + rnd.nextDouble())).toArray();
            double[] b = rnd.doubles(5 + rnd.nextInt(400), -20, 80).toArray();
            NumericDistribution da = NumericDistribution.ofSample(a);
            NumericDistribution db = NumericDistribution.ofSample(b);
            SvgChart.Bins bins = SvgChart.histogramBins(da, db);
            assertEquals(bins, SvgChart.histogramBins(db, da), "swapping the waves leaves the bins");
            assertTrue(bins.count() <= SvgChart.MAX_BINS);
            double lo = Math.min(da.value(0), db.value(0));
            double hi = Math.max(da.value(da.size() - 1), db.value(db.size() - 1));
            assertTrue(bins.edge(0) <= lo && bins.edge(bins.count()) >= hi - 1e-9, "bins cover the data");
            assertEquals(1.0, java.util.Arrays.stream(SvgChart.binShares(da, bins)).sum(), 1e-9);
        }
    }

    @Test
    void wholeNumberBinsHoldEqualNumbersOfPossibleAnswers() {
        Random rnd = new Random(3);
        double[] ages = rnd.ints(4000, 16, 100).asDoubleStream().toArray();
        NumericDistribution d = NumericDistribution.ofSample(ages);
        SvgChart.Bins bins = SvgChart.histogramBins(d, d);
        assertEquals(Math.rint(bins.width()), bins.width());
        assertEquals(Math.rint(bins.start()), bins.start());
        assertTrue(bins.edge(bins.count()) > 99, "99 lies inside a bin, not on its closing edge");
    }

    @Test
    void anOutlierCannotPushTheBinsPastTheLimit() {
        double[] x = IntStream.rangeClosed(1, 1000).asDoubleStream().toArray();
        x[999] = 999_999;
        NumericDistribution d = NumericDistribution.ofSample(x);
        SvgChart.Bins bins = SvgChart.histogramBins(d, NumericDistribution.empty());
        assertTrue(bins.count() <= SvgChart.MAX_BINS && bins.count() > 1, "bins " + bins);
    }

    @Test
    void chartsEscapeLabelsAndCarryTitleAndAriaLabel() {
        String svg = SvgChart.shares("v<1>", new VariablePlot.SharesPlot(List.of("a&b", "<b>"), new long[]{1, 2},
                new long[]{3, 4}), "W\"1", "W2");
        assertFalse(svg.contains("<b>"), svg);
        assertTrue(svg.contains("&lt;b&gt;") && svg.contains("a&amp;b") && svg.contains("W&quot;1"));
        assertTrue(svg.startsWith("<svg class=\"plot shares\"") && svg.contains("aria-label=\"Shares of v&lt;1&gt;")
                && svg.contains("<title>Shares of v&lt;1&gt;"));
    }

    @Test
    void sparklineBreaksAtAWaveWithoutData() {
        String svg = SvgChart.sparkline("x", new Trend("mean x", "cm", List.of("w1", "w2", "w3", "w4"),
                List.of(1.0, 2.0, Double.NaN, 4.0)), "w4");
        assertEquals(2, svg.split("<polyline", -1).length - 1, "two segments around the gap");
        assertTrue(svg.contains(">w1<") && svg.contains(">w4<") && svg.contains("mean x (cm)"));
        assertEquals(1, svg.split("pt cur", -1).length - 1, "the current wave is marked once");
    }

    @Test
    void numericPlotDrawsOneBarPairPerValueWhenValuesAreFew() {
        NumericDistribution b = NumericDistribution.ofSample(0, 0, 1, 2, 2, 2, 3);
        NumericDistribution c = NumericDistribution.ofSample(0, 1, 1, 1, 3, 4);
        String svg = SvgChart.numeric("children", new VariablePlot.NumericPlot(null, b, c), "A", "B");
        assertEquals(5, svg.split("<rect class=\"bar b\"", -1).length - 1, "one baseline bar per pooled value");
        assertEquals(5, svg.split("<rect class=\"bar c\"", -1).length - 1, "one current bar per pooled value");
    }

    @Test
    void valuesAtTheEndsOfTheDoublesAreDrawnInUnitsOfAPowerOfTen() {
        NumericDistribution b = NumericDistribution.ofSample(-1e308, 5e-324, 1e308, 1e308);
        NumericDistribution c = NumericDistribution.ofSample(-1e308, 5e-324, 5e-324, 1e308);
        String svg = SvgChart.numeric("huge", new VariablePlot.NumericPlot(null, b, c), "1", "2");
        assertFalse(svg.contains("NaN") || svg.contains("Infinity"), svg);
        assertTrue(svg.contains("(\u00d7 1e308)"), svg);

        NumericDistribution tiny = NumericDistribution.ofSample(0, 5e-324, 1e-320);
        String small = SvgChart.numeric("tiny", new VariablePlot.NumericPlot("m", tiny, tiny), "1", "2");
        assertFalse(small.contains("NaN") || small.contains("Infinity"), small);
        // 1e-320 is a subnormal just below itself, 9.99989e-321: the decade is -321.
        assertTrue(small.contains("(\u00d7 1e-321 m)"), small);

        double[] many = IntStream.range(0, 200).mapToDouble(i -> (i - 100) * 1e306).toArray();
        String binned = SvgChart.numeric("spread", new VariablePlot.NumericPlot(null, NumericDistribution.ofSample(many),
                NumericDistribution.ofSample(many)), "1", "2");
        assertFalse(binned.contains("NaN") || binned.contains("Infinity"), binned);
    }
}
