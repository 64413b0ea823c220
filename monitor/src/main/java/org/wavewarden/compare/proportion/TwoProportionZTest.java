package org.wavewarden.compare.proportion;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.TestResult;

/**
 * The two-sample test of equal proportions with pooled variance and no continuity correction, z = (pC - pB) /
 * sqrt(pbar (1 - pbar) (1 / nB + 1 / nC)), whose square is Pearson's X2 for the 2 x 2 table (Agresti 2007,
 * section 2.4; R's {@code prop.test(correct = FALSE)}), together with the risk difference pC - pB and Newcombe's
 * hybrid score interval for it (Newcombe 1998, Statistics in Medicine 17, 873-890, method 10): with Wilson limits
 * (lB, uB) and (lC, uC), the interval is [d - sqrt((pC - lC)^2 + (uB - pB)^2), d + sqrt((uC - pC)^2 + (pB - lB)^2)].
 *
 * <p>When both waves are all successes or all failures the pooled variance is zero and the proportions are equal:
 * z = 0 and p = 1.
 */
public final class TwoProportionZTest {

    static final String NAME = "two-proportion z";

    private TwoProportionZTest() {
    }

    public static TwoProportionResult test(long successesBaseline, long nBaseline, long successesCurrent,
                                           long nCurrent, double confidence) {
        Checks.successes(successesBaseline, nBaseline, "successesBaseline", "nBaseline");
        Checks.successes(successesCurrent, nCurrent, "successesCurrent", "nCurrent");
        Checks.confidence(confidence);
        double pB = (double) successesBaseline / nBaseline;
        double pC = (double) successesCurrent / nCurrent;
        double pooled = (double) (successesBaseline + successesCurrent) / (nBaseline + nCurrent);
        double variance = pooled * (1 - pooled) * (1.0 / nBaseline + 1.0 / nCurrent);
        double z = variance > 0 ? (pC - pB) / Math.sqrt(variance) : 0;
        TestResult test = TestResult.withoutDf(NAME, z, variance > 0 ? StandardNormal.twoSidedP(z) : 1);

        double d = pC - pB;
        WilsonInterval wB = WilsonInterval.of(successesBaseline, nBaseline, confidence);
        WilsonInterval wC = WilsonInterval.of(successesCurrent, nCurrent, confidence);
        double low = d - Math.hypot(pC - wC.lower(), wB.upper() - pB);
        double high = d + Math.hypot(wC.upper() - pC, pB - wB.lower());
        EffectSize newcombe = new EffectSize("risk difference", d, low, high, confidence);

        double zq = StandardNormal.twoSidedQuantile(confidence);
        double se = Math.sqrt(pB * (1 - pB) / nBaseline + pC * (1 - pC) / nCurrent);
        EffectSize wald = new EffectSize("risk difference (Wald)", d, d - zq * se, d + zq * se, confidence);
        return new TwoProportionResult(test, pB, pC, newcombe, wald);
    }
}
