package org.wavewarden.compare.interviewer;

import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.missing.Codebook;
import org.wavewarden.missing.MissingCandidate;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.NumericDistribution;

import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * One variable's answers split by interviewer with the wave's one valid-answer rule: per interviewer the rows, the
 * missing answers (SQL NULL, the variable's declared missing codes and the disguised missing values the screen
 * excluded) in total and per value, and the valid answers typed for the variable's kind.
 *
 * <p>The split follows the whole wave's screen, never a screen of one interviewer's answers: a value is missing for
 * an interviewer exactly when it is missing in the wave, so that an interviewer who keys 999 for most interviews is
 * measured by the rule the wave's 999s set and does not hide them by making 999 look ordinary among their own.
 *
 * @param variable   the variable
 * @param rows       each interviewer's rows
 * @param missing    each interviewer's missing answers, every kind together
 * @param byValue    per missing value (text form; {@link DomainMeasure#NULL} for SQL NULL) each interviewer's count,
 *                   in order of first appearance; only values some interviewer has
 * @param numbers    for a continuous or ordinal variable, each interviewer's valid answers; null otherwise
 * @param categories for a categorical or binary variable, the wave's valid categories; null otherwise
 * @param counts     for a categorical or binary variable, each interviewer's count of each category (same order)
 * @param binned     whether some interviewer's numbers were tallied in relative bins (their means are approximate)
 */
record InterviewerCounts(VariableConfig variable, long[] rows, long[] missing, Map<String, long[]> byValue,
                         NumericDistribution[] numbers, List<String> categories, long[][] counts, boolean binned) {

    /** Splits the per-interviewer tallies of one variable (index i: the interviewer at index i of the domains). */
    static InterviewerCounts of(VariableConfig v, ScreenedVariable screened, List<ColumnTally> tallies) {
        int k = tallies.size();
        Codebook codebook = VariableScreen.codebook(v);
        Set<String> disguised = new HashSet<>();
        for (MissingCandidate c : screened.candidates()) {
            if (c.confidence() >= VariableScreen.EXCLUDE_CONFIDENCE) {
                disguised.add(c.value());
            }
        }
        boolean numeric = screened.numeric() != null;
        boolean categorical = screened.categories() != null;
        ValidNumber rule = screened.validNumber() != null ? screened.validNumber() : ValidNumber.of(v);
        List<String> categories = categorical ? screened.categories().categories() : null;

        long[] rows = new long[k];
        long[] missing = new long[k];
        Map<String, long[]> byValue = new LinkedHashMap<>();
        NumericDistribution[] numbers = numeric ? new NumericDistribution[k] : null;
        long[][] counts = categorical ? new long[k][categories.size()] : null;
        boolean binned = false;
        for (int i = 0; i < k; i++) {
            ColumnTally t = tallies.get(i);
            rows[i] = t.rowCount();
            binned |= !t.binning().isExact();
            if (t.nullCount() > 0) {
                missing[i] += t.nullCount();
                byValue.computeIfAbsent(DomainMeasure.NULL, x -> new long[k])[i] += t.nullCount();
            }
            Map<Double, Long> valid = numeric ? new HashMap<>() : null;
            for (Map.Entry<String, Long> e : t.valueCounts().entrySet()) {
                String x = e.getKey();
                long c = e.getValue();
                if (disguised.contains(x) || codebook.reasonOf(x, t.type()).isPresent()) {
                    missing[i] += c;
                    byValue.computeIfAbsent(x, y -> new long[k])[i] += c;
                } else if (numeric) {
                    double y = rule.value(x);
                    if (!Double.isNaN(y)) {
                        valid.merge(y, c, Long::sum);
                    }
                } else if (categorical) {
                    int j = screened.categories().indexOf(x);
                    if (j >= 0) {
                        counts[i][j] += c;
                    }
                }
            }
            if (numeric) {
                numbers[i] = NumericDistribution.ofTally(valid);
            }
        }
        return new InterviewerCounts(v, rows, missing, byValue, numbers, categories, counts, binned);
    }

    String name() {
        return variable.name();
    }
}
