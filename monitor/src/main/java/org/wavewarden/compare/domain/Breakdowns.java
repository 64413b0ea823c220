package org.wavewarden.compare.domain;

import org.wavewarden.profile.WaveProfile;

import java.util.Optional;

/** Breaks one variable's change down by the domains of one column: pure functions of two waves' summaries. */
public final class Breakdowns {

    private Breakdowns() {
    }

    /**
     * The breakdown of {@code measure} by {@code column} between two waves' summaries, weighted when
     * {@code weighted} and both summaries hold the variable's weights, design-based when both also hold a design.
     * Empty when either summary lacks the column's domain tallies or fewer than two domains have answers in both
     * waves. {@code qValue} of the result is null (the judge adjusts across the run).
     *
     * @param confidence the confidence of the intervals, 1 - alpha
     */
    public static Optional<Breakdown> of(String column, DomainMeasure measure, WaveProfile baseline,
                                         WaveProfile current, boolean weighted, double confidence) {
        throw new UnsupportedOperationException("skeleton: domain statistics owner implements");
    }
}
