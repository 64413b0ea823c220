package org.wavewarden.compare.design;

/**
 * Kish's effective sample size and design effect due to unequal weighting.
 *
 * <p>{@code n_eff = (sum w)^2 / sum w^2} and {@code deff_w = n sum w^2 / (sum w)^2 = 1 + CV^2} of the weights
 * (CV with divisor n). Sources: Kish, L. (1965), Survey Sampling, Wiley, Section 11.7; Kish, L. (1992), "Weighting
 * for unequal P_i", Journal of Official Statistics 8, 183-200. This is a property of the weights alone: it is the
 * variance inflation of a weighted mean when the variable's spread does not depend on the weights. The design effect
 * that R's {@code svymean(..., deff = "replace")} reports ({@link DesignEstimate#designEffect()}) is measured on
 * the variable and also reflects clustering; for a weights-only design the two agree exactly when the squared
 * residuals of the variable are constant.
 */
public final class Kish {

    private Kish() {
    }

    /** {@code (sum w)^2 / sum w^2}; equals n for equal weights. */
    public static double effectiveSampleSize(double[] weights) {
        check(weights);
        double s = 0;
        double s2 = 0;
        for (double w : weights) {
            s += w;
            s2 += w * w;
        }
        return s * s / s2;
    }

    /** {@code n sum w^2 / (sum w)^2}; equals 1 for equal weights and is never below 1. */
    public static double designEffect(double[] weights) {
        return weights.length / effectiveSampleSize(weights);
    }

    /**
     * {@code (sum w)^2 / sum w^2} from the two sums, as a tally of the wave keeps them.
     *
     * @throws IllegalArgumentException unless both sums are finite and positive
     */
    public static double effectiveSampleSize(double sumOfWeights, double sumOfSquaredWeights) {
        checkSums(sumOfWeights, sumOfSquaredWeights);
        return sumOfWeights * sumOfWeights / sumOfSquaredWeights;
    }

    /**
     * {@code n sum w^2 / (sum w)^2} from the two sums and the number of respondents n. A respondent of weight zero
     * counts in n, so such respondents raise the design effect, as they lower the information per respondent.
     */
    public static double designEffect(long n, double sumOfWeights, double sumOfSquaredWeights) {
        if (n < 1) {
            throw new IllegalArgumentException("n must be positive, was " + n);
        }
        return n / effectiveSampleSize(sumOfWeights, sumOfSquaredWeights);
    }

    private static void checkSums(double sumOfWeights, double sumOfSquaredWeights) {
        if (!(sumOfWeights > 0) || Double.isInfinite(sumOfWeights)) {
            throw new IllegalArgumentException("sumOfWeights must be finite and > 0, was " + sumOfWeights);
        }
        if (!(sumOfSquaredWeights > 0) || Double.isInfinite(sumOfSquaredWeights)) {
            throw new IllegalArgumentException("sumOfSquaredWeights must be finite and > 0, was "
                    + sumOfSquaredWeights);
        }
    }

    private static void check(double[] weights) {
        if (weights == null || weights.length == 0) {
            throw new IllegalArgumentException("weights must hold at least one weight");
        }
        for (int i = 0; i < weights.length; i++) {
            if (!(weights[i] > 0) || Double.isInfinite(weights[i])) {
                throw new IllegalArgumentException("weights[" + i + "] must be finite and > 0, was " + weights[i]);
            }
        }
    }
}
