package org.wavewarden.compare.rank;

import org.wavewarden.profile.NumericDistribution;

/** Argument checks shared by the rank methods. */
final class Tables {

    private Tables() {
    }

    static void requireNonEmpty(NumericDistribution d, String name) {
        if (d == null) {
            throw new IllegalArgumentException(name + " must not be null");
        }
        if (d.size() == 0) {
            throw new IllegalArgumentException(name + " has no observations");
        }
    }

    static void requireConfidence(double confidence) {
        if (!(confidence > 0 && confidence < 1)) {
            throw new IllegalArgumentException("confidence must lie in (0, 1), was " + confidence);
        }
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
