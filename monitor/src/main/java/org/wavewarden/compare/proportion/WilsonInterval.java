package org.wavewarden.compare.proportion;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.StandardNormal;
/**
 * The Wilson (1927, JASA 22) score interval for one binomial proportion, without continuity correction: the
 * proportions p whose score statistic (phat - p) / sqrt(p (1 - p) / n) lies within +-z (R's
 * {@code prop.test(x, n, correct = FALSE)$conf.int}).
 *
 * @param lower lower limit
 * @param upper upper limit
 */
public record WilsonInterval(double lower, double upper) {

    public static WilsonInterval of(long successes, long n, double confidence) {
        Checks.successes(successes, n, "successes", "n");
        return ofShare((double) successes / n, n, confidence);
    }

    /**
     * The interval for a share p of n answers where n need not be whole: a weighted share at Kish's effective sample
     * size, as the design-based share falls back to where its own interval is undefined (a share of 0 or 1).
     */
    public static WilsonInterval ofShare(double p, double n, double confidence) {
        Checks.closedUnit(p, "p");
        if (!(n > 0)) {
            throw new IllegalArgumentException("n must be positive, is " + n);
        }
        Checks.confidence(confidence);
        double z = StandardNormal.twoSidedQuantile(confidence);
        double z2 = z * z;
        double centre = p + z2 / (2.0 * n);
        double half = z * Math.sqrt(p * (1 - p) / n + z2 / (4.0 * n * n));
        double denominator = 1 + z2 / n;
        // at p = 0 or 1 one limit is exactly 0 or 1; computing it as a difference would leave rounding dust
        double lower = p == 0 ? 0 : Math.max(0, (centre - half) / denominator);
        double upper = p == 1 ? 1 : Math.min(1, (centre + half) / denominator);
        return new WilsonInterval(lower, upper);
    }
}
