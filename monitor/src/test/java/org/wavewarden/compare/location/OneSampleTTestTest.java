package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.wavewarden.compare.location.Samples.*;

import java.util.Random;
import org.apache.commons.math3.stat.inference.TTest;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class OneSampleTTestTest {

    @Test
    void oneSampleTMatchesR() {
        // R 4.2.2 (Debian r-base-core): t.test(g1, mu = 0.5) on sleep group 1
        MeanDifference m = OneSampleTTest.test(NumericDistribution.ofSample(SLEEP_1), 0.5, 0.95);
        assertEquals(0.44190338023794046, m.test().statistic(), 1e-12);
        assertEquals(9, m.test().df(), 0.0);
        assertEquals("n - 1", m.test().dfConvention());
        assertEquals(0.66898662361467487, m.test().pValue(), 1e-12);
        // R's conf.int is for the mean; ours is for mean - mu
        assertEquals(-0.52978041352623229 - 0.5, m.ciLow(), 1e-10);
        assertEquals(2.0297804135262325 - 0.5, m.ciHigh(), 1e-10);
        assertEquals(0.5, m.meanBaseline(), 0.0);
        // R 4.2.2: t.test(tb, mu = 3, conf.level = 0.99) on the tied table
        MeanDifference ties = OneSampleTTest.test(tiesBaseline(), 3, 0.99);
        assertEquals(-1.4723733261910275, ties.test().statistic(), 1e-12);
        assertEquals(0.14409215226967015, ties.test().pValue(), 1e-12);
        assertEquals(2.5824314346203994 - 3, ties.ciLow(), 1e-10);
        assertEquals(3.1175685653796008 - 3, ties.ciHigh(), 1e-10);
        // R 4.2.2: t.test(c(1,2,2,3,3,3,4,4,5), mu = 2.5)
        MeanDifference small = OneSampleTTest.test(NumericDistribution.ofSample(1, 2, 2, 3, 3, 3, 4, 4, 5), 2.5, 0.95);
        assertEquals(1.2247448713915889, small.test().statistic(), 1e-12);
        assertEquals(0.25550815043113234, small.test().pValue(), 1e-12);
        assertEquals(2.0585777540003005 - 2.5, small.ciLow(), 1e-10);
    }

    @Test
    void frequencyTableAgreesWithCommonsMathOnRawData() {
        // reference: commons-math3 3.6.1 TTest.t(mu, x) and tTest(mu, x)
        Random rng = new Random(3L);
        TTest reference = new TTest();
        for (int rep = 0; rep < 50; rep++) {
            double[] x = roundedNormal(rng, 2 + rng.nextInt(500), 2, 1 + rng.nextDouble());
            double mu = 2 + 0.3 * rng.nextGaussian();
            MeanDifference m = OneSampleTTest.test(NumericDistribution.ofSample(x), mu, 0.95);
            assertEquals(reference.t(mu, x), m.test().statistic(), 1e-9 * Math.max(1, Math.abs(m.test().statistic())));
            assertEquals(reference.tTest(mu, x), m.test().pValue(), 1e-9);
        }
    }

    @Test
    void rejectsNonFiniteMu() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> OneSampleTTest.test(NumericDistribution.ofSample(1, 2), Double.NaN, 0.95));
        assertEquals(true, e.getMessage().startsWith("mu"));
    }
}
