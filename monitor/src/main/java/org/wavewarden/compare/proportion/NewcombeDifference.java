package org.wavewarden.compare.proportion;

/**
 * Newcombe's hybrid score interval for the difference of two independent proportions, current minus baseline
 * (Newcombe 1998, Statistics in Medicine 17, method 10), built from the two proportions' Wilson intervals: with d =
 * p1 - p2 for the current p1 and the baseline p2, the lower limit is d - sqrt((p1 - l1)^2 + (u2 - p2)^2), the upper
 * d + sqrt((u1 - p1)^2 + (p2 - l2)^2). Unlike a Wald interval it stays inside [-1, 1] and behaves at a rate of zero
 * or one, and it allows for the sampling error of both samples.
 *
 * @param lower lower limit of current minus baseline
 * @param upper upper limit of current minus baseline
 */
public record NewcombeDifference(double lower, double upper) {

    public static NewcombeDifference of(long baselineSuccesses, long baselineN, long currentSuccesses, long currentN,
                                        double confidence) {
        WilsonInterval w1 = WilsonInterval.of(currentSuccesses, currentN, confidence);
        WilsonInterval w2 = WilsonInterval.of(baselineSuccesses, baselineN, confidence);
        double p1 = (double) currentSuccesses / currentN;
        double p2 = (double) baselineSuccesses / baselineN;
        double d = p1 - p2;
        return new NewcombeDifference(d - Math.hypot(p1 - w1.lower(), w2.upper() - p2),
                d + Math.hypot(w1.upper() - p1, p2 - w2.lower()));
    }

    /** Whether the interval holds no difference at all: the two proportions cannot be told apart. */
    public boolean containsZero() {
        return lower <= 0 && upper >= 0;
    }
}
