package org.wavewarden.compare;

/**
 * The outcome of one hypothesis test.
 *
 * @param test      the method, e.g. "Welch t", "Mann-Whitney U", "Pearson chi-square"
 * @param statistic the test statistic as the method defines it (t, W, X2, z, ...)
 * @param df        degrees of freedom, or NaN where the method has none
 * @param pValue    two-sided p-value unless the method says otherwise
 */
public record TestResult(String test, double statistic, double df, double pValue) {

    public TestResult {
        if (!(pValue >= 0 && pValue <= 1)) {
            throw new IllegalArgumentException("pValue must lie in [0, 1], was " + pValue + " for " + test);
        }
    }

    public static TestResult withoutDf(String test, double statistic, double pValue) {
        return new TestResult(test, statistic, Double.NaN, pValue);
    }
}
