package org.wavewarden.soak;

import com.fasterxml.jackson.databind.JsonNode;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.Json;
import org.wavewarden.deliver.sink.SinkFilter;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.soak.WebhookReceiver.Outcome;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * What the soak checks at the end, from the results schema and the evidence at the receivers only (so it holds
 * whatever the daemon does inside): every wave produced has exactly one current run; every current alert a sink's
 * filter takes reached that sink exactly once.
 *
 * <p>Deliveries are matched to alerts by what identifies an open alert in the results schema (dataset, wave,
 * comparison wave, variable, kind of its lead finding), read from the delivered body. An alert is one event; a
 * sink's filter takes it when it takes any of the event's findings. Delivery is at least once, each alert under one
 * idempotency key on every retry, so that a receiver recognises a retry; the audit counts what the receiver took:
 * <ul>
 *   <li>at the webhook, a request the receiver took ({@link Outcome#ACCEPTED}); a retry after a 500, a refused
 *       connection or a held request is not taken, and a retry under a key already taken (the sender missed the
 *       answer) is a <em>repeat recognised by key</em>, answered 200 and counted apart, never as a delivery;</li>
 *   <li>in the JSON Lines file, every complete line: the sink drops repeats of a key itself, so a second line for
 *       one alert is a second delivery whatever its key.</li>
 * </ul>
 * An alert never taken is <em>lost</em>; every delivery of an alert taken beyond the first is <em>duplicated</em>
 * (at the webhook that needs a second key for one alert); a delivery taken of no current alert (or whose body
 * cannot be read) is <em>unexpected</em>.
 */
public final class SoakAudit {

    /** How many lost or duplicated alerts a report names; the counts are always complete. */
    static final int NAMED = 20;

    private SoakAudit() {
    }

    /** What identifies an open alert; {@code againstWave} is empty when the wave was judged alone. */
    public record AlertRef(String dataset, String wave, String againstWave, String variable, String kind) {
        @Override
        public String toString() {
            return dataset + " " + wave + (againstWave.isEmpty() ? "" : " vs " + againstWave) + " " + variable + " "
                    + kind;
        }
    }

    /**
     * A current alert of the results schema, with what a sink filter decides on.
     *
     * @param verdict the lead finding's verdict, or null
     * @param others  the event's other findings
     */
    public record AlertRow(AlertRef ref, String verdict, List<SinkFilter.Judged> others) {
        public AlertRow {
            others = List.copyOf(others);
        }

        /** An alert whose event has only its lead. */
        public AlertRow(AlertRef ref, String verdict) {
            this(ref, verdict, List.of());
        }

        List<SinkFilter.Judged> findings() {
            List<SinkFilter.Judged> all = new ArrayList<>();
            all.add(new SinkFilter.Judged(FindingKind.valueOf(ref.kind()), verdict == null ? null
                    : Verdict.valueOf(verdict)));
            all.addAll(others);
            return all;
        }
    }

    /** A run row: its wave and whether it is current. */
    public record RunRow(String wave, boolean current) {
    }

    /**
     * One delivery seen at a receiver.
     *
     * @param ref     the alert the body names, or null when the body could not be read
     * @param key     the idempotency key it carried
     * @param outcome what the receiver made of it (a line in a file is always {@link Outcome#ACCEPTED})
     */
    public record Delivery(AlertRef ref, String key, Outcome outcome) {
    }

    /** The judging half of the audit. */
    public record Waves(int produced, int judged, List<String> notJudged, List<String> judgedMoreThanOnce,
                        List<String> judgedButNotProduced, long runs, long supersededRuns) {
        public boolean clean() {
            return notJudged.isEmpty() && judgedMoreThanOnce.isEmpty() && judgedButNotProduced.isEmpty();
        }
    }

    /**
     * The delivery half of the audit for one sink.
     *
     * @param expected   current alerts the sink's filter takes
     * @param requests   deliveries seen (requests at the webhook, complete lines in the file)
     * @param accepted   of those, taken by the receiver
     * @param repeats    of those, answered 200 as repeats of a key already taken (not deliveries)
     * @param delivered  expected alerts taken at least once
     * @param keys       distinct idempotency keys among the deliveries taken
     */
    public record Sink(String sink, int expected, int requests, int accepted, int repeats, int delivered, int keys,
                       int lost, int duplicated, int unexpected, List<String> lostAlerts,
                       List<String> duplicatedAlerts, List<String> unexpectedDeliveries) {
    }

    public static Waves waves(List<String> produced, List<RunRow> runs) {
        Map<String, Integer> current = new TreeMap<>();
        long superseded = 0;
        for (RunRow r : runs) {
            if (r.current()) {
                current.merge(r.wave(), 1, Integer::sum);
            } else {
                superseded++;
            }
        }
        List<String> notJudged = new ArrayList<>();
        List<String> twice = new ArrayList<>();
        int judged = 0;
        for (String w : produced) {
            int n = current.getOrDefault(w, 0);
            if (n == 0) {
                notJudged.add(w);
            } else if (n > 1) {
                twice.add(w + " (" + n + " current runs)");
            } else {
                judged++;
            }
        }
        Set<String> known = Set.copyOf(produced);
        List<String> unknown = current.keySet().stream().filter(w -> !known.contains(w)).toList();
        return new Waves(produced.size(), judged, notJudged, twice, unknown, runs.size(), superseded);
    }

    public static Sink sink(String name, List<AlertRow> alerts, SinkFilter filter, List<Delivery> deliveries) {
        Map<AlertRef, Integer> accepted = new LinkedHashMap<>();
        Map<AlertRef, Set<String>> keysOf = new LinkedHashMap<>();
        Set<String> keys = new LinkedHashSet<>();
        int repeats = 0;
        List<String> unexpected = new ArrayList<>();
        int acceptedCount = 0;
        Set<AlertRef> expected = new LinkedHashSet<>();
        for (AlertRow a : alerts) {
            if (filter.acceptsAny(a.findings())) {
                expected.add(a.ref());
            }
        }
        Map<AlertRef, Integer> refused = new LinkedHashMap<>();
        for (Delivery d : deliveries) {
            if (d.outcome() == Outcome.REPEAT) {
                repeats++;
                continue;
            }
            if (d.outcome() == Outcome.REFUSED) {
                if (d.ref() != null) {
                    refused.merge(d.ref(), 1, Integer::sum);
                }
                continue;
            }
            acceptedCount++;
            if (d.key() != null) {
                keys.add(d.key());
            }
            if (d.ref() == null || !expected.contains(d.ref())) {
                unexpected.add(d.ref() == null ? "unreadable body, key " + d.key() : d.ref().toString());
                continue;
            }
            accepted.merge(d.ref(), 1, Integer::sum);
            keysOf.computeIfAbsent(d.ref(), r -> new LinkedHashSet<>()).add(String.valueOf(d.key()));
        }
        List<String> lost = new ArrayList<>();
        List<String> duplicated = new ArrayList<>();
        int lostCount = 0;
        int duplicatedCount = 0;
        for (AlertRef r : expected) {
            int n = accepted.getOrDefault(r, 0);
            if (n == 0) {
                lostCount++;
                int tries = refused.getOrDefault(r, 0);
                name(lost, r + (tries == 0 ? " (never sent)" : " (sent " + tries + " times, never accepted)"));
            } else if (n > 1) {
                duplicatedCount += n - 1;
                int k = keysOf.get(r).size();
                name(duplicated, r + " (accepted " + n + " times, under " + k + (k == 1 ? " key)" : " keys)"));
            }
        }
        return new Sink(name, expected.size(), deliveries.size(), acceptedCount, repeats, expected.size() - lostCount,
                keys.size(), lostCount, duplicatedCount, unexpected.size(), lost, duplicated,
                unexpected.subList(0, Math.min(NAMED, unexpected.size())));
    }

    private static void name(List<String> list, String item) {
        if (list.size() < NAMED) {
            list.add(item);
        }
    }

    /** The deliveries the webhook receiver recorded. */
    public static List<Delivery> fromWebhook(List<WebhookReceiver.Request> requests) {
        List<Delivery> out = new ArrayList<>();
        for (WebhookReceiver.Request r : requests) {
            JsonNode body = parse(r.body());
            String key = r.key() != null ? r.key() : text(body, "idempotencyKey");
            out.add(new Delivery(ref(body), key, r.outcome()));
        }
        return out;
    }

    /**
     * The lines of a JSON Lines file, each one accepted delivery. A last line without its newline is left out: the
     * sink may be writing it (or died writing it, and will write it again).
     */
    public static List<Delivery> fromJsonLines(Path file) {
        if (!Files.exists(file)) {
            return List.of();
        }
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + file, e);
        }
        int end = text.lastIndexOf('\n');
        List<Delivery> out = new ArrayList<>();
        if (end < 0) {
            return out;
        }
        for (String line : text.substring(0, end).split("\n", -1)) {
            if (line.isBlank()) {
                continue;
            }
            JsonNode body = parse(line);
            out.add(new Delivery(ref(body), text(body, "idempotencyKey"), Outcome.ACCEPTED));
        }
        return out;
    }

    private static JsonNode parse(String json) {
        try {
            return Json.mapper().readTree(json);
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    private static AlertRef ref(JsonNode body) {
        if (body == null || !body.isObject()) {
            return null;
        }
        String dataset = text(body, "dataset");
        String wave = text(body, "wave");
        String variable = text(body, "variable");
        String kind = text(body, "kind");
        if (dataset == null || wave == null || variable == null || kind == null) {
            return null;
        }
        String against = text(body, "againstWave");
        return new AlertRef(dataset, wave, against == null ? "" : against, variable, kind);
    }

    private static String text(JsonNode body, String field) {
        if (body == null || !body.hasNonNull(field)) {
            return null;
        }
        return body.get(field).asText();
    }

    /** The runs of a dataset in a results schema. */
    public static List<RunRow> runs(Connection c, String schema, String dataset) throws SQLException {
        List<RunRow> out = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT wave, superseded_at IS NULL FROM "
                + Identifiers.quote(schema) + ".run WHERE dataset = ? ORDER BY run_id")) {
            ps.setString(1, dataset);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    out.add(new RunRow(rs.getString(1), rs.getBoolean(2)));
                }
            }
        }
        return out;
    }

    /**
     * The current (not superseded) alerts of a dataset in a results schema, each with the verdicts of its event's
     * other findings (read from the run's findings, as the message sent for it is).
     */
    public static List<AlertRow> alerts(Connection c, String schema, String dataset) throws SQLException {
        List<AlertRow> out = new ArrayList<>();
        String s = Identifiers.quote(schema);
        try (PreparedStatement ps = c.prepareStatement("SELECT a.dataset, a.wave, a.against_wave, a.variable, a.kind,"
                + " a.verdict, (SELECT coalesce(array_agg(f.kind || ':' || coalesce(f.verdict, '')), '{}') FROM " + s
                + ".finding f WHERE f.run_id = a.run_id AND f.variable = a.variable AND f.kind = ANY (a.facet_kinds))"
                + " FROM " + s + ".alert a WHERE a.dataset = ? AND a.superseded_at IS NULL ORDER BY a.alert_id")) {
            ps.setString(1, dataset);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    List<SinkFilter.Judged> others = new ArrayList<>();
                    for (String kv : (String[]) rs.getArray(7).getArray()) {
                        String[] p = kv.split(":", 2);
                        others.add(new SinkFilter.Judged(FindingKind.valueOf(p[0]), p[1].isEmpty() ? null
                                : Verdict.valueOf(p[1])));
                    }
                    out.add(new AlertRow(new AlertRef(rs.getString(1), rs.getString(2), rs.getString(3),
                            rs.getString(4), rs.getString(5)), rs.getString(6), others));
                }
            }
        }
        return out;
    }
}
