package org.wavewarden.profile;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Quantiles of a frequency table against R 4.2.2's {@code quantile()} on the expanded data. R forms type 7 as
 * {@code (1 - h) x[lo] + h x[hi]}, this class as {@code x[lo] + h (x[hi] - x[lo])}: the two agree to rounding, so
 * type 7 is held to 1e-12 of the scale and type 1 (an observed value) exactly.
 */
class QuantilesTest {

    /** R: x &lt;- rep(c(-9, 1, 2, 3, 5, 8, 99), times = c(2, 4, 7, 3, 1, 2, 1)), n = 20. */
    private static final NumericDistribution CODED = new NumericDistribution(
            new double[] {-9, 1, 2, 3, 5, 8, 99}, new long[] {2, 4, 7, 3, 1, 2, 1});

    /** R: y &lt;- c(0.5, 0.5, 1.25, 2.75, 10). */
    private static final NumericDistribution SMALL = NumericDistribution.ofSample(0.5, 0.5, 1.25, 2.75, 10);

    @ParameterizedTest(name = "coded table, p = {0}")
    @CsvSource({
            // R 4.2.2: sprintf("%.17g", c(quantile(x, p, type = 7), quantile(x, p, type = 1)))
            "0, -9, -9",
            "0.1, 3.5527136788005009e-15, -9",
            "0.25, 1, 1",
            "0.5, 2, 2",
            "0.75, 3, 3",
            "0.9, 8, 8",
            "0.95, 12.550000000000065, 8",
            "1, 99, 99"
    })
    void codedTableQuantilesMatchR(double p, double type7, double type1) {
        assertEquals(type7, Quantiles.quantile(CODED, p), 1e-12 * 99);
        assertEquals(type1, Quantiles.inverse(CODED, p), 0.0);
    }

    @ParameterizedTest(name = "small sample, p = {0}")
    @CsvSource({
            // R 4.2.2: sprintf("%.17g", c(quantile(y, p, type = 7), quantile(y, p, type = 1)))
            "0, 0.5, 0.5",
            "0.1, 0.5, 0.5",
            "0.25, 0.5, 0.5",
            "0.5, 1.25, 1.25",
            "0.75, 2.75, 2.75",
            "0.9, 7.0999999999999979, 10",
            "0.95, 8.5499999999999989, 10",
            "1, 10, 10"
    })
    void smallSampleQuantilesMatchR(double p, double type7, double type1) {
        assertEquals(type7, Quantiles.quantile(SMALL, p), 1e-12 * 10);
        assertEquals(type1, Quantiles.inverse(SMALL, p), 0.0);
    }

    @Test
    void mediansMatchR() {
        // R 4.2.2: median(x) = 2 (n = 20, two middle values 2 and 2); median(y) = 1.25
        assertEquals(2, Quantiles.median(CODED), 0.0);
        assertEquals(1.25, Quantiles.median(SMALL), 0.0);
        // R 4.2.2: median(c(1, 4, 7, 10)) = 5.5
        assertEquals(5.5, Quantiles.median(new double[] {1, 4, 7, 10}), 0.0);
        assertTrue(Double.isNaN(Quantiles.median(new double[0])));
        assertTrue(Double.isNaN(Quantiles.median(NumericDistribution.empty())));
    }

    @Test
    void aTableGivesTheQuantilesOfTheSampleItSummarises() {
        // Property: the frequency table and the expanded sorted sample agree at every p, for every order statistic.
        Random r = new Random(9);
        for (int trial = 0; trial < 200; trial++) {
            double[] raw = new double[1 + r.nextInt(40)];
            for (int i = 0; i < raw.length; i++) {
                raw[i] = r.nextInt(12) - 3;
            }
            NumericDistribution d = NumericDistribution.ofSample(raw);
            double[] sorted = d.toSortedSample();
            for (int k = 0; k < sorted.length; k++) {
                assertEquals(sorted[k], Quantiles.orderStatistic(d, k), 0.0);
            }
            assertEquals(Quantiles.median(sorted), Quantiles.median(d), 0.0);
            for (double p = 0; p <= 1; p += 0.05) {
                double h = (sorted.length - 1) * p;
                int lo = (int) Math.floor(h);
                double expected = sorted[lo] + (h - lo) * (sorted[Math.min(sorted.length - 1, lo + 1)] - sorted[lo]);
                assertEquals(expected, Quantiles.quantile(d, p), 0.0);
            }
        }
    }

    @Test
    void anOrderStatisticBeyondTheTableOrAPOutsideTheUnitIntervalIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> Quantiles.orderStatistic(SMALL, 5));
        assertThrows(IllegalArgumentException.class, () -> Quantiles.orderStatistic(SMALL, -1));
        assertThrows(IllegalArgumentException.class, () -> Quantiles.quantile(SMALL, 1.01));
        assertThrows(IllegalArgumentException.class, () -> Quantiles.inverse(SMALL, Double.NaN));
    }
}
