package org.wavewarden.compare.design;

import org.wavewarden.compare.Checks;

/**
 * The weighted empirical distribution function {@code F_w(x) = sum of weights of values <= x / W} of a
 * {@link WeightedTally}, its quantiles and the largest gap between two waves' functions.
 *
 * <p>Quantile definition: {@code Q(p) = min {x : F_w(x) >= p}}, the inverse of the weighted distribution function
 * (Hyndman, R. J. and Fan, Y. (1996), "Sample quantiles in statistical packages", The American Statistician 50,
 * 361-365, definition 1, with weights). It is the default of R's survey package from version 4.1 on,
 * {@code svyquantile(~y, design, p)} with {@code qrule = "math"}, which also drops zero weights first. Equality
 * {@code F_w(x) = p} is decided with a tolerance of {@code 1e-12 W}, because a tally's sums of weights are added in
 * another order than the rows' and R's exact comparison would otherwise flip on the last bit.
 */
public final class WeightedDistribution {

    private static final double TIE = 1e-12;

    private WeightedDistribution() {
    }

    /** {@code min {x : F_w(x) >= p}} for p in (0, 1). */
    public static double quantile(WeightedTally t, double p) {
        Checks.openUnit(p, "p");
        double total = total(t);
        double target = p * total - TIE * total;
        double cum = 0;
        double last = Double.NaN;
        for (int i = 0; i < t.size(); i++) {
            if (t.weight(i) == 0) {
                continue;
            }
            cum += t.weight(i);
            last = t.value(i);
            if (cum >= target) {
                return last;
            }
        }
        return last;
    }

    /**
     * The Kolmogorov-Smirnov distance of the weighted distribution functions, {@code sup_x |F_current(x) -
     * F_baseline(x)|}, taken after every distinct value of either wave (Kolmogorov 1933; Smirnov 1939, with
     * weighted distribution functions).
     */
    public static double cdfDistance(WeightedTally baseline, WeightedTally current) {
        total(baseline);
        total(current);
        return org.wavewarden.compare.shape.CumulativeGap.largestGap(baseline.values(), baseline.weights(),
                current.values(), current.weights());
    }

    private static double total(WeightedTally t) {
        if (t == null) {
            throw new IllegalArgumentException("tally must not be null");
        }
        double w = t.totalWeight();
        if (!(w > 0)) {
            throw new IllegalArgumentException("tally has no weight: every respondent's weight is zero");
        }
        return w;
    }
}
