package org.wavewarden.read;

import java.util.Objects;

/**
 * Two numeric columns whose joint values a scan tallies in the same pass ({@link org.wavewarden.profile.JointTally}),
 * for relationship drift.
 *
 * @param x the first column, one of the scanned columns
 * @param y the second column, another of them
 */
public record PairSpec(String x, String y) {

    public PairSpec {
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        if (x.equals(y)) {
            throw new IllegalArgumentException("a pair needs two different columns, got " + x + " twice");
        }
    }

    /** The index of each column of the pair among the scanned columns, checked to be numeric. */
    int[] indexIn(java.util.List<SourceColumn> columns) {
        return new int[] {index(columns, x), index(columns, y)};
    }

    private int index(java.util.List<SourceColumn> columns, String name) {
        for (int i = 0; i < columns.size(); i++) {
            SourceColumn c = columns.get(i);
            if (c.name().equals(name)) {
                if (!c.type().isNumeric()) {
                    throw new IllegalArgumentException("pair " + x + " ~ " + y + ": column " + name + " is "
                            + c.postgresType() + ", not a number");
                }
                return i;
            }
        }
        throw new IllegalArgumentException("pair " + x + " ~ " + y + ": column " + name + " is not scanned");
    }
}
