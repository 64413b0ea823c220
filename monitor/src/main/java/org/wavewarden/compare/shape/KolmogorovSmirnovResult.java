package org.wavewarden.compare.shape;

import org.wavewarden.compare.TestResult;

/**
 * Outcome of the two-sample Kolmogorov-Smirnov test.
 *
 * @param test  the test with D as statistic and the two-sided p-value
 * @param d     D = max |F_current - F_baseline| over the pooled values, in [0, 1]
 * @param exact whether the p-value is the exact (conditional on ties) permutation probability
 */
public record KolmogorovSmirnovResult(TestResult test, double d, boolean exact) {
}
