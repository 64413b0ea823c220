package org.wavewarden.compare.proportion;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;

/**
 * Cohen's h, the difference of arcsine-transformed proportions h = 2 asin(sqrt(pC)) - 2 asin(sqrt(pB)) (Cohen 1988,
 * Statistical Power Analysis for the Behavioral Sciences, 2nd ed., chapter 6; conventions 0.2 / 0.5 / 0.8; R's
 * {@code pwr::ES.h(pC, pB)}). Positive h means the current proportion is larger.
 *
 * <p>The interval is the MOVER interval on the arcsine scale (method of variance estimates recovery: Zou, G. Y. and
 * Donner, A. (2008), "Construction of confidence limits about effect measures: a general approach", Statistics in
 * Medicine 27, 1693-1702; Newcombe, R. G. (1998), Statistics in Medicine 17, 873-890, method 10, is the same
 * construction for the risk difference). With g(p) = 2 asin(sqrt(p)) and each wave's Wilson score limits (l, u)
 * ({@link WilsonInterval}), which g maps to limits of g(p) because g is increasing:
 * {@code L = h - sqrt((g(pC) - g(lC))^2 + (g(uB) - g(pB))^2)},
 * {@code U = h + sqrt((g(uC) - g(pC))^2 + (g(pB) - g(lB))^2)}.
 * The Wald interval h +- z sqrt(1 / nB + 1 / nC) that the variance-stabilising property suggests (Cohen 1988,
 * section 6.2) fails where it is most needed: at a count of 0 (or n) its width ignores that the proportion cannot
 * move further, so 4/31 against 0/30 gets an h interval that excludes 0 while Newcombe's interval of the risk
 * difference includes it. The score limits carry the asymmetry of a proportion near 0 or 1 into h, and both
 * intervals are built from the same Wilson limits, so they agree on whether 0 is inside except for changes at the
 * border of significance in small waves (2/14 against 17/39 is one); the verdict rule rests no verdict on such a
 * disagreement.
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
        double gB = transform((double) successesBaseline / nBaseline);
        double gC = transform((double) successesCurrent / nCurrent);
        WilsonInterval wB = WilsonInterval.of(successesBaseline, nBaseline, confidence);
        WilsonInterval wC = WilsonInterval.of(successesCurrent, nCurrent, confidence);
        double h = gC - gB;
        double low = h - Math.hypot(gC - transform(wC.lower()), transform(wB.upper()) - gB);
        double high = h + Math.hypot(transform(wC.upper()) - gC, gB - transform(wB.lower()));
        return new EffectSize(NAME, h, low, high, confidence);
    }

    static double transform(double p) {
        return 2 * Math.asin(Math.sqrt(p));
    }
}
