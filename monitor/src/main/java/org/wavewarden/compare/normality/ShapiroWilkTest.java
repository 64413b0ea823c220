package org.wavewarden.compare.normality;

import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.TestResult;
import org.wavewarden.profile.NumericDistribution;

/**
 * The Shapiro-Wilk test of normality, W and its p-value, for 3 to 5000 observations.
 *
 * <p>Method: Royston, P. (1995), "Remark AS R94: A remark on Algorithm AS 181: The W-test for normality", Applied
 * Statistics 44, 547-551, which approximates the coefficients of Shapiro, S. S. and Wilk, M. B. (1965), Biometrika
 * 52, 591-611, from normal scores {@code m_i = Phi^-1((i - 3/8) / (n + 1/4))} with polynomial corrections of the two
 * extreme coefficients, and turns W into a p-value by a normalising transformation of {@code log(1 - W)}. For n = 3
 * the exact null distribution is used. W is computed as the squared correlation of the ordered data with the
 * coefficients, and 1 - W directly, so values of W close to 1 keep their precision.
 *
 * <p>Ties: the order statistics of tied observations are equal, so each distinct value contributes its value times
 * the sum of the coefficients of the ranks it occupies; the table is never expanded.
 */
public final class ShapiroWilkTest {

    public static final String NAME = "Shapiro-Wilk";
    public static final int MIN_N = 3;
    public static final int MAX_N = 5000;

    // Royston (1995), Table 1: polynomials in u = 1/sqrt(n) for the two largest coefficients
    private static final double[] C1 = {0.0, 0.221157, -0.147981, -2.071190, 4.434685, -2.706056};
    private static final double[] C2 = {0.0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633};
    // Royston (1995): mean and log sd of the normalised statistic, in n for n <= 11 and in log n above
    private static final double[] GAMMA_SMALL = {-2.273, 0.459};
    private static final double[] MEAN_SMALL = {0.5440, -0.39978, 0.025054, -6.714e-4};
    private static final double[] LOG_SD_SMALL = {1.3822, -0.77857, 0.062767, -0.0020322};
    private static final double[] MEAN_LARGE = {-1.5861, -0.31082, -0.083751, 0.0038915};
    private static final double[] LOG_SD_LARGE = {-0.4803, -0.082676, 0.0030302};

    private ShapiroWilkTest() {
    }

    /**
     * @param sample 3 to 5000 observations, not all equal
     * @return W as the statistic, NaN df, and the p-value (small W is evidence against normality)
     * @throws IllegalArgumentException if n is outside [3, 5000] or all values are equal
     */
    public static TestResult test(NumericDistribution sample) {
        if (sample == null) {
            throw new IllegalArgumentException("sample must not be null");
        }
        long nl = sample.n();
        if (nl < MIN_N || nl > MAX_N) {
            throw new IllegalArgumentException("sample must have between " + MIN_N + " and " + MAX_N
                    + " observations for Shapiro-Wilk, has " + nl);
        }
        if (sample.size() < 2) {
            throw new IllegalArgumentException("sample is constant (every observation equals " + sample.value(0)
                    + "): normality cannot be tested");
        }
        int n = (int) nl;
        double[] a = coefficients(n);
        double oneMinusW = oneMinusW(sample, a);
        double w = 1 - oneMinusW;
        return TestResult.withoutDf(NAME, w, pValue(n, w, oneMinusW));
    }

    /**
     * Coefficients a_1..a_n for ascending order statistics; antisymmetric (a_i = -a_{n+1-i}) with sum of squares 1.
     */
    static double[] coefficients(int n) {
        double[] a = new double[n];
        int half = n / 2;
        if (n == 3) {
            a[0] = -Math.sqrt(0.5);
            a[2] = Math.sqrt(0.5);
            return a;
        }
        // upper-half normal scores m[k] for the k-th largest, k = 0 .. half-1 (positive)
        double[] m = new double[half];
        double summ2 = 0;
        for (int k = 0; k < half; k++) {
            m[k] = -StandardNormal.quantile((k + 1 - 0.375) / (n + 0.25));
            summ2 += m[k] * m[k];
        }
        summ2 *= 2;
        double ssumm2 = Math.sqrt(summ2);
        double u = 1 / Math.sqrt(n);
        double[] top = new double[half];
        top[0] = m[0] / ssumm2 + poly(C1, u);
        int fixed;
        double phi;
        if (n > 5) {
            top[1] = m[1] / ssumm2 + poly(C2, u);
            phi = (summ2 - 2 * m[0] * m[0] - 2 * m[1] * m[1])
                    / (1 - 2 * top[0] * top[0] - 2 * top[1] * top[1]);
            fixed = 2;
        } else {
            phi = (summ2 - 2 * m[0] * m[0]) / (1 - 2 * top[0] * top[0]);
            fixed = 1;
        }
        double sphi = Math.sqrt(phi);
        for (int k = fixed; k < half; k++) {
            top[k] = m[k] / sphi;
        }
        for (int k = 0; k < half; k++) {
            a[n - 1 - k] = top[k];
            a[k] = -top[k];
        }
        return a; // the middle coefficient of odd n stays 0
    }

    /** 1 - W = 1 - corr(a, x)^2, from the table: tied ranks share their value, so their coefficients are summed. */
    private static double oneMinusW(NumericDistribution sample, double[] a) {
        // a sums to zero, so its centred form is itself; centre and scale x for conditioning
        double n = a.length;
        double mean = sample.mean();
        double range = sample.value(sample.size() - 1) - sample.value(0);
        double ssx = 0;
        double sax = 0;
        double ssa = 0;
        int rank = 0;
        for (int i = 0; i < sample.size(); i++) {
            double xs = (sample.value(i) - mean) / range;
            long c = sample.count(i);
            double blockA = 0;
            for (long r = 0; r < c; r++) {
                double ai = a[rank++];
                blockA += ai;
                ssa += ai * ai;
            }
            sax += blockA * xs;
            ssx += xs * xs * c;
        }
        double root = Math.sqrt(ssa * ssx);
        double value = (root - sax) * (root + sax) / (ssa * ssx);
        return Math.max(0.0, value);
    }

    private static double pValue(int n, double w, double oneMinusW) {
        if (n == 3) {
            // exact: W is distributed as 3/4 + (1/4) sin^2 of a uniform angle, Shapiro and Wilk (1965)
            double p = 6 / Math.PI * (Math.asin(Math.sqrt(w)) - Math.PI / 3);
            return Math.min(1.0, Math.max(0.0, p));
        }
        double y = Math.log(oneMinusW);
        double mean;
        double sd;
        if (n <= 11) {
            double gamma = poly(GAMMA_SMALL, n);
            if (y >= gamma) {
                return 0.0; // beyond the range of the transformation: W far too small for normal data
            }
            y = -Math.log(gamma - y);
            mean = poly(MEAN_SMALL, n);
            sd = Math.exp(poly(LOG_SD_SMALL, n));
        } else {
            double ln = Math.log(n);
            mean = poly(MEAN_LARGE, ln);
            sd = Math.exp(poly(LOG_SD_LARGE, ln));
        }
        return StandardNormal.cdf(-(y - mean) / sd);
    }

    private static double poly(double[] c, double x) {
        double r = 0;
        for (int i = c.length - 1; i >= 0; i--) {
            r = r * x + c[i];
        }
        return r;
    }
}
