package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * The one-sample t test of {@code mean = mu}, df = n - 1, with the confidence interval of {@code mean - mu}.
 *
 * <p>Source: Student (1908), "The probable error of a mean", Biometrika 6, 1-25. In the returned
 * {@link MeanDifference} the "baseline mean" is {@code mu} and the "current mean" is the sample mean.
 */
public final class OneSampleTTest {

    public static final String NAME = "one-sample t";

    private OneSampleTTest() {
    }

    /**
     * @param sample     at least 2 observations, not all equal
     * @param mu         the hypothesised mean, finite
     * @param confidence level of the interval, in (0, 1)
     */
    public static MeanDifference test(NumericDistribution sample, double mu, double confidence) {
        Checks.observations(sample, 2, "sample");
        if (!Double.isFinite(mu)) {
            throw new IllegalArgumentException("mu must be finite, was " + mu);
        }
        Checks.confidence(confidence);
        return of(NAME, sample, mu, confidence, mu, sample.mean(), TestResult.DF_ONE_SAMPLE);
    }

    static MeanDifference of(String name, NumericDistribution sample, double mu, double confidence,
                             double meanBaseline, double meanCurrent, String dfConvention) {
        double n = sample.n();
        double se = Math.sqrt(sample.variance() / n);
        return TStatistics.result(name, sample.mean() - mu, se, n - 1, dfConvention, meanBaseline, meanCurrent,
                confidence);
    }
}
