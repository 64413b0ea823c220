package org.wavewarden.deliver.html;

import java.util.List;
import java.util.Objects;

/**
 * One summary measure of a variable across every wave of the dataset, for the sparkline beside an alert.
 *
 * @param measure what the values are, e.g. "mean age" or "share missing (NULL)"
 * @param unit    the values' unit for the axis ("years", "%"), or null
 * @param waves   wave labels in wave order
 * @param values  one value per wave, aligned with {@code waves}; NaN for a wave without data (drawn as a gap)
 */
public record Trend(String measure, String unit, List<String> waves, List<Double> values) {

    public Trend {
        Objects.requireNonNull(measure, "measure");
        waves = List.copyOf(waves);
        values = List.copyOf(values); // rejects null entries: a wave without data is NaN, not null
        if (waves.size() != values.size()) {
            throw new IllegalArgumentException("waves has " + waves.size() + " entries but values has "
                    + values.size());
        }
        for (int i = 0; i < values.size(); i++) {
            if (Double.isInfinite(values.get(i))) {
                throw new IllegalArgumentException("values[" + i + "] is infinite");
            }
        }
    }
}
