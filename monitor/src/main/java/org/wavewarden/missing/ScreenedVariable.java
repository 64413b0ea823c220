package org.wavewarden.missing;

import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;
import java.util.Map;

/**
 * One variable of one wave after the missing-in-disguise stage: what is missing and why, and the valid answers
 * that alone enter the comparison.
 *
 * @param rows           rows in the wave
 * @param sqlNulls       rows with SQL NULL
 * @param missingByReason codebook missing codes and excluded disguised values, counted by reason
 * @param candidates     disguised-missing candidates found without a codebook (excluded or not)
 * @param excludedValues raw values left out of the comparison (codebook codes, confident candidates, out of range)
 * @param invalid        values that are not of the variable's type (text in a number), with counts
 * @param numeric        valid answers of a continuous or ordinal variable; null otherwise
 * @param categories     valid answers of a categorical or binary variable; null otherwise
 * @param weighted       with a weight column, the valid answers with their counts and weight sums: for a numeric
 *                       variable the values of {@code numeric}, for a categorical or binary one the positions of
 *                       {@code categories}; null without weights (and for text and dates)
 * @param validNumber    for a continuous or ordinal variable, the rule for a valid answer as this screen applied it
 *                       (the raw answers it left out are left out exactly); null otherwise
 */
public record ScreenedVariable(long rows, long sqlNulls, Map<String, Long> missingByReason,
                               List<MissingCandidate> candidates, List<String> excludedValues,
                               Map<String, Long> invalid, NumericDistribution numeric, CategoryCounts categories,
                               WeightedTally weighted, ValidNumber validNumber) {

    /** Valid answers: those that enter the comparison, or for text and dates every answer not missing. */
    public long validN() {
        if (numeric != null) {
            return numeric.n();
        }
        if (categories != null) {
            return categories.n();
        }
        long missing = missingByReason.values().stream().mapToLong(Long::longValue).sum();
        long bad = invalid.values().stream().mapToLong(Long::longValue).sum();
        return Math.max(0, rows - sqlNulls - missing - bad);
    }
}
