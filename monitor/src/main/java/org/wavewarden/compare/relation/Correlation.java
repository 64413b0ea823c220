package org.wavewarden.compare.relation;

import java.util.Arrays;
import java.util.Comparator;
import org.apache.commons.math3.util.FastMath;
import org.wavewarden.compare.Checks;
import org.wavewarden.compare.StandardNormal;

/**
 * Pearson's r and Spearman's rho with Fisher-z confidence intervals, from a joint tally of value pairs.
 *
 * <p>The tally form takes parallel arrays: {@code counts[i]} respondents answered {@code xs[i]} and {@code ys[i]}.
 * Pairs may repeat and counts may be 0, so any grouping of the rows is a valid tally; the raw form is the tally with
 * every count 1. Pearson's r is accumulated in one pass over the tally with West's weighted update of the means and
 * co-moments (West, D. H. D. (1979), "Updating mean and variance estimates: an improved method", Communications of
 * the ACM 22, 532-535), which avoids the cancellation of the textbook sums of squares. Spearman's rho is Pearson's r
 * on the mid-ranks of x and of y (ties share the mean of the ranks they cover, as R's {@code cor(method =
 * "spearman")}); the ranks come from the marginal tallies, sorted once each.
 *
 * <p>Interval: tanh(atanh(r) -+ z_{1-a/2} sqrt(c / (n - 3))), with c = 1 for Pearson (Fisher 1921, Metron 1; R's
 * {@code cor.test(method = "pearson")$conf.int}) and c = 1.06 for Spearman (Fieller, Hartley and Pearson 1957,
 * Biometrika 44, 470-481; see {@link CorrelationMethod#SPEARMAN}). With n &lt;= 3 the variance is undefined and the
 * interval is the whole range [-1, 1].
 */
public final class Correlation {

    private Correlation() {
    }

    /** Pearson's r from a joint tally. */
    public static CorrelationResult pearson(double[] xs, double[] ys, long[] counts, double confidence) {
        return of(CorrelationMethod.PEARSON, xs, ys, counts, confidence);
    }

    /** Spearman's rho, with mid-ranks for ties, from a joint tally. */
    public static CorrelationResult spearman(double[] xs, double[] ys, long[] counts, double confidence) {
        return of(CorrelationMethod.SPEARMAN, xs, ys, counts, confidence);
    }

    /** Pearson's r from paired observations, {@code x[i]} and {@code y[i]} from the same respondent. */
    public static CorrelationResult pearson(double[] x, double[] y, double confidence) {
        return of(CorrelationMethod.PEARSON, x, y, ones(x), confidence);
    }

    /** Spearman's rho from paired observations. */
    public static CorrelationResult spearman(double[] x, double[] y, double confidence) {
        return of(CorrelationMethod.SPEARMAN, x, y, ones(x), confidence);
    }

    /**
     * @param method     Pearson or Spearman
     * @param xs         the first variable's value of each tallied pair, finite
     * @param ys         the second variable's value, same length as {@code xs}, finite
     * @param counts     how many respondents gave each pair, not negative; at least 2 in all
     * @param confidence level of the interval, in (0, 1)
     * @throws IllegalArgumentException on null or unequal arrays, a non-finite value, a negative count, fewer than 2
     *                                  pairs, a variable that takes one value only (r is then undefined), or a
     *                                  confidence outside (0, 1)
     */
    public static CorrelationResult of(CorrelationMethod method, double[] xs, double[] ys, long[] counts,
                                       double confidence) {
        if (method == null) {
            throw new IllegalArgumentException("method must not be null");
        }
        long n = check(xs, ys, counts);
        Checks.confidence(confidence);
        double r = method == CorrelationMethod.SPEARMAN
                ? pearson(midRanks(xs, counts), midRanks(ys, counts), counts)
                : pearson(xs, ys, counts);
        if (n <= 3) {
            return new CorrelationResult(method, r, n, -1, 1, confidence);
        }
        double z = FastMath.atanh(r);
        double half = StandardNormal.twoSidedQuantile(confidence) * Math.sqrt(method.varianceNumerator() / (n - 3));
        return new CorrelationResult(method, r, n, FastMath.tanh(z - half), FastMath.tanh(z + half), confidence);
    }

    private static double pearson(double[] xs, double[] ys, long[] counts) {
        double w = 0;
        double mx = 0;
        double my = 0;
        double sxx = 0;
        double syy = 0;
        double sxy = 0;
        for (int i = 0; i < xs.length; i++) {
            long c = counts[i];
            if (c == 0) {
                continue;
            }
            double before = w;
            w += c;
            double dx = xs[i] - mx;
            double dy = ys[i] - my;
            mx += dx * (c / w);
            my += dy * (c / w);
            // c (x - mean_new) dx written as c W_before / W_new dx^2: exactly 0 for the first entry, where
            // x - mean_new would be a rounding residue multiplied by the full distance from 0
            double f = c * before / w;
            sxx += f * dx * dx;
            syy += f * dy * dy;
            sxy += f * dx * dy;
        }
        if (!(sxx > 0)) {
            throw new IllegalArgumentException("x takes a single value over all pairs; the correlation is undefined");
        }
        if (!(syy > 0)) {
            throw new IllegalArgumentException("y takes a single value over all pairs; the correlation is undefined");
        }
        return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
    }

    /** The mid-rank of each entry's value among all tallied respondents. */
    private static double[] midRanks(double[] values, long[] counts) {
        Integer[] order = new Integer[values.length];
        for (int i = 0; i < order.length; i++) {
            order[i] = i;
        }
        Arrays.sort(order, Comparator.comparingDouble(i -> values[i]));
        double[] ranks = new double[values.length];
        double below = 0;
        int start = 0;
        while (start < order.length) {
            int end = start;
            long tied = 0;
            while (end < order.length && values[order[end]] == values[order[start]]) {
                tied += counts[order[end]];
                end++;
            }
            double mid = below + (tied + 1) / 2.0;
            for (int i = start; i < end; i++) {
                ranks[order[i]] = mid;
            }
            below += tied;
            start = end;
        }
        return ranks;
    }

    private static long check(double[] xs, double[] ys, long[] counts) {
        if (xs == null || ys == null || counts == null) {
            throw new IllegalArgumentException((xs == null ? "xs" : ys == null ? "ys" : "counts")
                    + " must not be null");
        }
        if (xs.length != ys.length || xs.length != counts.length) {
            throw new IllegalArgumentException("xs, ys and counts must have equal lengths, have " + xs.length + ", "
                    + ys.length + " and " + counts.length);
        }
        long n = 0;
        for (int i = 0; i < xs.length; i++) {
            if (!Double.isFinite(xs[i])) {
                throw new IllegalArgumentException("xs[" + i + "] is not finite: " + xs[i]);
            }
            if (!Double.isFinite(ys[i])) {
                throw new IllegalArgumentException("ys[" + i + "] is not finite: " + ys[i]);
            }
            if (counts[i] < 0) {
                throw new IllegalArgumentException("counts[" + i + "] must not be negative, was " + counts[i]);
            }
            n = Math.addExact(n, counts[i]);
        }
        if (n < 2) {
            throw new IllegalArgumentException("a correlation needs at least 2 pairs, have " + n);
        }
        return n;
    }

    private static long[] ones(double[] x) {
        if (x == null) {
            throw new IllegalArgumentException("x must not be null");
        }
        long[] c = new long[x.length];
        Arrays.fill(c, 1);
        return c;
    }
}
