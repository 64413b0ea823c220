package org.wavewarden.compare.design;

import java.util.Arrays;
import java.util.Map;
import java.util.TreeMap;

/**
 * The sufficient statistic of one variable in one wave under a weights-only design: each distinct value with its
 * number of respondents {@code n_v}, their sum of weights {@code W_v} and sum of squared weights {@code Q_v}.
 *
 * <p>With weights only (no strata or clusters) each respondent is its own PSU, drawn with replacement, and the
 * linearised score of a weighted mean is {@code z_i = w_i (y_i - ybar) / W}. Respondents with the same value have
 * the same residual, so every sum the Taylor-linearised variance needs collapses onto the values:
 * {@code sum_i z_i^2 = sum_v Q_v (y_v - ybar)^2 / W^2}. The estimates computed from a tally are therefore the same
 * as those of R's {@code svydesign(ids = ~1, weights = ~w)} on the rows, not an approximation of them (Wolter, K. M.
 * (2007), Introduction to Variance Estimation, 2nd ed., Springer, Chapter 6; Lumley, T. (2010), Complex Surveys,
 * Wiley). A respondent whose weight is zero counts in {@code n_v} and adds nothing to {@code W_v} and {@code Q_v},
 * as a zero weight does in R.
 *
 * <p>For a categorical variable the values are the positions 0, 1, ... of the categories in an order the caller
 * fixes for both waves; a category absent from a wave has {@code n_v = 0}.
 *
 * @param values         distinct values, strictly ascending
 * @param counts         respondents per value, {@code >= 0}
 * @param weights        sum of weights per value, finite and {@code >= 0}
 * @param squaredWeights sum of squared weights per value, finite and {@code >= 0}
 */
public record WeightedTally(double[] values, long[] counts, double[] weights, double[] squaredWeights) {

    public WeightedTally {
        if (values == null || counts == null || weights == null || squaredWeights == null) {
            throw new IllegalArgumentException("values, counts, weights and squaredWeights must not be null");
        }
        int k = values.length;
        if (counts.length != k || weights.length != k || squaredWeights.length != k) {
            throw new IllegalArgumentException("values has " + k + " entries but counts, weights and squaredWeights"
                    + " have " + counts.length + ", " + weights.length + " and " + squaredWeights.length);
        }
        values = values.clone();
        counts = counts.clone();
        weights = weights.clone();
        squaredWeights = squaredWeights.clone();
        for (int i = 0; i < k; i++) {
            if (!Double.isFinite(values[i]) || (i > 0 && !(values[i] > values[i - 1]))) {
                throw new IllegalArgumentException("values must be finite and strictly ascending; values[" + i
                        + "] = " + values[i]);
            }
            if (counts[i] < 0) {
                throw new IllegalArgumentException("counts[" + i + "] must not be negative, was " + counts[i]);
            }
            if (!(weights[i] >= 0) || Double.isInfinite(weights[i])) {
                throw new IllegalArgumentException("weights[" + i + "] must be finite and >= 0, was " + weights[i]);
            }
            if (!(squaredWeights[i] >= 0) || Double.isInfinite(squaredWeights[i])) {
                throw new IllegalArgumentException("squaredWeights[" + i + "] must be finite and >= 0, was "
                        + squaredWeights[i]);
            }
        }
    }

    /** The tally of respondent-level values and weights (weights finite and {@code >= 0}). */
    public static WeightedTally ofSample(double[] values, double[] weights) {
        if (values == null || weights == null || values.length != weights.length) {
            throw new IllegalArgumentException("values and weights must have the same length");
        }
        TreeMap<Double, double[]> cells = new TreeMap<>();
        for (int i = 0; i < values.length; i++) {
            double[] c = cells.computeIfAbsent(values[i] == 0.0 ? 0.0 : values[i], x -> new double[3]);
            c[0]++;
            c[1] += weights[i];
            c[2] += weights[i] * weights[i];
        }
        return ofCells(cells);
    }

    /** The tally from value to {count, sum of weights, sum of squared weights}. */
    public static WeightedTally ofCells(Map<Double, double[]> cells) {
        TreeMap<Double, double[]> sorted = new TreeMap<>(cells);
        int k = sorted.size();
        double[] v = new double[k];
        long[] n = new long[k];
        double[] w = new double[k];
        double[] q = new double[k];
        int i = 0;
        for (Map.Entry<Double, double[]> e : sorted.entrySet()) {
            v[i] = e.getKey();
            n[i] = (long) e.getValue()[0];
            w[i] = e.getValue()[1];
            q[i] = e.getValue()[2];
            i++;
        }
        return new WeightedTally(v, n, w, q);
    }

    @Override
    public double[] values() {
        return values.clone();
    }

    @Override
    public long[] counts() {
        return counts.clone();
    }

    @Override
    public double[] weights() {
        return weights.clone();
    }

    @Override
    public double[] squaredWeights() {
        return squaredWeights.clone();
    }

    /** Number of distinct values. */
    public int size() {
        return values.length;
    }

    double value(int i) {
        return values[i];
    }

    long count(int i) {
        return counts[i];
    }

    double weight(int i) {
        return weights[i];
    }

    double squaredWeight(int i) {
        return squaredWeights[i];
    }

    /** Number of respondents. */
    public long n() {
        long n = 0;
        for (long c : counts) {
            n += c;
        }
        return n;
    }

    /** {@code W = sum w}. */
    public double totalWeight() {
        double s = 0;
        for (double w : weights) {
            s += w;
        }
        return s;
    }

    /** {@code sum w^2}. */
    public double totalSquaredWeight() {
        double s = 0;
        for (double q : squaredWeights) {
            s += q;
        }
        return s;
    }

    /** Kish's effective sample size {@code W^2 / sum w^2} ({@link Kish#effectiveSampleSize(double, double)}). */
    public double effectiveSampleSize() {
        return Kish.effectiveSampleSize(totalWeight(), totalSquaredWeight());
    }

    /** Kish's design effect due to weighting {@code n sum w^2 / W^2} ({@link Kish#designEffect(long, double, double)}). */
    public double weightingDesignEffect() {
        return Kish.designEffect(n(), totalWeight(), totalSquaredWeight());
    }

    /**
     * The 0/1 tally of the share of respondents whose value is {@code value}: 1 for them, 0 for the others. Its
     * weighted mean is the weighted share, with the same linearised variance.
     */
    public WeightedTally indicator(double value) {
        double[] cell1 = new double[3];
        double[] cell0 = new double[3];
        for (int i = 0; i < values.length; i++) {
            double[] c = values[i] == value ? cell1 : cell0;
            c[0] += counts[i];
            c[1] += weights[i];
            c[2] += squaredWeights[i];
        }
        return new WeightedTally(new double[] {0, 1}, new long[] {(long) cell0[0], (long) cell1[0]},
                new double[] {cell0[1], cell1[1]}, new double[] {cell0[2], cell1[2]});
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof WeightedTally t && Arrays.equals(values, t.values) && Arrays.equals(counts, t.counts)
                && Arrays.equals(weights, t.weights) && Arrays.equals(squaredWeights, t.squaredWeights);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(values) * 31 + Arrays.hashCode(counts);
    }

    @Override
    public String toString() {
        return "WeightedTally[n=" + n() + ", distinct=" + size() + ", W=" + totalWeight() + "]";
    }
}
