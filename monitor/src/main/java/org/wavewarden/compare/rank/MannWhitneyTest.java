package org.wavewarden.compare.rank;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * Wilcoxon-Mann-Whitney rank-sum test of two waves, computed exactly from their frequency tables.
 *
 * <p>The statistic is W = U of the current wave (Mann &amp; Whitney 1947; Wilcoxon 1945): the number of pairs
 * (current, baseline) in which the current observation is larger, a tie counting one half. It is what R's
 * {@code wilcox.test(current, baseline)} reports. The p-value is exact, from the permutation distribution of U,
 * when both waves have fewer than 50 observations and no value occurs twice in the pooled sample (R's rule);
 * otherwise it is the normal approximation with the tie-corrected variance and a continuity correction of one half
 * (Hollander &amp; Wolfe 1973, Section 4.1; Lehmann 1975, Section 1.4). One merge over the two sorted tables gives
 * U and the tie counts, so the cost is O(k1 + k2) in the number of distinct values.
 */
public final class MannWhitneyTest {

    /** R's bound below which the exact null distribution is used. */
    static final int EXACT_LIMIT = 50;

    private MannWhitneyTest() {
    }

    /** Two-sided rank-sum test; W is the U of {@code current}. */
    public static RankSumResult test(NumericDistribution baseline, NumericDistribution current) {
        Checks.observations(baseline, 1, "baseline");
        Checks.observations(current, 1, "current");
        long nb = baseline.n();
        long nc = current.n();
        double n = nb + nc;

        long greater = 0;
        long tiedPairs = 0;
        double tieTerm = 0; // sum of t^3 - t over the pooled tie groups
        long cumBaseline = 0;
        int i = 0;
        int j = 0;
        int distinct = 0;
        while (i < baseline.size() || j < current.size()) {
            double t;
            if (j == current.size() || (i < baseline.size() && baseline.value(i) < current.value(j))) {
                t = baseline.count(i);
                cumBaseline += baseline.count(i++);
            } else if (i == baseline.size() || current.value(j) < baseline.value(i)) {
                t = current.count(j);
                greater += current.count(j++) * cumBaseline;
            } else {
                t = baseline.count(i) + current.count(j);
                greater += current.count(j) * cumBaseline;
                tiedPairs += current.count(j) * baseline.count(i);
                cumBaseline += baseline.count(i++);
                j++;
            }
            tieTerm += t * t * t - t;
            distinct++;
        }
        double w = greater + 0.5 * tiedPairs;
        double centre = 0.5 * nb * nc;

        double sigma = Math.sqrt(nb * (double) nc / 12.0 * ((n + 1) - tieTerm / (n * (n - 1))));
        double dev = w - centre;
        double z = sigma > 0 ? (dev - 0.5 * Math.signum(dev)) / sigma : 0.0;

        boolean exact = nb < EXACT_LIMIT && nc < EXACT_LIMIT && distinct == n;
        double p;
        if (exact) {
            double[] nullDist = ExactNullDistributions.mannWhitney((int) nc, (int) nb);
            p = ExactNullDistributions.twoSided(nullDist, (int) Math.round(w), centre);
        } else {
            // all observations tied: no evidence of a shift at all
            p = sigma > 0 ? StandardNormal.twoSidedP(z) : 1.0;
        }
        return new RankSumResult(TestResult.withoutDf("Mann-Whitney U", w, p), w, z, exact);
    }
}
