package org.wavewarden.profile;

import java.util.Arrays;
import java.util.Objects;

/**
 * How often each pair of values of two numeric columns occurs together in one wave: the joint frequency table a
 * correlation is computed from ({@link org.wavewarden.compare.relation.Correlation}), over the rows where both cells
 * hold a finite number (SQL NULL, NaN and infinities in either cell leave the row out).
 *
 * <p>Entries are sorted by x, then y, and each pair occurs once, so equal data give equal tallies whatever order the
 * rows came in. With more distinct pairs than the reader keeps exactly ({@link PairCounter}), both coordinates are
 * replaced by their {@link RelativeBins} stand-ins at {@code binning}'s level (code-like numbers such as -9 or 999
 * stay exact): each value then stands within {@link Binning#relativeError()} of the number it replaces.
 *
 * @param x       the first column
 * @param y       the second column
 * @param xs      the first column's value of each entry
 * @param ys      the second column's value of each entry
 * @param counts  rows with that pair of values, each positive
 * @param binning {@link Binning#EXACT}, or the level both coordinates were summarised at; null reads as exact
 */
public record JointTally(String x, String y, double[] xs, double[] ys, long[] counts, Binning binning) {

    public JointTally {
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        xs = xs == null ? new double[0] : xs.clone();
        ys = ys == null ? new double[0] : ys.clone();
        counts = counts == null ? new long[0] : counts.clone();
        if (xs.length != ys.length || xs.length != counts.length) {
            throw new IllegalArgumentException("xs, ys and counts must have equal lengths, have " + xs.length + ", "
                    + ys.length + " and " + counts.length);
        }
        binning = binning == null ? Binning.EXACT : binning;
    }

    @Override
    public double[] xs() {
        return xs.clone();
    }

    @Override
    public double[] ys() {
        return ys.clone();
    }

    @Override
    public long[] counts() {
        return counts.clone();
    }

    /** Rows in the tally: both cells finite numbers. */
    public long pairCount() {
        long n = 0;
        for (long c : counts) {
            n += c;
        }
        return n;
    }

    /** Distinct pairs of values held. */
    public int entries() {
        return counts.length;
    }

    /** True when this is the tally of the columns {@code x} and {@code y}, in that order. */
    public boolean of(String x, String y) {
        return this.x.equals(x) && this.y.equals(y);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof JointTally t && x.equals(t.x) && y.equals(t.y) && binning.equals(t.binning)
                && Arrays.equals(xs, t.xs) && Arrays.equals(ys, t.ys) && Arrays.equals(counts, t.counts);
    }

    @Override
    public int hashCode() {
        return Objects.hash(x, y, binning, Arrays.hashCode(xs), Arrays.hashCode(ys), Arrays.hashCode(counts));
    }

    @Override
    public String toString() {
        return "JointTally[" + x + " ~ " + y + ", " + counts.length + " entries, " + pairCount() + " rows"
                + (binning.isExact() ? "" : ", bins level " + binning.level()) + "]";
    }
}
