package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.SignOff;

import java.time.Clock;
import java.time.Instant;
import java.time.OffsetDateTime;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.EnumMap;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.Objects;
import java.util.Optional;

/**
 * What the web console reads from the results schema, one bounded number of statements per page whatever the
 * history's size (no statement per row): the datasets overview, a dataset's variables-by-waves grid, a finding with
 * its trend and alert history, a wave with its alerts and sign-offs, and search by variable name.
 *
 * <p>A wave's findings are those of its current run: the latest run of the (dataset, wave) that is not superseded.
 * Waves are returned in the order the caller's comparator gives (the dataset's configured wave order).
 */
public final class ConsoleReads {

    /** The key of a finding or alert without a verdict, in counts and in the grid's verdict filter. */
    public static final String NO_VERDICT = "none";

    /** Most urgent first, as the grid and search pick a variable's finding; SQL over the finding {@code f}. */
    private static final String URGENCY = "CASE f.verdict WHEN 'MATERIAL' THEN 0 WHEN 'UNCERTAIN' THEN 1"
            + " WHEN 'MINOR' THEN 2 WHEN 'STABLE' THEN 3 WHEN 'CLEARED' THEN 4 ELSE 5 END";

    private final Jdbi jdbi;
    private final String s;
    private final AlertReviews reviews;
    private final ReleaseComparisons releases;

    public ConsoleReads(Jdbi jdbi, String schema) {
        this(jdbi, schema, Clock.systemUTC());
    }

    /** With the clock whose UTC day decides whether a mute by date still holds (as {@link AlertReviews}). */
    public ConsoleReads(Jdbi jdbi, String schema, Clock clock) {
        this.jdbi = Objects.requireNonNull(jdbi, "jdbi");
        this.s = Identifiers.quote(Objects.requireNonNull(schema, "schema"));
        this.reviews = new AlertReviews(jdbi, schema, clock);
        this.releases = new ReleaseComparisons(jdbi, schema);
    }

    /**
     * One dataset as the overview shows it.
     *
     * @param lastWave      the wave of the latest current run, or null before the first run
     * @param lastJudgedAt  when that run finished, or null
     * @param wavesJudged   waves with a current run
     * @param openByVerdict open alerts by verdict key (MATERIAL, UNCERTAIN, ...; "none" for a finding without one)
     * @param byState       alerts of current runs by state
     * @param lastSignOff   the latest sign-off of {@code lastWave}, or null
     * @param lastWaveSignedOff whether that sign-off rests on the wave's current run (a sign-off of a run since
     *                      replaced does not count)
     */
    public record DatasetSummary(String dataset, String lastWave, Instant lastJudgedAt, int wavesJudged,
                                 Map<String, Integer> openByVerdict, Map<AlertState, Integer> byState,
                                 SignOff lastSignOff, boolean lastWaveSignedOff) {
        public DatasetSummary {
            openByVerdict = Map.copyOf(openByVerdict);
            byState = Map.copyOf(byState);
        }
    }

    /** Which findings a grid shows: null for any. */
    public record GridFilter(String kind, String verdict) {
        public static final GridFilter ANY = new GridFilter(null, null);
    }

    /**
     * One variable in one wave: the most urgent of its findings that pass the filter (MATERIAL before UNCERTAIN before
     * MINOR before STABLE, then a finding without a verdict), with how many findings it stands for.
     *
     * @param alertState the state of the alert on this variable in this wave, or null when none
     */
    public record GridCell(long findingId, String kind, String verdict, int findings, AlertState alertState) {
        /** No finding of this variable in this wave. */
        public static final GridCell EMPTY = new GridCell(0, null, null, 0, null);

        public boolean empty() {
            return findingId == 0;
        }
    }

    /** A variable's cells, one per wave of {@link Grid#waves()} in that order ({@link GridCell#EMPTY} for none). */
    public record GridRow(String variable, String label, List<GridCell> cells) {
        public GridRow {
            cells = List.copyOf(cells);
        }
    }

    /**
     * @param kinds every finding kind present in the dataset (for the filter's choices), in a stable order
     */
    public record Grid(String dataset, List<String> waves, List<GridRow> rows, List<String> kinds) {
        public Grid {
            waves = List.copyOf(waves);
            rows = List.copyOf(rows);
            kinds = List.copyOf(kinds);
        }
    }

    /**
     * The same variable and kind in one wave: the effect with its interval, and where the finding's detail has one,
     * the current wave's level (share, mean, median) with its interval.
     */
    public record TrendPoint(String wave, long findingId, String verdict, String effectName, Double estimate,
                             Double low, Double high, Double threshold, String levelName, Double level,
                             Double levelLow, Double levelHigh) {
    }

    /**
     * A finding page's data.
     *
     * @param alert   the alert the finding belongs to (its lead or one of its other findings), or null
     * @param history that alert's actions in order, empty when there is no alert
     * @param trend   the same variable and kind across every wave with a current run, in wave order
     */
    public record FindingView(long findingId, long runId, String dataset, String wave, String againstWave,
                              Finding finding, AlertView alert, List<ReviewEntry> history, List<TrendPoint> trend) {
        public FindingView {
            history = List.copyOf(history);
            trend = List.copyOf(trend);
        }
    }

    /**
     * A wave page's data.
     *
     * @param runId       the current run, or 0 when the wave has none
     * @param alerts      the alerts of the current run (all states)
     * @param signOffs    every sign-off of the wave, oldest first
     * @param leadFinding each alert's lead finding (alert id to finding id), for links to the finding pages
     * @param releaseComparisons the comparisons of the wave's publications, latest first (none for a wave published
     *                    once)
     */
    public record WaveView(String dataset, String wave, String againstWave, long runId, Instant judgedAt,
                           String configFingerprint, String toolVersion, int findings, List<AlertView> alerts,
                           List<SignOff> signOffs, Map<Long, Long> leadFinding,
                           List<ReleaseComparisons.Stored> releaseComparisons) {
        public WaveView {
            alerts = List.copyOf(alerts);
            signOffs = List.copyOf(signOffs);
            leadFinding = leadFinding == null ? Map.of() : Map.copyOf(leadFinding);
            releaseComparisons = releaseComparisons == null ? List.of() : List.copyOf(releaseComparisons);
        }

        /** A wave without release comparisons. */
        public WaveView(String dataset, String wave, String againstWave, long runId, Instant judgedAt,
                        String configFingerprint, String toolVersion, int findings, List<AlertView> alerts,
                        List<SignOff> signOffs, Map<Long, Long> leadFinding) {
            this(dataset, wave, againstWave, runId, judgedAt, configFingerprint, toolVersion, findings, alerts,
                    signOffs, leadFinding, List.of());
        }

        /** A wave without links from its alerts to their findings. */
        public WaveView(String dataset, String wave, String againstWave, long runId, Instant judgedAt,
                        String configFingerprint, String toolVersion, int findings, List<AlertView> alerts,
                        List<SignOff> signOffs) {
            this(dataset, wave, againstWave, runId, judgedAt, configFingerprint, toolVersion, findings, alerts,
                    signOffs, Map.of());
        }
    }

    /** A variable whose name or label matched, with its latest current finding. */
    public record SearchHit(String dataset, String variable, String label, String lastWave, long findingId,
                            String verdict) {
    }

    /** Every dataset with results, by name: three statements whatever the number of datasets, waves or alerts. */
    public List<DatasetSummary> datasets() {
        return jdbi.withHandle(h -> {
            Map<String, Map<String, Integer>> open = new HashMap<>();
            Map<String, Map<AlertState, Integer>> states = new HashMap<>();
            // Every current alert's latest entry in one ordered pass over the actions' index, rather than one probe
            // per alert: the overview counts tens of thousands of alerts on a long history.
            h.createQuery("WITH " + currentRuns(null) + ", latest AS (SELECT DISTINCT ON (alert_id) * FROM " + s
                            + ".alert_action ORDER BY alert_id, entry_id DESC) SELECT a.dataset, a.verdict, "
                            + reviews.stateSql() + " AS state, count(*) AS n FROM cur c JOIN " + s + ".alert a ON"
                            + " a.run_id = c.run_id LEFT JOIN latest e ON e.alert_id = a.alert_id"
                            + " GROUP BY 1, 2, 3")
                    .bind("today", reviews.today())
                    .map((rs, ctx) -> {
                        String dataset = rs.getString("dataset");
                        AlertState state = AlertState.valueOf(rs.getString("state"));
                        int n = rs.getInt("n");
                        states.computeIfAbsent(dataset, k -> new EnumMap<>(AlertState.class)).merge(state, n, Integer::sum);
                        if (state == AlertState.OPEN) {
                            String verdict = rs.getString("verdict");
                            open.computeIfAbsent(dataset, k -> new TreeMap<>())
                                    .merge(verdict == null ? NO_VERDICT : verdict, n, Integer::sum);
                        }
                        return dataset;
                    })
                    .list();
            // The last wave's latest sign-off, and whether it was signed on the wave's current run: a sign-off of
            // a run since replaced rests on other numbers and does not count as the wave's.
            Map<String, SignOff> lastSignOff = new HashMap<>();
            Map<String, Boolean> onCurrentRun = new HashMap<>();
            h.createQuery("WITH " + currentRuns(null) + ", last AS (SELECT DISTINCT ON (dataset)"
                            + " dataset, wave, run_id, finished_at FROM cur ORDER BY dataset, finished_at DESC,"
                            + " run_id DESC), signed AS (SELECT DISTINCT ON (so.dataset) so.*, so.alerts::text AS"
                            + " alerts_text, so.run_id = l.run_id AS on_current FROM last l JOIN " + s + ".sign_off so"
                            + " ON so.dataset = l.dataset AND so.wave = l.wave ORDER BY so.dataset, so.sign_off_id DESC)"
                            + " SELECT * FROM signed")
                    .map((rs, ctx) -> Map.entry(SignOffs.signOff(rs), rs.getBoolean("on_current")))
                    .forEach(e -> {
                        lastSignOff.put(e.getKey().dataset(), e.getKey());
                        onCurrentRun.put(e.getKey().dataset(), e.getValue());
                    });
            return h.createQuery("WITH " + currentRuns(null) + ", last AS (SELECT DISTINCT ON (dataset) dataset, wave,"
                            + " finished_at FROM cur ORDER BY dataset, finished_at DESC, run_id DESC)"
                            + " SELECT l.dataset, l.wave, l.finished_at, (SELECT count(*) FROM cur c WHERE c.dataset ="
                            + " l.dataset) AS waves FROM last l ORDER BY l.dataset")
                    .map((rs, ctx) -> {
                        String dataset = rs.getString("dataset");
                        return new DatasetSummary(dataset, rs.getString("wave"),
                                rs.getObject("finished_at", OffsetDateTime.class).toInstant(), rs.getInt("waves"),
                                open.getOrDefault(dataset, Map.of()), states.getOrDefault(dataset, Map.of()),
                                lastSignOff.get(dataset), onCurrentRun.getOrDefault(dataset, false));
                    })
                    .list();
        });
    }

    /**
     * The grid of {@code dataset}, waves ordered by {@code waveOrder}: a row for each variable with at least one
     * finding that passes the filter, by name. Three statements.
     */
    public Grid grid(String dataset, GridFilter filter, Comparator<String> waveOrder) {
        GridFilter f = filter == null ? GridFilter.ANY : filter;
        return jdbi.withHandle(h -> {
            List<String> waves = new ArrayList<>(h.createQuery("WITH " + currentRuns(":d") + " SELECT wave FROM cur")
                    .bind("d", dataset).mapTo(String.class).list());
            waves.sort(waveOrder);
            Map<String, Integer> column = new HashMap<>();
            for (int i = 0; i < waves.size(); i++) {
                column.put(waves.get(i), i);
            }
            // Per variable: its cells by column, and its label as the latest wave (in wave order) that had one.
            Map<String, GridCell[]> cells = new TreeMap<>();
            Map<String, String> labels = new HashMap<>();
            Map<String, Integer> labelColumn = new HashMap<>();
            h.createQuery("WITH " + currentRuns(":d") + ", ranked AS (SELECT f.finding_id, f.run_id, c.wave,"
                            + " f.variable, f.label, f.kind, f.verdict, count(*) OVER w AS n, row_number() OVER (w ORDER BY "
                            + URGENCY + ", f.finding_id) AS rank FROM cur c CROSS JOIN LATERAL (SELECT * FROM " + s
                            + ".finding x WHERE x.run_id = c.run_id) f"
                            + " WHERE (CAST(:k AS text) IS NULL OR f.kind = :k) AND (CAST(:v AS text) IS NULL"
                            + " OR f.verdict = :v OR (:v = '" + NO_VERDICT + "' AND f.verdict IS NULL))"
                            + " WINDOW w AS (PARTITION BY f.run_id, f.variable)),"
                            // The alert the cell's finding belongs to (as its lead or one of its other kinds, as
                            // the finding page reads it): the current run's, preferring one still in force.
                            + " alerts AS (SELECT v.run_id, v.variable, v.kind, v.facet_kinds, v.state, v.alert_id"
                            + " FROM cur c CROSS JOIN LATERAL (" + reviews.alertSelect() + " WHERE a.run_id = c.run_id) v)"
                            + " SELECT DISTINCT ON (r.finding_id) r.*, al.state FROM ranked r LEFT JOIN alerts al"
                            + " ON al.run_id = r.run_id AND al.variable = r.variable AND (al.kind = r.kind"
                            + " OR r.kind = ANY (al.facet_kinds)) WHERE r.rank = 1"
                            + " ORDER BY r.finding_id, (al.state = 'SUPERSEDED'), al.alert_id DESC")
                    .bind("d", dataset).bind("k", f.kind()).bind("v", f.verdict()).bind("today", reviews.today())
                    .map((rs, ctx) -> {
                        String variable = rs.getString("variable");
                        Integer col = column.get(rs.getString("wave"));
                        if (col == null) {
                            // A wave whose first run was committed between this page's two statements: next time.
                            return variable;
                        }
                        String state = rs.getString("state");
                        cells.computeIfAbsent(variable, k -> new GridCell[waves.size()])[col] = new GridCell(
                                rs.getLong("finding_id"), rs.getString("kind"), rs.getString("verdict"), rs.getInt("n"),
                                state == null ? null : AlertState.valueOf(state));
                        String label = rs.getString("label");
                        if (label != null && !label.isBlank() && labelColumn.getOrDefault(variable, -1) < col) {
                            labels.put(variable, label);
                            labelColumn.put(variable, col);
                        }
                        return variable;
                    })
                    .list();
            List<String> kinds = h.createQuery("WITH " + currentRuns(":d") + " SELECT DISTINCT f.kind FROM cur c"
                            + " CROSS JOIN LATERAL (SELECT kind FROM " + s + ".finding x WHERE x.run_id = c.run_id) f"
                            + " ORDER BY f.kind")
                    .bind("d", dataset).mapTo(String.class).list();
            List<GridRow> rows = new ArrayList<>();
            cells.forEach((variable, row) -> rows.add(new GridRow(variable, labels.get(variable),
                    Arrays.stream(row).map(c -> c == null ? GridCell.EMPTY : c).toList())));
            return new Grid(dataset, waves, rows, kinds);
        });
    }

    /** A finding with its alert, the alert's history and the trend: four statements. */
    public Optional<FindingView> finding(long findingId, Comparator<String> waveOrder) {
        return jdbi.withHandle(h -> {
            Optional<FindingView> head = h.createQuery("SELECT f.finding_id, f.run_id, r.dataset, r.wave,"
                            + " r.against_wave, f.variable, f.label, f.kind, f.test, f.statistic, f.p_value, f.q_value,"
                            + " f.effect_name, f.effect_estimate, f.effect_ci_low, f.effect_ci_high, f.effect_threshold,"
                            + " f.verdict, f.n_baseline, f.n_current, f.sentence, f.df, f.df_convention,"
                            + " f.fdr_family_size, f.fdr_method, f.repeat::text AS repeat, f.detail::text AS detail,"
                            + " f.against"
                            + " FROM " + s + ".finding f JOIN " + s + ".run r ON r.run_id = f.run_id"
                            + " WHERE f.finding_id = :id")
                    .bind("id", findingId)
                    .map((rs, ctx) -> {
                        Finding finding = ResultsStore.finding(rs, ResultsStore.detail(
                                FindingKind.valueOf(rs.getString("kind")), rs.getString("detail")));
                        return new FindingView(rs.getLong("finding_id"), rs.getLong("run_id"), rs.getString("dataset"),
                                rs.getString("wave"), emptyIsNone(rs.getString("against_wave")), finding, null,
                                List.of(), List.of());
                    })
                    .findOne();
            if (head.isEmpty()) {
                return head;
            }
            FindingView v = head.get();
            // The alert whose event holds this finding: led by it, or listing its kind among the event's others.
            Optional<AlertView> alert = h.createQuery(reviews.alertSelect() + " WHERE a.run_id = :run AND a.variable ="
                            + " :v AND (a.kind = :k OR :k = ANY (a.facet_kinds))"
                            + " ORDER BY (a.superseded_at IS NULL) DESC, a.alert_id DESC LIMIT 1")
                    .bind("run", v.runId()).bind("v", v.finding().variable()).bind("k", v.finding().kind().name())
                    .bind("today", reviews.today())
                    .map((rs, ctx) -> AlertReviews.alertView(rs))
                    .findOne();
            List<ReviewEntry> history = h.createQuery("SELECT * FROM " + s + ".alert_action WHERE alert_id = :id"
                            + " ORDER BY entry_id")
                    .bind("id", alert.map(AlertView::alertId).orElse(0L))
                    .map((rs, ctx) -> AlertReviews.entry(rs))
                    .list();
            List<TrendPoint> trend = new ArrayList<>(h.createQuery("WITH " + currentRuns(":d") + ", p AS (SELECT"
                            + " c.wave, f.finding_id, f.verdict, f.effect_name, f.effect_estimate, f.effect_ci_low,"
                            + " f.effect_ci_high, f.effect_threshold, f.detail -> 'plot' AS plot,"
                            + " f.detail -> 'plot' -> 'current' -> 0 AS level FROM cur c CROSS JOIN LATERAL (SELECT *"
                            + " FROM " + s + ".finding x WHERE x.run_id = c.run_id AND x.variable = :v AND x.kind = :k) f)"
                            + " SELECT p.*, CASE WHEN jsonb_typeof(p.plot -> 'statistic') = 'string' THEN"
                            + " p.plot ->> 'statistic' END AS level_name,"
                            + " CASE WHEN jsonb_typeof(p.level -> 'category') = 'string' THEN p.level ->> 'category' END"
                            + " AS level_category, " + number("value") + " AS level_value, " + number("low")
                            + " AS level_low, " + number("high") + " AS level_high FROM p")
                    .bind("d", v.dataset()).bind("v", v.finding().variable()).bind("k", v.finding().kind().name())
                    .map((rs, ctx) -> {
                        String levelName = rs.getString("level_name");
                        String category = rs.getString("level_category");
                        Double level = (Double) rs.getObject("level_value");
                        return new TrendPoint(rs.getString("wave"), rs.getLong("finding_id"), rs.getString("verdict"),
                                rs.getString("effect_name"), (Double) rs.getObject("effect_estimate"),
                                (Double) rs.getObject("effect_ci_low"), (Double) rs.getObject("effect_ci_high"),
                                (Double) rs.getObject("effect_threshold"),
                                level == null || levelName == null ? null
                                        : category == null ? levelName : levelName + " (" + category + ")",
                                level, level == null ? null : (Double) rs.getObject("level_low"),
                                level == null ? null : (Double) rs.getObject("level_high"));
                    })
                    .list());
            trend.sort(Comparator.comparing(TrendPoint::wave, waveOrder));
            return Optional.of(new FindingView(v.findingId(), v.runId(), v.dataset(), v.wave(), v.againstWave(),
                    v.finding(), alert.orElse(null), history, trend));
        });
    }

    /**
     * A wave with its current run's alerts, every sign-off and every release comparison: five statements. Empty when
     * the wave has neither a current run, a sign-off nor a release comparison.
     */
    public Optional<WaveView> wave(String dataset, String wave) {
        return jdbi.withHandle(h -> {
            String run = "SELECT run_id FROM " + s + ".run WHERE dataset = :d AND wave = :w AND superseded_at IS NULL"
                    + " ORDER BY finished_at DESC, run_id DESC LIMIT 1";
            Optional<Map<String, Object>> current = h.createQuery("SELECT run_id, against_wave, finished_at,"
                            + " config_fingerprint, tool_version, findings_count FROM " + s + ".run WHERE run_id = ("
                            + run + ")")
                    .bind("d", dataset).bind("w", wave).mapToMap().findOne();
            List<AlertView> alerts = h.createQuery(reviews.alertSelect() + " WHERE a.run_id = (" + run + ")"
                            + " ORDER BY a.alert_id")
                    .bind("d", dataset).bind("w", wave).bind("today", reviews.today())
                    .map((rs, ctx) -> AlertReviews.alertView(rs))
                    .list();
            // Each alert's lead finding, joined on the key the alert was written under (run, variable, kind).
            Map<Long, Long> leads = new HashMap<>();
            h.createQuery("SELECT DISTINCT ON (a.alert_id) a.alert_id, f.finding_id FROM " + s + ".alert a JOIN " + s
                            + ".finding f ON f.run_id = a.run_id AND f.variable = a.variable AND f.kind = a.kind"
                            + " AND coalesce(f.against, '') = a.against"
                            + " WHERE a.run_id = (" + run + ") ORDER BY a.alert_id, f.finding_id")
                    .bind("d", dataset).bind("w", wave)
                    .map((rs, ctx) -> Map.entry(rs.getLong(1), rs.getLong(2)))
                    .forEach(e -> leads.put(e.getKey(), e.getValue()));
            List<SignOff> signOffs = h.createQuery("SELECT *, alerts::text AS alerts_text FROM " + s + ".sign_off"
                            + " WHERE dataset = :d AND wave = :w ORDER BY sign_off_id")
                    .bind("d", dataset).bind("w", wave)
                    .map((rs, ctx) -> SignOffs.signOff(rs))
                    .list();
            List<ReleaseComparisons.Stored> comparisons = releases.ofWave(h, dataset, wave, Integer.MAX_VALUE);
            if (current.isEmpty() && signOffs.isEmpty() && comparisons.isEmpty()) {
                return Optional.<WaveView>empty();
            }
            Map<String, Object> r = current.orElse(Map.of());
            Object finished = r.get("finished_at");
            return Optional.of(new WaveView(dataset, wave, emptyIsNone((String) r.get("against_wave")),
                    r.isEmpty() ? 0 : ((Number) r.get("run_id")).longValue(),
                    finished == null ? null : ((java.sql.Timestamp) finished).toInstant(),
                    (String) r.get("config_fingerprint"), (String) r.get("tool_version"),
                    r.isEmpty() ? 0 : ((Number) r.get("findings_count")).intValue(), alerts, signOffs, leads,
                    comparisons));
        });
    }

    /**
     * Variables whose name or label contains {@code text} (case-insensitive, as text, never a pattern), among the
     * variables judged in each dataset's latest current run, by dataset and name; one statement. Reading only the
     * latest runs keeps the search to one run per dataset however long the history: a variable no longer in a
     * dataset's latest wave is found through that dataset's grid instead.
     */
    public List<SearchHit> search(String text, int limit) {
        if (text == null || text.isBlank() || limit <= 0) {
            return List.of();
        }
        return jdbi.withHandle(h -> h.createQuery("WITH latest AS (SELECT DISTINCT ON (dataset) run_id, dataset, wave"
                        + " FROM " + s + ".run WHERE superseded_at IS NULL ORDER BY dataset, finished_at DESC, run_id DESC)"
                        // strpos compares text with text: % _ \ and quotes in what was typed match themselves.
                        + " SELECT DISTINCT ON (l.dataset, f.variable) l.dataset, f.variable, f.label, l.wave,"
                        // The latest runs' ids as an array, so the findings are read by run through the index
                        // rather than by a pass over every finding that a join would be planned as.
                        + " f.finding_id, f.verdict FROM " + s + ".finding f JOIN latest l ON l.run_id = f.run_id"
                        + " WHERE f.run_id = ANY (ARRAY(SELECT run_id FROM latest)) AND (strpos(lower(f.variable), lower(:t)) > 0 OR strpos(lower(coalesce(f.label, '')),"
                        + " lower(:t)) > 0) ORDER BY l.dataset, f.variable, " + URGENCY + ", f.finding_id LIMIT :n")
                .bind("t", text.trim()).bind("n", limit)
                .map((rs, ctx) -> new SearchHit(rs.getString("dataset"), rs.getString("variable"), rs.getString("label"),
                        rs.getString("wave"), rs.getLong("finding_id"), rs.getString("verdict")))
                .list());
    }

    /**
     * The current runs (the latest run of each wave that is not superseded) as a CTE named cur, of the dataset bound
     * as {@code datasetBind}, or of every dataset when null.
     */
    private String currentRuns(String datasetBind) {
        return "cur AS (SELECT DISTINCT ON (dataset, wave) run_id, dataset, wave, finished_at FROM " + s + ".run"
                + " WHERE superseded_at IS NULL" + (datasetBind == null ? "" : " AND dataset = " + datasetBind)
                + " ORDER BY dataset, wave, finished_at DESC, run_id DESC)";
    }

    /** A number of the level's JSON object, null when it is missing or not a number (bad data is no crash). */
    private static String number(String field) {
        return "CASE WHEN jsonb_typeof(p.level -> '" + field + "') = 'number' THEN CAST(p.level ->> '" + field
                + "' AS double precision) END";
    }

    private static String emptyIsNone(String againstWave) {
        return againstWave == null || againstWave.isEmpty() ? null : againstWave;
    }
}
