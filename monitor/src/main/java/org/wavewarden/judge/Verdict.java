package org.wavewarden.judge;

/**
 * The outcomes of the verdict rule, most urgent first, and CLEARED. The rule separates a change that is detectable
 * (significant after false-discovery-rate control) from one that is large enough to matter (beyond the
 * variable's threshold T), and says when the data cannot tell.
 */
public enum Verdict {
    /** Significant and at least T: a real change big enough to matter. */
    MATERIAL("a real change big enough to matter: look now"),
    /** Significant but smaller than T: detectable, not important (large waves make tiny changes significant). */
    MINOR("detectable, but smaller than what matters"),
    /** Not significant, but the interval reaches beyond T: too little data to rule out a change that matters. */
    UNCERTAIN("cannot rule out a change that matters: too little data"),
    /** Not significant and the interval lies inside (-T, T): shown equivalent within T. */
    STABLE("shown equivalent within the threshold"),
    /**
     * A missing rate or a sentinel's share that fell to zero: good news, reported as cleared and never alerted.
     * Not an outcome of the verdict rule but of the direction of the change; last, so it is the least urgent.
     */
    CLEARED("fell to zero: the problem cleared");

    private final String meaning;

    Verdict(String meaning) {
        this.meaning = meaning;
    }

    public String meaning() {
        return meaning;
    }

    /** True when this verdict is at least as urgent as {@code other}. */
    public boolean atLeast(Verdict other) {
        return ordinal() <= other.ordinal();
    }
}
