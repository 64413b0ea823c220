package org.wavewarden.compare.rank;

import org.wavewarden.compare.TestResult;

/**
 * Outcome of the Wilcoxon-Mann-Whitney rank-sum test of two waves.
 *
 * @param test  the test with W as statistic and the two-sided p-value
 * @param u     W = U of the current wave: pairs (current, baseline) with current larger, ties counting one half
 * @param z     the standardised statistic with tie and continuity correction (reported also when the p-value is
 *              exact); 0 when every observation is tied
 * @param exact whether the p-value comes from the exact permutation distribution
 */
public record RankSumResult(TestResult test, double u, double z, boolean exact) {
}
