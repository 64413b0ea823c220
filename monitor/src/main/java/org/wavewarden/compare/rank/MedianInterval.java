package org.wavewarden.compare.rank;

import org.apache.commons.math3.distribution.BinomialDistribution;
import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.profile.NumericDistribution;

/**
 * The median of a sample with its distribution-free interval, the one that goes with the sign test: the order
 * statistics {@code [x_(k), x_(n - k + 1)]} with {@code k} the lower {@code (1 - confidence) / 2} quantile of
 * Binomial(n, 1/2) (R's {@code qbinom}), whose coverage is {@code 1 - 2 P(B <= k - 1)}, at least the nominal level
 * for any continuous distribution (Hollander and Wolfe 1973, Nonparametric Statistical Methods, Chapter 3; Conover
 * 1999, Practical Nonparametric Statistics, 3rd ed., section 3.2). Used for paired differences: the change of the
 * middle respondent, in the variable's own units.
 *
 * <p>The median is the middle order statistic, or the mean of the two middle ones. With k = 0 (five observations
 * or fewer at 95%) no pair of order statistics reaches the level; the interval is then the range, whose coverage
 * {@code 1 - 2^(1 - n)} falls short of it. Above {@value #NORMAL_QUANTILE_ABOVE} observations k is taken from the
 * normal approximation {@code floor(n/2 - z sqrt(n)/2)}.
 */
public final class MedianInterval {

    public static final String NAME = "median paired difference";
    static final long NORMAL_QUANTILE_ABOVE = 1_000_000;

    private MedianInterval() {
    }

    /**
     * @param sample     at least one observation
     * @param confidence level of the interval, in (0, 1)
     */
    public static EffectSize of(NumericDistribution sample, double confidence) {
        Checks.observations(sample, 1, "sample");
        Checks.confidence(confidence);
        long n = sample.n();
        double median = (orderStatistic(sample, (n - 1) / 2) + orderStatistic(sample, n / 2)) / 2;
        double tail = (1 - confidence) / 2;
        long k;
        if (n > NORMAL_QUANTILE_ABOVE) {
            double z = StandardNormal.quantile(1 - tail);
            k = (long) Math.floor(n / 2.0 - z * Math.sqrt(n) / 2);
        } else {
            k = new BinomialDistribution(null, (int) n, 0.5).inverseCumulativeProbability(tail);
        }
        k = Math.max(1, k);
        double low = orderStatistic(sample, k - 1);
        double high = orderStatistic(sample, n - k);
        return new EffectSize(NAME, median, Math.min(low, median), Math.max(high, median), confidence);
    }

    /** The value at 0-based rank {@code rank} of the sorted sample. */
    static double orderStatistic(NumericDistribution d, long rank) {
        long seen = 0;
        for (int i = 0; i < d.size(); i++) {
            seen += d.count(i);
            if (rank < seen) {
                return d.value(i);
            }
        }
        return d.value(d.size() - 1);
    }
}
