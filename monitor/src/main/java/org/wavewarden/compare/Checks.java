package org.wavewarden.compare;

import org.wavewarden.profile.NumericDistribution;

/**
 * The argument checks the statistics share: a wrong argument is a programming error, reported with the argument's
 * name and value as an {@link IllegalArgumentException}.
 */
public final class Checks {

    private Checks() {
    }

    /** A confidence level, in (0, 1). */
    public static double confidence(double confidence) {
        return openUnit(confidence, "confidence");
    }

    /** A probability strictly between 0 and 1 (a quantile's p, a share), named {@code name} in the message. */
    public static double openUnit(double p, String name) {
        if (!(p > 0 && p < 1)) {
            throw new IllegalArgumentException(name + " must lie in (0, 1), was " + p);
        }
        return p;
    }

    /** A probability or a distance between distribution functions, in [0, 1]. */
    public static double closedUnit(double p, String name) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException(name + " must lie in [0, 1], was " + p);
        }
        return p;
    }

    /** A count or a size that must be at least 1. */
    public static long positive(long n, String name) {
        if (n <= 0) {
            throw new IllegalArgumentException(name + " must be positive, was " + n);
        }
        return n;
    }

    /** A number of successes out of n trials: n at least 1, successes in [0, n]. */
    public static void successes(long successes, long n, String successesName, String nName) {
        positive(n, nName);
        if (successes < 0 || successes > n) {
            throw new IllegalArgumentException(successesName + " must lie in [0, " + nName + " = " + n + "], was "
                    + successes);
        }
    }

    /** A table given and holding at least {@code min} observations. */
    public static NumericDistribution observations(NumericDistribution d, long min, String name) {
        if (d == null) {
            throw new IllegalArgumentException(name + " must not be null");
        }
        if (d.n() < min) {
            throw new IllegalArgumentException(name + " needs at least " + min
                    + (min == 1 ? " observation" : " observations") + ", has " + d.n());
        }
        return d;
    }
}
