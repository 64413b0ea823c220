package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.special.Gamma;
import org.junit.jupiter.api.Test;

class NoncentralTTest {

    /**
     * {t, df, ncp, P(T <= t)}. R 4.2.2 (Debian r-base-core): sprintf("%.17g", pt(t, df, ncp)); rows with |ncp| > 37.62
     * or df > 4e5 exercise the normal approximation (Abramowitz and Stegun 26.7.10), which R uses there too.
     */
    private static final double[][] R_PT = {
            {1, 10, 0.5, 0.67863063869104934},
            {-1, 10, 0.5, 0.074775445882651059},
            {0, 5, 1, 0.15865525393145705},
            {2.5, 3, 1, 0.82418375920036724},
            {0.29999999999999999, 1, -0.69999999999999996, 0.8223364887731297},
            {-3, 4.5, -2, 0.27827109645927239},
            {5, 20, 3, 0.93732088771414812},
            {10, 20, 8, 0.8429884424412839},
            {12, 50, 10, 0.89399396028210942},
            {-2, 30, 1.5, 0.00036612016421189164},
            {3, 2.5, 4, 0.20964500769162525},
            {1.96, 100, 0, 0.97361054931688518},
            {25, 100, 20, 0.99332980286598516},
            {30, 1000, 30, 0.49725832075949616},
            {40, 30, 37, 0.68885751490593161},
            {38, 200, 36, 0.81825101815785728},
            {45, 10, 35, 0.80987083838912788},
            {2, 10000, 2.1000000000000001, 0.46015628488138688},
            {3.1000000000000001, 100000, 3, 0.5398238072715591},
            {-1, 100000, -1.2, 0.57926049152943138},
            {50, 200, 45, 0.96665380977234949},
            {-36, 60, -37, 0.63566288868168086},
            {4, 300000, 4.0099999999999998, 0.4960093670648722},
            {7, 500000, 6.5, 0.69145691641196205},
            {0.01, 8, 0.02, 0.49588822956096595},
            {15, 15, 12, 0.82807485454590346},
            {100, 40, 50, 0.99999455430092998},
            {1, 0.5, 1, 0.37547866050307216},
    };

    @Test
    void cdfMatchesRPtAcrossDfAndNoncentrality() {
        for (double[] row : R_PT) {
            double p = NoncentralT.cdf(row[0], row[1], row[2]);
            assertEquals(row[3], p, 1e-10 * Math.max(1e-3, row[3]),
                    () -> "pt(" + row[0] + ", " + row[1] + ", " + row[2] + ")");
        }
    }

    @Test
    void zeroNoncentralityIsStudentT() {
        // reference: commons-math3 3.6.1 TDistribution
        for (double df : new double[] {0.7, 1, 3, 12.5, 80, 2000}) {
            TDistribution t = new TDistribution(df);
            for (double q = -6; q <= 6; q += 0.75) {
                assertEquals(t.cumulativeProbability(q), NoncentralT.cdf(q, df, 0), 1e-12);
            }
        }
    }

    @Test
    void cdfAgreesWithDirectIntegrationOfTheDefinition() {
        // independent reference: P(T <= t) = E[Phi(t U - ncp)], U = sqrt(chi2_df / df), integrated numerically
        Random rng = new Random(42L);
        for (int rep = 0; rep < 40; rep++) {
            double df = 2 + 200 * rng.nextDouble();
            double ncp = 12 * rng.nextDouble() - 4;
            double t = ncp + 3 * rng.nextGaussian();
            assertEquals(byIntegration(t, df, ncp), NoncentralT.cdf(t, df, ncp), 1e-9,
                    "t=" + t + " df=" + df + " ncp=" + ncp);
        }
    }

    @Test
    void cdfIsMonotoneInTAndDecreasingInNcp() {
        Random rng = new Random(8L);
        for (int rep = 0; rep < 30; rep++) {
            double df = 1 + 100 * rng.nextDouble();
            double ncp = 20 * rng.nextDouble() - 5;
            double t = 20 * rng.nextDouble() - 5;
            double base = NoncentralT.cdf(t, df, ncp);
            // Lenth's stopping rule bounds the absolute error by 1e-12, so far-tail values may wobble by that much
            assertTrue(NoncentralT.cdf(t + 0.1, df, ncp) >= base - 2e-12);
            assertTrue(NoncentralT.cdf(t, df, ncp + 0.1) <= base + 2e-12);
            if (base > 1e-6 && base < 1 - 1e-6) {
                assertTrue(NoncentralT.cdf(t + 0.1, df, ncp) > base);
                assertTrue(NoncentralT.cdf(t, df, ncp + 0.1) < base);
            }
            // reflection: P(T <= t; ncp) = 1 - P(T <= -t; -ncp)
            assertEquals(base, 1 - NoncentralT.cdf(-t, df, -ncp), 1e-12);
        }
    }

    @Test
    void infiniteQuantilesAndBadArguments() {
        assertEquals(0.0, NoncentralT.cdf(Double.NEGATIVE_INFINITY, 5, 1), 0.0);
        assertEquals(1.0, NoncentralT.cdf(Double.POSITIVE_INFINITY, 5, 1), 0.0);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> NoncentralT.cdf(1, 0, 1));
        assertTrue(e.getMessage().startsWith("df"));
        assertThrows(IllegalArgumentException.class, () -> NoncentralT.cdf(1, 3, Double.NaN));
    }

    private static double byIntegration(double t, double df, double ncp) {
        double sd = 1 / Math.sqrt(2 * df);
        double lo = Math.max(1e-12, 1 - 14 * sd);
        double hi = 1 + 14 * sd;
        int steps = 20_000;
        double h = (hi - lo) / steps;
        double sum = 0;
        for (int i = 0; i <= steps; i++) {
            double u = lo + i * h;
            double w = i == 0 || i == steps ? 1 : (i % 2 == 1 ? 4 : 2);
            sum += w * org.wavewarden.compare.StandardNormal.cdf(t * u - ncp) * densityOfU(u, df);
        }
        return sum * h / 3;
    }

    /** Density of U = sqrt(V / df), V chi-square on df degrees of freedom. */
    private static double densityOfU(double u, double df) {
        double v = df * u * u;
        double logChi2 = (df / 2 - 1) * Math.log(v) - v / 2 - (df / 2) * Math.log(2) - Gamma.logGamma(df / 2);
        return Math.exp(logChi2) * 2 * df * u;
    }
}
