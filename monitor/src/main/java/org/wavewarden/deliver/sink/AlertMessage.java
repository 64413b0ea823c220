package org.wavewarden.deliver.sink;

import com.fasterxml.jackson.annotation.JsonInclude;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;
import java.util.Objects;

/**
 * What a sink sends for one alert: where it comes from (dataset, wave, comparison wave, run) and the part of the
 * finding a reader or a receiving system acts on. The JSON form (field names as the components, camelCase) is the
 * body of a webhook request and one line of a JSON Lines file.
 *
 * <p>The idempotency key identifies the alert, not the delivery: it is the SHA-256 of
 * {@code dataset|wave|againstWave|variable|kind|runChecksum}, where {@code runChecksum} is the checksum of the data
 * the run judged. Judging the same data again gives the same key, so receivers can drop the repeat; changed data
 * gives a new key, so the new alert is not mistaken for the old one. A missing comparison wave counts as the
 * empty string, as in the results schema. Within each part a backslash and a bar are escaped with a backslash, so
 * two different tuples can never join to the same text; for parts without those characters the joined text is
 * exactly the bar-separated list.
 *
 * @param againstWave    the comparison wave, or null when the wave was screened alone
 * @param runId          the run that judged the wave
 * @param verdict        null for data-quality findings without a verdict
 * @param effect         null when the finding has no effect size
 * @param pValue         null when the finding has no test
 * @param qValue         null when the finding has no test
 * @param idempotencyKey 64 lower-case hex digits, see above
 */
@JsonInclude(JsonInclude.Include.ALWAYS)
public record AlertMessage(String dataset, String wave, String againstWave, long runId, String variable,
                           FindingKind kind, Verdict verdict, String sentence, Finding.Effect effect, Double pValue,
                           Double qValue, String idempotencyKey) {

    public AlertMessage {
        requireText(dataset, "dataset");
        // A wave label is data: the empty one is a wave like any other, and the escaping keeps its key apart.
        Objects.requireNonNull(wave, "wave");
        requireText(variable, "variable");
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(sentence, "sentence");
        if (idempotencyKey == null || !idempotencyKey.matches("[0-9a-f]{64}")) {
            throw new IllegalArgumentException("idempotencyKey: expected 64 lower-case hex digits but got "
                    + idempotencyKey);
        }
    }

    /**
     * The message for one finding of a judged wave.
     *
     * @param runChecksum the checksum of the judged data (the run's summary checksum)
     */
    public static AlertMessage of(String dataset, String wave, String againstWave, long runId, String runChecksum,
                                  Finding finding) {
        Objects.requireNonNull(finding, "finding");
        return new AlertMessage(dataset, wave, againstWave, runId, finding.variable(), finding.kind(),
                finding.verdict(), finding.sentence(), finding.effect(), finding.pValue(), finding.qValue(),
                idempotencyKey(dataset, wave, againstWave, finding.variable(), finding.kind(), runChecksum));
    }

    /** The messages for several findings of one judged wave, in the given order. */
    public static List<AlertMessage> ofRun(String dataset, String wave, String againstWave, long runId,
                                           String runChecksum, List<Finding> findings) {
        return findings.stream().map(f -> of(dataset, wave, againstWave, runId, runChecksum, f)).toList();
    }

    /** SHA-256 hex of {@code dataset|wave|againstWave|variable|kind|runChecksum}, parts escaped as described above. */
    public static String idempotencyKey(String dataset, String wave, String againstWave, String variable,
                                        FindingKind kind, String runChecksum) {
        requireText(dataset, "dataset");
        Objects.requireNonNull(wave, "wave");
        requireText(variable, "variable");
        Objects.requireNonNull(kind, "kind");
        requireText(runChecksum, "runChecksum");
        String joined = String.join("|", escape(dataset), escape(wave), escape(againstWave == null ? "" : againstWave),
                escape(variable), kind.name(), escape(runChecksum));
        return Signatures.sha256Hex(joined);
    }

    public String toJson() {
        return Json.write(this);
    }

    public static AlertMessage fromJson(String json) {
        return Json.read(json, AlertMessage.class);
    }

    private static String escape(String part) {
        return part.replace("\\", "\\\\").replace("|", "\\|");
    }

    private static void requireText(String value, String name) {
        if (value == null || value.isEmpty()) {
            throw new IllegalArgumentException(name + ": expected a non-empty string but got "
                    + (value == null ? "null" : "''"));
        }
    }
}
