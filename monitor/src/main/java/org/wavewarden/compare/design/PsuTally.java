package org.wavewarden.compare.design;

import java.util.Arrays;
import java.util.TreeMap;

/**
 * The sufficient statistic of one variable with few distinct values (the categories of a categorical variable, or
 * a numeric variable tallied exactly) in one wave under a stratified cluster design: for each value, the number of
 * answers and the sum of their weights in every PSU of the design.
 *
 * <p>A share is the weighted mean of a 0/1 indicator, so the per-PSU weights of each value are the PSU sums of
 * {@code w 1[y = v]} and of its square; {@link #totals()} gives the PSU sums of {@code w y} and {@code w y^2} of a
 * numeric variable. Everything is therefore estimated as from the rows, by Taylor linearisation with PSUs drawn with
 * replacement within strata (Wolter, K. M. (2007), Introduction to Variance Estimation, 2nd ed., Springer,
 * Chapter 6; Lumley, T. (2010), Complex Surveys, Wiley). The domain rule of {@link PsuTotals} applies: respondents
 * without a valid answer are left out of the sums, every PSU of the design is listed, with weight 0 where nobody
 * answered, as R's {@code svymean(~factor(cat), subset(design, !is.na(cat)))}.
 *
 * @param values     distinct values, strictly ascending
 * @param counts     {@code counts[v]}: answers with value {@code values[v]}, {@code >= 0}
 * @param psuStratum stratum index 0..H-1 of each PSU 0..P-1; every stratum index holds at least one PSU
 * @param weight     {@code weight[v][p]}: sum of w of the answers with value {@code values[v]} in PSU p, finite
 *                   and {@code >= 0}
 */
public record PsuTally(double[] values, long[] counts, int[] psuStratum, double[][] weight) {

    public PsuTally {
        if (values == null || counts == null || psuStratum == null || weight == null) {
            throw new IllegalArgumentException("values, counts, psuStratum and weight must not be null");
        }
        int k = values.length;
        if (counts.length != k || weight.length != k) {
            throw new IllegalArgumentException("values has " + k + " entries but counts and weight have "
                    + counts.length + " and " + weight.length);
        }
        values = values.clone();
        counts = counts.clone();
        psuStratum = PsuTotals.checkStrata(psuStratum);
        double[][] copy = new double[k][];
        for (int v = 0; v < k; v++) {
            if (!Double.isFinite(values[v]) || (v > 0 && !(values[v] > values[v - 1]))) {
                throw new IllegalArgumentException("values must be finite and strictly ascending; values[" + v
                        + "] = " + values[v]);
            }
            if (counts[v] < 0) {
                throw new IllegalArgumentException("counts[" + v + "] must not be negative, was " + counts[v]);
            }
            if (weight[v] == null || weight[v].length != psuStratum.length) {
                throw new IllegalArgumentException("weight[" + v + "] must hold one sum per PSU ("
                        + psuStratum.length + ")");
            }
            copy[v] = weight[v].clone();
            for (int p = 0; p < psuStratum.length; p++) {
                PsuTotals.checkWeight("weight[" + v + "][" + p + "]", copy[v][p]);
            }
        }
        weight = copy;
    }

    /**
     * The tally of respondent-level values under their design; {@code NaN} marks a respondent without a valid
     * answer.
     */
    public static PsuTally ofSample(double[] values, SurveyDesign design) {
        if (values == null) {
            throw new IllegalArgumentException("values must not be null");
        }
        SurveyDesign.checkValues("values", values.length, design);
        int psus = design.psuCount();
        TreeMap<Double, double[]> cells = new TreeMap<>(); // value -> {count, weight of PSU 0, 1, ...}
        for (int i = 0; i < values.length; i++) {
            if (!PsuTotals.answered(values, i)) {
                continue;
            }
            double y = values[i];
            double[] c = cells.computeIfAbsent(y == 0.0 ? 0.0 : y, x -> new double[1 + psus]);
            c[0]++;
            c[1 + design.psuOf(i)] += design.weight(i);
        }
        int k = cells.size();
        double[] v = new double[k];
        long[] n = new long[k];
        double[][] w = new double[k][];
        int j = 0;
        for (var e : cells.entrySet()) {
            v[j] = e.getKey();
            n[j] = (long) e.getValue()[0];
            w[j] = Arrays.copyOfRange(e.getValue(), 1, 1 + psus);
            j++;
        }
        return new PsuTally(v, n, PsuTotals.psuStrata(design), w);
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
    public int[] psuStratum() {
        return psuStratum.clone();
    }

    @Override
    public double[][] weight() {
        double[][] copy = new double[weight.length][];
        for (int v = 0; v < weight.length; v++) {
            copy[v] = weight[v].clone();
        }
        return copy;
    }

    /** Number of distinct values. */
    public int size() {
        return values.length;
    }

    /** Number of PSUs of the design, with or without answers. */
    public int psuCount() {
        return psuStratum.length;
    }

    /** Number of valid answers. */
    public long n() {
        long n = 0;
        for (long c : counts) {
            n += c;
        }
        return n;
    }

    double value(int v) {
        return values[v];
    }

    double weight(int v, int p) {
        return weight[v][p];
    }

    int stratumOf(int p) {
        return psuStratum[p];
    }

    /** Sum of w per PSU over all values. */
    double[] psuWeights() {
        double[] w = new double[psuStratum.length];
        for (double[] row : weight) {
            for (int p = 0; p < w.length; p++) {
                w[p] += row[p];
            }
        }
        return w;
    }

    /** The PSU sums of w, w y and w y^2 of the values as a numeric variable. */
    public PsuTotals totals() {
        int psus = psuStratum.length;
        double[] wy = new double[psus];
        double[] wyy = new double[psus];
        for (int v = 0; v < values.length; v++) {
            double y = values[v];
            for (int p = 0; p < psus; p++) {
                wy[p] += y * weight[v][p];
                wyy[p] += y * y * weight[v][p];
            }
        }
        return new PsuTotals(psuStratum, psuWeights(), wy, wyy, n());
    }

    /**
     * Design degrees of freedom of the answering domain, PSUs with weight minus strata with weight
     * ({@link PsuTotals#degreesOfFreedom()}).
     */
    public int degreesOfFreedom() {
        return PsuTotals.degreesOfFreedom(psuStratum, psuWeights());
    }

    /**
     * Weighted shares of every value with weight (values are category codes, integers, as in
     * {@link TallyEstimates#shares}) with their design-based covariance, as R's {@code svymean(~factor(cat),
     * subset(design, !is.na(cat)), deff = "replace")}, and as {@link WeightedEstimates#shares} on the answering rows
     * when every PSU holds an answer. The design effects use {@code s_w^2 = n/(n-1) p (1 - p)} with n the valid
     * answers.
     *
     * @throws IllegalArgumentException with fewer than 2 answers, no weight, or a value that is not an integer
     */
    public CategoryShares shares() {
        double[] psuWeight = psuWeights();
        double total = 0;
        for (double w : psuWeight) {
            total += w;
        }
        long n = n();
        PsuTotals.checkEstimable(n, total);
        int kept = 0;
        for (int v = 0; v < values.length; v++) {
            TallyEstimates.code(values[v]);
            if (rowWeight(v) > 0) {
                kept++;
            }
        }
        int[] codes = new int[kept];
        double[][] rows = new double[kept][];
        int j = 0;
        for (int v = 0; v < values.length; v++) {
            if (rowWeight(v) > 0) {
                codes[j] = TallyEstimates.code(values[v]);
                rows[j++] = weight[v];
            }
        }
        // For an indicator y = y^2, so the PSU sums of w y and of w y^2 are both the category's weights.
        WeightedEstimates.Means m = WeightedEstimates.means(psuStratum, psuWeight, rows, rows, n);
        DesignEstimate[] estimates = new DesignEstimate[kept];
        for (int c = 0; c < kept; c++) {
            estimates[c] = m.estimate(c);
        }
        return new CategoryShares(codes, m.means(), estimates, m.covariance());
    }

    /**
     * The 0/1 tally of the share of answers whose value is {@code value}: value 1 for them, 0 for the others, both
     * listed even when empty. Its {@link #totals()} mean is the weighted share with the same linearised variance; it
     * is what {@link DesignMeanDifference#testShares(PsuTally, PsuTally, double)} takes.
     */
    public PsuTally indicator(double value) {
        int psus = psuStratum.length;
        double[] hit = new double[psus];
        double[] miss = new double[psus];
        long hits = 0;
        long misses = 0;
        for (int v = 0; v < values.length; v++) {
            boolean isHit = values[v] == value;
            double[] target = isHit ? hit : miss;
            for (int p = 0; p < psus; p++) {
                target[p] += weight[v][p];
            }
            if (isHit) {
                hits += counts[v];
            } else {
                misses += counts[v];
            }
        }
        return new PsuTally(new double[] {0, 1}, new long[] {misses, hits}, psuStratum, new double[][] {miss, hit});
    }

    private double rowWeight(int v) {
        double s = 0;
        for (double w : weight[v]) {
            s += w;
        }
        return s;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof PsuTally t && Arrays.equals(values, t.values) && Arrays.equals(counts, t.counts)
                && Arrays.equals(psuStratum, t.psuStratum) && Arrays.deepEquals(weight, t.weight);
    }

    @Override
    public int hashCode() {
        return (Arrays.hashCode(values) * 31 + Arrays.hashCode(counts)) * 31 + Arrays.hashCode(psuStratum);
    }

    @Override
    public String toString() {
        return "PsuTally[n=" + n() + ", distinct=" + size() + ", psus=" + psuCount() + "]";
    }
}
