package org.wavewarden.missing;

import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.compare.interviewer.InterviewerFlag;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.ColumnTally;

import java.util.Collection;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import java.util.stream.Collectors;

/**
 * Which rows of the judged wave a finding's case list holds: the raw values (in PostgreSQL's text form, as the
 * scanner tallied them) that the finding is about, read back from the finding's own detail and the same valid-answer
 * rule that made it, so that the list names exactly the answers the finding counted.
 *
 * <p>Kinds with a case list:
 * <ul>
 *   <li>the disguised-missing kinds (BLANK, INVISIBLE, PLACEHOLDER, PATTERN_OUTLIER, NUMERIC_SENTINEL,
 *       OUT_OF_RANGE_SENTINEL, SENTINEL_DATE, INLIER_SPIKE, and TEXT_IN_NUMERIC in a text variable): the candidate
 *       values the finding reports;</li>
 *   <li>MISSING_CODE: every answer the declared missing codes and ranges match;</li>
 *   <li>OUT_OF_RANGE: every answer outside the declared range;</li>
 *   <li>TEXT_IN_NUMERIC in a numeric variable: every answer that is not a finite number;</li>
 *   <li>CODE_APPEARED and CODE_UNLABELLED: the answers carrying the new or unlabelled codes;</li>
 *   <li>INTERVIEWER_OUTLIER: the flagged interviewer's rows holding the offending values, or every row of the
 *       interviewer with an answer to the variable when the flag names no value (a mean or a distribution that
 *       stands out).</li>
 * </ul>
 *
 * <p>Kinds without one, and why: CODE_VANISHED (the code has no answers in this wave), LABEL_CHANGED (the answers
 * are valid, the codebook changed), MISSING_RATE_CHANGE (a rate of the whole wave; the cases of each missing reason
 * are listed with that reason's own finding), HEAPING and DIGIT_PREFERENCE (a pattern of the distribution, no single
 * answer is wrong), ALL_NULL, CONSTANT and TOO_MANY_DISTINCT (about every row of the column, not some), EMPTY_WAVE,
 * the schema kinds (COLUMN_ADDED, COLUMN_DROPPED, COLUMN_RETYPED), SIGNED_WAVE_CHANGED and SKIPPED (no answers
 * involved), INTERVIEWER_EFFECT (a property of every workload together; the interviewers that stand out are flagged
 * apart, each with its list), and every change between waves (SHIFT and the like).
 *
 * <p>Values longer than the scanner keeps whole are tallied as a prefix with a hash and match no row: such a value
 * is not listed.
 */
public final class CaseSelection {

    private CaseSelection() {
    }

    /**
     * The rows a case list holds.
     *
     * @param variable          the column whose values are listed
     * @param values            the offending values (text form); empty with {@code anyAnswer}
     * @param nulls             whether rows where the variable is SQL NULL are listed too
     * @param anyAnswer         every row with an answer (not NULL) to the variable is listed
     * @param interviewerColumn for an interviewer's list, the interviewer column; null otherwise
     * @param interviewer       for an interviewer's list, the interviewer's id (text form)
     * @param description       the selection in words, for a reader
     */
    public record Selection(String variable, Set<String> values, boolean nulls, boolean anyAnswer,
                            String interviewerColumn, String interviewer, String description) {

        public Selection {
            values = Set.copyOf(values);
        }

        /** Whether a row's value of the variable (null: SQL NULL) and interviewer belong to the list. */
        public boolean matches(String value, String rowInterviewer) {
            if (interviewerColumn != null && !interviewer.equals(rowInterviewer)) {
                return false;
            }
            if (value == null) {
                return nulls;
            }
            return anyAnswer || values.contains(value);
        }

        /** Whether the selection can match any row at all. */
        public boolean isEmpty() {
            return values.isEmpty() && !nulls && !anyAnswer;
        }
    }

    /**
     * The selection of a finding's case list, or empty when its kind lists no cases (see the class comment).
     *
     * @param finding  a finding of the judged wave, its detail the record the run made (not yet stored)
     * @param screened the judged wave after the missing-values stage
     */
    public static Optional<Selection> of(Finding finding, ScreenedWave screened) {
        FindingKind kind = finding.kind();
        if (kind == FindingKind.INTERVIEWER_OUTLIER) {
            return finding.detail() instanceof InterviewerFlag flag ? Optional.of(interviewer(flag))
                    : Optional.empty();
        }
        if (!kind.isDataQuality()) {
            return Optional.empty();
        }
        String name = finding.variable();
        ColumnTally tally = screened.tally(name);
        Optional<VariableConfig> v = screened.variable(name);
        if (tally == null || v.isEmpty()) {
            return Optional.empty();
        }
        ScreenedVariable s;
        try {
            s = screened.get(name).orElse(null);
        } catch (RuntimeException failedScreen) {
            // A variable whose screening failed has no findings of its answers to list.
            return Optional.empty();
        }
        if (s == null) {
            return Optional.empty();
        }
        Set<String> values = switch (kind) {
            case BLANK, INVISIBLE, PLACEHOLDER, PATTERN_OUTLIER, NUMERIC_SENTINEL, OUT_OF_RANGE_SENTINEL,
                    SENTINEL_DATE, INLIER_SPIKE, TEXT_IN_NUMERIC -> finding.detail()
                    instanceof DataQualityFindings.CandidatesDetail c
                    ? c.candidates().stream().map(MissingCandidate::value).collect(Collectors.toCollection(
                    LinkedHashSet::new))
                    : kind == FindingKind.TEXT_IN_NUMERIC ? notNumbers(s) : Set.of();
            case MISSING_CODE -> declaredMissing(v.get(), tally);
            case OUT_OF_RANGE -> outsideRange(v.get(), tally, s);
            case CODE_APPEARED, CODE_UNLABELLED -> finding.detail() instanceof DataQualityFindings.CodesDetail c
                    ? answersCarrying(c.codes(), tally) : Set.of();
            default -> Set.of();
        };
        if (values.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new Selection(name, values, false, false, null, null, name + " " + in(values)));
    }

    private static Selection interviewer(InterviewerFlag flag) {
        Set<String> values = new LinkedHashSet<>();
        boolean nulls = false;
        for (String o : flag.offendingValues()) {
            if (DomainMeasure.NULL.equals(o)) {
                nulls = true;
            } else {
                values.add(o);
            }
        }
        boolean any = flag.offendingValues().isEmpty();
        String which = any ? flag.variable() + " answered"
                : flag.variable() + " " + (values.isEmpty() ? "" : in(values)) + (nulls ? (values.isEmpty() ? ""
                : " or ") + "NULL" : "");
        return new Selection(flag.variable(), values, nulls, any, flag.interviewerColumn(), flag.interviewer(),
                flag.interviewerColumn() + " = " + quoted(flag.interviewer()) + ", " + which);
    }

    /** Every raw answer the declared missing codes and ranges match, as the screen's codebook split matched them. */
    private static Set<String> declaredMissing(VariableConfig v, ColumnTally tally) {
        Codebook codebook = VariableScreen.codebook(v);
        return tally.valueCounts().keySet().stream()
                .filter(raw -> codebook.reasonOf(raw, tally.type()).isPresent())
                .collect(Collectors.toCollection(java.util.TreeSet::new));
    }

    /**
     * The answers left out as outside the declared range: what the screen excluded that is neither a declared code
     * nor a disguised value it was confident of.
     */
    private static Set<String> outsideRange(VariableConfig v, ColumnTally tally, ScreenedVariable s) {
        Codebook codebook = VariableScreen.codebook(v);
        // Only a candidate the screen was confident of was left out as disguised; a doubtful one outside the range
        // was left out as outside it.
        Set<String> candidates = s.candidates().stream().filter(c -> c.confidence() >= VariableScreen.EXCLUDE_CONFIDENCE)
                .map(MissingCandidate::value).collect(Collectors.toSet());
        return s.excludedValues().stream()
                .filter(raw -> codebook.reasonOf(raw, tally.type()).isEmpty() && !candidates.contains(raw))
                .collect(Collectors.toCollection(java.util.TreeSet::new));
    }

    /** The answers of a numeric variable that are not finite numbers, and the text the screen left out as such. */
    private static Set<String> notNumbers(ScreenedVariable s) {
        Set<String> out = new java.util.TreeSet<>(s.invalid().keySet());
        s.candidates().stream().filter(c -> c.kind() == CandidateKind.TEXT_IN_NUMERIC)
                .filter(c -> s.excludedValues().contains(c.value())).forEach(c -> out.add(c.value()));
        return out;
    }

    /** The raw answers carrying the codes: written as the code, or the same number (as code labels match). */
    private static Set<String> answersCarrying(Collection<String> codes, ColumnTally tally) {
        Set<String> numeric = codes.stream().map(CodeLabels::numericKey).filter(java.util.Objects::nonNull)
                .collect(Collectors.toSet());
        return tally.valueCounts().keySet().stream().filter(raw -> codes.contains(raw)
                        || (CodeLabels.numericKey(raw) != null && numeric.contains(CodeLabels.numericKey(raw))))
                .collect(Collectors.toCollection(java.util.TreeSet::new));
    }

    private static String in(Set<String> values) {
        List<String> shown = values.stream().limit(5).map(CaseSelection::quoted).toList();
        String listed = String.join(", ", shown) + (values.size() > shown.size() ? ", ..." : "");
        return values.size() == 1 ? "= " + listed : "in (" + listed + ")";
    }

    private static String quoted(String v) {
        return DataQualityFindings.quoted(v);
    }

    /** The kinds whose findings may carry a case list, for the documentation and its test. */
    public static final Set<FindingKind> LISTED = java.util.EnumSet.of(FindingKind.BLANK, FindingKind.INVISIBLE,
            FindingKind.PLACEHOLDER, FindingKind.PATTERN_OUTLIER, FindingKind.NUMERIC_SENTINEL,
            FindingKind.OUT_OF_RANGE_SENTINEL, FindingKind.SENTINEL_DATE, FindingKind.INLIER_SPIKE,
            FindingKind.TEXT_IN_NUMERIC, FindingKind.MISSING_CODE, FindingKind.OUT_OF_RANGE, FindingKind.CODE_APPEARED,
            FindingKind.CODE_UNLABELLED, FindingKind.INTERVIEWER_OUTLIER);
}
