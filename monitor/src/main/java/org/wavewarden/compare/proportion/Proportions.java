package org.wavewarden.compare.proportion;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.special.Erf;

/** Argument checks and normal-distribution helpers shared by the proportion methods. */
final class Proportions {

    private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(null, 0, 1);

    private Proportions() {
    }

    static void checkCount(long successes, long n, String successesName, String nName) {
        if (n <= 0) {
            throw new IllegalArgumentException(nName + " must be positive, was " + n);
        }
        if (successes < 0 || successes > n) {
            throw new IllegalArgumentException(successesName + " must lie in [0, " + nName + " = " + n + "], was "
                    + successes);
        }
    }

    static void checkConfidence(double confidence) {
        if (!(confidence > 0 && confidence < 1)) {
            throw new IllegalArgumentException("confidence must lie in (0, 1), was " + confidence);
        }
    }

    /** The standard normal quantile z with P(|Z| <= z) = confidence. */
    static double twoSidedQuantile(double confidence) {
        return STANDARD_NORMAL.inverseCumulativeProbability(0.5 + confidence / 2);
    }

    /** Two-sided normal p-value 2 P(Z >= |z|), via erfc so that small values keep their precision. */
    static double twoSidedP(double z) {
        return Math.min(1, Erf.erfc(Math.abs(z) / Math.sqrt(2)));
    }
}
