package org.wavewarden.review;

/**
 * What a person may do to alerts and waves. The roles are nested: a steward may do all a viewer may, a releaser all
 * a steward may, because whoever signs a release off must also be able to record why an alert does not stop it.
 */
public enum Role {
    /** Reads everything, changes nothing. */
    VIEWER,
    /** Explains, mutes and unmutes alerts. */
    STEWARD,
    /** Signs waves off, besides all a steward does. */
    RELEASER;

    /** Whether this role includes {@code needed}. */
    public boolean includes(Role needed) {
        return ordinal() >= needed.ordinal();
    }

    /** The key used in the configuration and on pages: {@code viewer}, {@code steward}, {@code releaser}. */
    public String key() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }
}
