package org.wavewarden.compare.design;

import java.util.Arrays;

/**
 * The sufficient statistic of one numeric variable in one wave under a stratified cluster design: for every PSU of
 * the wave's design, the sums over its valid answers of {@code w}, {@code w y} and {@code w y^2}, with the stratum
 * of each PSU and the number of valid answers.
 *
 * <p>The weighted mean {@code ybar = sum_p Y_p / W} is a ratio of totals; its linearised score summed over PSU p is
 * {@code z_p = (Y_p - ybar W_p) / W} (Woodruff, R. S. (1971), JASA 66, 411-414), and with PSUs drawn with
 * replacement within strata its variance is {@code V = sum_h n_h/(n_h - 1) sum_{p in h} (z_p - zbar_h)^2}
 * (Wolter, K. M. (2007), Introduction to Variance Estimation, 2nd ed., Springer, Chapter 6), single-PSU strata
 * following R's {@code survey.lonely.psu = "adjust"} (see {@link WeightedEstimates}; Lumley, T. (2010), Complex
 * Surveys, Wiley). The row-level {@link WeightedEstimates#mean} needs nothing but these sums, so the estimates are
 * the same, not an approximation.
 *
 * <p><b>Domain rule.</b> Respondents without a valid answer form no domain of their own: they are left out of the
 * sums, but their PSUs are not. Every PSU of the wave's design is listed, with weight 0 when none of its respondents
 * answered, and {@code n_h} counts the PSUs of the design in stratum h. This is domain estimation as in R's
 * {@code svymean(~y, design, na.rm = TRUE)}, which equals {@code svymean(~y, subset(design, !is.na(y)))}
 * (Sarndal, C.-E., Swensson, B. and Wretman, J. (1992), Model Assisted Survey Sampling, Springer, Chapter 10;
 * Lumley, T., "Estimates in subpopulations", the {@code domain} vignette of R's survey package): the number of
 * answering respondents is random, and a PSU without answers is a draw whose domain total happened to be zero. Building a new design from the answering respondents only would count fewer PSUs and give a
 * different variance whenever a PSU has no answer at all. The design degrees of freedom, in contrast, follow R's
 * {@code degf(subset(design, !is.na(y)))}: PSUs with weight minus strata with weight, which is also what
 * {@code svyttest} uses.
 *
 * <p>The weighted variance {@code s_w^2} of the design effect comes from the raw moments, {@code n/(n-1) (sum w y^2
 * / W - ybar^2)}: it loses about {@code 1e-16 ybar^2 / s_w^2} of its relative precision, which matters only for a
 * variable that hardly varies around a large mean.
 *
 * @param psuStratum      stratum index 0..H-1 of each PSU 0..P-1; every stratum index holds at least one PSU
 * @param weight          {@code weight[p]}: sum of w over PSU p's valid answers, finite and {@code >= 0}
 * @param weightedSum     {@code weightedSum[p]}: sum of w y over them, finite
 * @param weightedSquares {@code weightedSquares[p]}: sum of w y^2 over them, finite and {@code >= 0}
 * @param n               number of valid answers in the wave
 */
public record PsuTotals(int[] psuStratum, double[] weight, double[] weightedSum, double[] weightedSquares, long n) {

    public PsuTotals {
        if (psuStratum == null || weight == null || weightedSum == null || weightedSquares == null) {
            throw new IllegalArgumentException("psuStratum, weight, weightedSum and weightedSquares must not be null");
        }
        int psus = psuStratum.length;
        if (weight.length != psus || weightedSum.length != psus || weightedSquares.length != psus) {
            throw new IllegalArgumentException("psuStratum has " + psus + " PSUs but weight, weightedSum and"
                    + " weightedSquares have " + weight.length + ", " + weightedSum.length + " and "
                    + weightedSquares.length);
        }
        psuStratum = checkStrata(psuStratum);
        weight = weight.clone();
        weightedSum = weightedSum.clone();
        weightedSquares = weightedSquares.clone();
        int answered = 0;
        for (int k = 0; k < psus; k++) {
            checkWeight("weight[" + k + "]", weight[k]);
            if (!Double.isFinite(weightedSum[k])) {
                throw new IllegalArgumentException("weightedSum[" + k + "] must be finite, was " + weightedSum[k]);
            }
            checkWeight("weightedSquares[" + k + "]", weightedSquares[k]);
            if (weight[k] > 0) {
                answered++;
            }
        }
        if (n < answered) {
            throw new IllegalArgumentException("n is " + n + " but " + answered
                    + " PSUs hold weight, each from at least one answer");
        }
    }

    /**
     * The totals of respondent-level values under their design; {@code NaN} marks a respondent without a valid
     * answer. This is the aggregation the read stage performs while it streams the rows.
     */
    public static PsuTotals ofSample(double[] values, SurveyDesign design) {
        if (values == null) {
            throw new IllegalArgumentException("values must not be null");
        }
        SurveyDesign.checkValues("values", values.length, design);
        int psus = design.psuCount();
        double[] w = new double[psus];
        double[] wy = new double[psus];
        double[] wyy = new double[psus];
        long n = 0;
        for (int i = 0; i < values.length; i++) {
            if (!answered(values, i)) {
                continue;
            }
            double y = values[i];
            int k = design.psuOf(i);
            double wi = design.weight(i);
            w[k] += wi;
            wy[k] += wi * y;
            wyy[k] += wi * y * y;
            n++;
        }
        return new PsuTotals(psuStrata(design), w, wy, wyy, n);
    }

    @Override
    public int[] psuStratum() {
        return psuStratum.clone();
    }

    @Override
    public double[] weight() {
        return weight.clone();
    }

    @Override
    public double[] weightedSum() {
        return weightedSum.clone();
    }

    @Override
    public double[] weightedSquares() {
        return weightedSquares.clone();
    }

    /** Number of PSUs of the design, with or without answers. */
    public int psuCount() {
        return psuStratum.length;
    }

    /** Number of strata of the design. */
    public int strataCount() {
        return DesignVariance.psusInStratum(psuStratum).length;
    }

    /** {@code W = sum w} over the valid answers. */
    public double totalWeight() {
        double s = 0;
        for (double w : weight) {
            s += w;
        }
        return s;
    }

    /**
     * The weighted mean with its design-based standard error and design effects, as {@link WeightedEstimates#mean}
     * and R's {@code svymean(~y, design, na.rm = TRUE, deff = TRUE | "replace")}: {@code V_srs = s_w^2 / n} with
     * {@code s_w^2 = n/(n-1) (sum w y^2 / W - ybar^2)}, and {@code s_w^2 (W - n) / (W n)} without replacement.
     *
     * @throws IllegalArgumentException with fewer than 2 valid answers or no weight
     */
    public DesignEstimate mean() {
        checkEstimable(n, totalWeight());
        return WeightedEstimates.means(psuStratum, weight, new double[][] {weightedSum},
                new double[][] {weightedSquares}, n).estimate(0);
    }

    /**
     * Design degrees of freedom of the answering domain: PSUs with weight minus strata with weight (R's
     * {@code degf(subset(design, !is.na(y)))}; Korn, E. L. and Graubard, B. I. (1999), Analysis of Health Surveys,
     * Wiley). Without missing answers this is the design's #PSU - #strata.
     */
    public int degreesOfFreedom() {
        return degreesOfFreedom(psuStratum, weight);
    }

    static int degreesOfFreedom(int[] psuStratum, double[] weight) {
        int strata = DesignVariance.psusInStratum(psuStratum).length;
        boolean[] seen = new boolean[strata];
        int psus = 0;
        int withWeight = 0;
        for (int k = 0; k < psuStratum.length; k++) {
            if (weight[k] > 0) {
                psus++;
                if (!seen[psuStratum[k]]) {
                    seen[psuStratum[k]] = true;
                    withWeight++;
                }
            }
        }
        return psus - withWeight;
    }

    /** Whether respondent i answered: NaN is no answer, an infinite value is an error. */
    static boolean answered(double[] values, int i) {
        if (Double.isInfinite(values[i])) {
            throw new IllegalArgumentException("values[" + i + "] must be finite or NaN, was " + values[i]);
        }
        return !Double.isNaN(values[i]);
    }

    static int[] psuStrata(SurveyDesign design) {
        int[] s = new int[design.psuCount()];
        for (int k = 0; k < s.length; k++) {
            s[k] = design.psuStratum(k);
        }
        return s;
    }

    static int[] checkStrata(int[] psuStratum) {
        int[] copy = psuStratum.clone();
        if (copy.length == 0) {
            throw new IllegalArgumentException("psuStratum must list at least one PSU");
        }
        for (int k = 0; k < copy.length; k++) {
            if (copy[k] < 0) {
                throw new IllegalArgumentException("psuStratum[" + k + "] must be >= 0, was " + copy[k]);
            }
        }
        int[] count = DesignVariance.psusInStratum(copy);
        for (int h = 0; h < count.length; h++) {
            if (count[h] == 0) {
                throw new IllegalArgumentException("psuStratum names strata 0.." + (count.length - 1)
                        + " but no PSU lies in stratum " + h);
            }
        }
        return copy;
    }

    static void checkWeight(String name, double w) {
        if (!(w >= 0) || Double.isInfinite(w)) {
            throw new IllegalArgumentException(name + " must be finite and >= 0, was " + w);
        }
    }

    static void checkEstimable(long n, double totalWeight) {
        if (n < 2) {
            throw new IllegalArgumentException("need at least 2 valid answers, have " + n);
        }
        if (!(totalWeight > 0)) {
            throw new IllegalArgumentException("the valid answers carry no weight");
        }
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof PsuTotals t && n == t.n && Arrays.equals(psuStratum, t.psuStratum)
                && Arrays.equals(weight, t.weight) && Arrays.equals(weightedSum, t.weightedSum)
                && Arrays.equals(weightedSquares, t.weightedSquares);
    }

    @Override
    public int hashCode() {
        return (Arrays.hashCode(psuStratum) * 31 + Arrays.hashCode(weight)) * 31 + Long.hashCode(n);
    }

    @Override
    public String toString() {
        return "PsuTotals[n=" + n + ", psus=" + psuCount() + ", strata=" + strataCount() + ", W=" + totalWeight()
                + "]";
    }
}
