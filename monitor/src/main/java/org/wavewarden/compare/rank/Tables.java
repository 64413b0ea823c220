package org.wavewarden.compare.rank;

import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.profile.NumericDistribution;

/** What the rank methods share: the tie term and the Feng-Cliff interval. */
final class Tables {

    private Tables() {
    }

    /**
     * The asymmetric interval of Feng and Cliff (2004, Journal of Modern Applied Statistical Methods 3) for a
     * dominance statistic d on [-1, 1] with estimated variance {@code var}:
     * {@code (d - d^3 -/+ z s sqrt((1 - d^2)^2 + z^2 s^2)) / (1 - d^2 + z^2 s^2)}, clipped to [-1, 1]; the estimate
     * itself when |d| = 1.
     */
    static EffectSize fengCliff(String name, double d, double var, double confidence) {
        double oneMinus = 1 - d * d;
        if (oneMinus <= 0) {
            return new EffectSize(name, d, d, d, confidence);
        }
        double z = StandardNormal.twoSidedQuantile(confidence);
        double zs2 = z * z * var;
        double centre = d - d * d * d;
        double spread = z * Math.sqrt(var) * Math.sqrt(oneMinus * oneMinus + zs2);
        double denom = oneMinus + zs2;
        double low = Math.max(-1.0, (centre - spread) / denom);
        double high = Math.min(1.0, (centre + spread) / denom);
        return new EffectSize(name, d, low, high, confidence);
    }

    /** Sum of t^3 - t over the counts of one table: the within-sample tie term of the rank variance. */
    static double tieTerm(NumericDistribution d) {
        double s = 0;
        for (int i = 0; i < d.size(); i++) {
            double t = d.count(i);
            s += t * t * t - t;
        }
        return s;
    }
}
