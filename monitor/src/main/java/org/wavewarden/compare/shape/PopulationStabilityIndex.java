package org.wavewarden.compare.shape;

import org.wavewarden.compare.Checks;
import java.util.ArrayList;
import java.util.List;
import org.wavewarden.profile.NumericDistribution;

/**
 * Population stability index of the current wave against bins cut at the baseline wave's deciles.
 *
 * <p>PSI = sum over bins of (c - b) ln(c / b), with b and c the baseline and current shares: the symmetrised
 * Kullback-Leibler divergence (Jeffreys' J) of the binned distributions, as used in scorecard monitoring (common
 * practice, no single source).
 *
 * <p>Bins. The cut points are the baseline deciles at 10%, ..., 90% by the inverse of the empirical distribution
 * function (the smallest value whose cumulative share reaches p; R's {@code quantile(type = 1)}), and the bins are
 * (-inf, c1], (c1, c2], ..., (c_last, +inf). With discrete data several deciles fall on one value; equal cut points
 * are merged, so such a value forms a single bin, and a cut point at the baseline maximum is dropped because the
 * bin above it would hold no baseline observation. Each baseline bin is therefore non-empty.
 *
 * <p>Empty bins. A share of zero would make ln(c / b) infinite; every share is floored at {@link #EMPTY_SHARE}
 * (10^-4) without renormalising (common practice, no source).
 */
public final class PopulationStabilityIndex {

    /** Floor for the share of an empty bin (common practice, no source). */
    public static final double EMPTY_SHARE = 1e-4;

    private static final int DECILES = 10;

    private PopulationStabilityIndex() {
    }

    public static PsiResult compute(NumericDistribution baseline, NumericDistribution current) {
        Checks.observations(baseline, 1, "baseline");
        Checks.observations(current, 1, "current");
        List<Double> cuts = decileCuts(baseline);

        int bins = cuts.size() + 1;
        long[] cb = binCounts(baseline, cuts, bins);
        long[] cc = binCounts(current, cuts, bins);
        double nb = baseline.n();
        double nc = current.n();
        List<PsiBin> table = new ArrayList<>(bins);
        double psi = 0;
        for (int k = 0; k < bins; k++) {
            double b = Math.max(cb[k] / nb, EMPTY_SHARE);
            double c = Math.max(cc[k] / nc, EMPTY_SHARE);
            double contribution = (c - b) * Math.log(c / b);
            psi += contribution;
            double lower = k == 0 ? Double.NEGATIVE_INFINITY : cuts.get(k - 1);
            double upper = k == bins - 1 ? Double.POSITIVE_INFINITY : cuts.get(k);
            table.add(new PsiBin(lower, upper, cb[k], cc[k], b, c, contribution));
        }
        return new PsiResult(psi, table);
    }

    /** Distinct baseline deciles below the baseline maximum, ascending. */
    static List<Double> decileCuts(NumericDistribution baseline) {
        long n = baseline.n();
        double max = baseline.value(baseline.size() - 1);
        List<Double> cuts = new ArrayList<>();
        long cum = 0;
        int i = 0;
        for (int p = 1; p < DECILES; p++) {
            // smallest value whose cumulative count reaches p / 10 of n, compared in integers
            while (cum * DECILES < p * n) {
                cum += baseline.count(i++);
            }
            double q = baseline.value(i - 1);
            if (q < max && (cuts.isEmpty() || q > cuts.get(cuts.size() - 1))) {
                cuts.add(q);
            }
        }
        return cuts;
    }

    private static long[] binCounts(NumericDistribution d, List<Double> cuts, int bins) {
        long[] out = new long[bins];
        int bin = 0;
        for (int i = 0; i < d.size(); i++) {
            while (bin < cuts.size() && d.value(i) > cuts.get(bin)) {
                bin++;
            }
            out[bin] += d.count(i);
        }
        return out;
    }
}
