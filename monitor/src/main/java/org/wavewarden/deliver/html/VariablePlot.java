package org.wavewarden.deliver.html;

import org.wavewarden.compare.WaveEstimates;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;
import java.util.Objects;

/**
 * The data behind one alert's chart: what both waves looked like for the variable the alert is about.
 * Baseline comes first everywhere, as in the comparison stage.
 */
public sealed interface VariablePlot permits VariablePlot.NumericPlot, VariablePlot.SharesPlot,
        VariablePlot.MissingPlot, VariablePlot.CorrelationPlot, VariablePlot.EstimatePlot, VariablePlot.Unavailable,
        VariablePlot.CumulativePlot, VariablePlot.DatePlot {

    /**
     * A change of shape: both waves' cumulative distributions as the finding measured them (weighted where it is),
     * with the largest gap, whose length is the finding's KS distance, marked with its interval.
     *
     * @param findingId the finding the numbers belong to, written on every element
     * @param shape     the finding's curves and gap
     */
    record CumulativePlot(String findingId, org.wavewarden.compare.shape.CumulativeGap.ShapeDetail shape)
            implements VariablePlot {
        public CumulativePlot {
            Objects.requireNonNull(shape, "shape");
            if (shape.current().isEmpty() || shape.baseline().size() != shape.current().size()) {
                throw new IllegalArgumentException("both curves must have the same, non-zero number of steps");
            }
        }
    }

    /**
     * A comparison of dates: each wave's median date with its interval and the span from its earliest to its latest
     * date, as the finding's detail holds them.
     *
     * @param findingId the finding the numbers belong to, written on every element
     * @param dates     the finding's dates
     */
    record DatePlot(String findingId, org.wavewarden.compare.DateComparison.DateDetail dates) implements VariablePlot {
        public DatePlot {
            Objects.requireNonNull(dates, "dates");
        }
    }

    /**
     * The estimates a finding was judged on, each with its interval, as the finding's detail holds them
     * ({@link WaveEstimates.Plotted}): shares as grouped bars with error bars, a mean or median as a point with
     * whiskers per wave, and the reference of a REFERENCE finding as a dashed mark.
     *
     * @param findingId the finding the numbers belong to (dataset/wave/variable/kind), written on every element
     * @param plotted   the finding's plotted estimates; an empty baseline means there is no baseline wave
     */
    record EstimatePlot(String findingId, WaveEstimates.Plotted plotted) implements VariablePlot {
        public EstimatePlot {
            Objects.requireNonNull(plotted, "plotted");
            if (plotted.current().isEmpty()) {
                throw new IllegalArgumentException("nothing to draw: no current estimate");
            }
            if (!plotted.baseline().isEmpty() && plotted.baseline().size() != plotted.current().size()) {
                throw new IllegalArgumentException("baseline has " + plotted.baseline().size()
                        + " estimates but current has " + plotted.current().size());
            }
            if (!plotted.reference().isEmpty() && plotted.reference().size() != plotted.current().size()) {
                throw new IllegalArgumentException("reference has " + plotted.reference().size()
                        + " values but current has " + plotted.current().size());
            }
        }
    }

    /**
     * No chart: preparing its data failed. The alert is shown with a note in the chart's place.
     *
     * @param error the simple name of the error's class, for the note
     */
    record Unavailable(String error) implements VariablePlot {
        public Unavailable {
            Objects.requireNonNull(error, "error");
        }
    }

    /**
     * A relationship of two variables: each wave's correlation (Spearman's rho, and Pearson's r beside it) with its
     * confidence interval, drawn as points with whiskers on the scale from -1 to 1.
     *
     * @param labels    the measures, e.g. "Spearman rho", "Pearson r"
     * @param baseline  per measure {estimate, low, high} in the baseline wave
     * @param current   per measure {estimate, low, high} in the current wave
     */
    record CorrelationPlot(List<String> labels, double[][] baseline, double[][] current, String findingId)
            implements VariablePlot {

        public CorrelationPlot(List<String> labels, double[][] baseline, double[][] current) {
            this(labels, baseline, current, null);
        }

        public CorrelationPlot {
            if (labels.size() != baseline.length || labels.size() != current.length) {
                throw new IllegalArgumentException("one row of baseline and current per label");
            }
            labels = List.copyOf(labels);
        }
    }

    /**
     * A numeric variable: both waves' valid values, drawn as overlaid histograms.
     *
     * @param unit     the variable's unit for the axis label, or null when it has none
     * @param baseline the baseline wave's valid values, or null when there is no baseline wave
     * @param current  the current wave's valid values
     * @param findingId the finding drawn (dataset/wave/variable/kind), or null
     */
    record NumericPlot(String unit, NumericDistribution baseline, NumericDistribution current, String findingId)
            implements VariablePlot {

        public NumericPlot(String unit, NumericDistribution baseline, NumericDistribution current) {
            this(unit, baseline, current, null);
        }

        public NumericPlot {
            Objects.requireNonNull(current, "current");
            if ((baseline == null ? 0 : baseline.n()) + current.n() == 0) {
                throw new IllegalArgumentException("baseline and current are both empty: nothing to draw");
            }
        }
    }

    /**
     * A categorical or binary variable: each category's count of valid answers in both waves, drawn as bars of
     * the share of valid answers.
     *
     * @param categories category labels, in the order the bars are drawn
     * @param baseline   baseline counts, aligned with {@code categories}; null when there is no baseline wave
     * @param current    current counts, aligned with {@code categories}
     * @param findingId  the finding drawn (dataset/wave/variable/kind), or null
     */
    record SharesPlot(List<String> categories, long[] baseline, long[] current, String findingId)
            implements VariablePlot {

        public SharesPlot(List<String> categories, long[] baseline, long[] current) {
            this(categories, baseline, current, null);
        }

        public SharesPlot {
            categories = List.copyOf(categories);
            baseline = baseline == null ? null : checkedCounts("baseline", baseline, categories.size(), "categories");
            current = checkedCounts("current", current, categories.size(), "categories");
            if (categories.isEmpty()) {
                throw new IllegalArgumentException("categories must not be empty");
            }
        }

        @Override
        public long[] baseline() {
            return baseline == null ? null : baseline.clone();
        }

        @Override
        public long[] current() {
            return current.clone();
        }
    }

    /**
     * The missing answers of a variable by reason (NULL, a codebook code, a disguised missing value), with each
     * wave's row count, drawn as the share of rows per reason.
     *
     * @param reasons      reason labels, in the order the bars are drawn
     * @param baseline     baseline rows per reason, aligned with {@code reasons}; null when there is no baseline wave
     * @param rowsBaseline rows in the baseline wave (the denominator of its rates); 0 without a baseline wave
     * @param current      current rows per reason, aligned with {@code reasons}
     * @param rowsCurrent  rows in the current wave
     * @param findingId    the finding drawn (dataset/wave/variable/kind), or null
     */
    record MissingPlot(List<String> reasons, long[] baseline, long rowsBaseline, long[] current, long rowsCurrent,
                       String findingId) implements VariablePlot {

        public MissingPlot(List<String> reasons, long[] baseline, long rowsBaseline, long[] current,
                           long rowsCurrent) {
            this(reasons, baseline, rowsBaseline, current, rowsCurrent, null);
        }

        public MissingPlot {
            reasons = List.copyOf(reasons);
            baseline = baseline == null ? null : checkedCounts("baseline", baseline, reasons.size(), "reasons");
            current = checkedCounts("current", current, reasons.size(), "reasons");
            if (reasons.isEmpty()) {
                throw new IllegalArgumentException("reasons must not be empty");
            }
            if (baseline != null) {
                checkRows("rowsBaseline", rowsBaseline, baseline);
            }
            checkRows("rowsCurrent", rowsCurrent, current);
        }

        @Override
        public long[] baseline() {
            return baseline == null ? null : baseline.clone();
        }

        @Override
        public long[] current() {
            return current.clone();
        }

        private static void checkRows(String name, long rows, long[] counts) {
            long sum = 0;
            for (long c : counts) {
                sum += c;
            }
            if (rows < sum) {
                throw new IllegalArgumentException(name + " is " + rows + " but the reasons count " + sum + " rows");
            }
        }
    }

    private static long[] checkedCounts(String name, long[] counts, int size, String against) {
        Objects.requireNonNull(counts, name);
        if (counts.length != size) {
            throw new IllegalArgumentException(name + " has " + counts.length + " entries but " + against + " has "
                    + size);
        }
        for (int i = 0; i < counts.length; i++) {
            if (counts[i] < 0) {
                throw new IllegalArgumentException(name + "[" + i + "] must not be negative, was " + counts[i]);
            }
        }
        return counts.clone();
    }
}
