package org.wavewarden.compare.location;

import java.util.Random;
import org.wavewarden.profile.NumericDistribution;

/** Data sets shared by the location tests; each mirrors an R expression quoted beside it. */
final class Samples {

    private Samples() {
    }

    /** Student (1908) sleep data, group 1 (R: sleep$extra[1:10]). */
    static final double[] SLEEP_1 = {0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0};
    /** Student (1908) sleep data, group 2 (R: sleep$extra[11:20]). */
    static final double[] SLEEP_2 = {1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4};

    static NumericDistribution table(double[] values, long[] counts) {
        return new NumericDistribution(values, counts);
    }

    /** R: tb <- rep(c(1,2,3,4,5), c(10,25,40,20,5)) */
    static NumericDistribution tiesBaseline() {
        return table(new double[] {1, 2, 3, 4, 5}, new long[] {10, 25, 40, 20, 5});
    }

    /** R: tc <- rep(c(1,2,3,4,5,6), c(5,20,35,30,8,2)) */
    static NumericDistribution tiesCurrent() {
        return table(new double[] {1, 2, 3, 4, 5, 6}, new long[] {5, 20, 35, 30, 8, 2});
    }

    /** R: ub <- (((1:3000)*7919) %% 1000)/10 */
    static NumericDistribution unbalancedBaseline() {
        double[] x = new double[3000];
        for (int i = 1; i <= x.length; i++) {
            x[i - 1] = ((i * 7919) % 1000) / 10.0;
        }
        return NumericDistribution.ofSample(x);
    }

    /** R: uc <- (((1:30)*104729) %% 997)/20 + 30 */
    static NumericDistribution unbalancedCurrent() {
        double[] x = new double[30];
        for (int i = 1; i <= x.length; i++) {
            x[i - 1] = ((i * 104729) % 997) / 20.0 + 30;
        }
        return NumericDistribution.ofSample(x);
    }

    private static final double[] ELEVEN = {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10};

    /** R: lb <- rep(0:10, c(1200,3400,8800,15000,21000,24000,20500,14000,8000,3500,1100)) (n = 120500) */
    static NumericDistribution largeBaseline() {
        return table(ELEVEN, new long[] {1200, 3400, 8800, 15000, 21000, 24000, 20500, 14000, 8000, 3500, 1100});
    }

    /** R: lc <- rep(0:10, c(1000,3300,8500,14800,21200,24500,21000,14300,8200,3600,1200)) (n = 121600) */
    static NumericDistribution largeCurrent() {
        return table(ELEVEN, new long[] {1000, 3300, 8500, 14800, 21200, 24500, 21000, 14300, 8200, 3600, 1200});
    }

    /** Raw observations with many ties: a normal variate with random mean and scale, rounded to one decimal. */
    static double[] roundedNormal(Random rng, int n, double mean, double sd) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = Math.round((mean + sd * rng.nextGaussian()) * 10) / 10.0;
        }
        return x;
    }

    static double relativeError(double expected, double actual) {
        return Math.abs(expected - actual) / Math.max(Math.abs(expected), 1e-300);
    }
}
