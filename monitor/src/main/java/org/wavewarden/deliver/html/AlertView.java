package org.wavewarden.deliver.html;

import org.wavewarden.deliver.Alert;
import org.wavewarden.judge.Finding;

import java.util.Objects;

/**
 * One alert as the HTML digest shows it: the event's findings, and optionally the chart of both waves and the
 * trend, drawn for the lead finding.
 *
 * @param alert the event, its lead finding first
 * @param plot  both waves' data for the chart, or null when there is nothing to draw
 * @param trend the variable across all waves, or null
 */
public record AlertView(Alert alert, VariablePlot plot, Trend trend) {

    public AlertView {
        Objects.requireNonNull(alert, "alert");
    }

    /** A finding that is an alert of its own. */
    public AlertView(Finding finding, VariablePlot plot, Trend trend) {
        this(Alert.of(Objects.requireNonNull(finding, "finding")), plot, trend);
    }

    /** The lead finding, which the card is named by and whose plot it draws. */
    public Finding finding() {
        return alert.lead();
    }
}
