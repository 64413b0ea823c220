package org.wavewarden.compare.relation;

import org.wavewarden.compare.Checks;
import org.apache.commons.math3.util.FastMath;
import org.wavewarden.compare.StandardNormal;

/**
 * Whether a correlation changed between two independently sampled waves.
 *
 * <p>Test: Fisher's z, z = (atanh r2 - atanh r1) / sqrt(c / (n1 - 3) + c / (n2 - 3)) with a two-sided standard
 * normal p-value (Fisher, R. A. (1925), Statistical Methods for Research Workers, Oliver and Boyd; c = 1 for Pearson's
 * r, 1.06 for Spearman's rho after Fieller, Hartley and Pearson 1957, see {@link CorrelationMethod}). The sign follows
 * the project's convention, current (r2) minus baseline (r1); |z| and p are those of R's
 * {@code psych::r.test(n = n1, r12 = r1, r34 = r2, n2 = n2)}, which reports |z|.
 *
 * <p>Interval for r2 - r1: Zou's (2007) method of recovering variance estimates from the two single-correlation
 * Fisher-z intervals (l1, u1) and (l2, u2), with the same c:
 * L = r2 - r1 - sqrt((r2 - l2)^2 + (u1 - r1)^2), U = r2 - r1 + sqrt((u2 - r2)^2 + (r1 - l1)^2) (Zou, G. Y. (2007),
 * "Toward using confidence intervals to compare correlations", Psychological Methods 12, 399-413, equation for two
 * independent correlations). Unlike back-transforming the interval of atanh r2 - atanh r1, which is not an interval
 * for r2 - r1 at all, it respects the skewness of each r near the bounds and always lies inside [-2, 2].
 */
public final class CorrelationDifference {

    private CorrelationDifference() {
    }

    /**
     * Compares two waves' correlations of the same kind, each as {@link Correlation} computed it.
     *
     * @param baseline   the baseline wave's correlation
     * @param current    the current wave's correlation, of the same {@link CorrelationMethod}
     * @param confidence level of the interval, in (0, 1)
     */
    public static CorrelationDifferenceResult compare(CorrelationResult baseline, CorrelationResult current,
                                                      double confidence) {
        if (baseline == null || current == null) {
            throw new IllegalArgumentException((baseline == null ? "baseline" : "current") + " must not be null");
        }
        if (baseline.method() != current.method()) {
            throw new IllegalArgumentException("baseline is a " + baseline.method().label() + " but current is a "
                    + current.method().label() + "; compare correlations of one kind");
        }
        return compare(baseline.method(), baseline.estimate(), baseline.n(), current.estimate(), current.n(),
                confidence);
    }

    /**
     * @param method     the coefficient, which sets c
     * @param r1         the baseline wave's correlation, in (-1, 1)
     * @param n1         the baseline wave's number of pairs, at least 4
     * @param r2         the current wave's correlation, in (-1, 1)
     * @param n2         the current wave's number of pairs, at least 4
     * @param confidence level of the interval, in (0, 1)
     * @throws IllegalArgumentException on |r| &gt;= 1 (atanh is infinite), n &lt;= 3 (the Fisher-z variance is
     *                                  undefined) or a confidence outside (0, 1)
     */
    public static CorrelationDifferenceResult compare(CorrelationMethod method, double r1, long n1, double r2,
                                                      long n2, double confidence) {
        if (method == null) {
            throw new IllegalArgumentException("method must not be null");
        }
        checkR("r1", r1);
        checkR("r2", r2);
        checkN("n1", n1);
        checkN("n2", n2);
        Checks.confidence(confidence);
        double c = method.varianceNumerator();
        double z1 = FastMath.atanh(r1);
        double z2 = FastMath.atanh(r2);
        double v1 = c / (n1 - 3);
        double v2 = c / (n2 - 3);
        double z = (z2 - z1) / Math.sqrt(v1 + v2);
        double p = StandardNormal.twoSidedP(z);

        double q = StandardNormal.twoSidedQuantile(confidence);
        double l1 = FastMath.tanh(z1 - q * Math.sqrt(v1));
        double u1 = FastMath.tanh(z1 + q * Math.sqrt(v1));
        double l2 = FastMath.tanh(z2 - q * Math.sqrt(v2));
        double u2 = FastMath.tanh(z2 + q * Math.sqrt(v2));
        double d = r2 - r1;
        double low = d - Math.sqrt((r2 - l2) * (r2 - l2) + (u1 - r1) * (u1 - r1));
        double high = d + Math.sqrt((u2 - r2) * (u2 - r2) + (r1 - l1) * (r1 - l1));
        String name = "Fisher z (" + method.label() + "), Zou interval";
        return new CorrelationDifferenceResult(method, r1, r2, n1, n2, z, p, d, low, high, confidence, name);
    }

    private static void checkR(String name, double r) {
        if (!(r > -1 && r < 1)) {
            throw new IllegalArgumentException(name + " must lie in (-1, 1) for Fisher's z, was " + r);
        }
    }

    private static void checkN(String name, long n) {
        if (n <= 3) {
            throw new IllegalArgumentException(name + " must be at least 4 for the Fisher-z variance c / (n - 3), was "
                    + n);
        }
    }
}
