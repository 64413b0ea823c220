package org.wavewarden.deliver.sink;

import org.wavewarden.deliver.DataText;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Verdict;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * One message per firing and sink: the firing's new alerts (open ones the sink's filter takes), grouped MATERIAL,
 * UNCERTAIN, then data-quality findings by kind, and how many were not sent on their own and why. A reader of a
 * roll-up sees in one place what the firing found, instead of one message per alert; the counts say that nothing
 * was dropped silently.
 *
 * <p>The JSON form (components as field names) is the body of a webhook post; {@link #text()} is the body of an
 * e-mail and of a webhook post for chat tools. Every value from the data (wave labels, variable names, sentences)
 * passes through {@link DataText#visible} in the text form, so it stays on its line.
 *
 * @param dataset        the dataset the firing judged
 * @param firing         the firing's name (its digest folder's name, which carries the time it started)
 * @param runIds         the runs of the firing
 * @param alerts         the new alerts, in the order of {@link #groups()}
 * @param notSent        what was not sent on its own, and why
 * @param digestLink     the firing's digest, or null when no base URL is configured or the firing has none
 * @param idempotencyKey the same on every attempt and every carrying out of the same outbox row
 */
public record RollUp(String dataset, String firing, List<Long> runIds, List<AlertMessage> alerts,
                     NotSent notSent, String digestLink, String idempotencyKey) {

    /**
     * Counts of what the firing found and did not send on its own.
     *
     * @param explained         alerts explained (by an expected change declared in the configuration, or by a
     *                          person before the firing's messages went out)
     * @param muted             alerts a mute rule covers: recorded, listed in the digest's muted section
     * @param stillPresent      data-quality findings unchanged from the previous wave: no new alert
     * @param stillTooFewAnswers variables whose samples still cannot resolve their threshold: no new alert
     * @param notForThisSink    open alerts this sink's filter does not take
     */
    public record NotSent(int explained, int muted, int stillPresent, int stillTooFewAnswers, int notForThisSink) {
        public static final NotSent NONE = new NotSent(0, 0, 0, 0, 0);

        public int total() {
            return explained + muted + stillPresent + stillTooFewAnswers + notForThisSink;
        }
    }

    public RollUp {
        Objects.requireNonNull(dataset, "dataset");
        Objects.requireNonNull(firing, "firing");
        runIds = List.copyOf(runIds);
        alerts = sorted(alerts);
        notSent = notSent == null ? NotSent.NONE : notSent;
        if (idempotencyKey == null || !idempotencyKey.matches("[0-9a-f]{64}")) {
            throw new IllegalArgumentException("idempotencyKey: expected 64 lower-case hex digits but got "
                    + idempotencyKey);
        }
    }

    /** The key of the roll-up of one outbox row: SHA-256 of {@code roll-up|dataset|sink|item}. */
    public static String idempotencyKey(String dataset, String sink, String item) {
        return Signatures.sha256Hex(String.join("|", "roll-up", dataset, sink, item));
    }

    /** The new alerts under their headings: MATERIAL, UNCERTAIN, then one heading per data-quality kind. */
    public Map<String, List<AlertMessage>> groups() {
        Map<String, List<AlertMessage>> out = new LinkedHashMap<>();
        for (AlertMessage a : alerts) {
            out.computeIfAbsent(heading(a), k -> new ArrayList<>()).add(a);
        }
        return out;
    }

    /** E.g. {@code household: 3 new alerts (1 MATERIAL, 1 UNCERTAIN, 1 data quality), firing digest-...}. */
    public String subject() {
        long material = alerts.stream().filter(a -> a.verdict() == Verdict.MATERIAL).count();
        long uncertain = alerts.stream().filter(a -> a.verdict() == Verdict.UNCERTAIN).count();
        long quality = alerts.size() - material - uncertain;
        List<String> parts = new ArrayList<>();
        if (material > 0) {
            parts.add(material + " MATERIAL");
        }
        if (uncertain > 0) {
            parts.add(uncertain + " UNCERTAIN");
        }
        if (quality > 0) {
            parts.add(quality + " data quality");
        }
        return "[Wavewarden] " + DataText.visible(dataset) + ": " + alerts.size() + " new alert"
                + (alerts.size() == 1 ? "" : "s") + (parts.isEmpty() ? "" : " (" + String.join(", ", parts) + ")")
                + ", firing " + DataText.visible(firing);
    }

    /** The plain-text message. */
    public String text() {
        StringBuilder sb = new StringBuilder();
        sb.append("Wavewarden, dataset ").append(DataText.visible(dataset)).append(", firing ")
                .append(DataText.visible(firing)).append('\n');
        sb.append(alerts.size()).append(" new alert").append(alerts.size() == 1 ? "" : "s").append(".\n");
        for (var g : groups().entrySet()) {
            sb.append('\n').append(g.getKey()).append(" (").append(g.getValue().size()).append(")\n");
            for (AlertMessage a : g.getValue()) {
                sb.append("- ").append(line(a)).append('\n');
            }
        }
        sb.append("\nNot sent on their own: ").append(notSent.total()).append('\n');
        sb.append("- explained (expected change or reviewer): ").append(notSent.explained()).append('\n');
        sb.append("- muted: ").append(notSent.muted()).append('\n');
        sb.append("- still present from the previous wave: ").append(notSent.stillPresent()).append('\n');
        sb.append("- still too few answers to judge: ").append(notSent.stillTooFewAnswers()).append('\n');
        sb.append("- not taken by this sink's filter: ").append(notSent.notForThisSink()).append('\n');
        if (digestLink != null) {
            sb.append("\nDigest: ").append(digestLink).append('\n');
        }
        return sb.toString();
    }

    /** One alert on one line: wave, comparison wave, variable, kind and verdict, then its sentence. */
    public static String line(AlertMessage a) {
        return "wave " + DataText.visible(a.wave()) + (a.againstWave() == null ? ""
                : " against " + DataText.visible(a.againstWave())) + ", " + DataText.visible(a.variable()) + " ("
                + a.kind() + (a.verdict() == null ? "" : ", " + a.verdict()) + "): " + DataText.visible(a.sentence());
    }

    /** One alert as a plain-text message of its own, for a chat tool or an e-mail per alert. */
    public static String text(AlertMessage a) {
        return "Wavewarden, dataset " + DataText.visible(a.dataset()) + ": " + line(a);
    }

    /** The subject of an e-mail per alert. */
    public static String subject(AlertMessage a) {
        return "[Wavewarden] " + DataText.visible(a.dataset()) + " wave " + DataText.visible(a.wave()) + ": "
                + (a.verdict() == null ? a.kind().name() : a.verdict().name()) + " " + DataText.visible(a.variable());
    }

    public String toJson() {
        return Json.write(this);
    }

    private static String heading(AlertMessage a) {
        if (a.verdict() == Verdict.MATERIAL || a.verdict() == Verdict.UNCERTAIN) {
            return a.verdict().name();
        }
        return "Data quality: " + a.kind().name();
    }

    /** MATERIAL first, then UNCERTAIN, then data quality by kind; within a group as given. */
    private static List<AlertMessage> sorted(List<AlertMessage> alerts) {
        List<AlertMessage> out = new ArrayList<>(alerts);
        out.sort(java.util.Comparator.comparingInt(RollUp::rank));
        return List.copyOf(out);
    }

    private static int rank(AlertMessage a) {
        if (a.verdict() == Verdict.MATERIAL) {
            return 0;
        }
        if (a.verdict() == Verdict.UNCERTAIN) {
            return 1;
        }
        return 2 + a.kind().ordinal();
    }
}
