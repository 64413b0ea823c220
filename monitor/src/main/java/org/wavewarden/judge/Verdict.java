package org.wavewarden.judge;

/**
 * The four outcomes of the verdict rule, most urgent first. The rule separates a change that is detectable
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
    STABLE("shown equivalent within the threshold");

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
