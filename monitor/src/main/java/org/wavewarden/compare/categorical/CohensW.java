package org.wavewarden.compare.categorical;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;

/**
 * Cohen's w = sqrt(X2 / n) for a contingency table (Cohen 1988, Statistical Power Analysis for the Behavioral
 * Sciences, 2nd ed., chapter 7; conventions 0.1 / 0.3 / 0.5), with the confidence interval obtained by inverting the
 * noncentral chi-square distribution for the noncentrality lambda and mapping each limit to sqrt(lambda / n)
 * (Smithson 2003; as MBESS's {@code conf.limits.nc.chisq}). w has no sign.
 */
public final class CohensW {

    static final String NAME = "Cohen's w";

    private CohensW() {
    }

    public static EffectSize estimate(long[][] table, double confidence) {
        ChiSquareResult chi = ChiSquareHomogeneity.test(table);
        return fromStatistic(chi.test().statistic(), chi.test().df(), CramersV.n(table), confidence);
    }

    public static EffectSize fromStatistic(double x2, double df, double n, double confidence) {
        Checks.confidence(confidence);
        if (n <= 0 || df <= 0) {
            return new EffectSize(NAME, 0, 0, 0, confidence);
        }
        double[] ncp = NoncentralityInterval.of(x2, df, confidence);
        return new EffectSize(NAME, Math.sqrt(x2 / n), Math.sqrt(ncp[0] / n), Math.sqrt(ncp[1] / n), confidence);
    }
}
