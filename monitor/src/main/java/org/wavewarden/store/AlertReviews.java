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
        throw new UnsupportedOperationException("to be written");
    }

    public Optional<AlertView> get(long alertId) {
        throw new UnsupportedOperationException("to be written");
    }

    /** The states of the given alerts, in one query. */
    public Map<Long, AlertState> states(Collection<Long> alertIds) {
        throw new UnsupportedOperationException("to be written");
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
