package org.wavewarden.compare.normality;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Random;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

/**
 * R references from the hand formula, R 4.2.2 (Debian r-base-core):
 * {@code mom <- function(x) { m <- mean(x); m2 <- mean((x - m)^2); c(mean((x - m)^3) / m2^1.5, mean((x - m)^4) / m2^2 - 3) }}
 */
class MomentsTest {

    @Test
    void matchesRHandFormula() {
        Moments hw = Moments.of(NumericDistribution.ofSample(0.80, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46));
        assertEquals(-0.027675271382501181, hw.skewness(), 1e-13);
        assertEquals(-1.3876958119617955, hw.excessKurtosis(), 1e-13);
        Moments ties = Moments.of(new NumericDistribution(new double[] {1, 2, 3, 4, 5}, new long[] {10, 25, 40, 20, 5}));
        assertEquals(0.015121950506579048, ties.skewness(), 1e-13);
        assertEquals(-0.42342870335837501, ties.excessKurtosis(), 1e-13);
        Moments twelve = Moments.of(new NumericDistribution(new double[] {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12},
                new long[] {1, 3, 8, 20, 40, 70, 80, 60, 30, 12, 4, 1}));
        assertEquals(-0.13418041643262199, twelve.skewness(), 1e-13);
        assertEquals(0.28367414344059405, twelve.excessKurtosis(), 1e-13);
        // R 4.2.2: mom(c(1, 1, 1, 1, 50)); by hand, one outlier among n = 5 gives g1 = 3 / 2 and g2 = 13 / 4 - 3
        Moments spike = Moments.of(NumericDistribution.ofSample(1, 1, 1, 1, 50));
        assertEquals(1.5, spike.skewness(), 1e-13);
        assertEquals(0.25, spike.excessKurtosis(), 1e-13);
    }

    @Test
    void frequencyTableAgreesWithCommonsMathOnRawData() {
        // reference: commons-math3 3.6.1 DescriptiveStatistics getSkewness / getKurtosis, which report the adjusted
        // G1 = g1 sqrt(n (n - 1)) / (n - 2) and G2 = ((n + 1) g2 + 6) (n - 1) / ((n - 2) (n - 3)) (Joanes and Gill 1998)
        Random rng = new Random(17L);
        for (int rep = 0; rep < 40; rep++) {
            int n = 4 + rng.nextInt(500);
            double[] x = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = Math.round(Math.exp(0.6 * rng.nextGaussian()) * 10) / 10.0;
            }
            DescriptiveStatistics ds = new DescriptiveStatistics(x);
            if (ds.getVariance() == 0) {
                continue;
            }
            Moments m = Moments.of(NumericDistribution.ofSample(x));
            double g1 = m.skewness() * Math.sqrt((double) n * (n - 1)) / (n - 2);
            double g2 = ((n + 1) * m.excessKurtosis() + 6) * (n - 1) / ((double) (n - 2) * (n - 3));
            assertEquals(ds.getSkewness(), g1, 1e-9 * Math.max(1, Math.abs(g1)));
            assertEquals(ds.getKurtosis(), g2, 1e-9 * Math.max(1, Math.abs(g2)));
            assertEquals(ds.getMean(), m.mean(), 1e-12 * Math.max(1, Math.abs(m.mean())));
        }
    }

    @Test
    void reflectionFlipsSkewnessAndKeepsKurtosis() {
        Random rng = new Random(4L);
        double[] x = new double[200];
        double[] y = new double[200];
        for (int i = 0; i < x.length; i++) {
            x[i] = Math.exp(rng.nextGaussian());
            y[i] = -3 * x[i] + 7;
        }
        Moments a = Moments.of(NumericDistribution.ofSample(x));
        Moments b = Moments.of(NumericDistribution.ofSample(y));
        assertEquals(a.skewness(), -b.skewness(), 1e-10);
        assertEquals(a.excessKurtosis(), b.excessKurtosis(), 1e-10);
    }

    @Test
    void rejectsConstantSamples() {
        assertThrows(IllegalArgumentException.class, () -> Moments.of(NumericDistribution.ofSample(2, 2)));
        assertThrows(IllegalArgumentException.class, () -> Moments.of(NumericDistribution.ofSample(2)));
    }
}
