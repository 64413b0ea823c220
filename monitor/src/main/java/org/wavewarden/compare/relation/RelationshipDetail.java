package org.wavewarden.compare.relation;

/**
 * What a relationship comparison reports beside its primary effect (the difference of Spearman correlations).
 *
 * @param x                  the first variable
 * @param y                  the second variable
 * @param spearmanBaseline   Spearman's rho in the baseline wave, with its interval
 * @param spearmanCurrent    Spearman's rho in the current wave
 * @param pearsonBaseline    Pearson's r in the baseline wave
 * @param pearsonCurrent     Pearson's r in the current wave
 * @param pearsonDifference  Fisher's z and Zou's interval for the difference of Pearson's r; null when a wave's r is
 *                           -1 or 1, where atanh is infinite
 * @param screenedBaseline   baseline pairs left out because x or y is missing (a missing code, a disguised missing
 *                           value, outside the declared range, not a number)
 * @param screenedCurrent    current pairs left out for the same reasons
 * @param relativeError      0 when both waves' pairs are exact; else the largest relative distance between a
 *                           summarised value and the value it stands for
 */
public record RelationshipDetail(String x, String y, CorrelationResult spearmanBaseline,
                                 CorrelationResult spearmanCurrent, CorrelationResult pearsonBaseline,
                                 CorrelationResult pearsonCurrent, CorrelationDifferenceResult pearsonDifference,
                                 long screenedBaseline, long screenedCurrent, double relativeError) {
}
