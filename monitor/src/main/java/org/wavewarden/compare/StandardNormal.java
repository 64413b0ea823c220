package org.wavewarden.compare;

import org.apache.commons.math3.special.Erf;

/**
 * The standard normal distribution the statistics use: its distribution function, quantile and two-sided forms,
 * through commons-math3's {@link Erf} ({@code erfc} for tails, so small p-values keep their precision; the inverse
 * error function of Giles 2010, "Approximating the erfinv function", GPU Computing Gems, for quantiles, as
 * commons-math3's {@code NormalDistribution} computes them).
 */
public final class StandardNormal {

    private static final double SQRT2 = Math.sqrt(2);

    private StandardNormal() {
    }

    /** {@code P(Z <= x)}. */
    public static double cdf(double x) {
        return 0.5 * Erf.erfc(-x / SQRT2);
    }

    /** The x with {@code P(Z <= x) = p}, for p in [0, 1] (minus and plus infinity at the ends). */
    public static double quantile(double p) {
        Checks.closedUnit(p, "p");
        return SQRT2 * Erf.erfInv(2 * p - 1);
    }

    /** The z with {@code P(|Z| <= z) = confidence}: 1.959964 for 95%. */
    public static double twoSidedQuantile(double confidence) {
        return quantile(0.5 + Checks.confidence(confidence) / 2);
    }

    /** The two-sided p-value {@code P(|Z| >= |z|) = erfc(|z| / sqrt 2)}, at most 1. */
    public static double twoSidedP(double z) {
        return Math.min(1, Erf.erfc(Math.abs(z) / SQRT2));
    }
}
