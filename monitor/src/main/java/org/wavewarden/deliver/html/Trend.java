package org.wavewarden.deliver.html;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * One statistic of a variable across every wave of the dataset, for the trend beside an alert: the statistic the
 * finding's sentence names, each wave computed with the finding's own estimator, with its interval.
 *
 * @param measure   what the values are, e.g. "weighted share answering 'SELF'" or "median income_monthly"
 * @param unit      the values' unit for the axis ("years"), or null; shares carry none and set {@code percent}
 * @param waves     wave labels in wave order
 * @param values    one value per wave, aligned with {@code waves}; NaN for a wave without data (drawn as a gap)
 * @param lows      each value's lower confidence limit, NaN where there is none (no band is drawn there)
 * @param highs     each value's upper confidence limit, NaN where there is none
 * @param percent   true when the values are shares from 0 to 1, drawn in percent as the sentence states them
 * @param category  the category or missing reason the shares are of, or null
 * @param reference the reference value of a REFERENCE finding, drawn as a dashed line; NaN for none
 * @param findingId the finding the trend belongs to (dataset/wave/variable/kind), or null
 */
public record Trend(String measure, String unit, List<String> waves, List<Double> values, List<Double> lows,
                    List<Double> highs, boolean percent, String category, double reference, String findingId) {

    /** A trend without intervals or reference. */
    public Trend(String measure, String unit, List<String> waves, List<Double> values) {
        this(measure, unit, waves, values, nans(values.size()), nans(values.size()), false, null, Double.NaN, null);
    }

    public Trend {
        Objects.requireNonNull(measure, "measure");
        waves = List.copyOf(waves);
        values = List.copyOf(values); // rejects null entries: a wave without data is NaN, not null
        lows = List.copyOf(lows);
        highs = List.copyOf(highs);
        if (waves.size() != values.size() || lows.size() != values.size() || highs.size() != values.size()) {
            throw new IllegalArgumentException("waves has " + waves.size() + " entries but values, lows and highs have "
                    + values.size() + ", " + lows.size() + " and " + highs.size());
        }
        for (int i = 0; i < values.size(); i++) {
            if (Double.isInfinite(values.get(i)) || Double.isInfinite(lows.get(i))
                    || Double.isInfinite(highs.get(i))) {
                throw new IllegalArgumentException("values[" + i + "] or its interval is infinite");
            }
        }
        if (Double.isInfinite(reference)) {
            throw new IllegalArgumentException("reference is infinite");
        }
    }

    /**
     * The same trend of a complete enumeration, whose waves each counted every unit: no wave has a sampling interval,
     * so each limit is the wave's value and no band is drawn.
     */
    public Trend exact() {
        return new Trend(measure, unit, waves, values, values, values, percent, category, reference, findingId);
    }

    private static List<Double> nans(int n) {
        List<Double> out = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            out.add(Double.NaN);
        }
        return out;
    }
}
