package org.wavewarden.deliver.html;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.compare.DateComparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.WaveEstimates;

import java.util.List;
import java.util.function.Function;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * An interval of no width (a census's, whose count has no sampling error) is drawn as no interval at all: no whisker,
 * no error bar, no band, and no title promising them; the estimate itself is drawn as before. The same chart with
 * intervals of positive width draws them, so the count below can see them.
 */
class ZeroWidthIntervalChartTest {

    static final String ID = "dwelling_census/2/tenure/SHIFT";

    /** The estimate with limits {@code half} either side of it; 0 gives a census's interval. */
    static WaveEstimates.Estimate estimate(String category, double value, double half) {
        return new WaveEstimates.Estimate(category, value, value - half, value + half);
    }

    static EffectSize days(double day, double half) {
        return new EffectSize("median date", day, day - half, day + half, 0.95);
    }

    static String shares(double half) {
        return SvgChart.estimates("tenure", new VariablePlot.EstimatePlot(ID, new WaveEstimates.Plotted(
                "share answering 'let'", WaveEstimates.Estimator.SHARE, null,
                List.of(estimate("let", 0.25, half), estimate("owned", 0.5, half)),
                List.of(estimate("let", 0.5, half), estimate("owned", 0.25, half)), null)), "1", "2");
    }

    static String location(double half) {
        return SvgChart.estimates("rent", new VariablePlot.EstimatePlot(ID, new WaveEstimates.Plotted("mean rent",
                WaveEstimates.Estimator.MEAN, "pounds", List.of(estimate(null, 650, 4 * half)),
                List.of(estimate(null, 710, 4 * half)), null)), "1", "2");
    }

    static String correlation(double half) {
        return SvgChart.correlation("floor_area and rooms", new VariablePlot.CorrelationPlot(
                List.of("Spearman rho", "Pearson r"),
                new double[][] {{0.6, 0.6 - half, 0.6 + half}, {0.55, 0.55 - half, 0.55 + half}},
                new double[][] {{0.2, 0.2 - half, 0.2 + half}, {0.18, 0.18 - half, 0.18 + half}}, ID), "1", "2");
    }

    static String dates(double half) {
        return SvgChart.dates("inspected", new VariablePlot.DatePlot(ID, new DateComparison.DateDetail(
                "2019-12-01", "2020-12-01", "2019-01-02", "2020-11-30", "2020-01-02", "2021-11-30", 0.5, 366,
                days(18231, 100 * half), days(18597, 100 * half))), "1", "2");
    }

    static String trend(double half) {
        return SvgChart.sparkline("tenure", new Trend("share answering 'let'", null, List.of("1", "2", "3"),
                List.of(0.25, 0.5, 0.4), List.of(0.25 - half, 0.5 - half, 0.4 - half),
                List.of(0.25 + half, 0.5 + half, 0.4 + half), true, "let", Double.NaN, ID), "3");
    }

    static Stream<Arguments> charts() {
        return Stream.of(
                Arguments.of("shares with error bars", (Function<Double, String>) ZeroWidthIntervalChartTest::shares,
                        "<rect"),
                Arguments.of("a mean with whiskers", (Function<Double, String>) ZeroWidthIntervalChartTest::location,
                        "<circle class=\"pt"),
                Arguments.of("correlations with whiskers",
                        (Function<Double, String>) ZeroWidthIntervalChartTest::correlation, "<circle class=\"pt"),
                Arguments.of("median dates with whiskers",
                        (Function<Double, String>) ZeroWidthIntervalChartTest::dates, "<circle class=\"pt"),
                Arguments.of("a trend with its band", (Function<Double, String>) ZeroWidthIntervalChartTest::trend,
                        "<polyline"));
    }

    static int drawnIntervals(String svg) {
        Matcher m = Pattern.compile("<line class=\"ci |<polygon class=\"band\"").matcher(svg);
        int n = 0;
        while (m.find()) {
            n++;
        }
        return n;
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("charts")
    void anIntervalOfNoWidthIsNotDrawnNorNamed(String chart, Function<Double, String> draw, String estimateMark) {
        String sampled = draw.apply(0.03);
        String counted = draw.apply(0.0);
        assertTrue(drawnIntervals(sampled) > 0, sampled);
        assertTrue(sampled.contains("confidence interval"), "a sample's chart names its intervals: " + sampled);
        assertEquals(0, drawnIntervals(counted), counted);
        assertFalse(counted.contains("confidence interval"), counted);
        assertTrue(counted.contains(estimateMark), "the estimates are still drawn: " + counted);
    }
}
