package org.wavewarden.compare.relation;

import org.wavewarden.compare.Checks;

/**
 * The comparison of a correlation between two independent waves; every signed value is current minus baseline.
 *
 * @param method     the coefficient compared, with the Fisher-z variance it implies
 * @param r1         the baseline wave's correlation
 * @param r2         the current wave's correlation
 * @param n1         the baseline wave's number of pairs
 * @param n2         the current wave's number of pairs
 * @param z          (atanh r2 - atanh r1) / sqrt(c / (n1 - 3) + c / (n2 - 3)); positive when the current wave's
 *                   correlation is the higher
 * @param pValue     two-sided normal p-value of {@code z}
 * @param difference r2 - r1
 * @param ciLow      lower limit of Zou's interval for the difference
 * @param ciHigh     upper limit of Zou's interval
 * @param confidence the confidence level of the interval
 * @param name       a reader's name of the method, e.g. "Fisher z (Spearman rho), Zou interval"
 */
public record CorrelationDifferenceResult(CorrelationMethod method, double r1, double r2, long n1, long n2, double z,
                                          double pValue, double difference, double ciLow, double ciHigh,
                                          double confidence, String name) {

    public CorrelationDifferenceResult {
        if (method == null || name == null) {
            throw new IllegalArgumentException("method and name must not be null");
        }
        Checks.closedUnit(pValue, "pValue");
        if (!(ciLow <= ciHigh)) {
            throw new IllegalArgumentException("ciLow " + ciLow + " exceeds ciHigh " + ciHigh);
        }
        Checks.confidence(confidence);
    }

    /** The same difference without sampling error (a complete enumeration): Zou's interval is the difference. */
    public CorrelationDifferenceResult exact() {
        return new CorrelationDifferenceResult(method, r1, r2, n1, n2, z, pValue, difference, difference, difference,
                confidence, name);
    }
}
