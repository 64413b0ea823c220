package org.wavewarden.store;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.statement.PreparedBatch;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.Json;
import org.wavewarden.compare.relation.RelationshipDetail;
import org.wavewarden.deliver.Alert;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.profile.WaveProfile;

import java.time.Instant;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Optional;

/**
 * Reads and writes the results schema. A judged wave is written in one transaction (run, findings, alerts), keyed
 * so that a rerun on the same data under the same configuration keeps its run and findings and adds no alert twice,
 * and a rerun on changed data, against another wave or under another configuration is a new run that supersedes the
 * older run and its alerts. Nothing written is deleted; each alert's history is kept by {@link AlertReviews}. An
 * alert row is one event ({@link Alert}): it is keyed and named by its lead finding and lists the kinds of the
 * event's other findings.
 */
public final class ResultsStore {

    private final Jdbi jdbi;
    private final String s;

    private final OutboxStore outbox;
    private final String schemaName;

    public ResultsStore(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.schemaName = schema;
        this.s = Identifiers.quote(schema);
        this.outbox = new OutboxStore(jdbi, s);
    }

    /** What committed runs still owe their folders and sinks. */
    public OutboxStore outbox() {
        return outbox;
    }

    /** The case lists stored beside the runs' findings. */
    public CaseLists caseLists() {
        return new CaseLists(jdbi, schemaName);
    }

    public Jdbi jdbi() {
        return jdbi;
    }

    /** A judged wave as the run table records it. */
    public record RunRecord(long runId, String dataset, String wave, String againstWave, String summaryChecksum,
                            Instant startedAt, Instant finishedAt, int findingsCount, int alertsCount) {
    }

    /** What a run is about to write. */
    public record RunWrite(String dataset, String wave, String againstWave, String summaryChecksum, Instant startedAt,
                           Instant finishedAt, double alpha, String fdrMethod, String toolVersion,
                           String configFingerprint) {
    }

    /**
     * The stored run that writing a run of this key would keep rather than write anew: the same dataset, wave,
     * baseline ({@code ""} for none), data (summary checksum), configuration fingerprint and tool version. Its
     * findings are those the wave keeps.
     */
    public Optional<Long> sameRun(String dataset, String wave, String againstWave, String summaryChecksum,
                                  String configFingerprint, String toolVersion) {
        return jdbi.withHandle(h -> sameRun(h, new RunWrite(dataset, wave, againstWave, summaryChecksum, null, null,
                Double.NaN, null, toolVersion, configFingerprint), ""));
    }

    private Optional<Long> sameRun(Handle h, RunWrite run, String lock) {
        return h.createQuery("SELECT run_id FROM " + s + ".run WHERE dataset = :dataset AND wave = :wave AND"
                        + " against_wave = :against AND summary_checksum = :checksum AND"
                        + " coalesce(config_fingerprint, '') = :fingerprint AND coalesce(tool_version, '') = :tool"
                        + lock)
                .bind("dataset", run.dataset()).bind("wave", run.wave()).bind("against", run.againstWave())
                .bind("checksum", run.summaryChecksum())
                .bind("fingerprint", run.configFingerprint() == null ? "" : run.configFingerprint())
                .bind("tool", run.toolVersion() == null ? "" : run.toolVersion())
                .mapTo(Long.class).findOne();
    }

    public void saveSummary(String dataset, WaveProfile profile, String checksum) {
        jdbi.useHandle(h -> saveSummary(h, dataset, profile, checksum));
    }

    void saveSummary(Handle h, String dataset, WaveProfile profile, String checksum) {
        // A wave judged again (another configuration, a re-run) has its summary stored already: its checksum covers
        // every tally, so the stored one is this one, and it is not written out and sent again. With breakdowns the
        // summary holds every domain's tables, and sending it for the server to parse and drop cost more than the
        // rest of the run's writes.
        if (summaryStored(h, dataset, profile.wave(), checksum)) {
            return;
        }
        h.createUpdate("INSERT INTO " + s + ".wave_summary (dataset, wave, checksum, row_count, summary)"
                        + " VALUES (:dataset, :wave, :checksum, :rows, CAST(:summary AS jsonb))"
                        + " ON CONFLICT (dataset, wave, checksum) DO NOTHING")
                .bind("dataset", dataset).bind("wave", profile.wave()).bind("checksum", checksum)
                .bind("rows", profile.rows()).bind("summary", Json.write(profile))
                .execute();
    }

    private boolean summaryStored(Handle h, String dataset, String wave, String checksum) {
        return h.createQuery("SELECT EXISTS (SELECT 1 FROM " + s + ".wave_summary WHERE dataset = :dataset"
                        + " AND wave = :wave AND checksum = :checksum)")
                .bind("dataset", dataset).bind("wave", wave).bind("checksum", checksum)
                .mapTo(Boolean.class).one();
    }

    /**
     * Stores a summary read under the configuration whose key is given; a summary of the same content already
     * stored takes the key and counts as the latest.
     */
    public void saveSummary(String dataset, WaveProfile profile, String checksum, String summaryKey) {
        jdbi.useHandle(h -> h.createUpdate("INSERT INTO " + s + ".wave_summary (dataset, wave, checksum, row_count,"
                        + " summary, summary_key) VALUES (:dataset, :wave, :checksum, :rows, CAST(:summary AS jsonb),"
                        + " :key) ON CONFLICT (dataset, wave, checksum) DO UPDATE SET summary_key = EXCLUDED.summary_key,"
                        + " created_at = now()")
                .bind("dataset", dataset).bind("wave", profile.wave()).bind("checksum", checksum)
                .bind("rows", profile.rows()).bind("summary", Json.write(profile)).bind("key", summaryKey)
                .execute());
    }

    /** Records the configuration key of a stored summary (one a run wrote), which then counts as the latest. */
    public void keySummary(String dataset, String wave, String checksum, String summaryKey) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".wave_summary SET summary_key = :key, created_at = now()"
                        + " WHERE dataset = :dataset AND wave = :wave AND checksum = :checksum")
                .bind("dataset", dataset).bind("wave", wave).bind("checksum", checksum).bind("key", summaryKey)
                .execute());
    }

    /** The most recently stored summary of a wave. */
    public Optional<StoredSummary> latestSummary(String dataset, String wave) {
        return jdbi.withHandle(h -> h.createQuery("SELECT checksum, summary_key, summary::text AS summary FROM " + s
                        + ".wave_summary WHERE dataset = :dataset AND wave = :wave ORDER BY created_at DESC, checksum"
                        + " LIMIT 1")
                .bind("dataset", dataset).bind("wave", wave)
                .map((rs, ctx) -> new StoredSummary(rs.getString("checksum"),
                        Json.read(rs.getString("summary"), WaveProfile.class), rs.getString("summary_key")))
                .findOne());
    }

    /**
     * @param summaryKey the configuration key it was read under (see {@code pipeline.SummaryKey}), or null for a
     *                   summary stored before summaries were keyed
     */
    public record StoredSummary(String checksum, WaveProfile profile, String summaryKey) {
    }

    /** The current (not superseded) judged run of a wave, if any. */
    public Optional<RunRecord> currentRun(String dataset, String wave) {
        return jdbi.withHandle(h -> h.createQuery("SELECT * FROM " + s + ".run WHERE dataset = :dataset AND wave = :wave"
                        + " AND superseded_at IS NULL ORDER BY finished_at DESC LIMIT 1")
                .bind("dataset", dataset).bind("wave", wave)
                .map((rs, ctx) -> new RunRecord(rs.getLong("run_id"), rs.getString("dataset"), rs.getString("wave"),
                        rs.getString("against_wave"), rs.getString("summary_checksum"),
                        rs.getObject("started_at", OffsetDateTime.class).toInstant(),
                        rs.getObject("finished_at", OffsetDateTime.class).toInstant(),
                        rs.getInt("findings_count"), rs.getInt("alerts_count")))
                .findOne());
    }

    /**
     * Writes one judged wave atomically: the wave's summary, the run row, its findings and its alerts, with no
     * outputs.
     *
     * @return the run id
     */
    public long writeRun(RunWrite run, WaveProfile currentProfile, List<Finding> findings, List<Alert> alerts) {
        return writeRun(run, currentProfile, findings, alerts, List.of(), OutboxStore.Outputs.NONE);
    }

    /**
     * Writes one judged wave atomically: the wave's summary, the run row, its findings, its alerts and, as outbox
     * rows, everything the run is to produce, so that nothing a committed run owes can be lost by what happens
     * after the commit.
     *
     * @param inference how unlisted variables were classified (part of {@code findings.json})
     * @return the run id
     */
    public long writeRun(RunWrite run, WaveProfile currentProfile, List<Finding> findings, List<Alert> alerts,
                         List<String> inference, OutboxStore.Outputs outputs) {
        return writeRun(run, currentProfile, findings, alerts, inference, outputs, a -> Optional.empty());
    }

    /**
     * The same, with what the configuration decides for each new alert when it is created (explained by an expected
     * change, muted by a rule); an alert without a decision is created open.
     */
    public long writeRun(RunWrite run, WaveProfile currentProfile, List<Finding> findings, List<Alert> alerts,
                         List<String> inference, OutboxStore.Outputs outputs,
                         java.util.function.Function<Alert, Optional<org.wavewarden.review.CreationDecision>> decide) {
        return writeRun(run, currentProfile, findings, alerts, inference, outputs, decide, List.of());
    }

    /** The same with the run's case lists, written with its findings (a kept run keeps the lists it has). */
    public long writeRun(RunWrite run, WaveProfile currentProfile, List<Finding> findings, List<Alert> alerts,
                         List<String> inference, OutboxStore.Outputs outputs,
                         java.util.function.Function<Alert, Optional<org.wavewarden.review.CreationDecision>> decide,
                         List<CaseLists.Draft> caseLists) {
        AlertReviews reviews = new AlertReviews(jdbi, schemaName);
        return jdbi.inTransaction(h -> {
            saveSummary(h, run.dataset(), currentProfile, run.summaryChecksum());
            // A run is judged data under a configuration by a version of the tool: the same data judged under the
            // same configuration by the same version again is the same run, kept with its findings as they were
            // written (what was seen, explained or signed off stays what it was); other data, another baseline,
            // another configuration or another version is a new run.
            Optional<Long> existing = sameRun(h, run, " FOR UPDATE");
            h.createUpdate("UPDATE " + s + ".run SET superseded_at = now() WHERE dataset = :dataset AND wave = :wave"
                            + " AND superseded_at IS NULL AND run_id <> :kept")
                    .bind("dataset", run.dataset()).bind("wave", run.wave()).bind("kept", existing.orElse(-1L)).execute();
            Optional<Long> inserted = Optional.empty();
            if (existing.isEmpty()) {
                // Another writer of the same run that committed meanwhile wins the key, and this one keeps its run.
                inserted = h.createQuery("INSERT INTO " + s + ".run (dataset, wave, against_wave, summary_checksum,"
                                + " started_at, finished_at, alpha, fdr_method, findings_count, alerts_count, tool_version,"
                                + " config_fingerprint) VALUES (:dataset, :wave, :against, :checksum, :started, :finished,"
                                + " :alpha, :fdr, :nf, :na, :tool, :fingerprint) ON CONFLICT (dataset, wave, against_wave,"
                                + " summary_checksum, (coalesce(config_fingerprint, '')), (coalesce(tool_version, '')))"
                                + " DO NOTHING RETURNING run_id")
                        .bind("dataset", run.dataset()).bind("wave", run.wave()).bind("against", run.againstWave())
                        .bind("checksum", run.summaryChecksum())
                        .bind("started", OffsetDateTime.ofInstant(run.startedAt(), ZoneOffset.UTC))
                        .bind("finished", OffsetDateTime.ofInstant(run.finishedAt(), ZoneOffset.UTC))
                        .bind("alpha", run.alpha()).bind("fdr", run.fdrMethod())
                        .bind("tool", run.toolVersion()).bind("fingerprint", run.configFingerprint())
                        .bind("nf", findings.size()).bind("na", alerts.size())
                        .mapTo(Long.class).findOne();
            }
            boolean isNew = inserted.isPresent();
            long runId = inserted.or(() -> existing).orElseGet(() -> sameRun(h, run, "").orElseThrow());
            if (!isNew) {
                // Judged again after other data had replaced it, the run is current again.
                h.createUpdate("UPDATE " + s + ".run SET superseded_at = NULL WHERE run_id = :run")
                        .bind("run", runId).execute();
            }
            org.wavewarden.pipeline.FaultPoints.hit(org.wavewarden.pipeline.FaultPoints.INSIDE_WRITE);
            if (isNew) {
                insertFindings(h, runId, findings);
                new CaseLists(jdbi, schemaName).insert(h, runId, caseLists);
            }
            // Alerts of this wave's other runs, and alerts of this run that it no longer raises, are superseded,
            // each with an entry in its history.
            reviews.supersede(h, "dataset = :dataset AND wave = :wave AND run_id <> :run",
                    java.util.Map.of("dataset", run.dataset(), "wave", run.wave(), "run", runId), runId);
            reviews.supersede(h, "run_id = :run AND NOT ((variable, kind, against) IN (SELECT * FROM unnest(CAST(:vars"
                            + " AS text[]), CAST(:kinds AS text[]), CAST(:againsts AS text[]))))",
                    java.util.Map.of("run", runId,
                            "vars", alerts.stream().map(Alert::variable).toArray(String[]::new),
                            "kinds", alerts.stream().map(a -> a.kind().name()).toArray(String[]::new),
                            "againsts", alerts.stream().map(ResultsStore::againstKey).toArray(String[]::new)), runId);
            // A rerun on the same data keeps the open alert (and so its deliveries and its history) and takes the
            // event's facets as now judged, which a rerun from before alerts were grouped did not record. Only an
            // alert inserted now gets its first entry: OPENED, or what the configuration decides.
            for (Alert a : alerts) {
                java.util.Map<String, Object> row = h.createQuery("INSERT INTO " + s + ".alert (run_id, dataset, wave,"
                                + " against_wave, variable, kind, verdict, sentence, facet_kinds, against) VALUES (:run,"
                                + " :dataset, :wave, :against, :variable, :kind, :verdict, :sentence,"
                                + " CAST(:facets AS text[]), :baseline)"
                                + " ON CONFLICT (dataset, wave, against_wave, variable, kind, against)"
                                + " WHERE superseded_at IS NULL"
                                + " DO UPDATE SET facet_kinds = EXCLUDED.facet_kinds"
                                // xmax is 0 on a row version this statement inserted, not on one it updated.
                                + " RETURNING alert_id, (xmax = 0) AS inserted")
                        .bind("run", runId).bind("dataset", run.dataset()).bind("wave", run.wave())
                        .bind("against", run.againstWave()).bind("variable", a.variable()).bind("kind", a.kind().name())
                        .bind("verdict", a.verdict() == null ? null : a.verdict().name())
                        .bind("sentence", a.lead().sentence())
                        .bind("facets", a.otherKinds().stream().map(Enum::name).toArray(String[]::new))
                        .bind("baseline", againstKey(a))
                        .mapToMap().one();
                if (Boolean.TRUE.equals(row.get("inserted"))) {
                    reviews.created(h, ((Number) row.get("alert_id")).longValue(), decide.apply(a));
                }
            }
            // The notes on how the wave was read (a baseline summary reused or read again) describe the latest
            // reading of the same data; they change no finding.
            h.createUpdate("UPDATE " + s + ".run SET inference = CAST(:inference AS jsonb) WHERE run_id = :run")
                    .bind("run", runId).bind("inference", Json.write(inference)).execute();
            outbox.add(h, run, runId, alerts, outputs);
            return runId;
        });
    }

    /**
     * An alert's baseline as its key holds it: the empty text for the run's first baseline, the further baseline's
     * label otherwise (a finding's {@code against}).
     */
    public static String againstKey(Alert a) {
        return a.against() == null ? "" : a.against();
    }

    private void insertFindings(Handle h, long runId, List<Finding> findings) {
        if (findings.isEmpty()) {
            return;
        }
        PreparedBatch b = h.prepareBatch("INSERT INTO " + s + ".finding (run_id, variable, label, kind, test, statistic, p_value,"
                + " q_value, effect_name, effect_estimate, effect_ci_low, effect_ci_high, effect_threshold, verdict,"
                + " n_baseline, n_current, sentence, detail, df, df_convention, fdr_family_size, fdr_method, repeat,"
                + " against, breakdowns) VALUES"
                + " (:run, :variable, :label, :kind, :test, :statistic, :p, :q, :effectName, :estimate, :ciLow, :ciHigh,"
                + " :threshold, :verdict, :nb, :nc, :sentence, CAST(:detail AS jsonb), :df, :dfConvention, :family,"
                + " :fdrMethod, CAST(:repeat AS jsonb), :against, CAST(:breakdowns AS jsonb))");
        for (Finding f : findings) {
            Finding.Effect e = f.effect();
            b.bind("run", runId).bind("variable", f.variable()).bind("label", f.label()).bind("kind", f.kind().name()).bind("test", f.test())
                    .bind("statistic", f.statistic()).bind("p", f.pValue()).bind("q", f.qValue())
                    .bind("effectName", e == null ? null : e.name())
                    .bind("estimate", e == null ? null : e.estimate())
                    .bind("ciLow", e == null ? null : e.ciLow())
                    .bind("ciHigh", e == null ? null : e.ciHigh())
                    .bind("threshold", e == null ? null : e.threshold())
                    .bind("verdict", f.verdict() == null ? null : f.verdict().name())
                    .bind("nb", f.nBaseline()).bind("nc", f.nCurrent()).bind("sentence", f.sentence())
                    .bind("detail", Json.write(f.detail() == null ? java.util.Map.of() : f.detail()))
                    .bind("df", f.df()).bind("dfConvention", f.dfConvention())
                    .bind("family", f.fdrFamilySize()).bind("fdrMethod", f.fdrMethod())
                    .bind("repeat", f.repeat() == null ? null : Json.write(f.repeat()))
                    .bind("against", f.against())
                    .bind("breakdowns", f.breakdowns().isEmpty() ? null : Json.write(f.breakdowns()))
                    .add();
        }
        b.execute();
    }

    /**
     * A run's {@code findings.json} content made again from the results schema: the run row, its findings in the
     * order they were written (reading order), and its inference notes. A finding's detail comes back as the JSON
     * object it was stored as, except a relationship's, which the HTML digest draws and which is read back as its
     * record.
     */
    public Optional<FindingsReport> storedReport(long runId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT dataset, wave, against_wave, finished_at, alpha, fdr_method,"
                        + " tool_version, config_fingerprint, inference::text AS inference FROM " + s
                        + ".run WHERE run_id = :run")
                .bind("run", runId)
                .map((rs, ctx) -> {
                    String against = rs.getString("against_wave");
                    List<String> inference = List.of(Json.read(rs.getString("inference"), String[].class));
                    List<Finding> findings = storedFindings(h, runId);
                    return new FindingsReport(rs.getString("dataset"), rs.getString("wave"),
                            against.isEmpty() ? null : against,
                            rs.getObject("finished_at", OffsetDateTime.class).toInstant(), rs.getDouble("alpha"),
                            rs.getString("fdr_method"), inference, findings, rs.getString("tool_version"),
                            rs.getString("config_fingerprint"));
                })
                .findOne());
    }

    private List<Finding> storedFindings(Handle h, long runId) {
        return h.createQuery("SELECT variable, label, kind, test, statistic, p_value, q_value, effect_name, effect_estimate,"
                        + " effect_ci_low, effect_ci_high, effect_threshold, verdict, n_baseline, n_current, sentence,"
                        + " df, df_convention, fdr_family_size, fdr_method, repeat::text AS repeat, detail::text AS detail,"
                        + " against, breakdowns::text AS breakdowns FROM " + s
                        + ".finding WHERE run_id = :run ORDER BY finding_id")
                .bind("run", runId)
                .map((rs, ctx) -> finding(rs, detail(FindingKind.valueOf(rs.getString("kind")),
                        rs.getString("detail"))))
                .list();
    }

    /**
     * A finding from a result row with the finding table's column names (variable, label, kind, test, statistic, p_value,
     * q_value, effect_*, verdict, n_baseline, n_current, sentence, df, df_convention, fdr_family_size, fdr_method,
     * and optionally repeat as text).
     */
    static Finding finding(java.sql.ResultSet rs, Object detail) throws java.sql.SQLException {
        String effectName = rs.getString("effect_name");
        Finding.Effect effect = effectName == null ? null : new Finding.Effect(effectName,
                rs.getDouble("effect_estimate"), rs.getDouble("effect_ci_low"), rs.getDouble("effect_ci_high"),
                rs.getDouble("effect_threshold"));
        String verdict = rs.getString("verdict");
        return new Finding(rs.getString("variable"), rs.getString("label"), FindingKind.valueOf(rs.getString("kind")),
                rs.getString("test"),
                (Double) rs.getObject("statistic"), (Double) rs.getObject("p_value"), (Double) rs.getObject("q_value"),
                effect, verdict == null ? null : Verdict.valueOf(verdict), (Long) rs.getObject("n_baseline"),
                (Long) rs.getObject("n_current"), rs.getString("sentence"), detail, (Double) rs.getObject("df"),
                rs.getString("df_convention"), (Integer) rs.getObject("fdr_family_size"), rs.getString("fdr_method"),
                repeat(rs), optionalText(rs, "against"), breakdowns(optionalText(rs, "breakdowns")));
    }

    /** A column of the result by its label, or null when the query did not select it. */
    private static String optionalText(java.sql.ResultSet rs, String label) throws java.sql.SQLException {
        java.sql.ResultSetMetaData meta = rs.getMetaData();
        for (int i = 1; i <= meta.getColumnCount(); i++) {
            if (meta.getColumnLabel(i).equals(label)) {
                return rs.getString(i);
            }
        }
        return null;
    }

    private static List<org.wavewarden.compare.domain.Breakdown> breakdowns(String json) {
        return json == null ? List.of()
                : List.of(Json.read(json, org.wavewarden.compare.domain.Breakdown[].class));
    }

    private static Finding.Repeat repeat(java.sql.ResultSet rs) throws java.sql.SQLException {
        java.sql.ResultSetMetaData meta = rs.getMetaData();
        for (int i = 1; i <= meta.getColumnCount(); i++) {
            if (meta.getColumnLabel(i).equals("repeat")) {
                String json = rs.getString(i);
                return json == null ? null : Json.read(json, Finding.Repeat.class);
            }
        }
        return null;
    }

    static Object detail(FindingKind kind, String json) {
        if (kind == FindingKind.RELATIONSHIP_CHANGE) {
            try {
                return Json.read(json, RelationshipDetail.class);
            } catch (IllegalStateException e) {
                // A relationship note without correlations (a pair that could not be compared) is a plain object.
            }
        }
        Object detail = Json.read(json, Object.class);
        return detail instanceof java.util.Map<?, ?> m && m.isEmpty() ? null : detail;
    }

    /** Rows of the stored summary a run judged, or -1 when it is gone. */
    public long summaryRows(String dataset, String wave, String checksum) {
        return jdbi.withHandle(h -> h.createQuery("SELECT row_count FROM " + s + ".wave_summary WHERE dataset = :d"
                        + " AND wave = :w AND checksum = :c")
                .bind("d", dataset).bind("w", wave).bind("c", checksum).mapTo(Long.class).findOne().orElse(-1L));
    }

    /**
     * Notes a wave's current row count and returns since when it has had that count: the first time a count is
     * seen, {@code now}; while it stays the same, the time it was first seen.
     */
    public Instant watch(String dataset, String wave, long rows, long fingerprint, Instant now) {
        return jdbi.inTransaction(h -> h.createQuery("INSERT INTO " + s + ".wave_watch AS w (dataset, wave, row_count,"
                        + " fingerprint, stable_since) VALUES (:d, :w, :n, :f, :now) ON CONFLICT (dataset, wave) DO UPDATE"
                        + " SET row_count = EXCLUDED.row_count, fingerprint = EXCLUDED.fingerprint, stable_since = CASE"
                        + " WHEN w.row_count = EXCLUDED.row_count AND w.fingerprint = EXCLUDED.fingerprint"
                        + " THEN w.stable_since ELSE EXCLUDED.stable_since END RETURNING stable_since")
                .bind("d", dataset).bind("w", wave).bind("n", rows).bind("f", fingerprint)
                .bind("now", OffsetDateTime.ofInstant(now, ZoneOffset.UTC))
                .map((rs, ctx) -> rs.getObject(1, OffsetDateTime.class).toInstant()).one());
    }

    /** Records the source fingerprint of the data a wave's current run judged. */
    public void judgedFingerprint(String dataset, String wave, long fingerprint) {
        jdbi.useHandle(h -> h.createUpdate("UPDATE " + s + ".wave_watch SET judged_fingerprint = :f WHERE dataset = :d"
                + " AND wave = :w").bind("d", dataset).bind("w", wave).bind("f", fingerprint).execute());
    }

    /** The fingerprint recorded when the wave was last judged by the daemon, if any. */
    public java.util.Optional<Long> judgedFingerprint(String dataset, String wave) {
        return jdbi.withHandle(h -> h.createQuery("SELECT judged_fingerprint FROM " + s + ".wave_watch WHERE"
                        + " dataset = :d AND wave = :w AND judged_fingerprint IS NOT NULL")
                .bind("d", dataset).bind("w", wave).mapTo(Long.class).findOne());
    }

    /** Open alerts of a dataset, oldest first. */
    public List<AlertRow> openAlerts(String dataset) {
        return jdbi.withHandle(h -> h.createQuery("SELECT alert_id, wave, against_wave, variable, kind, verdict, sentence,"
                        + " facet_kinds FROM " + s + ".alert WHERE dataset = :dataset AND superseded_at IS NULL"
                        + " ORDER BY alert_id")
                .bind("dataset", dataset)
                .map((rs, ctx) -> new AlertRow(rs.getLong(1), rs.getString(2), rs.getString(3), rs.getString(4),
                        rs.getString(5), rs.getString(6), rs.getString(7),
                        List.of((String[]) rs.getArray(8).getArray())))
                .list());
    }

    /**
     * An alert as stored: named by its lead finding.
     *
     * @param otherKinds the kinds of the event's other findings, in order of urgency
     */
    public record AlertRow(long alertId, String wave, String againstWave, String variable, String kind, String verdict,
                           String sentence, List<String> otherKinds) {
        public AlertRow {
            otherKinds = List.copyOf(otherKinds);
        }
    }
}
