package org.wavewarden.compare.proportion;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;

/**
 * Cohen's h, the difference of arcsine-transformed proportions h = 2 asin(sqrt(pC)) - 2 asin(sqrt(pB)) (Cohen 1988,
 * Statistical Power Analysis for the Behavioral Sciences, 2nd ed., chapter 6; conventions 0.2 / 0.5 / 0.8; R's
 * {@code pwr::ES.h(pC, pB)}). The transform stabilizes the variance: 2 asin(sqrt(phat)) has variance close to 1 / n
 * whatever the true proportion (Cohen 1988, section 6.2), hence the interval h +- z sqrt(1 / nB + 1 / nC).
 * Positive h means the current proportion is larger.
 */
public final class CohensH {

    static final String NAME = "Cohen's h";

    private CohensH() {
    }

    public static EffectSize estimate(long successesBaseline, long nBaseline, long successesCurrent, long nCurrent,
                                      double confidence) {
        Checks.successes(successesBaseline, nBaseline, "successesBaseline", "nBaseline");
        Checks.successes(successesCurrent, nCurrent, "successesCurrent", "nCurrent");
        Checks.confidence(confidence);
        double h = transform((double) successesCurrent / nCurrent) - transform((double) successesBaseline / nBaseline);
        double half = StandardNormal.twoSidedQuantile(confidence) * Math.sqrt(1.0 / nBaseline + 1.0 / nCurrent);
        return new EffectSize(NAME, h, h - half, h + half, confidence);
    }

    private static double transform(double p) {
        return 2 * Math.asin(Math.sqrt(p));
    }
}
