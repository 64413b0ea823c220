package org.wavewarden.compare.categorical;

import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;

/**
 * Pearson's chi-square goodness-of-fit test of observed counts against given category proportions, X2 =
 * sum (O - n p)^2 / (n p) on k - 1 degrees of freedom (Pearson 1900; Agresti 2007, section 1.5.5; R's
 * {@code chisq.test(x, p = ...)}), and Cohen's w = sqrt(X2 / n) for it (Cohen 1988, chapter 7) with the noncentral
 * chi-square interval (Smithson 2003).
 *
 * <p>Typical use: the current wave's counts against the baseline wave's shares taken as known.
 */
public final class ChiSquareGoodnessOfFit {

    static final String NAME = "Pearson chi-square goodness of fit";

    /** How the df of this test are counted. */

    static final String DF_CONVENTION = "categories - 1";

    private ChiSquareGoodnessOfFit() {
    }

    public static TestResult test(long[] observed, double[] expectedProportions) {
        check(observed, expectedProportions);
        double n = 0;
        for (long o : observed) {
            n += o;
        }
        int df = observed.length - 1;
        if (n == 0 || df == 0) {
            return new TestResult(NAME, 0, df, 1, DF_CONVENTION);
        }
        double x2 = 0;
        for (int i = 0; i < observed.length; i++) {
            double e = n * expectedProportions[i];
            double d = observed[i] - e;
            x2 += d * d / e;
        }
        return new TestResult(NAME, x2, df, ChiSquareHomogeneity.upperTail(x2, df), DF_CONVENTION);
    }

    public static EffectSize cohensW(long[] observed, double[] expectedProportions, double confidence) {
        TestResult t = test(observed, expectedProportions);
        double n = 0;
        for (long o : observed) {
            n += o;
        }
        return CohensW.fromStatistic(t.statistic(), t.df(), n, confidence);
    }

    private static void check(long[] observed, double[] p) {
        if (observed == null || observed.length == 0) {
            throw new IllegalArgumentException("observed must have at least one category");
        }
        if (p == null || p.length != observed.length) {
            throw new IllegalArgumentException("expectedProportions must have one entry per observed category ("
                    + observed.length + "), had " + (p == null ? "none" : p.length));
        }
        double sum = 0;
        for (int i = 0; i < p.length; i++) {
            if (observed[i] < 0) {
                throw new IllegalArgumentException("observed[" + i + "] must not be negative, was " + observed[i]);
            }
            if (!(p[i] > 0 && p[i] <= 1)) {
                throw new IllegalArgumentException("expectedProportions[" + i + "] must lie in (0, 1], was " + p[i]);
            }
            sum += p[i];
        }
        // the same tolerance R's chisq.test applies before refusing p
        if (Math.abs(sum - 1) > Math.sqrt(Math.ulp(1.0))) {
            throw new IllegalArgumentException("expectedProportions must sum to 1, summed to " + sum);
        }
    }
}
