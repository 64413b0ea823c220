package org.wavewarden.compare.interviewer;

/**
 * The interviewer effect on one measure: the intra-interviewer correlation by the one-way ANOVA estimator with its
 * interval, over the interviewers with at least the minimum workload.
 *
 * @param variable     the variable
 * @param measure      the measure, e.g. "value" (a numeric answer), "missing" (1 when the answer is missing or a
 *                     disguised missing value)
 * @param icc          the ANOVA estimate (MSB - MSW) / (MSB + (m0 - 1) MSW), which may be negative
 * @param ciLow        lower end of its interval (F-distribution based)
 * @param ciHigh       upper end
 * @param fStatistic   MSB / MSW
 * @param dfBetween    interviewers - 1
 * @param dfWithin     interviews - interviewers
 * @param pValue       of the F test that the correlation is zero
 * @param m0           the effective workload (n - sum n_i^2 / n) / (k - 1)
 * @param interviewers interviewers judged
 * @param interviews   their interviews with an answer
 * @param belowMinimum interviewers left out for a workload under the minimum
 */
public record InterviewerEffect(String variable, String measure, double icc, double ciLow, double ciHigh,
                                double fStatistic, double dfBetween, double dfWithin, double pValue, double m0,
                                int interviewers, long interviews, int belowMinimum) {
}
