package org.wavewarden.deliver.sink;

import com.fasterxml.jackson.annotation.JsonCreator;
import com.fasterxml.jackson.annotation.JsonInclude;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.util.List;
import java.util.Objects;

/**
 * What a sink sends for one alert: where it comes from (dataset, wave, comparison wave, run) and the part of the
 * findings a reader or a receiving system acts on. The JSON form (field names as the components, camelCase) is the
 * body of a webhook request and one line of a JSON Lines file.
 *
 * <p>An alert is one event ({@link Alert}): the top-level variable, kind, verdict, sentence, effect, p and q are its
 * lead finding's, and {@code facets} lists every finding of the event, the lead first, each with the aspect it shows
 * ({@link Alert.Facet}). A message read from JSON written before alerts were grouped has its lead as its one facet.
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
 * @param facets         every finding of the event, the lead first; never empty
 * @param idempotencyKey 64 lower-case hex digits, see above; the lead's key, so an event keeps the key its lead had
 *                       alone
 */
@JsonInclude(JsonInclude.Include.ALWAYS)
public record AlertMessage(String dataset, String wave, String againstWave, long runId, String variable,
                           FindingKind kind, Verdict verdict, String sentence, Finding.Effect effect, Double pValue,
                           Double qValue, List<Part> facets, String idempotencyKey) {

    /**
     * One finding of the event.
     *
     * @param facet the aspect of the event it shows
     */
    @JsonInclude(JsonInclude.Include.ALWAYS)
    public record Part(Alert.Facet facet, FindingKind kind, Verdict verdict, String sentence, Finding.Effect effect,
                       Double pValue, Double qValue) {

        public Part {
            Objects.requireNonNull(kind, "kind");
            Objects.requireNonNull(sentence, "sentence");
            // Derived from the kind, so a message read back can never name a facet its kind does not show.
            facet = Alert.Facet.of(kind);
        }

        static Part of(Finding f) {
            return new Part(Alert.Facet.of(f.kind()), f.kind(), f.verdict(), f.sentence(), f.effect(), f.pValue(),
                    f.qValue());
        }
    }

    /** A message whose event has only its lead finding. */
    public AlertMessage(String dataset, String wave, String againstWave, long runId, String variable,
                        FindingKind kind, Verdict verdict, String sentence, Finding.Effect effect, Double pValue,
                        Double qValue, String idempotencyKey) {
        this(dataset, wave, againstWave, runId, variable, kind, verdict, sentence, effect, pValue, qValue, null,
                idempotencyKey);
    }

    @JsonCreator
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
        facets = facets == null || facets.isEmpty()
                ? List.of(new Part(null, kind, verdict, sentence, effect, pValue, qValue)) : List.copyOf(facets);
        if (facets.get(0).kind() != kind) {
            throw new IllegalArgumentException("facets: expected the lead (" + kind + ") first but got "
                    + facets.get(0).kind());
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
        return of(dataset, wave, againstWave, runId, runChecksum, Alert.of(finding));
    }

    /**
     * The message for one alert (one event) of a judged wave.
     *
     * @param runChecksum the checksum of the judged data (the run's summary checksum)
     */
    public static AlertMessage of(String dataset, String wave, String againstWave, long runId, String runChecksum,
                                  Alert alert) {
        Objects.requireNonNull(alert, "alert");
        Finding lead = alert.lead();
        // An alert against a further baseline (the same quarter a year back) names that baseline and is keyed by it,
        // so it is another event than the run's first baseline's alert of the same variable and kind.
        String baseline = alert.against() == null ? againstWave : alert.against();
        return new AlertMessage(dataset, wave, baseline, runId, lead.variable(), lead.kind(), lead.verdict(),
                lead.sentence(), lead.effect(), lead.pValue(), lead.qValue(),
                alert.facets().stream().map(Part::of).toList(),
                idempotencyKey(dataset, wave, baseline, lead.variable(), lead.kind(), runChecksum));
    }

    /** The messages for several findings of one judged wave, each its own alert, in the given order. */
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
