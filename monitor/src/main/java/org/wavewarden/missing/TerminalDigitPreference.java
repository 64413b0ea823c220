package org.wavewarden.missing;

import java.util.Arrays;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.profile.Quantiles;

/**
 * Preference for some last digits in whole-number answers (minutes, hours, amounts): Pearson's chi-square of the
 * last-digit counts against the uniform distribution (9 degrees of freedom), with the index of dissimilarity
 * {@code 0.5 * sum |share_d - 0.1|} (the share of answers that would have to move to another digit for the digits
 * to be uniform). See Shryock and Siegel, The Methods and Materials of Demography, on digit preference, and Pearson
 * (1900) for the test.
 *
 * <p>The last digit is uniform only when the answers spread over several decades, so the test applies when every
 * value is a whole number, there are at least 50 answers (an expected count of 5 per digit, after Cochran 1954), and
 * the values from the 10th to the 90th percentile span at least {@value #MIN_SPREAD} units. Otherwise
 * {@code applicable} is false, {@code reason} says why, and the statistic is NaN.
 *
 * @param applicable    whether the test applies to these values
 * @param reason        why not, or "" when it applies
 * @param digitCounts   answers per last digit 0..9 (of the absolute value)
 * @param chiSquare     Pearson's X2 against uniform
 * @param pValue        upper-tail p-value of X2 on 9 degrees of freedom
 * @param dissimilarity the index of dissimilarity, in [0, 0.9]
 */
public record TerminalDigitPreference(boolean applicable, String reason, long[] digitCounts, double chiSquare,
                                      double pValue, double dissimilarity) {

    static final int MIN_N = 50;
    static final double MIN_SPREAD = 20;

    public TerminalDigitPreference {
        digitCounts = digitCounts.clone();
        if (digitCounts.length != 10) {
            throw new IllegalArgumentException("digitCounts must have 10 entries, had " + digitCounts.length);
        }
    }

    public static TerminalDigitPreference test(NumericDistribution values) {
        if (values == null) {
            throw new IllegalArgumentException("values must not be null");
        }
        long[] counts = new long[10];
        long n = values.n();
        for (int i = 0; i < values.size(); i++) {
            double x = values.value(i);
            if (x != Math.rint(x)) {
                return notApplicable("values are not whole numbers (" + NumberText.plain(x) + ")", counts);
            }
            // The remainder in double arithmetic is exact and never overflows: a cast to long would saturate at
            // +-1e308, and the absolute value of Long.MIN_VALUE stays negative.
            counts[(int) Math.abs(x % 10)] += values.count(i);
        }
        if (n < MIN_N) {
            return notApplicable("only " + n + " answers; at least " + MIN_N + " are needed", counts);
        }
        double spread = Quantiles.inverse(values, 0.9) - Quantiles.inverse(values, 0.1);
        if (spread < MIN_SPREAD) {
            return notApplicable("the middle 80% of answers span " + NumberText.plain(spread) + " units; at least "
                    + NumberText.plain(MIN_SPREAD) + " are needed for the last digit to be uniform", counts);
        }
        double expected = n / 10.0;
        double x2 = 0;
        double dis = 0;
        for (long c : counts) {
            x2 += (c - expected) * (c - expected) / expected;
            dis += Math.abs((double) c / n - 0.1);
        }
        double p = new ChiSquaredDistribution(9).cumulativeProbability(x2);
        return new TerminalDigitPreference(true, "", counts, x2, Math.min(1, Math.max(0, 1 - p)), dis / 2);
    }

    /** The test as a {@link TestResult}, for the false-discovery-rate step; only when applicable. */
    public TestResult toTestResult() {
        if (!applicable) {
            throw new IllegalStateException("terminal-digit test does not apply: " + reason);
        }
        return new TestResult("Pearson chi-square, terminal digit against uniform", chiSquare, 9, pValue);
    }

    private static TerminalDigitPreference notApplicable(String why, long[] counts) {
        return new TerminalDigitPreference(false, why, counts, Double.NaN, Double.NaN, Double.NaN);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof TerminalDigitPreference t && applicable == t.applicable && reason.equals(t.reason)
                && Arrays.equals(digitCounts, t.digitCounts) && Double.compare(chiSquare, t.chiSquare) == 0
                && Double.compare(pValue, t.pValue) == 0 && Double.compare(dissimilarity, t.dissimilarity) == 0;
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(digitCounts) + Double.hashCode(chiSquare);
    }
}
