package org.wavewarden.compare.relation;

import org.wavewarden.compare.Checks;

/**
 * A correlation with its Fisher-z confidence interval.
 *
 * @param method     Pearson or Spearman
 * @param estimate   r or rho, in [-1, 1]
 * @param n          the number of pairs
 * @param ciLow      lower confidence limit; -1 when n &lt;= 3, where the Fisher-z variance is undefined
 * @param ciHigh     upper confidence limit; 1 when n &lt;= 3
 * @param confidence the confidence level of the interval
 */
public record CorrelationResult(CorrelationMethod method, double estimate, long n, double ciLow, double ciHigh,
                                double confidence) {

    public CorrelationResult {
        if (method == null) {
            throw new IllegalArgumentException("method must not be null");
        }
        if (!(estimate >= -1 && estimate <= 1)) {
            throw new IllegalArgumentException("estimate must lie in [-1, 1], was " + estimate);
        }
        if (n < 2) {
            throw new IllegalArgumentException("n must be at least 2, was " + n);
        }
        if (!(ciLow <= ciHigh)) {
            throw new IllegalArgumentException("ciLow " + ciLow + " exceeds ciHigh " + ciHigh);
        }
        Checks.confidence(confidence);
    }

    /** The same correlation without sampling error (a complete enumeration): the interval is the estimate. */
    public CorrelationResult exact() {
        return new CorrelationResult(method, estimate, n, estimate, estimate, confidence);
    }
}
