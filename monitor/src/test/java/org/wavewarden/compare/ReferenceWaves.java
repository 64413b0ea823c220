package org.wavewarden.compare;

import java.util.Random;
import org.wavewarden.profile.NumericDistribution;

/**
 * Test waves shared by the comparison tests. The generated ones use integer arithmetic only, so the same samples
 * are rebuilt exactly by the R expressions quoted beside each.
 */
public final class ReferenceWaves {

    private ReferenceWaves() {
    }

    /** Hollander &amp; Wolfe (1973), p. 69, permeability constants: x, here the current wave. */
    public static final double[] HW_X = {0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46};
    /** Hollander &amp; Wolfe (1973), p. 69: y, here the baseline wave. */
    public static final double[] HW_Y = {1.15, 0.88, 0.90, 0.74, 1.21};

    /** Student (1908) sleep data, group 1 and group 2, paired by subject. */
    public static final double[] SLEEP_1 = {0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0};
    public static final double[] SLEEP_2 = {1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4};

    /** R: lb <- rep(1:5, c(30, 45, 60, 40, 25)) */
    public static NumericDistribution likertBaseline() {
        return table(new double[] {1, 2, 3, 4, 5}, new long[] {30, 45, 60, 40, 25});
    }

    /** R: lc <- rep(1:5, c(20, 35, 60, 55, 40)) */
    public static NumericDistribution likertCurrent() {
        return table(new double[] {1, 2, 3, 4, 5}, new long[] {20, 35, 60, 55, 40});
    }

    /** R: ((1:n) * a) %% p / divisor + offset */
    public static double[] modular(int n, long a, long p, double divisor, double offset) {
        double[] out = new double[n];
        for (int i = 1; i <= n; i++) {
            out[i - 1] = ((i * a) % p) / divisor + offset;
        }
        return out;
    }

    /** R: 18 + ((1:n) * a) %% p %% span */
    public static double[] ages(int n, long a, long p, long span) {
        double[] out = new double[n];
        for (int i = 1; i <= n; i++) {
            out[i - 1] = 18 + ((i * a) % p) % span;
        }
        return out;
    }

    public static NumericDistribution table(double[] values, long[] counts) {
        return new NumericDistribution(values, counts);
    }

    public static NumericDistribution of(double... sample) {
        return NumericDistribution.ofSample(sample);
    }

    /** A seeded small wave on a grid of eighths, so shifts by whole numbers are exact in floating point. */
    public static double[] gridSample(Random rnd, int n, int levels, double location) {
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            out[i] = location + rnd.nextInt(levels) / 8.0;
        }
        return out;
    }

    public static double[] shifted(double[] x, double c) {
        double[] out = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            out[i] = x[i] + c;
        }
        return out;
    }
}
