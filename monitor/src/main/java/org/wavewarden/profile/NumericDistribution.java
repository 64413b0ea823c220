package org.wavewarden.profile;

import java.util.Arrays;
import java.util.Map;
import java.util.TreeMap;

/**
 * The distinct valid values of one numeric variable in one wave, in ascending order, with how often each occurs.
 *
 * <p>This is the sufficient statistic every two-sample method of the comparison stage works from: ranks (with
 * ties), empirical distribution functions, quantiles, moments and pairwise differences are all exact functions of
 * it. Survey answers are mostly discrete, so the table is far smaller than the wave.
 */
public record NumericDistribution(double[] values, long[] counts) implements Quantiles.Table {

    public NumericDistribution {
        if (values.length != counts.length) {
            throw new IllegalArgumentException("values has " + values.length + " entries but counts has " + counts.length);
        }
        values = values.clone();
        counts = counts.clone();
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("values[" + i + "] is not finite: " + values[i]);
            }
            if (counts[i] <= 0) {
                throw new IllegalArgumentException("counts[" + i + "] must be positive, was " + counts[i]);
            }
            if (i > 0 && !(values[i] > values[i - 1])) {
                throw new IllegalArgumentException("values must be strictly ascending; values[" + i + "] = " + values[i]
                        + " follows " + values[i - 1]);
            }
        }
    }

    /** Builds the table from raw observations (order does not matter). */
    public static NumericDistribution ofSample(double... observations) {
        TreeMap<Double, Long> tally = new TreeMap<>();
        for (double x : observations) {
            tally.merge(x == 0.0 ? 0.0 : x, 1L, Long::sum); // -0.0 and 0.0 are one value
        }
        return ofTally(tally);
    }

    /** Builds the table from a value-to-count map. */
    public static NumericDistribution ofTally(Map<Double, Long> tally) {
        TreeMap<Double, Long> sorted = new TreeMap<>(tally);
        double[] v = new double[sorted.size()];
        long[] c = new long[sorted.size()];
        int i = 0;
        for (Map.Entry<Double, Long> e : sorted.entrySet()) {
            v[i] = e.getKey();
            c[i] = e.getValue();
            i++;
        }
        return new NumericDistribution(v, c);
    }

    public static NumericDistribution empty() {
        return new NumericDistribution(new double[0], new long[0]);
    }

    /** Number of distinct values. */
    public int size() {
        return values.length;
    }

    public double value(int i) {
        return values[i];
    }

    public long count(int i) {
        return counts[i];
    }

    /** Number of observations. */
    public long n() {
        long n = 0;
        for (long c : counts) {
            n += c;
        }
        return n;
    }

    public double mean() {
        double sum = 0;
        long n = 0;
        for (int i = 0; i < values.length; i++) {
            sum += values[i] * counts[i];
            n += counts[i];
        }
        return n == 0 ? Double.NaN : sum / n;
    }

    /** Sample variance with the n - 1 denominator (two-pass, to keep precision for values far from zero). */
    public double variance() {
        long n = n();
        if (n < 2) {
            return Double.NaN;
        }
        double m = mean();
        double ss = 0;
        for (int i = 0; i < values.length; i++) {
            double d = values[i] - m;
            ss += d * d * counts[i];
        }
        return ss / (n - 1);
    }

    public double standardDeviation() {
        return Math.sqrt(variance());
    }

    /** Expands the table back to the sorted sample; for tests and for small-sample exact methods only. */
    public double[] toSortedSample() {
        long n = n();
        if (n > Integer.MAX_VALUE - 8) {
            throw new IllegalStateException("sample of " + n + " observations is too large to expand");
        }
        double[] out = new double[(int) n];
        int k = 0;
        for (int i = 0; i < values.length; i++) {
            Arrays.fill(out, k, k + (int) counts[i], values[i]);
            k += (int) counts[i];
        }
        return out;
    }

    /** Pools two waves' tables, as when comparing against the pooled last k waves. */
    public NumericDistribution merge(NumericDistribution other) {
        TreeMap<Double, Long> tally = new TreeMap<>();
        for (int i = 0; i < size(); i++) {
            tally.merge(values[i], counts[i], Long::sum);
        }
        for (int i = 0; i < other.size(); i++) {
            tally.merge(other.values[i], other.counts[i], Long::sum);
        }
        return ofTally(tally);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof NumericDistribution d && Arrays.equals(values, d.values) && Arrays.equals(counts, d.counts);
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(values) + Arrays.hashCode(counts);
    }

    @Override
    public String toString() {
        return "NumericDistribution[n=" + n() + ", distinct=" + size() + "]";
    }
}
