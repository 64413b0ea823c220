package org.wavewarden.pipeline;

import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;

import java.util.List;

/** A wave that has been judged and written: its report, its run id and the alerts it raised. */
public record JudgedWave(FindingsReport report, long runId, List<Finding> alerts) {
}
