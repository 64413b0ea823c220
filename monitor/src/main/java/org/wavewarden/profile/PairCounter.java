package org.wavewarden.profile;

import java.util.Arrays;

/**
 * Counts pairs of numbers as they stream past, for a {@link JointTally}: an open-addressing table keyed by the two
 * doubles' bits, with no object per row.
 *
 * <p>Bounded: up to {@code maxPairs} distinct pairs are counted exactly. The pair that would exceed that moves the
 * whole table to {@link RelativeBins} stand-ins at level {@value #FIRST_SUMMARY_LEVEL} (0.2% of the value); while
 * the table is still over budget the level is raised by one, which merges neighbouring bins, and every later pair is
 * binned at the current level. Code-like numbers ({@link RelativeBins#isCodeLike}) stay exact, so a missing-value
 * code keeps its own entries. Binning at a level is a function of the value alone and binning a stand-in again at a
 * coarser level gives the value's own bin there ({@link RelativeBins#binnedValue}), so the final level is the
 * smallest at or above the first that holds all the data within budget, and the tally does not depend on the order
 * the rows arrive in. If code-like pairs alone exceed the budget at the coarsest level, the table keeps them: they
 * are at most a few hundred values a column.
 */
public final class PairCounter {

    /** Distinct pairs counted exactly before the table is summarised. */
    public static final int DEFAULT_MAX_PAIRS = 20_000;

    /**
     * The level a table is first summarised at: 0.2% of the value (level 0 is 0.05%). Two values of a pair make the
     * table grow as the product of their distinct values, so one step coarser than a column's summary would leave
     * it over budget again at once.
     */
    public static final int FIRST_SUMMARY_LEVEL = 2;

    private static final int COARSEST_LEVEL = 30;

    private final int maxPairs;
    private int level = -1;
    private ValueIndex pairs = ValueIndex.ofPairs(); // (x bits, y bits) numbered; each pair's count in counts
    private long[] counts = new long[64];

    /** @param maxPairs distinct pairs counted exactly, at least 1 */
    public PairCounter(int maxPairs) {
        if (maxPairs < 1) {
            throw new IllegalArgumentException("maxPairs must be positive, was " + maxPairs);
        }
        this.maxPairs = maxPairs;
    }

    public PairCounter() {
        this(DEFAULT_MAX_PAIRS);
    }

    /** Counts one row with values x and y, both finite. */
    public void add(double x, double y) {
        add(x, y, 1);
    }

    /**
     * Counts {@code count} rows with values x and y.
     *
     * @throws IllegalArgumentException on a value that is not finite or a count that is not positive
     */
    public void add(double x, double y, long count) {
        if (!Double.isFinite(x) || !Double.isFinite(y)) {
            throw new IllegalArgumentException("pairs of finite numbers only, got " + x + " and " + y);
        }
        if (count <= 0) {
            throw new IllegalArgumentException("count must be positive, was " + count);
        }
        if (level >= 0) {
            x = RelativeBins.binnedValue(x, level);
            y = RelativeBins.binnedValue(y, level);
        }
        put(x, y, count);
        while (pairs.size() > maxPairs && level < COARSEST_LEVEL) {
            rebuild(Math.max(FIRST_SUMMARY_LEVEL, level + 1));
        }
    }

    /**
     * Starts summarised at {@code atLeast} (ignored when exact or finer than the current level): a pooled tally is
     * summarised at the coarser level of its parts.
     */
    public void summariseAtLeast(Binning atLeast) {
        if (!atLeast.isExact() && atLeast.level() > level) {
            rebuild(atLeast.level());
        }
    }

    public Binning binning() {
        return new Binning(level);
    }

    /** Distinct pairs held now. */
    public int size() {
        return pairs.size();
    }

    /** The tally, its entries sorted by x, then y. */
    public JointTally tally(String x, String y) {
        int size = pairs.size();
        Integer[] order = new Integer[size];
        for (int i = 0; i < size; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (a, b) -> {
            int c = Double.compare(Double.longBitsToDouble(pairs.first(a)), Double.longBitsToDouble(pairs.first(b)));
            return c != 0 ? c
                    : Double.compare(Double.longBitsToDouble(pairs.second(a)), Double.longBitsToDouble(pairs.second(b)));
        });
        double[] xs = new double[size];
        double[] ys = new double[size];
        long[] n = new long[size];
        for (int i = 0; i < size; i++) {
            xs[i] = Double.longBitsToDouble(pairs.first(order[i]));
            ys[i] = Double.longBitsToDouble(pairs.second(order[i]));
            n[i] = counts[order[i]];
        }
        return new JointTally(x, y, xs, ys, n, binning());
    }

    private void put(double x, double y, long count) {
        long kx = Double.doubleToLongBits(x == 0 ? 0.0 : x); // -0 and 0 are one answer
        long ky = Double.doubleToLongBits(y == 0 ? 0.0 : y);
        int e = pairs.add(kx, ky);
        if (e == counts.length) {
            counts = Arrays.copyOf(counts, ValueIndex.capacityFor(e, counts.length));
        }
        counts[e] += count;
    }

    /** Re-bins every entry at {@code newLevel}; entries that meet in one bin merge. */
    private void rebuild(int newLevel) {
        level = newLevel;
        ValueIndex old = pairs;
        long[] oc = counts;
        pairs = ValueIndex.ofPairs();
        counts = new long[Math.max(64, old.size())];
        for (int e = 0; e < old.size(); e++) {
            double x = RelativeBins.binnedValue(Double.longBitsToDouble(old.first(e)), level);
            double y = RelativeBins.binnedValue(Double.longBitsToDouble(old.second(e)), level);
            put(x, y, oc[e]);
        }
    }
}
