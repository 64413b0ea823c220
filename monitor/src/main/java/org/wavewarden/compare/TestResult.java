package org.wavewarden.compare;

/**
 * The outcome of one hypothesis test.
 *
 * @param test         the method, e.g. "Welch t", "Mann-Whitney U", "Pearson chi-square"
 * @param statistic    the test statistic as the method defines it (t, W, X2, z, ...)
 * @param df           degrees of freedom, or NaN where the method has none
 * @param pValue       two-sided p-value unless the method says otherwise
 * @param dfConvention how {@code df} was obtained, so that a reader can reproduce the p-value with another tool
 *                     (e.g. "Welch-Satterthwaite"); null where the method has no df or states none
 */
public record TestResult(String test, double statistic, double df, double pValue, String dfConvention) {

    /** Welch's two-sample t. */
    public static final String DF_WELCH = "Welch-Satterthwaite";
    /** Student's one-sample t and the paired t on the differences. */
    public static final String DF_ONE_SAMPLE = "n - 1";
    /** The paired t: one less than the number of pairs. */
    public static final String DF_PAIRED = "pairs - 1";
    /** Student's pooled two-sample t. */
    public static final String DF_POOLED = "n_baseline + n_current - 2";

    public TestResult {
        if (!(pValue >= 0 && pValue <= 1)) {
            throw new IllegalArgumentException("pValue must lie in [0, 1], was " + pValue + " for " + test);
        }
    }

    /** A test whose df, if any, needs no stated convention. */
    public TestResult(String test, double statistic, double df, double pValue) {
        this(test, statistic, df, pValue, null);
    }

    public static TestResult withoutDf(String test, double statistic, double pValue) {
        return new TestResult(test, statistic, Double.NaN, pValue, null);
    }
}
