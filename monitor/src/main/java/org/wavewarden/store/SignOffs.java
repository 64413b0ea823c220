package org.wavewarden.store;

import org.jdbi.v3.core.Handle;
import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;
import org.wavewarden.deliver.Json;
import org.wavewarden.review.AlertState;
import org.wavewarden.review.AlertView;
import org.wavewarden.review.ReviewException;
import org.wavewarden.review.SignOff;
import org.wavewarden.review.SignOffRule;

import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.Clock;
import java.time.OffsetDateTime;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Wave sign-offs in the results schema, append-only: who released which wave (and release), on which run, under
 * which configuration and tool version, with the wave's alerts and their states at that moment.
 */
public final class SignOffs {

    private final Jdbi jdbi;
    private final String s;
    private final AlertReviews reviews;

    public SignOffs(Jdbi jdbi, String schema) {
        this(jdbi, schema, Clock.systemUTC());
    }

    /** With the clock whose UTC day decides whether a mute by date still holds when the wave is signed off. */
    public SignOffs(Jdbi jdbi, String schema, Clock clock) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
        this.reviews = new AlertReviews(jdbi, schema, clock);
    }

    /**
     * @param release     the release (revision) signed; '' for a dataset without releases
     * @param force       sign although a MATERIAL alert of the wave is open
     * @param forceReason required when forcing
     * @param source      where the sign-off came from: {@code command} or {@code console}
     * @param shownRun    the run the person was shown (the console's wave page), or null: a sign-off is refused
     *                    when the wave has been judged again since, so nobody signs numbers they have not seen
     */
    public record Request(String dataset, String wave, String release, String actor, boolean force,
                          String forceReason, String source, Long shownRun) {
        public Request {
            source = source == null || source.isBlank() ? "command" : source;
        }

        /** A sign-off from the command line, on whatever run is current. */
        public Request(String dataset, String wave, String release, String actor, boolean force, String forceReason) {
            this(dataset, wave, release, actor, force, forceReason, "command", null);
        }
    }

    /**
     * Signs a wave off on its current run. Refused with a {@link org.wavewarden.review.ReviewException} naming the
     * blocking alerts while a MATERIAL alert of the wave is open, unless forced with a reason (which is recorded);
     * refused when the wave has no current run.
     */
    public SignOff signOff(Request request) {
        if (request.actor() == null || request.actor().isBlank()) {
            throw new ReviewException("A sign-off names the person releasing the wave: no actor was given.");
        }
        if (request.force() && (request.forceReason() == null || request.forceReason().isBlank())) {
            throw new ReviewException("Wave " + request.wave() + " of " + request.dataset() + " was not signed off:"
                    + " forcing a sign-off needs a reason, which is recorded with it.");
        }
        return jdbi.inTransaction(h -> {
            Map<String, Object> run = h.createQuery("SELECT run_id, config_fingerprint, tool_version FROM " + s
                            + ".run WHERE dataset = :d AND wave = :w AND superseded_at IS NULL ORDER BY finished_at DESC"
                            + " LIMIT 1 FOR SHARE")
                    .bind("d", request.dataset()).bind("w", request.wave()).mapToMap().findOne()
                    .orElseThrow(() -> new ReviewException("Wave " + request.wave() + " of " + request.dataset()
                            + " was not signed off: it has not been judged (there is no current run to sign on)."));
            long currentRun = ((Number) run.get("run_id")).longValue();
            if (request.shownRun() != null && request.shownRun() != currentRun) {
                throw new ReviewException("Wave " + request.wave() + " of " + request.dataset() + " was not signed off:"
                        + " it has been judged again since the page was shown (run " + currentRun + ", not run "
                        + request.shownRun() + "); look at the new numbers before signing.");
            }
            // The wave's alerts are held while the decision is taken, so an action on one of them waits for the
            // sign-off, and the states recorded are the states the decision was taken on.
            h.createQuery("SELECT alert_id FROM " + s + ".alert WHERE dataset = :d AND wave = :w AND superseded_at IS"
                            + " NULL FOR SHARE")
                    .bind("d", request.dataset()).bind("w", request.wave()).mapTo(Long.class).list();
            List<AlertView> current = reviews.list(h, new AlertReviews.Filter(request.dataset(), request.wave(), null,
                    null, null), null).stream().filter(a -> a.state() != AlertState.SUPERSEDED).toList();
            List<AlertView> blocking = SignOffRule.blocking(current);
            if (!blocking.isEmpty() && !request.force()) {
                throw new ReviewException(SignOffRule.refusal(request.dataset(), request.wave(), blocking));
            }
            // A forced sign-off with nothing blocking is recorded as what it is: not forced.
            boolean forced = request.force() && !blocking.isEmpty();
            return h.createQuery("INSERT INTO " + s + ".sign_off (dataset, wave, release, actor, run_id,"
                            + " config_fingerprint, tool_version, forced, force_reason, alerts, source) VALUES (:d, :w,"
                            + " :release, :actor, :run, :fingerprint, :tool, :forced, :reason, CAST(:alerts AS jsonb),"
                            + " :source) RETURNING *,"
                            + " alerts::text AS alerts_text")
                    .bind("d", request.dataset()).bind("w", request.wave())
                    .bind("release", request.release() == null ? "" : request.release().trim())
                    .bind("actor", request.actor().trim()).bind("run", ((Number) run.get("run_id")).longValue())
                    .bind("fingerprint", (String) run.get("config_fingerprint"))
                    .bind("tool", (String) run.get("tool_version")).bind("forced", forced)
                    .bind("reason", forced ? request.forceReason().trim() : null)
                    .bind("alerts", Json.write(current)).bind("source", request.source())
                    .map((rs, ctx) -> signOff(rs))
                    .one();
        });
    }

    /** The latest sign-off of a wave. */
    public Optional<SignOff> latest(String dataset, String wave) {
        return jdbi.withHandle(h -> h.createQuery("SELECT *, alerts::text AS alerts_text FROM " + s + ".sign_off"
                        + " WHERE dataset = :d AND wave = :w ORDER BY sign_off_id DESC LIMIT 1")
                .bind("d", dataset).bind("w", wave)
                .map((rs, ctx) -> signOff(rs))
                .findOne());
    }

    /** Every sign-off of a dataset's waves (null: every dataset), oldest first. */
    public List<SignOff> all(String dataset) {
        return jdbi.withHandle(h -> h.createQuery("SELECT *, alerts::text AS alerts_text FROM " + s + ".sign_off"
                        + " WHERE CAST(:d AS text) IS NULL OR dataset = :d ORDER BY sign_off_id")
                .bind("d", dataset)
                .map((rs, ctx) -> signOff(rs))
                .list());
    }

    static SignOff signOff(ResultSet rs) throws SQLException {
        return new SignOff(rs.getLong("sign_off_id"), rs.getString("dataset"), rs.getString("wave"),
                rs.getString("release"), rs.getString("actor"),
                rs.getObject("signed_at", OffsetDateTime.class).toInstant(), rs.getLong("run_id"),
                rs.getString("config_fingerprint"), rs.getString("tool_version"), rs.getBoolean("forced"),
                rs.getString("force_reason"), List.of(Json.read(rs.getString("alerts_text"), AlertView[].class)),
                rs.getString("source"));
    }
}
