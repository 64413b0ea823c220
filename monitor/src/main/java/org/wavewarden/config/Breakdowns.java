package org.wavewarden.config;

import java.util.List;

/**
 * Where a dataset's changes are looked for: the domain columns each flagged variable is broken down by, and the
 * interviewer column whose workloads are monitored.
 *
 * @param columns        domain columns (for example district, interview mode, interviewer id), tallied in the wave's
 *                       one pass; each may be a monitored variable or an excluded identifier, never the wave,
 *                       weight or respondent-key column
 * @param maxDomains     most domains kept per column; the rows of further domains are pooled, counted and named
 *                       in every breakdown of that column as overflow
 * @param interviewer    the column naming the interviewer of each interview (one of {@code columns}), or null
 * @param minInterviews  an interviewer with fewer interviews in the wave is not judged (stated in the finding)
 * @param keyVariables   variables whose per-interviewer distributions are compared; empty: every compared variable
 * @param iccThreshold   an intra-interviewer correlation whose interval lies above this is reported
 * @param maxCases       most respondent keys written per case list; beyond it the list is capped and the total
 *                       counted
 */
public record Breakdowns(List<String> columns, int maxDomains, String interviewer, int minInterviews,
                         List<String> keyVariables, double iccThreshold, int maxCases) {

    /** Default cap on domains per column: every district or mode, a few hundred interviewers. */
    public static final int DEFAULT_MAX_DOMAINS = 500;
    /** Default minimum workload of a judged interviewer (common practice, no source). */
    public static final int DEFAULT_MIN_INTERVIEWS = 20;
    /**
     * Default reporting threshold of the intra-interviewer correlation: values of 0.01 to 0.05 are usual in
     * face-to-face surveys, so a lower bound above 0.02 is worth a look (common practice, no source).
     */
    public static final double DEFAULT_ICC_THRESHOLD = 0.02;
    /** Default cap on keys per case list. */
    public static final int DEFAULT_MAX_CASES = 5_000;

    /** No breakdowns, no interviewer monitoring. */
    public static final Breakdowns NONE = new Breakdowns(List.of(), DEFAULT_MAX_DOMAINS, null,
            DEFAULT_MIN_INTERVIEWS, List.of(), DEFAULT_ICC_THRESHOLD, DEFAULT_MAX_CASES);

    public Breakdowns {
        columns = columns == null ? List.of() : List.copyOf(columns);
        keyVariables = keyVariables == null ? List.of() : List.copyOf(keyVariables);
    }

    public boolean isEmpty() {
        return columns.isEmpty();
    }
}
