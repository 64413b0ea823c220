package org.wavewarden.store;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.statement.PreparedBatch;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.sink.AlertMessage;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;

import java.nio.file.Path;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Arrays;
import java.util.List;
import java.util.Optional;

/**
 * The outbox table (migration V7): what committed runs still owe their sinks and folders. Rows are added in the
 * run's transaction ({@link ResultsStore#writeRun}); the steps that carry them out read them here, and record here
 * what came of each attempt.
 */
public final class OutboxStore {

    /** The sink name of findings files and digests. */
    public static final String FILES = "files";
    public static final String WAVE_FILES = "wave-files";
    public static final String FIRING_DIGEST = "firing-digest";
    public static final String ALERT = "alert";
    /** One message per firing and sink listing the firing's new alerts (migration V14). */
    public static final String ROLL_UP = "roll-up";

    private final Jdbi jdbi;
    private final String s;

    OutboxStore(Jdbi jdbi, String quotedSchema) {
        this.jdbi = jdbi;
        this.s = quotedSchema;
    }

    /**
     * What a run's outputs are, written as outbox rows with the run.
     *
     * @param waveFolder   where the wave's {@code findings.json} and {@code digest.md} go; null for none
     * @param digestFolder the folder of the digest of the firing the run belongs to; null for none
     * @param alertSinks   the names of the sinks every alert of the run goes to on its own
     * @param rollUpSinks  the names of the sinks that get one roll-up of the firing the run belongs to
     * @param firing       what names the firing, the same for all its runs (the folder its digest would go to);
     *                     required when there are roll-up sinks
     */
    public record Outputs(Path waveFolder, Path digestFolder, List<String> alertSinks, List<String> rollUpSinks,
                          Path firing) {
        public static final Outputs NONE = new Outputs(null, null, List.of());

        public Outputs {
            alertSinks = List.copyOf(alertSinks);
            rollUpSinks = rollUpSinks == null ? List.of() : List.copyOf(rollUpSinks);
            if (!rollUpSinks.isEmpty() && firing == null) {
                throw new IllegalArgumentException("firing: required for roll-up sinks " + rollUpSinks);
            }
        }

        public Outputs(Path waveFolder, Path digestFolder, List<String> alertSinks) {
            this(waveFolder, digestFolder, alertSinks, List.of(), null);
        }

        public static Outputs files(Path waveFolder) {
            return new Outputs(waveFolder, null, List.of());
        }
    }

    /** One row of the outbox. */
    public record Row(long id, String dataset, String sink, String product, String item, List<Long> runIds,
                      Long alertId, Path folder, String state, int failedAttempts, int deadCount, String lastError) {
    }

    /** What one sink of one dataset owes; see {@code DeliveryBacklog} for the meaning of each number. */
    public record Backlog(String dataset, String sink, long pending, double oldestPendingSeconds,
                          long failedAttempts, long deadLetters) {
    }

    /** Adds a committed run's outputs; called inside {@link ResultsStore#writeRun}'s transaction. */
    void add(Handle h, ResultsStore.RunWrite run, long runId, List<Alert> alerts, Outputs outputs) {
        if (outputs.waveFolder() != null) {
            String folder = outputs.waveFolder().toAbsolutePath().normalize().toString();
            // An older run's files for the same folder would overwrite this run's if carried out later.
            h.createUpdate("UPDATE " + s + ".outbox SET state = 'superseded' WHERE sink = :files AND product = :p"
                            + " AND folder = :folder AND state IN ('pending', 'dead') AND NOT (:run = ANY (run_ids))")
                    .bind("files", FILES).bind("p", WAVE_FILES).bind("folder", folder).bind("run", runId).execute();
            h.createUpdate("INSERT INTO " + s + ".outbox (dataset, sink, product, item, run_ids, folder)"
                            + " VALUES (:d, :files, :p, :item, ARRAY[:run]::bigint[], :folder)"
                            + " ON CONFLICT ON CONSTRAINT outbox_key DO UPDATE SET state = 'pending',"
                            + " next_attempt_at = now(), delivered_at = NULL")
                    .bind("d", run.dataset()).bind("files", FILES).bind("p", WAVE_FILES)
                    .bind("item", WAVE_FILES + " run " + runId + " in " + folder).bind("run", runId)
                    .bind("folder", folder).execute();
        }
        if (outputs.digestFolder() != null) {
            String folder = outputs.digestFolder().toAbsolutePath().normalize().toString();
            h.createUpdate("INSERT INTO " + s + ".outbox AS o (dataset, sink, product, item, run_ids, folder)"
                            + " VALUES (:d, :files, :p, :item, ARRAY[:run]::bigint[], :folder)"
                            + " ON CONFLICT ON CONSTRAINT outbox_key DO UPDATE SET state = 'pending',"
                            + " next_attempt_at = now(), delivered_at = NULL, run_ids = (SELECT array_agg(DISTINCT x"
                            + " ORDER BY x) FROM unnest(o.run_ids || EXCLUDED.run_ids) x)")
                    .bind("d", run.dataset()).bind("files", FILES).bind("p", FIRING_DIGEST)
                    .bind("item", FIRING_DIGEST + " in " + folder).bind("run", runId).bind("folder", folder)
                    .execute();
        }
        if (!outputs.alertSinks().isEmpty() && !alerts.isEmpty()) {
            PreparedBatch b = h.prepareBatch("INSERT INTO " + s + ".outbox (dataset, sink, product, item, run_ids,"
                    + " alert_id) SELECT :d, :sink, :p, :key, ARRAY[a.run_id], a.alert_id FROM " + s + ".alert a"
                    + " WHERE a.dataset = :d AND a.wave = :w AND a.against_wave = :against AND a.variable = :v"
                    + " AND a.kind = :kind AND a.against = :baseline AND a.superseded_at IS NULL"
                    + " ON CONFLICT ON CONSTRAINT outbox_key DO NOTHING");
            String against = run.againstWave().isEmpty() ? null : run.againstWave();
            for (String sink : outputs.alertSinks()) {
                for (Alert a : alerts) {
                    b.bind("d", run.dataset()).bind("sink", sink).bind("p", ALERT)
                            // A further baseline's alert is its own event, keyed by its own baseline.
                            .bind("key", AlertMessage.idempotencyKey(run.dataset(), run.wave(),
                                    a.against() == null ? against : a.against(), a.variable(), a.kind(),
                                    run.summaryChecksum()))
                            .bind("w", run.wave()).bind("against", run.againstWave()).bind("v", a.variable())
                            .bind("kind", a.kind().name()).bind("baseline", ResultsStore.againstKey(a)).add();
                }
            }
            b.execute();
        }
        if (!outputs.rollUpSinks().isEmpty()) {
            String firing = outputs.firing().toAbsolutePath().normalize().toString();
            String digest = outputs.digestFolder() == null ? null
                    : outputs.digestFolder().toAbsolutePath().normalize().toString();
            // Keyed like the firing's digest: one row per firing and sink, gathering the firing's runs.
            PreparedBatch b = h.prepareBatch("INSERT INTO " + s + ".outbox AS o (dataset, sink, product, item,"
                    + " run_ids, folder) VALUES (:d, :sink, :p, :item, ARRAY[:run]::bigint[], :folder)"
                    + " ON CONFLICT ON CONSTRAINT outbox_key DO UPDATE SET state = 'pending', next_attempt_at = now(),"
                    + " delivered_at = NULL, run_ids = (SELECT array_agg(DISTINCT x ORDER BY x)"
                    + " FROM unnest(o.run_ids || EXCLUDED.run_ids) x)");
            for (String sink : outputs.rollUpSinks()) {
                b.bind("d", run.dataset()).bind("sink", sink).bind("p", ROLL_UP).bind("item", ROLL_UP + " of " + firing)
                        .bind("run", runId).bind("folder", digest).add();
            }
            b.execute();
        }
        // Alerts superseded by this run (their data changed) are not sent any more.
        h.createUpdate("UPDATE " + s + ".outbox SET state = 'superseded' WHERE state IN ('pending', 'dead')"
                        + " AND alert_id IN (SELECT alert_id FROM " + s + ".alert WHERE dataset = :d AND wave = :w"
                        + " AND superseded_at IS NOT NULL)")
                .bind("d", run.dataset()).bind("w", run.wave()).execute();
    }

    /**
     * Gives each open alert of the dataset a row for the sink when it has none: alerts of runs made without the
     * sink (by {@code check}, or before the sink was configured). An alert that the sink took before the outbox
     * existed (recorded in {@code alert_delivery}) is added as delivered, so it is not sent twice.
     *
     * @return rows added
     */
    public int enrolAlerts(String dataset, String sink) {
        return jdbi.inTransaction(h -> {
            record Open(long alertId, long runId, String wave, String against, String variable, String kind,
                        String checksum, boolean delivered) {
            }
            List<Open> open = h.createQuery("SELECT a.alert_id, a.run_id, a.wave, CASE WHEN a.against = '' THEN"
                            + " a.against_wave ELSE a.against END, a.variable, a.kind,"
                            + " r.summary_checksum, EXISTS (SELECT 1 FROM " + s + ".alert_delivery x WHERE"
                            + " x.alert_id = a.alert_id AND x.sink = :sink) AS delivered FROM " + s + ".alert a JOIN "
                            + s + ".run r ON r.run_id = a.run_id WHERE a.dataset = :d AND a.superseded_at IS NULL"
                            + " AND NOT EXISTS (SELECT 1 FROM " + s + ".outbox o WHERE o.sink = :sink"
                            + " AND o.alert_id = a.alert_id)")
                    .bind("d", dataset).bind("sink", sink)
                    .map((rs, ctx) -> new Open(rs.getLong(1), rs.getLong(2), rs.getString(3), rs.getString(4),
                            rs.getString(5), rs.getString(6), rs.getString(7), rs.getBoolean(8)))
                    .list();
            if (open.isEmpty()) {
                return 0;
            }
            // The outbox's predecessor marked dead-lettered alerts as delivered too; they are owed again here.
            java.util.Set<String> deadKeys = new java.util.HashSet<>(h.createQuery("SELECT idempotency_key FROM " + s
                    + ".dead_letter WHERE sink = :sink").bind("sink", sink).mapTo(String.class).list());
            PreparedBatch b = h.prepareBatch("INSERT INTO " + s + ".outbox (dataset, sink, product, item, run_ids,"
                    + " alert_id, state, delivered_at) VALUES (:d, :sink, :p, :key, ARRAY[:run]::bigint[], :alert,"
                    + " :state, CASE WHEN :state = 'delivered' THEN now() END)"
                    + " ON CONFLICT ON CONSTRAINT outbox_key DO UPDATE SET alert_id = EXCLUDED.alert_id");
            for (Open o : open) {
                String key = AlertMessage.idempotencyKey(dataset, o.wave(), o.against().isEmpty() ? null : o.against(),
                        o.variable(), FindingKind.valueOf(o.kind()), o.checksum());
                b.bind("d", dataset).bind("sink", sink).bind("p", ALERT).bind("key", key)
                        .bind("run", o.runId()).bind("alert", o.alertId())
                        .bind("state", deadKeys.contains(key) ? "dead" : o.delivered() ? "delivered" : "pending")
                        .add();
            }
            return Arrays.stream(b.execute()).sum();
        });
    }

    /**
     * The rows of a sink that are due, oldest first: pending ones, and dead ones whose backoff has run out.
     */
    public List<Row> due(String dataset, String sink, Instant now) {
        return jdbi.withHandle(h -> h.createQuery(select() + " WHERE dataset = :d AND sink = :sink AND (state = 'pending'"
                        + " OR (state = 'dead' AND next_attempt_at <= :now)) ORDER BY outbox_id")
                .bind("d", dataset).bind("sink", sink).bind("now", OffsetDateTime.ofInstant(now, ZoneOffset.UTC))
                .map((rs, ctx) -> row(rs)).list());
    }

    /** Whether any sink of the dataset has a row {@link #due} now; one indexed look-up. */
    public boolean anyDue(String dataset, Instant now) {
        return jdbi.withHandle(h -> h.createQuery("SELECT EXISTS (SELECT 1 FROM " + s + ".outbox WHERE dataset = :d"
                        + " AND (state = 'pending' OR (state = 'dead' AND next_attempt_at <= :now)))")
                .bind("d", dataset).bind("now", OffsetDateTime.ofInstant(now, ZoneOffset.UTC))
                .mapTo(Boolean.class).one());
    }

    /** The pending {@code wave-files} rows of a run. */
    public List<Row> pendingWaveFiles(long runId) {
        return jdbi.withHandle(h -> h.createQuery(select() + " WHERE sink = :files AND product = :p AND state = 'pending'"
                        + " AND :run = ANY (run_ids) ORDER BY outbox_id")
                .bind("files", FILES).bind("p", WAVE_FILES).bind("run", runId).map((rs, ctx) -> row(rs)).list());
    }

    /** The sinks of a dataset that have rows, in name order. */
    public List<String> sinks(String dataset) {
        return jdbi.withHandle(h -> h.createQuery("SELECT DISTINCT sink FROM " + s + ".outbox WHERE dataset = :d"
                + " ORDER BY sink").bind("d", dataset).mapTo(String.class).list());
    }

    public void delivered(long id) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".outbox SET state = 'delivered', delivered_at = now(),"
                + " last_error = NULL WHERE outbox_id = :id").bind("id", id).execute());
    }

    /** An alert whose data changed (or that is gone) before it was delivered: nothing is owed any more. */
    public void superseded(long id) {
        state(id, "superseded");
    }

    /** An alert the sink's filter does not take: nothing is owed. */
    public void filtered(long id) {
        state(id, "filtered");
    }

    /**
     * Not sent, and nothing owed: an alert explained or muted by the time it was due, or a roll-up with nothing
     * new. The reason (e.g. the alert's state) is kept in {@code last_error}.
     */
    public void withheld(long id, String reason) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".outbox SET state = 'withheld', last_error = :why"
                + " WHERE outbox_id = :id").bind("id", id).bind("why", reason).execute());
    }

    /**
     * The alerts a roll-up row announces as new: the alerts of its runs, oldest first, except those an earlier
     * roll-up of the same sink already carried (a rerun on the same data keeps its run and its alerts).
     */
    public List<Long> rollUpAlerts(Row rollUp) {
        return jdbi.withHandle(h -> h.createQuery("SELECT a.alert_id FROM " + s + ".alert a WHERE a.run_id = ANY"
                        + " (CAST(:runs AS bigint[])) AND NOT EXISTS (SELECT 1 FROM " + s + ".outbox o WHERE"
                        + " o.sink = :sink AND o.product = :p AND o.outbox_id <> :id AND o.state = 'delivered'"
                        + " AND a.run_id = ANY (o.run_ids) AND o.delivered_at >= a.created_at) ORDER BY a.alert_id")
                .bind("runs", rollUp.runIds().toArray(Long[]::new)).bind("sink", rollUp.sink()).bind("p", ROLL_UP)
                .bind("id", rollUp.id()).mapTo(Long.class).list());
    }

    /** How many findings of the runs repeat the previous wave's, by {@link Finding.Repeat.Kind} name. */
    public java.util.Map<String, Integer> repeats(List<Long> runIds) {
        return jdbi.withHandle(h -> h.createQuery("SELECT repeat->>'kind' AS k, count(*) AS n FROM " + s + ".finding"
                        + " WHERE run_id = ANY (CAST(:runs AS bigint[])) AND repeat IS NOT NULL GROUP BY 1")
                .bind("runs", runIds.toArray(Long[]::new))
                .reduceRows(new java.util.HashMap<String, Integer>(), (m, r) -> {
                    m.put(r.getColumn("k", String.class), r.getColumn("n", Integer.class));
                    return m;
                }));
    }

    private void state(long id, String state) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".outbox SET state = :state WHERE outbox_id = :id")
                .bind("id", id).bind("state", state).execute());
    }

    /** The id of the dataset's newest firing digest, or 0 when it has none. */
    public long newestDigest(String dataset) {
        return jdbi.withHandle(h -> h.createQuery("SELECT coalesce(max(outbox_id), 0) FROM " + s + ".outbox WHERE"
                + " dataset = :d AND sink = :files AND product = :p").bind("d", dataset).bind("files", FILES)
                .bind("p", FIRING_DIGEST).mapTo(Long.class).one());
    }

    /** A failed attempt; the row stays pending and is tried again by the next step. */
    public void failed(long id, String error) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".outbox SET failed_attempts = failed_attempts + 1,"
                + " last_error = :e WHERE outbox_id = :id").bind("id", id).bind("e", error).execute());
    }

    /** Given up on for now: tried again once {@code retryAt} has passed, or at once when replayed. */
    public void dead(long id, String error, Instant retryAt) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".outbox SET state = 'dead', failed_attempts ="
                        + " failed_attempts + 1, dead_count = dead_count + 1, last_error = :e, next_attempt_at = :at"
                        + " WHERE outbox_id = :id")
                .bind("id", id).bind("e", error).bind("at", OffsetDateTime.ofInstant(retryAt, ZoneOffset.UTC))
                .execute());
    }

    /** Dead rows, optionally of one dataset and one sink, oldest first. */
    public List<Row> dead(String dataset, String sink) {
        return jdbi.withHandle(h -> h.createQuery(select() + " WHERE state = 'dead' AND (CAST(:d AS text) IS NULL"
                        + " OR dataset = :d) AND (CAST(:sink AS text) IS NULL OR sink = :sink) ORDER BY outbox_id")
                .bind("d", dataset).bind("sink", sink).map((rs, ctx) -> row(rs)).list());
    }

    /** Makes dead rows due now; returns how many. */
    public int replay(String dataset, String sink) {
        return jdbi.withHandle(h -> h.createUpdate("UPDATE " + s + ".outbox SET next_attempt_at = now() WHERE"
                        + " state = 'dead' AND (CAST(:d AS text) IS NULL OR dataset = :d)"
                        + " AND (CAST(:sink AS text) IS NULL OR sink = :sink)")
                .bind("d", dataset).bind("sink", sink).execute());
    }

    /** Per dataset and sink, what is owed, in one query. */
    public List<Backlog> backlog() {
        return backlog(null);
    }

    /** The same for one dataset (null for every dataset). */
    public List<Backlog> backlog(String dataset) {
        return jdbi.withHandle(h -> h.createQuery("SELECT dataset, sink, count(*) FILTER (WHERE state = 'pending'),"
                        + " coalesce(extract(epoch FROM now() - min(created_at) FILTER (WHERE state = 'pending')), 0),"
                        + " coalesce(sum(failed_attempts), 0), count(*) FILTER (WHERE state = 'dead') FROM " + s
                        + ".outbox WHERE CAST(:d AS text) IS NULL OR dataset = :d GROUP BY dataset, sink"
                        + " ORDER BY dataset, sink")
                .bind("d", dataset)
                .map((rs, ctx) -> new Backlog(rs.getString(1), rs.getString(2), rs.getLong(3), rs.getDouble(4),
                        rs.getLong(5), rs.getLong(6)))
                .list());
    }

    /**
     * The message of an alert row, made from the stored alert, its run and the run's findings of the event: the
     * lead (named by the alert row itself, so it is sent even without its finding row) and then the findings of the
     * alert's other kinds, in the order stored.
     */
    public Optional<AlertMessage> message(long alertId) {
        record Facet(String dataset, String wave, String against, long runId, String checksum, Finding finding) {
        }
        List<Facet> facets = jdbi.withHandle(h -> h.createQuery("SELECT a.dataset, a.wave, a.against_wave, a.run_id,"
                        + " r.summary_checksum, a.variable, k.kind, CASE WHEN k.ord = 1 THEN a.verdict ELSE f.verdict"
                        + " END AS verdict, CASE WHEN k.ord = 1 THEN a.sentence ELSE f.sentence END AS sentence, f.test,"
                        + " f.statistic, f.p_value, f.q_value, f.effect_name, f.effect_estimate, f.effect_ci_low,"
                        + " f.effect_ci_high, f.effect_threshold, f.n_baseline, f.n_current, f.df, f.df_convention,"
                        + " f.fdr_family_size, f.fdr_method, f.label, f.against FROM " + s + ".alert a"
                        + " JOIN " + s + ".run r ON r.run_id = a.run_id CROSS JOIN LATERAL unnest(ARRAY[a.kind]"
                        + " || a.facet_kinds) WITH ORDINALITY AS kk(kind, ord)"
                        // A kind may stand several times (interviewers flagged on one variable): its n-th place is
                        // its n-th finding of the alert's baseline, in the order written.
                        + " CROSS JOIN LATERAL (SELECT kk.kind, kk.ord) k"
                        + " LEFT JOIN LATERAL (SELECT * FROM " + s + ".finding x WHERE x.run_id = a.run_id"
                        + " AND x.variable = a.variable AND x.kind = k.kind AND coalesce(x.against, '') = a.against"
                        + " ORDER BY x.finding_id OFFSET (SELECT count(*) FROM unnest(ARRAY[a.kind] || a.facet_kinds)"
                        + " WITH ORDINALITY AS p(kind, ord) WHERE p.kind = k.kind AND p.ord < k.ord) LIMIT 1) f ON true"
                        + " WHERE a.alert_id = :id AND (k.ord = 1 OR f.finding_id IS NOT NULL) ORDER BY k.ord")
                .bind("id", alertId)
                .map((rs, ctx) -> new Facet(rs.getString("dataset"), rs.getString("wave"),
                        rs.getString("against_wave"), rs.getLong("run_id"), rs.getString("summary_checksum"),
                        ResultsStore.finding(rs, null)))
                .list());
        if (facets.isEmpty()) {
            return Optional.empty();
        }
        Facet lead = facets.get(0);
        return Optional.of(AlertMessage.of(lead.dataset(), lead.wave(), lead.against().isEmpty() ? null
                : lead.against(), lead.runId(), lead.checksum(), new Alert(facets.stream().map(Facet::finding)
                .toList())));
    }

    private String select() {
        return "SELECT outbox_id, dataset, sink, product, item, run_ids, alert_id, folder, state, failed_attempts,"
                + " dead_count, last_error FROM " + s + ".outbox";
    }

    private static Row row(java.sql.ResultSet rs) throws java.sql.SQLException {
        Long[] runs = (Long[]) rs.getArray("run_ids").getArray();
        String folder = rs.getString("folder");
        return new Row(rs.getLong("outbox_id"), rs.getString("dataset"), rs.getString("sink"),
                rs.getString("product"), rs.getString("item"), List.of(runs), (Long) rs.getObject("alert_id"),
                folder == null ? null : Path.of(folder), rs.getString("state"), rs.getInt("failed_attempts"),
                rs.getInt("dead_count"), rs.getString("last_error"));
    }
}
