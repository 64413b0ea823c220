package org.wavewarden.compare.rank;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * References: R 4.2.2 (Debian r-base-core):
 * {@code d <- sort(x); k <- qbinom(tail, n, 0.5); c(median(x), d[k], d[n - k + 1])}.
 */
class MedianIntervalTest {

    @Test
    void matchesRsOrderStatisticsOnTheSleepDifferences() {
        // g1 - g2 of Student's sleep data: median -1.3; qbinom(0.025, 10, 0.5) = 2; d[2] = -2.4, d[9] = -0.8
        double[] d = {-1.2, -2.4, -1.3, -1.3, 0, -1.0, -1.8, -0.8, -4.6, -1.4};
        EffectSize e = MedianInterval.of(NumericDistribution.ofSample(d), 0.95);
        assertEquals("median paired difference", e.name());
        assertEquals(-1.3, e.estimate(), 1e-15);
        assertEquals(-2.4, e.ciLow(), 1e-15);
        assertEquals(-0.8, e.ciHigh(), 1e-15);
        // RankBiserialTest's 15 differences, 90%: median 3, qbinom(0.05, 15, 0.5) = 4, d[4] = 0, d[12] = 4
        EffectSize f = MedianInterval.of(NumericDistribution.ofSample(RankBiserialTest.DIFFERENCES), 0.9);
        assertEquals(3, f.estimate(), 0.0);
        assertEquals(0, f.ciLow(), 0.0);
        assertEquals(4, f.ciHigh(), 0.0);
    }

    @Test
    void coverageOfTheChosenOrderStatisticsIsAtLeastNominal() {
        for (int n = 6; n < 200; n++) {
            int k = new BinomialDistribution(null, n, 0.5).inverseCumulativeProbability(0.025);
            double coverage = 1 - 2 * new BinomialDistribution(null, n, 0.5).cumulativeProbability(k - 1);
            assertEquals(true, coverage >= 0.95, "n = " + n);
        }
        // a table gives what the sorted sample gives
        Random rng = new Random(8L);
        double[] x = new double[101];
        for (int i = 0; i < x.length; i++) {
            x[i] = rng.nextInt(20);
        }
        double[] sorted = x.clone();
        java.util.Arrays.sort(sorted);
        int k = new BinomialDistribution(null, 101, 0.5).inverseCumulativeProbability(0.025);
        EffectSize e = MedianInterval.of(NumericDistribution.ofSample(x), 0.95);
        assertEquals(sorted[50], e.estimate(), 0.0);
        assertEquals(sorted[k - 1], e.ciLow(), 0.0);
        assertEquals(sorted[101 - k], e.ciHigh(), 0.0);
    }
}
