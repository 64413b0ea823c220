package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.location.Samples.SLEEP_1;
import static org.wavewarden.compare.location.Samples.SLEEP_2;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.profile.NumericDistribution;

/**
 * References: R 4.2.2 (Debian r-base-core), the noncentral t inverted with {@code uniroot}, as for Hedges' g:
 * <pre>
 * t0 <- t.test(current, baseline, paired = TRUE)$statistic; n <- length(current)
 * f <- function(ncp, p) pt(t0, n - 1, ncp) - p
 * c(mean(d) / sd(d), uniroot(f, c(-30, 30), p = 1 - tail, tol = 1e-14)$root / sqrt(n),
 *   uniroot(f, c(-30, 30), p = tail, tol = 1e-14)$root / sqrt(n))
 * </pre>
 */
class CohensDzTest {

    static EffectSize dz(double[] baseline, double[] current, double confidence) {
        double[] d = new double[baseline.length];
        for (int i = 0; i < d.length; i++) {
            d[i] = current[i] - baseline[i];
        }
        NumericDistribution t = NumericDistribution.ofSample(d);
        return CohensDz.estimate(d.length, t.mean(), t.standardDeviation(), confidence);
    }

    @Test
    void matchesRsNoncentralTInversionOnStudentsSleepData() {
        // g1 - g2 of the sleep data, 95%: -1.2845575625910546, -2.1180165139770666, -0.41462775638014426
        EffectSize e = dz(SLEEP_2, SLEEP_1, 0.95);
        assertEquals("Cohen's d_z", e.name());
        assertEquals(-1.2845575625910546, e.estimate(), 1e-12);
        assertEquals(-2.1180165139770666, e.ciLow(), 1e-8);
        assertEquals(-0.41462775638014426, e.ciHigh(), 1e-8);
    }

    @Test
    void matchesRAtNinetyPercent() {
        // b <- c(12,15,9,20,14,11,17,13,16,10,18,12,21,8,15); cc <- c(14,13,12,24,14,15,16,18,19,9,23,12,25,11,17)
        // 90%: 0.89329916189668201, 0.3742837273192533, 1.3862986019290768
        double[] b = {12, 15, 9, 20, 14, 11, 17, 13, 16, 10, 18, 12, 21, 8, 15};
        double[] c = {14, 13, 12, 24, 14, 15, 16, 18, 19, 9, 23, 12, 25, 11, 17};
        EffectSize e = dz(b, c, 0.9);
        assertEquals(0.89329916189668201, e.estimate(), 1e-12);
        assertEquals(0.3742837273192533, e.ciLow(), 1e-8);
        assertEquals(1.3862986019290768, e.ciHigh(), 1e-8);
    }

    @Test
    void swappingWavesFlipsTheEffectAndTheLargeSampleIntervalIsClose() {
        Random rng = new Random(29L);
        for (int rep = 0; rep < 30; rep++) {
            long n = 3 + rng.nextInt(500);
            double mean = rng.nextGaussian();
            double sd = 0.2 + rng.nextDouble() * 3;
            EffectSize up = CohensDz.estimate(n, mean, sd, 0.95);
            EffectSize down = CohensDz.estimate(n, -mean, sd, 0.95);
            assertEquals(-up.estimate(), down.estimate(), 1e-12);
            assertEquals(-up.ciLow(), down.ciHigh(), 1e-8);
            assertEquals(-up.ciHigh(), down.ciLow(), 1e-8);
            assertTrue(up.ciLow() < up.estimate() && up.estimate() < up.ciHigh());
        }
        // Beyond 100,000 pairs the normal interval: d +- z sqrt(1/n + d^2 / (2n))
        EffectSize big = CohensDz.estimate(200_000, 0.1, 1, 0.95);
        double se = Math.sqrt(1 / 200_000.0 + 0.01 / 400_000.0);
        assertEquals(0.1 - 1.959963984540054 * se, big.ciLow(), 1e-10);
        // and the inversion just below that size agrees with it to the digits anyone reads
        EffectSize near = CohensDz.estimate(100_000, 0.1, 1, 0.95);
        double seNear = Math.sqrt(1 / 100_000.0 + 0.01 / 200_000.0);
        assertEquals(0.1 - 1.959963984540054 * seNear, near.ciLow(), 1e-4);
    }

    @Test
    void refusesDifferencesWithoutSpread() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> CohensDz.estimate(5, 1, 0, 0.95));
        assertTrue(e.getMessage().startsWith("sdDifference must be positive"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> CohensDz.estimate(1, 1, 1, 0.95));
    }
}
