package org.wavewarden.pipeline;

import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.FindingsReport;

import java.util.List;

/** A wave that has been judged and written: its report, its run id and the alerts it raised, one per event. */
public record JudgedWave(FindingsReport report, long runId, List<Alert> alerts) {
}
