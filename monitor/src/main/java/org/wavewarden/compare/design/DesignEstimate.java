package org.wavewarden.compare.design;

/**
 * A weighted mean or share with its design-based standard error and design effects.
 *
 * <p>The design effect is {@code V_design / V_srs} for the same estimate (Kish, L. (1965), Survey Sampling, Wiley;
 * Kish, L. (1995), "Methods for design effects", Journal of Official Statistics 11, 55-77), with
 * {@code V_srs = s_w^2 / n} and {@code s_w^2 = n/(n-1) sum w (y - ybar)^2 / sum w}, as R's
 * {@code svymean(..., deff = "replace")}. The without-replacement form divides by {@code s_w^2 (N - n) / (N n)} with
 * {@code N = sum w}, as R's {@code svymean(..., deff = TRUE)}; it is NaN when the weights sum to no more than n
 * (weights not scaled to a population). Both depend on the variable, unlike {@link Kish#designEffect}, which
 * depends on the weights only; they coincide with it for a weights-only design when the squared residuals
 * {@code (y - ybar)^2} are constant.
 *
 * @param estimate                        the weighted mean or share
 * @param standardError                   design-based standard error by Taylor linearisation
 * @param designEffect                    design effect against simple random sampling with replacement
 * @param designEffectWithoutReplacement  design effect against simple random sampling without replacement from
 *                                        N = sum of weights; NaN when that N does not exceed n
 */
public record DesignEstimate(double estimate, double standardError, double designEffect,
                             double designEffectWithoutReplacement) {

    public DesignEstimate {
        if (!(standardError >= 0)) {
            throw new IllegalArgumentException("standardError must be >= 0, was " + standardError);
        }
    }
}
