package org.wavewarden.compare.proportion;

/**
 * Newcombe's hybrid score interval for the difference of two independent proportions p1 - p2 (Newcombe 1998,
 * Statistics in Medicine 17, method 10), built from the two proportions' Wilson intervals: the lower limit is
 * d - sqrt((p1 - l1)^2 + (u2 - p2)^2), the upper d + sqrt((u1 - p1)^2 + (p2 - l2)^2). Unlike a Wald interval it
 * stays inside [-1, 1] and behaves at a rate of zero or one, and it allows for the sampling error of both samples.
 *
 * @param lower lower limit of p1 - p2
 * @param upper upper limit of p1 - p2
 */
public record NewcombeDifference(double lower, double upper) {

    public static NewcombeDifference of(long x1, long n1, long x2, long n2, double confidence) {
        WilsonInterval w1 = WilsonInterval.of(x1, n1, confidence);
        WilsonInterval w2 = WilsonInterval.of(x2, n2, confidence);
        double p1 = (double) x1 / n1;
        double p2 = (double) x2 / n2;
        double d = p1 - p2;
        return new NewcombeDifference(d - Math.hypot(p1 - w1.lower(), w2.upper() - p2),
                d + Math.hypot(w1.upper() - p1, p2 - w2.lower()));
    }

    /** Whether the interval holds no difference at all: the two proportions cannot be told apart. */
    public boolean containsZero() {
        return lower <= 0 && upper >= 0;
    }
}
