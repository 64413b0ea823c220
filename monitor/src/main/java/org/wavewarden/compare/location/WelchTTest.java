package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * Welch's two-sample t test for a difference in means without assuming equal variances, with the confidence
 * interval of {@code mean(current) - mean(baseline)}.
 *
 * <p>The degrees of freedom are the Welch-Satterthwaite approximation
 * {@code (v1/n1 + v2/n2)^2 / ((v1/n1)^2/(n1-1) + (v2/n2)^2/(n2-1))}. Sources: Welch, B. L. (1947), "The
 * generalization of 'Student's' problem when several different population variances are involved", Biometrika 34,
 * 28-35; Satterthwaite, F. E. (1946), Biometrics Bulletin 2, 110-114. Works from the frequency tables only.
 */
public final class WelchTTest {

    public static final String NAME = "Welch t";

    private WelchTTest() {
    }

    /**
     * @param baseline   the earlier wave, at least 2 observations
     * @param current    the wave being judged, at least 2 observations
     * @param confidence level of the interval, in (0, 1)
     * @throws IllegalArgumentException if a wave has fewer than 2 observations or both waves are constant
     */
    public static MeanDifference test(NumericDistribution baseline, NumericDistribution current, double confidence) {
        Checks.observations(baseline, 2, "baseline");
        Checks.observations(current, 2, "current");
        Checks.confidence(confidence);
        double n1 = baseline.n();
        double n2 = current.n();
        double w1 = baseline.variance() / n1;
        double w2 = current.variance() / n2;
        double se2 = w1 + w2;
        double df = se2 * se2 / (w1 * w1 / (n1 - 1) + w2 * w2 / (n2 - 1));
        double m1 = baseline.mean();
        double m2 = current.mean();
        return TStatistics.result(NAME, m2 - m1, Math.sqrt(se2), df, TestResult.DF_WELCH, m1, m2, confidence);
    }
}
