package org.wavewarden.profile;

/**
 * How exactly a column's tally holds its values: {@link #EXACT}, or summarised in relative bins of a level
 * ({@link RelativeBins}), each value then standing within {@link #relativeError()} of the number that represents it.
 *
 * @param level -1 for exact; 0, 1, 2, ... for relative bins whose growth factor is {@code gamma0^(2^level)}
 */
public record Binning(int level) {

    public static final Binning EXACT = new Binning(-1);

    public Binning {
        if (level < -1 || level > 30) {
            throw new IllegalArgumentException("level must be in -1..30, was " + level);
        }
    }

    public boolean isExact() {
        return level < 0;
    }

    /** The largest relative distance between a summarised value and its stand-in; 0 when exact. */
    public double relativeError() {
        return isExact() ? 0 : RelativeBins.relativeError(level);
    }

    /** The coarser of two binnings, the one a pooled tally must use. */
    public Binning coarser(Binning other) {
        return level >= other.level ? this : other;
    }
}
