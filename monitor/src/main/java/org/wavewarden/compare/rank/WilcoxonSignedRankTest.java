package org.wavewarden.compare.rank;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * Wilcoxon signed-rank test (Wilcoxon 1945), one-sample about mu and for paired observations.
 *
 * <p>V is the sum of the ranks of |x - mu| over the positive differences, zeros dropped and ties given mid-ranks,
 * as R's {@code wilcox.test} defines it. The p-value is exact, from the permutation distribution of V, when fewer
 * than 50 non-zero differences remain and there are neither ties nor zeros (R's rule); otherwise it is the normal
 * approximation with the tie-corrected variance n(n+1)(2n+1)/24 - sum(t^3 - t)/48 and a continuity correction of
 * one half (Hollander &amp; Wolfe 1973, Section 3.1). The one-sample form works on the frequency table: the
 * positive and the negative side are merged by absolute value in O(k).
 */
public final class WilcoxonSignedRankTest {

    private WilcoxonSignedRankTest() {
    }

    /** Two-sided test that the distribution of {@code sample} is symmetric about {@code mu}. */
    public static SignedRankResult oneSample(NumericDistribution sample, double mu) {
        Checks.observations(sample, 1, "sample");
        if (!Double.isFinite(mu)) {
            throw new IllegalArgumentException("mu must be finite, was " + mu);
        }
        int k = sample.size();
        double[] x = new double[k];
        for (int i = 0; i < k; i++) {
            x[i] = sample.value(i) - mu;
        }
        // negatives: indices below firstNonNegative, read backwards to ascend in |x|; positives ascend forwards
        int firstNonNegative = 0;
        while (firstNonNegative < k && x[firstNonNegative] < 0) {
            firstNonNegative++;
        }
        int firstPositive = firstNonNegative;
        long zeros = 0;
        while (firstPositive < k && x[firstPositive] == 0) {
            zeros += sample.count(firstPositive++);
        }

        int neg = firstNonNegative - 1;
        int pos = firstPositive;
        double rankBase = 0; // observations with smaller |x| already ranked
        double v = 0;
        double tieTerm = 0;
        boolean ties = false;
        while (neg >= 0 || pos < k) {
            double a;
            if (pos >= k || (neg >= 0 && -x[neg] <= x[pos])) {
                a = -x[neg];
            } else {
                a = x[pos];
            }
            long total = 0;
            long positives = 0;
            while (neg >= 0 && -x[neg] == a) {
                total += sample.count(neg--);
            }
            while (pos < k && x[pos] == a) {
                positives += sample.count(pos);
                total += sample.count(pos++);
            }
            double midRank = rankBase + (total + 1) / 2.0;
            v += positives * midRank;
            double t = total;
            tieTerm += t * t * t - t;
            ties |= total > 1;
            rankBase += total;
        }
        double n = rankBase;
        if (n == 0) {
            return new SignedRankResult(TestResult.withoutDf("Wilcoxon signed rank", 0, 1.0), 0, 0, false, 0);
        }
        double centre = n * (n + 1) / 4;
        double sigma = Math.sqrt(n * (n + 1) * (2 * n + 1) / 24 - tieTerm / 48);
        double dev = v - centre;
        double z = sigma > 0 ? (dev - 0.5 * Math.signum(dev)) / sigma : 0.0;

        boolean exact = n < MannWhitneyTest.EXACT_LIMIT && !ties && zeros == 0;
        double p;
        if (exact) {
            p = ExactNullDistributions.twoSided(ExactNullDistributions.signedRank((int) n), (int) Math.round(v), centre);
        } else {
            p = sigma > 0 ? StandardNormal.twoSidedP(z) : 1.0;
        }
        return new SignedRankResult(TestResult.withoutDf("Wilcoxon signed rank", v, p), v, z, exact, (long) n);
    }

    /** Paired test on the differences current[i] - baseline[i] (R's {@code wilcox.test(current, baseline, paired = TRUE)}). */
    public static SignedRankResult paired(double[] baseline, double[] current) {
        if (baseline == null || current == null) {
            throw new IllegalArgumentException((baseline == null ? "baseline" : "current") + " must not be null");
        }
        if (baseline.length != current.length) {
            throw new IllegalArgumentException("baseline has " + baseline.length + " observations but current has "
                    + current.length);
        }
        if (baseline.length == 0) {
            throw new IllegalArgumentException("baseline has no observations");
        }
        double[] diffs = new double[baseline.length];
        for (int i = 0; i < diffs.length; i++) {
            if (!Double.isFinite(baseline[i]) || !Double.isFinite(current[i])) {
                throw new IllegalArgumentException("pair " + i + " is not finite: baseline " + baseline[i]
                        + ", current " + current[i]);
            }
            diffs[i] = current[i] - baseline[i];
        }
        return oneSample(NumericDistribution.ofSample(diffs), 0.0);
    }
}
