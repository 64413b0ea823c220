package org.wavewarden.compare.rank;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.profile.NumericDistribution;

/**
 * Hodges-Lehmann estimate of the shift between two waves, in raw units, with its distribution-free interval.
 *
 * <p>The estimate is the median of all n1 * n2 differences current_i - baseline_j (Hodges &amp; Lehmann 1963); for
 * an even number of pairs, the mean of the two middle ones. The interval inverts the two-sided rank-sum test in its
 * normal approximation with tie-corrected variance and continuity correction (Lehmann 1975, Section 2.6; Bauer
 * 1972): its limits are the pairwise differences at which the standardised U of the shifted current wave crosses
 * the normal quantiles. That is the interval R's {@code wilcox.test(current, baseline, conf.int = TRUE,
 * exact = FALSE, correct = TRUE)} seeks with a numerical root finder; here the crossing is located exactly by rank
 * selection among the differences, without forming the pairs.
 */
public final class HodgesLehmann {

    public static final String NAME = "Hodges-Lehmann shift";

    private HodgesLehmann() {
    }

    /** Shift of {@code current} relative to {@code baseline} with a {@code confidence} interval. */
    public static EffectSize estimate(NumericDistribution baseline, NumericDistribution current, double confidence) {
        Checks.observations(baseline, 1, "baseline");
        Checks.observations(current, 1, "current");
        Checks.confidence(confidence);
        PairwiseDifferences diffs = new PairwiseDifferences(baseline, current);
        long pairs = diffs.pairs();

        double estimate = pairs % 2 == 1
                ? diffs.kthSmallest((pairs + 1) / 2)
                : 0.5 * diffs.kthSmallest(pairs / 2) + 0.5 * diffs.kthSmallest(pairs / 2 + 1);

        long nb = baseline.n();
        long nc = current.n();
        double n = nb + nc;
        // Between two pairwise differences no current value shifted by d meets a baseline value, so the only ties
        // are those inside each wave.
        double ties = Tables.tieTerm(baseline) + Tables.tieTerm(current);
        double sigma = Math.sqrt(nb * (double) nc / 12.0 * ((n + 1) - ties / (n * (n - 1))));
        double zq = StandardNormal.twoSidedQuantile(confidence);

        double low = diffs.kthSmallest(rankOfRoot(pairs, sigma, zq));
        double high = diffs.kthSmallest(rankOfRoot(pairs, sigma, -zq));
        return new EffectSize(NAME, estimate, low, high, confidence);
    }

    /**
     * For a shift d strictly between two pairwise differences, G(d) pairs still have current - d above baseline and
     * the corrected statistic is h(G) = (G - N/2 - sign(G - N/2) / 2) / sigma - zq, rising in G while G falls in d.
     * The root is the difference at which h changes sign: the (N - Gmax)-th smallest, Gmax being the largest G with
     * h(G) <= 0; clamped to the smallest and largest difference as R does when no crossing exists.
     */
    static long rankOfRoot(long pairs, double sigma, double zq) {
        double half = pairs / 2.0;
        long g = (long) Math.floor(half + zq * sigma + 0.5);
        g = Math.max(-1, Math.min(pairs, g));
        while (g >= 0 && h(g, half, sigma, zq) > 0) {
            g--;
        }
        while (g < pairs && h(g + 1, half, sigma, zq) <= 0) {
            g++;
        }
        long k = pairs - g;
        return Math.max(1, Math.min(pairs, k));
    }

    private static double h(long g, double half, double sigma, double zq) {
        double dev = g - half;
        return (dev - 0.5 * Math.signum(dev)) / sigma - zq;
    }
}
