package org.wavewarden.compare.categorical;

import org.apache.commons.math3.special.Gamma;
import org.wavewarden.compare.TestResult;

/**
 * Fisher's exact test for a 2 x 2 table (Fisher 1935, The Design of Experiments; Agresti 2007, section 2.6).
 *
 * <p>Conditional on both margins, the top-left count follows a hypergeometric distribution. The two-sided p-value is
 * the total probability of the tables no more probable than the observed one, with the relative tolerance 1e-7 that
 * R's {@code fisher.test} uses so that tables tied in probability up to rounding count as tied. Probabilities are
 * computed in log space, so tables with counts in the millions do not underflow.
 *
 * <p>The reported statistic is the top-left count {@code a}, the quantity the test conditions on.
 */
public final class FisherExact {

    static final String NAME = "Fisher exact";
    private static final double RELATIVE_TOLERANCE = 1 + 1e-7;

    private FisherExact() {
    }

    /**
     * Two-sided test of the table {@code a b / c d}: rows the baseline and the current wave, columns the two
     * outcomes.
     */
    public static TestResult twoByTwo(long a, long b, long c, long d) {
        check(a, "a");
        check(b, "b");
        check(c, "c");
        check(d, "d");
        long m = a + c; // first column total: the "successes" of the urn
        long nOther = b + d;
        long k = a + b; // first row total: the draws
        long lo = Math.max(0, k - nOther);
        long hi = Math.min(k, m);
        int size = Math.toIntExact(hi - lo + 1);
        double[] logd = new double[size];
        double max = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < size; i++) {
            long x = lo + i;
            logd[i] = logChoose(m, x) + logChoose(nOther, k - x);
            max = Math.max(max, logd[i]);
        }
        double observed = Math.exp(logd[Math.toIntExact(a - lo)] - max);
        double total = 0;
        double tail = 0;
        for (double l : logd) {
            double p = Math.exp(l - max);
            total += p;
            if (p <= observed * RELATIVE_TOLERANCE) {
                tail += p;
            }
        }
        return TestResult.withoutDf(NAME, a, Math.min(1, tail / total));
    }

    static double logChoose(long n, long k) {
        if (k == 0 || k == n) {
            return 0;
        }
        return Gamma.logGamma(n + 1.0) - Gamma.logGamma(k + 1.0) - Gamma.logGamma(n - k + 1.0);
    }

    private static void check(long v, String name) {
        if (v < 0) {
            throw new IllegalArgumentException(name + " must not be negative, was " + v);
        }
    }
}
