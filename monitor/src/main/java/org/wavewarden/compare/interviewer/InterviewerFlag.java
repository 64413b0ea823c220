package org.wavewarden.compare.interviewer;

import java.util.List;

/**
 * An interviewer whose answers of one variable stand out beyond chance: the detail of an INTERVIEWER_OUTLIER
 * finding, and what its case list selects (the interviewer's cases with an offending value).
 *
 * @param interviewerColumn the interviewer column
 * @param interviewer       the interviewer's id (the column's text)
 * @param variable          the variable
 * @param measure           what stands out, e.g. "share of 999", "missing share", "mean", "answer shares"
 * @param test              the test of this interviewer against all other interviewers
 * @param interviews        the interviewer's rows in the wave
 * @param value             the interviewer's value of the measure (a proportion 0..1 or a mean)
 * @param rest              the same over every other interviewer
 * @param pValue            the test's p-value
 * @param qValue            adjusted for the false discovery rate over every interviewer test of the wave
 * @param offendingValues   the values (text form; {@code DomainMeasure.NULL} for SQL NULL) whose cases the case
 *                          list holds; empty: every case of the interviewer with an answer to the variable
 * @param minInterviews     the minimum workload an interviewer needed to be judged
 */
public record InterviewerFlag(String interviewerColumn, String interviewer, String variable, String measure,
                              String test, long interviews, double value, double rest, double pValue, double qValue,
                              List<String> offendingValues, int minInterviews) {

    public InterviewerFlag {
        offendingValues = offendingValues == null ? List.of() : List.copyOf(offendingValues);
    }
}
