package org.wavewarden.store;

import org.jdbi.v3.core.Jdbi;
import org.wavewarden.config.Identifiers;
import org.wavewarden.review.SignOff;

import java.util.List;
import java.util.Optional;

/**
 * Wave sign-offs in the results schema, append-only: who released which wave (and release), on which run, under
 * which configuration and tool version, with the wave's alerts and their states at that moment.
 */
public final class SignOffs {

    private final Jdbi jdbi;
    private final String s;

    public SignOffs(Jdbi jdbi, String schema) {
        this.jdbi = jdbi;
        this.s = Identifiers.quote(schema);
    }

    /**
     * @param release     the release (revision) signed; '' for a dataset without releases
     * @param force       sign although a MATERIAL alert of the wave is open
     * @param forceReason required when forcing
     */
    public record Request(String dataset, String wave, String release, String actor, boolean force,
                          String forceReason) {
    }

    /**
     * Signs a wave off on its current run. Refused with a {@link org.wavewarden.review.ReviewException} naming the
     * blocking alerts while a MATERIAL alert of the wave is open, unless forced with a reason (which is recorded);
     * refused when the wave has no current run.
     */
    public SignOff signOff(Request request) {
        throw new UnsupportedOperationException("to be written");
    }

    /** The latest sign-off of a wave. */
    public Optional<SignOff> latest(String dataset, String wave) {
        return Optional.empty();
    }

    /** Every sign-off of a dataset's waves (null: every dataset), oldest first. */
    public List<SignOff> all(String dataset) {
        throw new UnsupportedOperationException("to be written");
    }
}
