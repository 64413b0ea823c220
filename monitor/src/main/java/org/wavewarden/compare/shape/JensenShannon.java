package org.wavewarden.compare.shape;

import org.wavewarden.profile.NumericDistribution;

/**
 * Jensen-Shannon distance between two distributions: the square root of the Jensen-Shannon divergence
 * JSD(p, q) = KL(p || m) / 2 + KL(q || m) / 2 with m = (p + q) / 2 (Lin 1991, IEEE Transactions on Information
 * Theory 37), in base-2 logarithms so that the divergence and the distance lie in [0, 1]: 0 for identical and 1 for
 * disjoint supports. The square root is a metric (Endres &amp; Schindelin 2003).
 */
public final class JensenShannon {

    private JensenShannon() {
    }

    /**
     * Distance between two weight vectors over the same categories; each is rescaled to sum to one, so shares and
     * counts both work.
     */
    public static double distance(double[] p, double[] q) {
        if (p == null || q == null) {
            throw new IllegalArgumentException((p == null ? "p" : "q") + " must not be null");
        }
        if (p.length != q.length) {
            throw new IllegalArgumentException("p has " + p.length + " entries but q has " + q.length);
        }
        double sp = total(p, "p");
        double sq = total(q, "q");
        double divergence = 0;
        for (int i = 0; i < p.length; i++) {
            double a = p[i] / sp;
            double b = q[i] / sq;
            double m = 0.5 * a + 0.5 * b;
            if (a > 0) {
                divergence += 0.5 * a * Math.log(a / m);
            }
            if (b > 0) {
                divergence += 0.5 * b * Math.log(b / m);
            }
        }
        divergence /= Math.log(2);
        return Math.sqrt(Math.max(0.0, Math.min(1.0, divergence)));
    }

    /** Distance between two aligned count vectors. */
    public static double distance(long[] p, long[] q) {
        if (p == null || q == null) {
            throw new IllegalArgumentException((p == null ? "p" : "q") + " must not be null");
        }
        double[] a = new double[p.length];
        double[] b = new double[q.length];
        for (int i = 0; i < p.length; i++) {
            a[i] = p[i];
        }
        for (int i = 0; i < q.length; i++) {
            b[i] = q[i];
        }
        return distance(a, b);
    }

    /** Distance between two waves' distributions over the union of their distinct values. */
    public static double distance(NumericDistribution baseline, NumericDistribution current) {
        Union u = Union.of(baseline, current);
        return distance(u.baseline, u.current);
    }

    private static double total(double[] w, String name) {
        double s = 0;
        for (int i = 0; i < w.length; i++) {
            if (!(w[i] >= 0) || Double.isInfinite(w[i])) {
                throw new IllegalArgumentException(name + "[" + i + "] must be finite and non-negative, was " + w[i]);
            }
            s += w[i];
        }
        if (!(s > 0)) {
            throw new IllegalArgumentException(name + " must have a positive total");
        }
        return s;
    }
}
