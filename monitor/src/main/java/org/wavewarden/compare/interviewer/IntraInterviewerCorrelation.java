package org.wavewarden.compare.interviewer;

import org.apache.commons.math3.distribution.FDistribution;
import org.apache.commons.math3.special.Beta;

import java.util.Optional;

/**
 * The intra-interviewer correlation of one measure by the one-way analysis-of-variance estimator, from each
 * interviewer's count, sum and sum of squares (what the wave's tallies give; no row is reread).
 *
 * <p>With k interviewers, N interviews and interviewer i's n_i answers y_ij:
 * MSB = sum n_i (mean_i - mean)^2 / (k - 1), MSW = sum (y_ij - mean_i)^2 / (N - k), F = MSB / MSW and the
 * effective workload m0 = (N - sum n_i^2 / N) / (k - 1); the estimate is
 * rho = (MSB - MSW) / (MSB + (m0 - 1) MSW) = (F - 1) / (F + m0 - 1), which may be negative (Searle 1971, Linear
 * Models, section 9.8; Kish 1962, JASA 57, 92-115 for its use on interviewers).
 *
 * <p>The interval puts the F quantiles into the same form, with m0 standing in for the common workload:
 * F_L = F / F(1 - a/2; k - 1, N - k), F_U = F / F(a/2; k - 1, N - k) and
 * rho_L = (F_L - 1) / (F_L + m0 - 1), rho_U = (F_U - 1) / (F_U + m0 - 1) (Searle 1971; Donner 1986, International
 * Statistical Review 54, 67-82). It is exact for equal workloads and approximate when they differ. The p-value is the
 * F test's upper tail, that the correlation is zero.
 */
public final class IntraInterviewerCorrelation {

    /** The effect's name in a finding. */
    public static final String NAME = "intra-interviewer correlation";

    private IntraInterviewerCorrelation() {
    }

    /**
     * The estimate with its (confidence) interval, or empty when it is undefined: fewer than two interviewers, no
     * degree of freedom within interviewers, or no variation within them (MSW = 0).
     *
     * @param n            each interviewer's answers
     * @param sum          each interviewer's sum of the measure
     * @param sumSquares   each interviewer's sum of its squares
     * @param confidence   level of the interval, in (0, 1)
     * @param belowMinimum interviewers left out before this (reported beside the estimate)
     */
    public static Optional<InterviewerEffect> estimate(String variable, String measure, long[] n, double[] sum,
                                                       double[] sumSquares, double confidence, int belowMinimum) {
        if (n.length != sum.length || n.length != sumSquares.length) {
            throw new IllegalArgumentException("n, sum and sumSquares differ in length: " + n.length + ", "
                    + sum.length + ", " + sumSquares.length);
        }
        if (!(confidence > 0 && confidence < 1)) {
            throw new IllegalArgumentException("confidence must lie in (0, 1), was " + confidence);
        }
        int k = 0;
        long total = 0;
        double grand = 0;
        for (int i = 0; i < n.length; i++) {
            if (n[i] > 0) {
                k++;
                total += n[i];
                grand += sum[i];
            }
        }
        if (k < 2 || total - k < 1) {
            return Optional.empty();
        }
        double mean = grand / total;
        double ssb = 0;
        double ssw = 0;
        double sumN2 = 0;
        for (int i = 0; i < n.length; i++) {
            if (n[i] == 0) {
                continue;
            }
            double mi = sum[i] / n[i];
            ssb += n[i] * (mi - mean) * (mi - mean);
            // Within each interviewer apart: the squares are centred on the interviewer's own mean, so large
            // values (heights in centimetres) lose no digits to a grand total.
            ssw += Math.max(0, sumSquares[i] - sum[i] * mi);
            sumN2 += (double) n[i] * n[i];
        }
        double df1 = k - 1;
        double df2 = total - k;
        double msb = ssb / df1;
        double msw = ssw / df2;
        if (!(msw > 0)) {
            return Optional.empty();
        }
        double f = msb / msw;
        double m0 = (total - sumN2 / total) / df1;
        FDistribution fd = new FDistribution(null, df1, df2, 1e-12);
        double a = 1 - confidence;
        double fLow = f / fd.inverseCumulativeProbability(1 - a / 2);
        double fHigh = f / fd.inverseCumulativeProbability(a / 2);
        // Upper tail of F through the incomplete beta: 1 - cdf would round to 0 far below 1e-16.
        double p = Beta.regularizedBeta(df2 / (df2 + df1 * f), df2 / 2, df1 / 2);
        return Optional.of(new InterviewerEffect(variable, measure, rho(f, m0), rho(fLow, m0), rho(fHigh, m0), f,
                df1, df2, p, m0, k, total, belowMinimum));
    }

    private static double rho(double f, double m0) {
        return (f - 1) / (f + m0 - 1);
    }
}
