package org.wavewarden.compare.normality;

import org.wavewarden.profile.NumericDistribution;

/**
 * Shape of a distribution from its frequency table: the moment estimators of skewness and excess kurtosis,
 * {@code g1 = m3 / m2^(3/2)} and {@code g2 = m4 / m2^2 - 3}, with {@code m_k = (1/n) sum (x - mean)^k}.
 *
 * <p>Names and formulas as in Joanes, D. N. and Gill, C. A. (1998), "Comparing measures of sample skewness and
 * kurtosis", The Statistician 47, 183-189 (their g1 and g2, the plain moment estimators, without the small-sample
 * adjustments G1, G2 or b1, b2).
 *
 * @param n              number of observations
 * @param mean           arithmetic mean
 * @param skewness       g1
 * @param excessKurtosis g2
 */
public record Moments(long n, double mean, double skewness, double excessKurtosis) {

    /**
     * @param sample at least 2 observations, not all equal
     * @throws IllegalArgumentException if the sample has fewer than 2 observations or no spread
     */
    public static Moments of(NumericDistribution sample) {
        if (sample == null) {
            throw new IllegalArgumentException("sample must not be null");
        }
        long n = sample.n();
        if (n < 2) {
            throw new IllegalArgumentException("sample needs at least 2 observations for skewness and kurtosis, has "
                    + n);
        }
        double mean = sample.mean();
        double m2 = 0;
        double m3 = 0;
        double m4 = 0;
        for (int i = 0; i < sample.size(); i++) {
            double d = sample.value(i) - mean;
            double d2 = d * d;
            long c = sample.count(i);
            m2 += d2 * c;
            m3 += d2 * d * c;
            m4 += d2 * d2 * c;
        }
        m2 /= n;
        m3 /= n;
        m4 /= n;
        if (!(m2 > 0)) {
            throw new IllegalArgumentException("sample is constant: skewness and kurtosis are undefined");
        }
        return new Moments(n, mean, m3 / Math.pow(m2, 1.5), m4 / (m2 * m2) - 3);
    }
}
