package org.wavewarden.judge.multiplicity;

/** The step-up adjustment shared by Benjamini-Hochberg and Benjamini-Yekutieli, with NaN entries set aside. */
final class StepUp {

    private StepUp() {
    }

    /**
     * q_(i) = min over j >= i of min(1, factor m p_(j) / j), over the m non-NaN p-values in ascending order; NaN
     * p-values give NaN and do not count in m.
     */
    static double[] adjust(double[] p, boolean harmonic) {
        if (p == null) {
            throw new IllegalArgumentException("p must not be null");
        }
        int m = 0;
        for (int i = 0; i < p.length; i++) {
            if (Double.isNaN(p[i])) {
                continue;
            }
            if (p[i] < 0 || p[i] > 1) {
                throw new IllegalArgumentException("p[" + i + "] must lie in [0, 1] or be NaN, was " + p[i]);
            }
            m++;
        }
        double[] q = new double[p.length];
        java.util.Arrays.fill(q, Double.NaN);
        if (m == 0) {
            return q;
        }
        Integer[] order = new Integer[m];
        int k = 0;
        for (int i = 0; i < p.length; i++) {
            if (!Double.isNaN(p[i])) {
                order[k++] = i;
            }
        }
        // stable sort: tied p-values keep their input order, which cannot change the adjusted values
        java.util.Arrays.sort(order, (a, b) -> Double.compare(p[a], p[b]));
        double factor = 1;
        if (harmonic) {
            double h = 0;
            for (int i = 1; i <= m; i++) {
                h += 1.0 / i;
            }
            factor = h;
        }
        double running = 1;
        for (int rank = m; rank >= 1; rank--) {
            int idx = order[rank - 1];
            running = Math.min(running, factor * m / rank * p[idx]);
            q[idx] = Math.min(1, running);
        }
        return q;
    }
}
