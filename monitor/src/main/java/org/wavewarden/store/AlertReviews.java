package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;
import org.wavewarden.config.MuteRule;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewEntry;
import org.wavewarden.review.ReviewReason;

import java.time.LocalDate;
import java.util.Collection;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The lifecycle of alerts in the results schema: every alert's history of actions, append-only (the table refuses
 * UPDATE and DELETE), its state read from its latest action, and the mute rules stored by commands.
 */
public final class AlertReviews {

    /** The actor of entries the monitor writes itself (creation, supersession). */
    public static final String MONITOR = "wavewarden";

    private final Jdbi jdbi;
    private final String s;

    public AlertReviews(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
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

    /** The alerts the filter matches, oldest first. */
    public List<AlertView> list(Filter filter) {
        // Until alert histories exist, an alert's state is read from its row alone: superseded or open.
        return jdbi.withHandle(h -> h.createQuery("SELECT alert_id, run_id, dataset, wave, against_wave, variable, kind,"
                        + " verdict, sentence, facet_kinds, created_at, superseded_at FROM " + s + ".alert WHERE"
                        + " (CAST(:d AS text) IS NULL OR dataset = :d) AND (CAST(:w AS text) IS NULL OR wave = :w)"
                        + " AND (CAST(:v AS text) IS NULL OR verdict = :v) AND (CAST(:k AS text) IS NULL OR kind = :k"
                        + " OR :k = ANY (facet_kinds)) AND (CAST(:st AS text) IS NULL OR (CASE WHEN superseded_at IS"
                        + " NULL THEN 'OPEN' ELSE 'SUPERSEDED' END) = :st) ORDER BY alert_id")
                .bind("d", filter.dataset()).bind("w", filter.wave()).bind("v", filter.verdict())
                .bind("k", filter.kind()).bind("st", filter.state() == null ? null : filter.state().name())
                .map((rs, ctx) -> new AlertView(rs.getLong("alert_id"), rs.getLong("run_id"), rs.getString("dataset"),
                        rs.getString("wave"), rs.getString("against_wave"), rs.getString("variable"),
                        rs.getString("kind"), rs.getString("verdict"), rs.getString("sentence"),
                        List.of((String[]) rs.getArray("facet_kinds").getArray()),
                        rs.getObject("created_at", java.time.OffsetDateTime.class).toInstant(),
                        rs.getObject("superseded_at") == null ? AlertState.OPEN : AlertState.SUPERSEDED, null))
                .list());
    }

    public Optional<AlertView> get(long alertId) {
        return list(Filter.ANY).stream().filter(a -> a.alertId() == alertId).findFirst();
    }

    /** The states of the given alerts, in one query. */
    public Map<Long, AlertState> states(Collection<Long> alertIds) {
        return jdbi.withHandle(h -> h.createQuery("SELECT alert_id, superseded_at IS NULL FROM " + s + ".alert WHERE"
                        + " alert_id = ANY (CAST(:ids AS bigint[]))")
                .bind("ids", alertIds.toArray(Long[]::new))
                .reduceRows(new java.util.HashMap<Long, AlertState>(), (m, row) -> {
                    m.put(row.getColumn(1, Long.class), row.getColumn(2, Boolean.class) ? AlertState.OPEN
                            : AlertState.SUPERSEDED);
                    return m;
                }));
    }

    /** Every entry of an alert's history, oldest first. */
    public List<ReviewEntry> history(long alertId) {
        throw new UnsupportedOperationException("to be written");
    }

    /** Explains an open or muted alert; refused (ReviewException) for a superseded or unknown one. */
    public ReviewEntry explain(long alertId, String actor, ReviewReason reason, String note, String source) {
        throw new UnsupportedOperationException("to be written");
    }

    /**
     * Mutes an alert until a wave or a day (at least one), and stores a mute rule for its dataset, variable and
     * kind with the same expiry, so the same alert of a later wave is muted when it is created.
     */
    public ReviewEntry mute(long alertId, String actor, String untilWave, LocalDate untilDate, ReviewReason reason,
                            String note, String source) {
        throw new UnsupportedOperationException("to be written");
    }

    /** Lifts a mute: the alert is open again and the mute rule stored with it ends. */
    public ReviewEntry unmute(long alertId, String actor, String note, String source) {
        throw new UnsupportedOperationException("to be written");
    }

    /** The mute rules stored by commands for a dataset that have not been lifted and have not expired by date. */
    public List<MuteRule> activeMutes(String dataset, LocalDate today) {
        return List.of();
    }
}
