package org.wavewarden.deliver;

import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import org.wavewarden.judge.Finding;

import java.time.Instant;
import java.util.List;

/**
 * The content of {@code findings.json} for one judged wave (the output contract of the project; its JSON Schema is
 * {@code docs/findings.schema.json}).
 *
 * @param againstWave       the comparison wave, or null when the wave was screened alone (the first wave)
 * @param inference         how unlisted variables were classified, so a reader can check the guess
 * @param schemaVersion     the format of this file, {@link #SCHEMA_VERSION}; a file without it is format 1
 * @param toolVersion       the Wavewarden version that judged the wave
 * @param configFingerprint SHA-256 of the configuration the run judged the wave under
 *                          ({@link org.wavewarden.config.ConfigFingerprint}), or null when not known
 * @param fdrFamilySize     how many p-values the run adjusted together for the false discovery rate (0 when
 *                          nothing was tested); every q-value of the report comes from this one family
 */
@JsonPropertyOrder({"schemaVersion", "toolVersion", "configFingerprint", "dataset", "wave", "againstWave",
        "generatedAt", "alpha", "fdrMethod", "fdrFamilySize", "inference", "findings"})
public record FindingsReport(String dataset, String wave, String againstWave, Instant generatedAt, double alpha,
                             String fdrMethod, List<String> inference, List<Finding> findings, Integer schemaVersion,
                             String toolVersion, String configFingerprint, Integer fdrFamilySize) {

    /**
     * Format 2 added the schema version, the tool version, the configuration fingerprint, the family size, and
     * each finding's df, df convention, family size and method.
     */
    public static final int SCHEMA_VERSION = 2;

    public FindingsReport {
        inference = List.copyOf(inference);
        findings = List.copyOf(findings);
        schemaVersion = schemaVersion == null ? 1 : schemaVersion;
    }

    /**
     * A report in the current format by the running version; the family size is read from the findings, each of
     * which carries the size of the family its q-value came from.
     */
    public FindingsReport(String dataset, String wave, String againstWave, Instant generatedAt, double alpha,
                          String fdrMethod, List<String> inference, List<Finding> findings, String toolVersion,
                          String configFingerprint) {
        this(dataset, wave, againstWave, generatedAt, alpha, fdrMethod, inference, findings, SCHEMA_VERSION,
                toolVersion, configFingerprint, familySize(findings));
    }

    /** The same by the running version with no configuration fingerprint (a report not made from one config). */
    public FindingsReport(String dataset, String wave, String againstWave, Instant generatedAt, double alpha,
                          String fdrMethod, List<String> inference, List<Finding> findings) {
        this(dataset, wave, againstWave, generatedAt, alpha, fdrMethod, inference, findings, ToolVersion.current(),
                null);
    }

    /** The size of the findings' false-discovery-rate family, 0 when none was tested. */
    static int familySize(List<Finding> findings) {
        return findings.stream().map(Finding::fdrFamilySize).filter(java.util.Objects::nonNull)
                .mapToInt(Integer::intValue).max().orElse(0);
    }
}
