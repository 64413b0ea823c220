package org.wavewarden.compare.rank;

import org.wavewarden.compare.TestResult;

/**
 * Outcome of the Wilcoxon signed-rank test.
 *
 * @param test    the test with V as statistic and the two-sided p-value
 * @param v       V: the sum of the ranks of |x - mu| over the positive differences (zeros dropped)
 * @param z       the standardised statistic with tie and continuity correction (reported also when the p-value
 *                is exact); 0 when no non-zero difference is left
 * @param exact   whether the p-value comes from the exact permutation distribution
 * @param nonZero number of non-zero differences that were ranked
 */
public record SignedRankResult(TestResult test, double v, double z, boolean exact, long nonZero) {
}
