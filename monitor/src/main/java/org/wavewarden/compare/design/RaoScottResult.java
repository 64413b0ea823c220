package org.wavewarden.compare.design;

import org.wavewarden.compare.TestResult;

/**
 * The outcome of {@link RaoScott}: Pearson's X2 on the weighted 2 x k table and its two design corrections.
 *
 * @param codes                    the category codes of the table rows, ascending
 * @param pearsonChiSquare         Pearson's X2 on the weighted table scaled to the total sample size (R's
 *                                 {@code svychisq(..., statistic = "Chisq")$statistic})
 * @param designEffects            the generalized design effects (eigenvalues of the design effect matrix),
 *                                 descending, k - 1 of them
 * @param meanDesignEffect         their mean, the first-order correction
 * @param firstOrder               X2 / meanDesignEffect on chi-square with k - 1 df (R's {@code statistic = "Chisq"}
 *                                 p-value)
 * @param secondOrder              F = X2 / sum(designEffects) on the Satterthwaite numerator df (in {@code df}) and
 *                                 {@link #denominatorDf} (R's {@code statistic = "F"})
 * @param denominatorDf            denominator df of the F form: numerator df x (#PSU - #strata of both waves)
 */
public record RaoScottResult(int[] codes, double pearsonChiSquare, double[] designEffects, double meanDesignEffect,
                             TestResult firstOrder, TestResult secondOrder, double denominatorDf) {

    public RaoScottResult {
        codes = codes.clone();
        designEffects = designEffects.clone();
        if (firstOrder == null || secondOrder == null) {
            throw new IllegalArgumentException("firstOrder and secondOrder must not be null");
        }
    }

    @Override
    public int[] codes() {
        return codes.clone();
    }

    @Override
    public double[] designEffects() {
        return designEffects.clone();
    }
}
