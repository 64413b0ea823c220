package org.wavewarden.profile;

/**
 * Sample quantiles of a frequency table ({@link Table}: distinct values ascending with their counts, such as a
 * {@link NumericDistribution}), read off its order statistics {@code x(0) <= ... <= x(n-1)} without expanding the table. The definitions are those of
 * Hyndman and Fan (1996), "Sample quantiles in statistical packages", The American Statistician 50, 361-365, which
 * R's {@code quantile(x, p, type = )} numbers:
 *
 * <ul>
 *   <li>{@link #quantile}: type 7, R's default, {@code x(floor(h)) + (h - floor(h)) (x(floor(h)+1) - x(floor(h)))}
 *       with {@code h = (n - 1) p}; what a reader checking a plotted quartile in R gets.</li>
 *   <li>{@link #inverse}: type 1, the inverse of the empirical distribution function,
 *       {@code min {x : F(x) >= p}}, always an observed value (a fence drawn at an answer that occurs).</li>
 *   <li>{@link #median}: the middle order statistic, or the mean of the two middle ones (types 2 and 7 at 1/2).</li>
 * </ul>
 */
public final class Quantiles {

    private Quantiles() {
    }

    /** A frequency table: {@code size()} distinct values, ascending, each with a positive count. */
    public interface Table {
        int size();

        double value(int i);

        long count(int i);
    }

    /** The number of observations of a table. */
    static long n(Table t) {
        long n = 0;
        for (int i = 0; i < t.size(); i++) {
            n += t.count(i);
        }
        return n;
    }

    /** The k-th smallest observation, k from 0 to n - 1. */
    public static double orderStatistic(Table d, long k) {
        if (k < 0) {
            throw new IllegalArgumentException("order statistic " + k);
        }
        long seen = 0;
        for (int i = 0; i < d.size(); i++) {
            seen += d.count(i);
            if (k < seen) {
                return d.value(i);
            }
        }
        throw new IllegalArgumentException("order statistic " + k + " of " + seen + " observations");
    }

    /** R's {@code quantile(x, p)} (type 7) for p in [0, 1]; NaN for an empty table. */
    public static double quantile(Table d, double p) {
        checkP(p);
        long n = n(d);
        if (n == 0) {
            return Double.NaN;
        }
        double h = (n - 1) * p;
        long lo = (long) Math.floor(h);
        double xlo = orderStatistic(d, lo);
        double xhi = orderStatistic(d, Math.min(n - 1, lo + 1));
        return xlo + (h - lo) * (xhi - xlo);
    }

    /** R's {@code quantile(x, p, type = 1)} for p in [0, 1]: the smallest x with {@code F(x) >= p}; NaN if empty. */
    public static double inverse(Table d, double p) {
        checkP(p);
        long n = n(d);
        return n == 0 ? Double.NaN : orderStatistic(d, Math.max(1, (long) Math.ceil(p * n)) - 1);
    }

    /** R's {@code median(x)}; NaN for an empty table. */
    public static double median(Table d) {
        long n = n(d);
        return n == 0 ? Double.NaN : (orderStatistic(d, (n - 1) / 2) + orderStatistic(d, n / 2)) / 2;
    }

    /** R's {@code median(x)} of values already sorted ascending; NaN for none. */
    public static double median(double[] sorted) {
        int n = sorted.length;
        return n == 0 ? Double.NaN : (sorted[(n - 1) / 2] + sorted[n / 2]) / 2;
    }

    private static void checkP(double p) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException("p must lie in [0, 1], was " + p);
        }
    }
}
