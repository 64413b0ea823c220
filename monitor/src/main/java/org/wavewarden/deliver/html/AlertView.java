package org.wavewarden.deliver.html;

import org.wavewarden.judge.Finding;

import java.util.Objects;

/**
 * One alert as the HTML digest shows it: the finding, and optionally the chart of both waves and the trend.
 *
 * @param finding the alert's finding
 * @param plot    both waves' data for the chart, or null when there is nothing to draw
 * @param trend   the variable across all waves, or null
 */
public record AlertView(Finding finding, VariablePlot plot, Trend trend) {

    public AlertView {
        Objects.requireNonNull(finding, "finding");
    }
}
