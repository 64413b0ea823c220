package org.wavewarden.review;

/** Where an alert stands, as its latest action says. */
public enum AlertState {
    /** Nobody has concluded anything yet. */
    OPEN,
    /** Someone (or an expected change declared in the configuration) gave a reason. */
    EXPLAINED,
    /** Recorded, never delivered, until its mute expires or is lifted. */
    MUTED,
    /** A later run on other data or another configuration replaced it. */
    SUPERSEDED
}
