package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;

import java.time.Instant;
import java.util.List;

/**
 * The content of {@code findings.json} for one judged wave (the output contract of the project).
 *
 * @param againstWave the comparison wave, or null when the wave was screened alone (the first wave)
 * @param inference   how unlisted variables were classified, so a reader can check the guess
 */
public record FindingsReport(String dataset, String wave, String againstWave, Instant generatedAt, double alpha,
                             String fdrMethod, List<String> inference, List<Finding> findings) {

    public FindingsReport {
        inference = List.copyOf(inference);
        findings = List.copyOf(findings);
    }
}
