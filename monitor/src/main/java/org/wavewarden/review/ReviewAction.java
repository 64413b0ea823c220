package org.wavewarden.review;

/** What one entry of an alert's history did. */
public enum ReviewAction {
    /** The alert was raised, open. */
    OPENED(AlertState.OPEN),
    /** A reason was given. */
    EXPLAINED(AlertState.EXPLAINED),
    /** Muted, with an expiry. */
    MUTED(AlertState.MUTED),
    /** A mute was lifted (or expired and was noted); the alert is open again. */
    UNMUTED(AlertState.OPEN),
    /** Opened again after an explanation. */
    REOPENED(AlertState.OPEN),
    /** Replaced by a later run. */
    SUPERSEDED(AlertState.SUPERSEDED);

    private final AlertState leadsTo;

    ReviewAction(AlertState leadsTo) {
        this.leadsTo = leadsTo;
    }

    /** The state the alert is in after this action. */
    public AlertState leadsTo() {
        return leadsTo;
    }
}
