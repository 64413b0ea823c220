package org.wavewarden.deliver.html;

import org.wavewarden.deliver.FindingsReport;

import java.util.List;
import java.util.Objects;

/**
 * One judged wave in the HTML digest: its report (for the header and the verdict counts) and the alerts to show.
 * The digest shows the alerts in the project's reading order whatever order they are given in.
 *
 * @param report the wave's findings report
 * @param alerts the alerts to show, one per event, usually those {@link org.wavewarden.deliver.Alerts#group} makes
 */
public record WaveSection(FindingsReport report, List<AlertView> alerts) {

    public WaveSection {
        Objects.requireNonNull(report, "report");
        alerts = List.copyOf(alerts);
    }
}
