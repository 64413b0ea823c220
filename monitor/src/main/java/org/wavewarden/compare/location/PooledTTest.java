package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * Student's two-sample t test with a pooled variance (equal variances assumed), df = n1 + n2 - 2, with the
 * confidence interval of {@code mean(current) - mean(baseline)}.
 *
 * <p>Source: Student (1908), "The probable error of a mean", Biometrika 6, 1-25; in the two-sample pooled form as
 * in Snedecor, G. W. and Cochran, W. G. (1989), Statistical Methods, 8th ed., Section 6.7. Prefer
 * {@link WelchTTest} for monitoring; this one is kept for comparison with reports that use it.
 */
public final class PooledTTest {

    public static final String NAME = "Student t (pooled)";

    private PooledTTest() {
    }

    /**
     * @param baseline   the earlier wave, at least 1 observation
     * @param current    the wave being judged, at least 1 observation; together at least 3
     * @param confidence level of the interval, in (0, 1)
     * @throws IllegalArgumentException if the pooled variance is undefined or zero
     */
    public static MeanDifference test(NumericDistribution baseline, NumericDistribution current, double confidence) {
        Checks.observations(baseline, 1, "baseline");
        Checks.observations(current, 1, "current");
        Checks.confidence(confidence);
        double n1 = baseline.n();
        double n2 = current.n();
        double df = n1 + n2 - 2;
        if (df < 1) {
            throw new IllegalArgumentException("baseline and current together need at least 3 observations, have "
                    + (long) (n1 + n2));
        }
        double pooled = (sumOfSquares(baseline) + sumOfSquares(current)) / df;
        double se = Math.sqrt(pooled * (1 / n1 + 1 / n2));
        double m1 = baseline.mean();
        double m2 = current.mean();
        return TStatistics.result(NAME, m2 - m1, se, df, TestResult.DF_POOLED, m1, m2, confidence);
    }

    /** Sum of squared deviations from the wave's own mean; zero for a single observation. */
    static double sumOfSquares(NumericDistribution d) {
        double m = d.mean();
        double ss = 0;
        for (int i = 0; i < d.size(); i++) {
            double dev = d.value(i) - m;
            ss += dev * dev * d.count(i);
        }
        return ss;
    }
}
