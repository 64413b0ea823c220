package org.wavewarden.compare.shape;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;

/**
 * A distribution-free confidence interval for the Kolmogorov-Smirnov distance D = sup |F_current - F_baseline|
 * between the two waves' populations, from the Dvoretzky-Kiefer-Wolfowitz inequality with Massart's (1990) tight
 * constant: P(sup |F_n - F| > e) <= 2 exp(-2 n e^2). Splitting the error rate between the two waves and applying
 * the triangle inequality, the population distance lies within e_b + e_c of the observed one, where
 * e = sqrt(ln(4 / (1 - confidence)) / (2 n)). The interval is conservative (coverage at least the nominal level).
 */
public final class DistanceInterval {

    private DistanceInterval() {
    }

    /** The half-width e for one wave of {@code n} observations. */
    public static double halfWidth(long n, double confidence) {
        if (n < 1) {
            throw new IllegalArgumentException("n must be positive, was " + n);
        }
        Checks.confidence(confidence);
        return Math.sqrt(Math.log(4 / (1 - confidence)) / (2.0 * n));
    }

    /**
     * The same interval for weighted waves, with Kish's effective sample sizes in place of n (an approximation:
     * the inequality holds for simple random samples, and a weighted wave is treated as one of its effective size).
     */
    public static EffectSize ofEffectiveSizes(double d, double nBaseline, double nCurrent, double confidence) {
        Checks.closedUnit(d, "d");
        double e = halfWidth(nBaseline, confidence) + halfWidth(nCurrent, confidence);
        return new EffectSize("KS distance (weighted)", d, Math.max(0, d - e), Math.min(1, d + e), confidence);
    }

    private static double halfWidth(double n, double confidence) {
        if (!(n > 0) || Double.isInfinite(n)) {
            throw new IllegalArgumentException("n must be finite and positive, was " + n);
        }
        Checks.confidence(confidence);
        return Math.sqrt(Math.log(4 / (1 - confidence)) / (2.0 * n));
    }

    public static EffectSize of(double d, long nBaseline, long nCurrent, double confidence) {
        Checks.closedUnit(d, "d");
        double e = halfWidth(nBaseline, confidence) + halfWidth(nCurrent, confidence);
        return new EffectSize("KS distance", d, Math.max(0, d - e), Math.min(1, d + e), confidence);
    }
}
