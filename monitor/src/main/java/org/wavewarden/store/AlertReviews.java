package org.wavewarden.store;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.MuteRule;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.CreationDecision;
import org.wavewarden.review.ReviewAction;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.ReviewReason;

import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.LocalDate;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.Arrays;
import java.util.Collection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Collectors;

/**
 * The lifecycle of alerts in the results schema: every alert's history of actions, append-only (the table refuses
 * UPDATE and DELETE), its state read from its latest action, and the mute rules stored by commands.
 *
 * <p>The state of an alert is what its latest entry (highest entry_id) leads to ({@link ReviewAction#leadsTo}),
 * with two readings that keep it true without writing anything: an alert whose row is superseded is SUPERSEDED
 * whatever its latest entry says (the row is marked in the same transaction as the entry), and a MUTED entry holds
 * only while its mute is in force: once its last day (UTC) has passed, or the stored rule behind it has been
 * lifted, the alert is OPEN again. A mute's last wave is not read here: it bounds which later waves' alerts are
 * muted when they are created (review.CreationRules reads it in the dataset's wave order); the alert that was muted
 * is itself within its rule and stays muted. An alert with no entry at all (written by hand, or by a version
 * before histories) is OPEN.
 */
public final class AlertReviews {

    /** The actor of entries the monitor writes itself (creation, supersession). */
    public static final String MONITOR = "wavewarden";

    /** How a creation decision or a mute rule's words name the stored rule behind them. */
    private static final Pattern RULE_NAME = Pattern.compile("\\bmute rule (\\d+)\\b");

    private final Jdbi jdbi;
    private final String s;
    private final Clock clock;

    public AlertReviews(Jdbi jdbi, String schema) {
        this(jdbi, schema, Clock.systemUTC());
    }

    /** With the clock whose UTC day decides whether a mute by date still holds. */
    public AlertReviews(Jdbi jdbi, String schema, Clock clock) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
        this.clock = clock;
    }

    /**
     * Which alerts to list; a null field matches everything.
     *
     * @param verdict a verdict name, e.g. MATERIAL
     * @param kind    a finding kind name; matches the lead's kind or any facet's
     */
    public record Filter(String dataset, String wave, AlertState state, String verdict, String kind) {
        public static final Filter ANY = new Filter(null, null, null, null, null);
    }

    LocalDate today() {
        return LocalDate.ofInstant(clock.instant(), ZoneOffset.UTC);
    }

    /** The state of alert {@code a} with its latest entry {@code e}, as SQL (binds :today). */
    String stateSql() {
        String byAction = Arrays.stream(ReviewAction.values())
                .map(x -> " WHEN e.action = '" + x.name() + "' THEN '" + x.leadsTo().name() + "'")
                .collect(Collectors.joining());
        return "CASE WHEN a.superseded_at IS NOT NULL THEN 'SUPERSEDED' WHEN e.action IS NULL THEN 'OPEN'"
                + " WHEN e.action = 'MUTED' AND (e.until_date < CAST(:today AS date) OR EXISTS (SELECT 1 FROM " + s
                + ".mute_rule_lift l WHERE l.rule_id = e.mute_rule_id)) THEN 'OPEN'" + byAction + " END";
    }

    String latestEntryJoin() {
        return " LEFT JOIN LATERAL (SELECT * FROM " + s + ".alert_action x WHERE x.alert_id = a.alert_id"
                + " ORDER BY x.entry_id DESC LIMIT 1) e ON true";
    }

    /**
     * Alerts with their state and latest entry, as {@link #alertView} reads them: the select and from clauses, for
     * a caller to add its where clause over {@code a} (the alert); binds :today.
     */
    String alertSelect() {
        return "SELECT a.alert_id, a.run_id, a.dataset, a.wave, a.against_wave, a.variable, a.kind, a.verdict,"
                + " a.sentence, a.facet_kinds, a.created_at, " + stateSql() + " AS state, e.entry_id, e.acted_at,"
                + " e.actor, e.action, e.reason, e.note, e.source, e.until_wave, e.until_date FROM " + s + ".alert a"
                + latestEntryJoin();
    }

    /** The alerts the filter matches, oldest first. */
    public List<AlertView> list(Filter filter) {
        return jdbi.withHandle(h -> list(h, filter, null));
    }

    List<AlertView> list(Handle h, Filter filter, Long alertId) {
        return h.createQuery("SELECT * FROM (" + alertSelect() + " WHERE"
                        + " (CAST(:id AS bigint) IS NULL OR a.alert_id = :id)"
                        + " AND (CAST(:d AS text) IS NULL OR a.dataset = :d) AND (CAST(:w AS text) IS NULL OR a.wave = :w)"
                        + " AND (CAST(:v AS text) IS NULL OR a.verdict = :v) AND (CAST(:k AS text) IS NULL OR a.kind = :k"
                        + " OR :k = ANY (a.facet_kinds))) v WHERE CAST(:st AS text) IS NULL OR v.state = :st"
                        + " ORDER BY v.alert_id")
                .bind("id", alertId).bind("today", today())
                .bind("d", filter.dataset()).bind("w", filter.wave()).bind("v", filter.verdict())
                .bind("k", filter.kind()).bind("st", filter.state() == null ? null : filter.state().name())
                .map((rs, ctx) -> alertView(rs))
                .list();
    }

    /**
     * An alert from a row with the alert table's columns, its state as {@code state} ({@link #stateSql()}) and its
     * latest entry's columns ({@link #latestEntryJoin()}), null when it has none.
     */
    static AlertView alertView(ResultSet rs) throws SQLException {
        return new AlertView(rs.getLong("alert_id"), rs.getLong("run_id"), rs.getString("dataset"),
                rs.getString("wave"), rs.getString("against_wave"), rs.getString("variable"),
                rs.getString("kind"), rs.getString("verdict"), rs.getString("sentence"),
                List.of((String[]) rs.getArray("facet_kinds").getArray()),
                rs.getObject("created_at", OffsetDateTime.class).toInstant(),
                AlertState.valueOf(rs.getString("state")),
                rs.getObject("entry_id") == null ? null : entry(rs));
    }

    public Optional<AlertView> get(long alertId) {
        return jdbi.withHandle(h -> list(h, Filter.ANY, alertId).stream().findFirst());
    }

    /** The states of the given alerts, in one query; an id that is no alert is left out. */
    public Map<Long, AlertState> states(Collection<Long> alertIds) {
        if (alertIds.isEmpty()) {
            return Map.of();
        }
        return jdbi.withHandle(h -> h.createQuery("SELECT a.alert_id, " + stateSql() + " FROM " + s + ".alert a"
                        + latestEntryJoin() + " WHERE a.alert_id = ANY (CAST(:ids AS bigint[]))")
                .bind("ids", alertIds.toArray(Long[]::new)).bind("today", today())
                .reduceRows(new HashMap<Long, AlertState>(), (m, row) -> {
                    m.put(row.getColumn(1, Long.class), AlertState.valueOf(row.getColumn(2, String.class)));
                    return m;
                }));
    }

    /** Every entry of an alert's history, oldest first. */
    public List<ReviewEntry> history(long alertId) {
        return jdbi.withHandle(h -> h.createQuery("SELECT * FROM " + s + ".alert_action WHERE alert_id = :id"
                        + " ORDER BY entry_id")
                .bind("id", alertId)
                .map((rs, ctx) -> entry(rs))
                .list());
    }

    /** Explains an open or muted alert; refused (ReviewException) for a superseded or unknown one. */
    public ReviewEntry explain(long alertId, String actor, ReviewReason reason, String note, String source) {
        if (reason == null) {
            throw new ReviewException("Alert " + alertId + " was not explained: a reason is needed, one of "
                    + ReviewReason.keys() + ".");
        }
        return jdbi.inTransaction(h -> {
            AlertView a = lockedCurrent(h, alertId, "explained");
            return append(h, a.alertId(), actor(actor), ReviewAction.EXPLAINED, reason, note, source, null, null,
                    null);
        });
    }

    /**
     * Mutes an alert until a wave or a day (at least one), and stores a mute rule for its dataset, variable and
     * kind with the same expiry, so the same alert of a later wave is muted when it is created.
     */
    public ReviewEntry mute(long alertId, String actor, String untilWave, LocalDate untilDate, ReviewReason reason,
                            String note, String source) {
        String wave = untilWave == null || untilWave.isBlank() ? null : untilWave.trim();
        if (wave == null && untilDate == null) {
            throw new ReviewException("Alert " + alertId + " was not muted: a mute needs an end, the last wave or"
                    + " the last day it holds (or both).");
        }
        if (untilDate != null && untilDate.isBefore(today())) {
            throw new ReviewException("Alert " + alertId + " was not muted: the last day given, " + untilDate
                    + ", is already past.");
        }
        String who = actor(actor);
        return jdbi.inTransaction(h -> {
            AlertView a = lockedCurrent(h, alertId, "muted");
            long ruleId = h.createQuery("INSERT INTO " + s + ".mute_rule (dataset, variable, kind, until_wave,"
                            + " until_date, reason, note, created_by, alert_id) VALUES (:d, :v, :k, :uw, :ud, :r, :n,"
                            + " :by, :a) RETURNING rule_id")
                    .bind("d", a.dataset()).bind("v", a.variable()).bind("k", a.kind()).bind("uw", wave)
                    .bind("ud", untilDate).bind("r", reason == null ? null : reason.key()).bind("n", note)
                    .bind("by", who).bind("a", alertId)
                    .mapTo(Long.class).one();
            return append(h, alertId, who, ReviewAction.MUTED, reason, note, source, wave, untilDate, ruleId);
        });
    }

    /** Lifts a mute: the alert is open again and the mute rule stored with it ends. */
    public ReviewEntry unmute(long alertId, String actor, String note, String source) {
        String who = actor(actor);
        return jdbi.inTransaction(h -> {
            AlertView a = lockedCurrent(h, alertId, "unmuted");
            if (a.state() != AlertState.MUTED) {
                throw new ReviewException("Alert " + alertId + " is not muted (it is " + a.state() + "): there is"
                        + " no mute to lift.");
            }
            h.createQuery("SELECT mute_rule_id FROM " + s + ".alert_action WHERE alert_id = :id AND action = 'MUTED'"
                            + " ORDER BY entry_id DESC LIMIT 1")
                    .bind("id", alertId).mapTo(Long.class).findOne()
                    .ifPresent(ruleId -> h.createUpdate("INSERT INTO " + s + ".mute_rule_lift (rule_id, lifted_by,"
                                    + " note) VALUES (:r, :by, :n) ON CONFLICT (rule_id) DO NOTHING")
                            .bind("r", ruleId).bind("by", who).bind("n", note).execute());
            return append(h, alertId, who, ReviewAction.UNMUTED, null, note, source, null, null, null);
        });
    }

    /**
     * Opens an explained alert again (its explanation no longer holds, for example); the explanation stays in the
     * history. Refused for an alert that is not explained: an open one is open, a muted one is unmuted.
     */
    public ReviewEntry reopen(long alertId, String actor, String note, String source) {
        String who = actor(actor);
        return jdbi.inTransaction(h -> {
            AlertView a = lockedCurrent(h, alertId, "reopened");
            if (a.state() != AlertState.EXPLAINED) {
                throw new ReviewException("Alert " + alertId + " is not explained (it is " + a.state() + "): only an"
                        + " explained alert is reopened" + (a.state() == AlertState.MUTED ? "; unmute a muted one."
                        : "."));
            }
            return append(h, alertId, who, ReviewAction.REOPENED, null, note, source, null, null, null);
        });
    }

    /**
     * The mute rules stored by commands for a dataset that have not been lifted and have not expired by date. A
     * rule's words name it ({@code mute rule 12}), so that an alert it mutes when created is linked to it and
     * opens again when the rule is lifted.
     */
    public List<MuteRule> activeMutes(String dataset, LocalDate today) {
        return jdbi.withHandle(h -> h.createQuery("SELECT * FROM " + s + ".mute_rule r WHERE dataset = :d"
                        + " AND NOT EXISTS (SELECT 1 FROM " + s + ".mute_rule_lift l WHERE l.rule_id = r.rule_id)"
                        + " AND (until_date IS NULL OR until_date >= :today) ORDER BY rule_id")
                .bind("d", dataset).bind("today", today)
                .map((rs, ctx) -> {
                    String kind = rs.getString("kind");
                    String reason = rs.getString("reason");
                    String note = rs.getString("note");
                    String words = "mute rule " + rs.getLong("rule_id") + (reason == null ? "" : " (" + reason + ")")
                            + (note == null || note.isBlank() ? "" : ": " + note);
                    return new MuteRule(rs.getString("variable"), kind == null ? null : FindingKind.valueOf(kind),
                            rs.getString("until_wave"), rs.getObject("until_date", LocalDate.class), words,
                            rs.getString("created_by"));
                })
                .list());
    }

    /**
     * Writes the first entry of a newly inserted alert: OPENED, or what the configuration decided. A MUTED
     * decision whose source or note names a stored rule ({@code mute rule 12}) is linked to that rule.
     */
    void created(Handle h, long alertId, Optional<CreationDecision> decision) {
        if (decision.isEmpty()) {
            append(h, alertId, MONITOR, ReviewAction.OPENED, null, null, "run", null, null, null);
            return;
        }
        CreationDecision c = decision.get();
        Long ruleId = null;
        if (c.action() == ReviewAction.MUTED) {
            ruleId = ruleNamed(c.source()).or(() -> ruleNamed(c.note()))
                    .filter(id -> h.createQuery("SELECT count(*) FROM " + s + ".mute_rule WHERE rule_id = :r")
                            .bind("r", id).mapTo(Long.class).one() == 1)
                    .orElse(null);
        }
        // A rule of the configuration ends its alerts' mute on its last day, as a rule stored by a person does.
        String until = c.untilWave();
        LocalDate untilDate = c.untilDate();
        ReviewReason reason = c.reason();
        if (ruleId != null) {
            Map<String, Object> rule = h.createQuery("SELECT until_wave, until_date, reason FROM " + s
                    + ".mute_rule WHERE rule_id = :r").bind("r", ruleId).mapToMap().one();
            until = (String) rule.get("until_wave");
            untilDate = rule.get("until_date") == null ? null : ((java.sql.Date) rule.get("until_date")).toLocalDate();
            // The rule's words only name its category, so the category the person gave is read from the rule itself.
            if (reason == null) {
                reason = ReviewReason.parse((String) rule.get("reason")).orElse(null);
            }
        }
        String actor = c.actor() == null || c.actor().isBlank() ? MONITOR : c.actor();
        append(h, alertId, actor, c.action(), reason, c.note(), c.source() == null ? "configuration" : c.source(),
                until, untilDate, ruleId);
    }

    private static Optional<Long> ruleNamed(String text) {
        if (text == null) {
            return Optional.empty();
        }
        Matcher m = RULE_NAME.matcher(text);
        return m.find() ? Optional.of(Long.parseLong(m.group(1))) : Optional.empty();
    }

    /**
     * Marks the alerts the condition selects (a fixed SQL condition over the alert table; values only as binds)
     * superseded by a run, each with a SUPERSEDED entry naming the run. Already superseded ones are left as they are.
     */
    void supersede(Handle h, String whereAlerts, Map<String, Object> binds, long byRun) {
        var u = h.createUpdate("WITH sup AS (UPDATE " + s + ".alert SET superseded_at = now() WHERE superseded_at IS"
                + " NULL AND (" + whereAlerts + ") RETURNING alert_id) INSERT INTO " + s + ".alert_action (alert_id,"
                + " actor, action, source) SELECT alert_id, :monitor, 'SUPERSEDED', :source FROM sup ORDER BY alert_id");
        binds.forEach(u::bind);
        u.bind("monitor", MONITOR).bind("source", "run " + byRun).execute();
    }

    /** The alert, locked for this transaction, refused when it is unknown or superseded. */
    private AlertView lockedCurrent(Handle h, long alertId, String what) {
        // The row lock orders two people acting on one alert at once: the second waits, then sees the first's entry.
        boolean exists = h.createQuery("SELECT alert_id FROM " + s + ".alert WHERE alert_id = :id FOR UPDATE")
                .bind("id", alertId).mapTo(Long.class).findOne().isPresent();
        if (!exists) {
            throw new ReviewException("Alert " + alertId + " was not " + what + ": there is no alert " + alertId + ".");
        }
        AlertView a = list(h, Filter.ANY, alertId).get(0);
        if (a.state() == AlertState.SUPERSEDED) {
            throw new ReviewException("Alert " + alertId + " was not " + what + ": it was superseded by a later run of"
                    + " wave " + a.wave() + " of " + a.dataset() + "; act on the alert that replaced it.");
        }
        return a;
    }

    private static String actor(String actor) {
        if (actor == null || actor.isBlank()) {
            throw new ReviewException("Every action names the person taking it: no actor was given.");
        }
        return actor.trim();
    }

    private ReviewEntry append(Handle h, long alertId, String actor, ReviewAction action, ReviewReason reason,
                               String note, String source, String untilWave, LocalDate untilDate, Long ruleId) {
        return h.createQuery("INSERT INTO " + s + ".alert_action (alert_id, actor, action, reason, note, source,"
                        + " until_wave, until_date, mute_rule_id) VALUES (:a, :actor, :action, :reason, :note, :source,"
                        + " :uw, :ud, :rule) RETURNING *")
                .bind("a", alertId).bind("actor", actor).bind("action", action.name())
                .bind("reason", reason == null ? null : reason.key())
                .bind("note", note == null || note.isBlank() ? null : note)
                .bind("source", source == null || source.isBlank() ? "command" : source)
                .bind("uw", untilWave).bind("ud", untilDate).bind("rule", ruleId)
                .map((rs, ctx) -> entry(rs))
                .one();
    }

    static ReviewEntry entry(ResultSet rs) throws SQLException {
        String reason = rs.getString("reason");
        return new ReviewEntry(rs.getLong("entry_id"), rs.getLong("alert_id"),
                rs.getObject("acted_at", OffsetDateTime.class).toInstant(), rs.getString("actor"),
                ReviewAction.valueOf(rs.getString("action")),
                reason == null ? null : ReviewReason.parse(reason).orElseThrow(), rs.getString("note"),
                rs.getString("source"), rs.getString("until_wave"), rs.getObject("until_date", LocalDate.class));
    }
}
