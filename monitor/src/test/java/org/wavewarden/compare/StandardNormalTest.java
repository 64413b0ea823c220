package org.wavewarden.compare;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

class StandardNormalTest {

    @ParameterizedTest(name = "confidence {0}: z = {1}")
    @CsvSource({
            // R 4.2.2: sprintf("%.17g", qnorm(0.5 + confidence / 2))
            "0.5, 0.67448975019608171",
            "0.8, 1.2815515655446008",
            "0.9, 1.6448536269514715",
            "0.95, 1.9599639845400536",
            "0.99, 2.5758293035488999",
            "0.999, 3.2905267314919255"
    })
    void twoSidedQuantileMatchesR(double confidence, double z) {
        assertEquals(z, StandardNormal.twoSidedQuantile(confidence), 1e-15 * z);
    }

    @ParameterizedTest(name = "x = {0}")
    @CsvSource({
            // R 4.2.2: sprintf("%.17g", c(pnorm(x), 2 * pnorm(-abs(x))))
            "-8, 6.2209605742717849e-16, 1.244192114854357e-15",
            "-1.959963984540054, 0.025000000000000012, 0.050000000000000024",
            "-1, 0.15865525393145705, 0.31731050786291409",
            "0, 0.5, 1",
            "0.5, 0.69146246127401301, 0.61707507745197387",
            "3, 0.9986501019683699, 0.0026997960632601892"
    })
    void cdfAndTwoSidedPMatchR(double x, double cdf, double twoSided) {
        assertEquals(cdf, StandardNormal.cdf(x), 1e-14 * cdf);
        assertEquals(twoSided, StandardNormal.twoSidedP(x), 1e-14 * twoSided);
        assertEquals(twoSided, StandardNormal.twoSidedP(-x), 1e-14 * twoSided);
    }

    @Test
    void aFarTailPKeepsItsMagnitudeWhereOneMinusTheCdfWouldBeZero() {
        // R 4.2.2: sprintf("%.17g", 2 * pnorm(-30)) = 9.8134278542963744e-198. commons-math3's erfc, which the
        // helper uses, is within 2e-12 of it relative this far out (measured 1.2e-12).
        assertEquals(9.8134278542963744e-198, StandardNormal.twoSidedP(30), 2e-12 * 9.8134278542963744e-198);
        assertEquals(0.0, 1 - StandardNormal.cdf(30), 0.0);
    }

    @Test
    void quantileInvertsTheCdfAndReachesFarTails() {
        // R 4.2.2: sprintf("%.17g", qnorm(1e-10)) = -6.3613409024040557. commons-math3's inverse error function
        // (Giles 2010) is a polynomial approximation good to about 2e-9 relative this far out (measured
        // -6.361340889697421), against R's Wichura (1988) AS 241 to full precision; the 95% to 99.9% quantiles
        // the statistics use are within 1e-15 (the rows above).
        assertEquals(-6.3613409024040557, StandardNormal.quantile(1e-10), 5e-9 * 6.36);
        assertEquals(Double.NEGATIVE_INFINITY, StandardNormal.quantile(0), 0.0);
        assertEquals(Double.POSITIVE_INFINITY, StandardNormal.quantile(1), 0.0);
        Random r = new Random(1);
        for (int i = 0; i < 1000; i++) {
            double p = 0.001 + 0.998 * r.nextDouble();
            assertEquals(p, StandardNormal.cdf(StandardNormal.quantile(p)), 1e-14);
        }
    }

    @Test
    void everyValueEqualsCommonsMathsNormalDistributionToTheLastBit() {
        // The helper replaced commons-math3 3.6.1's NormalDistribution(0, 1) at every call site: no result may move.
        NormalDistribution normal = new NormalDistribution(null, 0, 1);
        Random r = new Random(2);
        for (int i = 0; i < 5000; i++) {
            double x = (r.nextDouble() - 0.5) * 20;
            double p = r.nextDouble();
            assertEquals(normal.cumulativeProbability(x), StandardNormal.cdf(x), 0.0);
            assertEquals(normal.inverseCumulativeProbability(p), StandardNormal.quantile(p), 0.0);
            assertEquals(Math.min(1, 2 * normal.cumulativeProbability(-Math.abs(x))), StandardNormal.twoSidedP(x), 0.0);
        }
    }

    @Test
    void aConfidenceOutsideTheOpenUnitIntervalIsRefused() {
        assertThrows(IllegalArgumentException.class, () -> StandardNormal.twoSidedQuantile(1));
        assertThrows(IllegalArgumentException.class, () -> StandardNormal.twoSidedQuantile(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> StandardNormal.quantile(1.5));
    }
}
