package org.wavewarden.compare.design;

import org.junit.jupiter.api.Test;

import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * Properties of the design-based goodness of fit; its values against R's svygofchisq (survey 4.1.1) are checked
 * end to end in {@code DesignJudgeIntegrationTest}.
 */
class DesignGoodnessOfFitTest {

    @Test
    void thePValueDoesNotDependOnTheScaleOfTheWeights() {
        Random r = new Random(5);
        int k = 4;
        double[] values = {0, 1, 2, 3};
        long[] n = new long[k];
        double[] w = new double[k];
        double[] q = new double[k];
        for (int i = 0; i < 500; i++) {
            int j = r.nextInt(k);
            double wi = 0.5 + r.nextDouble() * 3;
            n[j]++;
            w[j] += wi;
            q[j] += wi * wi;
        }
        double[] p = {0.3, 0.2, 0.25, 0.25};
        DesignGoodnessOfFit.Result a = DesignGoodnessOfFit.test(new WeightedTally(values, n, w, q), p);
        double[] w10 = w.clone();
        double[] q100 = q.clone();
        for (int j = 0; j < k; j++) {
            w10[j] *= 10;
            q100[j] *= 100;
        }
        DesignGoodnessOfFit.Result b = DesignGoodnessOfFit.test(new WeightedTally(values, n, w10, q100), p);
        assertEquals(10 * a.test().statistic(), b.test().statistic(), 1e-9 * b.test().statistic(),
                "the statistic is on the totals");
        assertEquals(a.test().pValue(), b.test().pValue(), 1e-12, "the p-value is not");
        assertEquals(a.test().df(), b.test().df(), 1e-12);
    }

    @Test
    void underTheNullWithEqualWeightsTheApproximationIsPearsonsOnKMinusOneDf() {
        // Equal weights, each respondent its own PSU, shares exactly as given: V of the totals is the multinomial
        // covariance times n/(n-1), the Jacobian is (I - p 1') / sqrt(p N), so the eigenvalues are n/(n-1) (k - 1
        // times) and 0: Satterthwaite's df is k - 1 and the scale n/(n-1) (Rao and Scott 1981, Section 3).
        double[] values = {0, 1, 2};
        long[] n = {30, 40, 30};
        double[] w = {30, 40, 30};
        DesignGoodnessOfFit.Result r = DesignGoodnessOfFit.test(new WeightedTally(values, n, w, w),
                new double[] {0.3, 0.4, 0.3});
        assertEquals(0, r.test().statistic(), 1e-12);
        assertEquals(2, r.test().df(), 1e-9);
        assertEquals(100.0 / 99, r.scale(), 1e-12);
        assertEquals(1.0, r.test().pValue(), 1e-12);
    }
}
