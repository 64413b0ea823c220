package org.wavewarden.compare.location;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class PairedTestChoiceTest {

    @Test
    void studentsSleepDifferencesAreNormalEnoughForThePairedT() {
        double[] d = new double[Samples.SLEEP_1.length];
        for (int i = 0; i < d.length; i++) {
            d[i] = Samples.SLEEP_1[i] - Samples.SLEEP_2[i];
        }
        // R 4.2.2: shapiro.test(sleep$extra[1:10] - sleep$extra[11:20])$p.value = 0.033341608630308141 >= 0.01
        PairedTestChoice.Choice c = PairedTestChoice.choose(NumericDistribution.ofSample(d));
        assertEquals(PairedTestChoice.PairedTest.PAIRED_T, c.test());
        assertTrue(c.reason().contains("Shapiro-Wilk p = 0.0333"), c.reason());
    }

    @Test
    void coarseOrSkewedDifferencesGetTheSignedRankTest() {
        // four distinct differences: too coarse for a normal model
        NumericDistribution coarse = new NumericDistribution(new double[] {-1, 0, 1, 2}, new long[] {5, 20, 9, 3});
        assertEquals(PairedTestChoice.PairedTest.SIGNED_RANK, PairedTestChoice.choose(coarse).test());
        // exponential differences, 300 of them: Shapiro-Wilk rejects at 0.01
        Random rng = new Random(3L);
        double[] e = new double[300];
        for (int i = 0; i < e.length; i++) {
            e[i] = -Math.log(rng.nextDouble());
        }
        PairedTestChoice.Choice skewed = PairedTestChoice.choose(NumericDistribution.ofSample(e));
        assertEquals(PairedTestChoice.PairedTest.SIGNED_RANK, skewed.test());
        assertTrue(skewed.reason().startsWith("the paired differences depart from a normal distribution"));
        // beyond 5,000 pairs the shape rule: normal differences pass, exponential ones do not
        double[] big = new double[6000];
        double[] bigSkewed = new double[6000];
        for (int i = 0; i < big.length; i++) {
            big[i] = rng.nextGaussian();
            bigSkewed[i] = Math.exp(2 * rng.nextGaussian());
        }
        assertEquals(PairedTestChoice.PairedTest.PAIRED_T, PairedTestChoice.choose(NumericDistribution.ofSample(big))
                .test());
        assertEquals(PairedTestChoice.PairedTest.SIGNED_RANK,
                PairedTestChoice.choose(NumericDistribution.ofSample(bigSkewed)).test());
    }
}
