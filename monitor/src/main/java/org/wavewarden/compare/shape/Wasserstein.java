package org.wavewarden.compare.shape;

import org.wavewarden.profile.NumericDistribution;

/**
 * First Wasserstein (earth mover's) distance between two waves, in the variable's raw units.
 *
 * <p>For distributions on the line, W1 = integral |F_current(x) - F_baseline(x)| dx (Vallender 1973); both empirical
 * distribution functions are step functions that change only at pooled distinct values, so the integral is a finite
 * sum over the gaps between consecutive pooled values, O(k1 + k2). This is the definition scipy's
 * {@code wasserstein_distance} uses for unweighted samples.
 */
public final class Wasserstein {

    private Wasserstein() {
    }

    public static double distance(NumericDistribution baseline, NumericDistribution current) {
        Union u = Union.of(baseline, current);
        double nb = u.nBaseline;
        double nc = u.nCurrent;
        long cumB = 0;
        long cumC = 0;
        double sum = 0;
        for (int k = 0; k + 1 < u.size(); k++) {
            cumB += u.baseline[k];
            cumC += u.current[k];
            sum += Math.abs(cumC / nc - cumB / nb) * (u.values[k + 1] - u.values[k]);
        }
        return sum;
    }
}
