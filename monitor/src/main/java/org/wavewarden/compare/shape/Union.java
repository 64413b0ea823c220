package org.wavewarden.compare.shape;

import org.wavewarden.compare.Checks;
import org.wavewarden.profile.NumericDistribution;

/** Two waves' frequency tables laid over the sorted union of their distinct values (one merge, O(k1 + k2)). */
final class Union {

    final double[] values;
    final long[] baseline;
    final long[] current;
    final long nBaseline;
    final long nCurrent;

    private Union(double[] values, long[] baseline, long[] current, long nBaseline, long nCurrent) {
        this.values = values;
        this.baseline = baseline;
        this.current = current;
        this.nBaseline = nBaseline;
        this.nCurrent = nCurrent;
    }

    static Union of(NumericDistribution b, NumericDistribution c) {
        Checks.observations(b, 1, "baseline");
        Checks.observations(c, 1, "current");
        int cap = b.size() + c.size();
        double[] v = new double[cap];
        long[] cb = new long[cap];
        long[] cc = new long[cap];
        int i = 0;
        int j = 0;
        int k = 0;
        while (i < b.size() || j < c.size()) {
            if (j == c.size() || (i < b.size() && b.value(i) < c.value(j))) {
                v[k] = b.value(i);
                cb[k] = b.count(i++);
            } else if (i == b.size() || c.value(j) < b.value(i)) {
                v[k] = c.value(j);
                cc[k] = c.count(j++);
            } else {
                v[k] = b.value(i);
                cb[k] = b.count(i++);
                cc[k] = c.count(j++);
            }
            k++;
        }
        return new Union(java.util.Arrays.copyOf(v, k), java.util.Arrays.copyOf(cb, k), java.util.Arrays.copyOf(cc, k),
                b.n(), c.n());
    }

    int size() {
        return values.length;
    }
}
