package org.wavewarden.judge;

import java.util.List;

/**
 * Which findings worth a person repeat the previous wave's and so raise no new alert: a data-quality finding of the
 * same kind whose rate is within its interval ("still present"), and a variable still too small to resolve its
 * threshold whose verdict has not changed ("still too few answers to judge").
 */
public final class Repeats {

    private Repeats() {
    }

    /**
     * @param previousWave     the wave compared against, null when there is none or it is pooled
     * @param previousFindings that wave's current findings (empty when none)
     * @param findings         this run's findings
     * @return the findings, repeats marked with {@link Finding#withRepeat}
     */
    public static List<Finding> mark(String previousWave, List<Finding> previousFindings, List<Finding> findings) {
        return findings;
    }
}
