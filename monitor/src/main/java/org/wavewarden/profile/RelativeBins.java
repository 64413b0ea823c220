package org.wavewarden.profile;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;

/**
 * A bounded summary of the numbers of one column, for a column with more distinct values than the reader keeps
 * exactly: every value goes to a bin on a logarithmic scale, so each bin's stand-in is within a fixed relative
 * distance of every value in it, whatever the spread of the data.
 *
 * <p>Bin {@code i} of level {@code L} holds the positive values in {@code (g^(i-1), g^i]} with
 * {@code g = g0^(2^L)}, {@code g0 = (1 + a0) / (1 - a0)}; its stand-in {@code 2 g^i / (g + 1)} is within
 * {@code (g - 1) / (g + 1)} of each of them, relative to the value (the relative-error sketch of Masson, Rim and Lee
 * 2019, "DDSketch: a fast and fully-mergeable quantile sketch with relative-error guarantees", PVLDB 12(12)).
 * Negative values are binned by their magnitude. When the bins exceed their budget, neighbouring pairs merge into
 * the bins of the next level, which doubles {@code ln g}: the error bound roughly doubles and is reported, never
 * exceeded. A bin that holds one distinct value keeps that value exactly, and so do zero, non-finite values and
 * code-like numbers ({@link #isCodeLike}), so a missing-value code such as {@code -9} or {@code 999} keeps its exact
 * count. The result does not depend on the order values arrive in: a bin's level is the smallest within budget for
 * all the data, and counts, sums, minimum and maximum are order-free.
 */
public final class RelativeBins {

    /** Relative error of level 0: 0.05% of the value. */
    public static final double BASE_RELATIVE_ERROR = 0.0005;

    /** Bins kept before neighbours merge; about 1,700 span a factor of 5 at level 0. */
    public static final int DEFAULT_MAX_BINS = 4096;

    private static final int[] NO_WINDOW = new int[0];
    private static final int WINDOW_PER_BIN = 4;

    /** Significant digits a stand-in is printed with; the rounding adds at most half a unit in the last place. */
    private static final int DIGITS = 7;
    private static final double ROUNDING = 5e-7;
    private static final MathContext PRINT = new MathContext(DIGITS);
    private static final double LN_GAMMA0 = Math.log((1 + BASE_RELATIVE_ERROR) / (1 - BASE_RELATIVE_ERROR));

    private final int maxBins;
    private final boolean singlePrecision;
    private int level;
    private ValueIndex bins = ValueIndex.ofLongs(); // bin keys numbered; each bin's sums in the arrays below
    // The entries of the keys in a window of neighbouring keys, looked up by position: slot[key - lowKey] is the
    // bin's entry plus one (0: not looked up here yet). A value's bin lies near the others', so nearly every key
    // falls in the window, and one array load replaces a hash probe, which for a whole wave's thousands of bins and
    // a scan's thousands of domain summaries missed the cache. The hash index still numbers the bins, so the
    // entries, and everything read from them, are the same as without the window. At most WINDOW_PER_BIN keys per
    // bin of the budget (4 bytes each); a key beyond that span is looked up in the hash index alone.
    private int[] window = NO_WINDOW;
    private long lowKey;
    // Small to start with and grown as bins appear: a scan with breakdowns holds one summary per domain and column.
    private long[] counts = new long[8];
    private double[] min = new double[8];
    private double[] max = new double[8];
    private double[] wsum; // null while every weight sum added was zero (no weights): read as zeros
    private double[] wsq;
    private final Map<Double, double[]> exact = new HashMap<>(); // {count, sum w, sum w^2}

    /**
     * @param maxBins         bins kept before neighbours merge
     * @param level           the level to start at (a pooled summary starts at the coarser of its parts)
     * @param singlePrecision the column is {@code real}: exact values print as the float they are
     */
    public RelativeBins(int maxBins, int level, boolean singlePrecision) {
        if (maxBins < 16) {
            throw new IllegalArgumentException("maxBins must be at least 16, was " + maxBins);
        }
        this.maxBins = maxBins;
        this.level = new Binning(Math.max(0, level)).level();
        this.singlePrecision = singlePrecision;
    }

    public RelativeBins() {
        this(DEFAULT_MAX_BINS, 0, false);
    }

    /** The error bound of a level: {@code (g - 1) / (g + 1)} plus the rounding of the printed stand-in. */
    static double relativeError(int level) {
        double g = Math.exp(LN_GAMMA0 * Math.pow(2, level));
        return (g - 1) / (g + 1) + ROUNDING;
    }

    /**
     * Numbers that survey codebooks use for "no answer" and that must keep their exact counts: zero, the negative
     * integers from -1 to -99, and integers whose digits are all one digit (7, 88, 999, 9999, -999; common practice
     * in survey codebooks, no single source).
     */
    public static boolean isCodeLike(double x) {
        if (x == 0) {
            return true;
        }
        if (x != Math.rint(x) || Math.abs(x) >= 1e7) {
            return false;
        }
        long a = Math.abs((long) x);
        if (x < 0 && a <= 99) {
            return true;
        }
        long digit = a % 10;
        while (a > 0) {
            if (a % 10 != digit) {
                return false;
            }
            a /= 10;
        }
        return true;
    }

    /** Adds one value; {@code w} is its weight, NaN for none. */
    public void add(double x, double w) {
        boolean weighted = !Double.isNaN(w);
        add(x, 1, weighted ? w : 0, weighted ? w * w : 0);
    }

    /** Adds {@code count} copies of a value with the given sums of weights and squared weights. */
    public void add(double x, long count, double sumW, double sumW2) {
        if (count <= 0) {
            throw new IllegalArgumentException("count must be positive, was " + count);
        }
        if (!Double.isFinite(x) || isCodeLike(x)) {
            addExact(x, count, sumW, sumW2);
            return;
        }
        addBinned(x, key(x, 0), count, sumW, sumW2);
    }

    /**
     * The bin key of a value at level 0 ({@link #key}), or {@link #EXACT} for a value kept exactly (zero, not finite,
     * code-like): worked out once per cell by a caller that adds the same value to several summaries (a whole wave's
     * and its domains'), which then add it with {@link #add(double, long, double)} without a logarithm each.
     */
    public static long fineKey(double x) {
        return !Double.isFinite(x) || isCodeLike(x) ? EXACT : key(x, 0);
    }

    /** What {@link #fineKey} gives for a value kept exactly; no level-0 key is this small. */
    public static final long EXACT = Long.MIN_VALUE;

    /** Adds one value whose {@link #fineKey} is {@code fineKey}; {@code w} is its weight, NaN for none. */
    public void add(double x, long fineKey, double w) {
        boolean weighted = !Double.isNaN(w);
        double sumW = weighted ? w : 0;
        double sumW2 = weighted ? w * w : 0;
        if (fineKey == EXACT) {
            addExact(x, 1, sumW, sumW2);
        } else {
            addBinned(x, fineKey, 1, sumW, sumW2);
        }
    }

    private void addExact(double x, long count, double sumW, double sumW2) {
        double[] cell = exact.computeIfAbsent(x == 0 ? 0.0 : x, k -> new double[3]);
        cell[0] += count;
        cell[1] += sumW;
        cell[2] += sumW2;
    }

    private void addBinned(double x, long fineKey, long count, double sumW, double sumW2) {
        put(coarser(fineKey, level), x, x, count, sumW, sumW2);
        while (bins.size() > maxBins) {
            coarsen();
        }
    }

    /** A level-0 bin key moved up {@code levels} levels: ceil(i / 2^levels), as {@link #key} computes it. */
    private static long coarser(long fineKey, int levels) {
        // ceil(i / 2^levels) = -floor(-i / 2^levels), the floor by an arithmetic shift: no division per value
        long i = -((-(fineKey >> 1)) >> levels);
        return (i << 1) | (fineKey & 1);
    }

    /** Adds to a bin; a new bin starts from these sums. */
    private void put(long key, double lo, double hi, long count, double sumW, double sumW2) {
        int before = bins.size();
        int e = entry(key);
        boolean fresh = e == before;
        if (fresh) {
            if (e == counts.length) {
                // Never past the budget's one bin over, which coarsens at once: doubling beyond it would be waste.
                int n = Math.min(ValueIndex.capacityFor(e, counts.length), Math.max(maxBins + 1, e + 1));
                counts = Arrays.copyOf(counts, n);
                min = Arrays.copyOf(min, n);
                max = Arrays.copyOf(max, n);
                if (wsum != null) {
                    wsum = Arrays.copyOf(wsum, n);
                    wsq = Arrays.copyOf(wsq, n);
                }
            }
            counts[e] = count;
            min[e] = lo;
            max[e] = hi;
        } else {
            counts[e] += count;
            min[e] = Math.min(min[e], lo);
            max[e] = Math.max(max[e], hi);
        }
        // Sums stay unallocated while every one is +0.0, which is what the zeros of a new array hold; any other
        // value (even -0.0) makes them real, so the sums are bit for bit what they would be with arrays throughout.
        if (wsum == null && (Double.doubleToRawLongBits(sumW) != 0 || Double.doubleToRawLongBits(sumW2) != 0)) {
            wsum = new double[counts.length];
            wsq = new double[counts.length];
        }
        if (wsum != null) {
            if (fresh) {
                wsum[e] = sumW;
                wsq[e] = sumW2;
            } else {
                wsum[e] += sumW;
                wsq[e] += sumW2;
            }
        }
    }

    /** The entry of a bin key, numbered by the hash index when new; the window is looked at first. */
    private int entry(long key) {
        long off = key - lowKey;
        if (off >= 0 && off < window.length) {
            int s = window[(int) off];
            if (s != 0) {
                return s - 1;
            }
            int e = bins.add(key);
            window[(int) off] = e + 1;
            return e;
        }
        int e = bins.add(key);
        widen(key, e);
        return e;
    }

    /**
     * Moves the window to take in {@code key} (entry e) as well as the keys it holds, with room to spare on the side
     * it grew, unless the span would exceed the window's limit; then the window stays as it is.
     */
    private void widen(long key, int e) {
        int limit = WINDOW_PER_BIN * maxBins;
        long low = window.length == 0 ? key : Math.min(lowKey, key);
        long high = window.length == 0 ? key : Math.max(lowKey + window.length - 1, key);
        long span = high - low + 1;
        if (span > limit) {
            return;
        }
        int n = (int) Math.min(limit, Math.max(16, Math.max(span, 2L * window.length)));
        long newLow = key < lowKey || window.length == 0 ? high - n + 1 : low;
        int[] w = new int[n];
        if (window.length > 0) {
            System.arraycopy(window, 0, w, (int) (lowKey - newLow), window.length);
        }
        window = w;
        lowKey = newLow;
        window[(int) (key - newLow)] = e + 1;
    }

    /** The bin of a nonzero finite value at a level: its index on the log scale, doubled, plus 1 when negative. */
    static long key(double x, int level) {
        long i0 = (long) Math.ceil(Math.log(Math.abs(x)) / LN_GAMMA0);
        // ceil(i0 / 2^level): ceil(ceil(a) / 2) = ceil(a / 2)
        return coarser((i0 << 1) | (x < 0 ? 1 : 0), level);
    }

    /** Moves every bin one level coarser: neighbouring pairs of bins merge. */
    private void coarsen() {
        ValueIndex old = bins;
        long[] oc = counts;
        double[] omin = min;
        double[] omax = max;
        double[] ow = wsum;
        double[] ow2 = wsq;
        int n = old.size();
        bins = ValueIndex.ofLongs();
        counts = new long[n];
        min = new double[n];
        max = new double[n];
        wsum = null;
        wsq = null;
        window = NO_WINDOW; // the keys change with the level
        level++;
        for (int e = 0; e < n; e++) {
            put(coarser(old.first(e), 1), omin[e], omax[e], oc[e], ow == null ? 0 : ow[e], ow2 == null ? 0 : ow2[e]);
        }
    }

    public Binning binning() {
        return new Binning(level);
    }

    /** Distinct entries the summary yields: bins plus exact values. */
    public int size() {
        return bins.size() + exact.size();
    }

    /** Each bin's stand-in (or its one exact value) and each exact value, as text, with its count. */
    public Map<String, Long> counts() {
        Map<String, Long> out = new HashMap<>(size() * 2);
        forEach((text, c, w, w2) -> out.merge(text, c, Long::sum));
        return out;
    }

    /** The same entries as {@link #counts()} with {@code {sum of weights, sum of squared weights}}. */
    public Map<String, double[]> weights() {
        Map<String, double[]> out = new HashMap<>(size() * 2);
        forEach((text, c, w, w2) -> {
            double[] cell = out.computeIfAbsent(text, k -> new double[2]);
            cell[0] += w;
            cell[1] += w2;
        });
        return out;
    }

    /** One entry of the summary. */
    @FunctionalInterface
    public interface Entry {
        void accept(String text, long count, double sumW, double sumW2);
    }

    public void forEach(Entry e) {
        for (int j = 0; j < bins.size(); j++) {
            String text = min[j] == max[j] ? exactText(min[j]) : standIn(bins.first(j), level);
            e.accept(text, counts[j], wsum == null ? 0 : wsum[j], wsq == null ? 0 : wsq[j]);
        }
        exact.forEach((x, cell) -> e.accept(exactText(x), (long) cell[0], cell[1], cell[2]));
    }

    /**
     * The number a value stands for at a level, unprinted: the bin's stand-in {@code 2 g^i / (g + 1)}, or the value
     * itself when it is zero, not finite or code-like ({@link #isCodeLike}). The stand-in lies in the middle of its
     * own bin on the log scale, so binning it again at the same level gives it back and binning it at a coarser
     * level gives what binning the value there gives: summaries re-binned step by step do not depend on the order
     * of the steps. A stand-in beyond the largest double is clamped to it.
     */
    public static double binnedValue(double x, int level) {
        if (!Double.isFinite(x) || isCodeLike(x)) {
            return x == 0 ? 0.0 : x;
        }
        int l = new Binning(level).level();
        if (l < 0) {
            return x;
        }
        long key = key(x, l);
        double lnG = LN_GAMMA0 * Math.pow(2, l);
        // 2 g^i / (g + 1) = exp((i - 1) ln g + ln 2 - ln(1 + 1/g)), one exp that cannot overflow on the way
        double v = Math.exp(((key >> 1) - 1) * lnG + Math.log(2) - Math.log1p(Math.exp(-lnG)));
        v = Double.isInfinite(v) ? Double.MAX_VALUE : v == 0 ? Double.MIN_VALUE : v;
        return (key & 1) == 1 ? -v : v;
    }

    /** The printed stand-in of a bin: {@code 2 g^i / (g + 1)}, signed, to {@value #DIGITS} significant digits. */
    static String standIn(long key, int level) {
        double lnG = LN_GAMMA0 * Math.pow(2, level);
        double g = Math.exp(lnG);
        double v = 2 * Math.exp((key >> 1) * lnG) / (g + 1);
        String s = new BigDecimal(v).round(PRINT).stripTrailingZeros().toPlainString();
        return (key & 1) == 1 ? "-" + s : s;
    }

    private String exactText(double x) {
        if (Double.isNaN(x)) {
            return "NaN";
        }
        if (Double.isInfinite(x)) {
            return x > 0 ? "Infinity" : "-Infinity";
        }
        if (x == Math.rint(x) && Math.abs(x) < 1e15) {
            return Long.toString((long) x);
        }
        String shortest = singlePrecision ? Float.toString((float) x) : Double.toString(x);
        return new BigDecimal(shortest).stripTrailingZeros().toPlainString();
    }

    /**
     * The number a tally key stands for: the keys are what the scanner and the bins print, plain decimals and, for
     * the non-finite values a float column may hold, {@code NaN}, {@code Infinity} and {@code -Infinity}, each kept in
     * its own cell. This reads keys back, it does not judge answers: whether an answer is a valid number is the
     * screen's rule ({@code missing.ValidNumber}), applied later, and re-summarising keeps every key it counted.
     */
    public static double keyValue(String key) {
        return Double.parseDouble(key.strip());
    }

    /**
     * Re-summarises tallies at a common level, for pooling waves: each entry's text is read back as a number (a
     * stand-in falls in its own bin again) and added with its count and weights.
     */
    public static RelativeBins of(int level, boolean singlePrecision, Map<String, Long> counts,
                                  Map<String, double[]> weights) {
        RelativeBins bins = new RelativeBins(DEFAULT_MAX_BINS, level, singlePrecision);
        counts.forEach((text, c) -> {
            double[] w = weights == null ? null : weights.get(text);
            bins.add(keyValue(text), c, w == null ? 0 : w[0], w == null ? 0 : w[1]);
        });
        return bins;
    }
}
