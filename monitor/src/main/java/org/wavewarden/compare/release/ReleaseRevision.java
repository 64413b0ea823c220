package org.wavewarden.compare.release;

import org.wavewarden.judge.Finding;
import org.wavewarden.read.KeyedPairReader.SideKeys;

import java.util.List;

/**
 * How a wave changed between two publications of it: respondents added and removed, cells changed per variable
 * with examples, the keys that could not be matched, and the two releases' distributions judged as two waves are.
 *
 * @param rowsBefore      rows of the earlier release
 * @param rowsAfter       rows of the later release
 * @param matched         respondents present once in each release, whose cells are compared
 * @param added           respondents only in the later release
 * @param removed         respondents only in the earlier release
 * @param addedExamples   up to {@link ReleaseComparison#EXAMPLES} added keys, the smallest first
 * @param removedExamples up to {@link ReleaseComparison#EXAMPLES} removed keys, the smallest first
 * @param keysBefore      the earlier release's keys: NULL and duplicated keys, whose rows are matched to no one
 * @param keysAfter       the same for the later release
 * @param variables       per compared column, its changed cells
 * @param inference       how unlisted variables were classified for the distribution comparison
 * @param findings        the distribution comparison of the two releases (the earlier as baseline) and its
 *                        data-quality findings
 * @param notes           plain sentences on what kept respondents from being matched
 */
public record ReleaseRevision(long rowsBefore, long rowsAfter, long matched, long added, long removed,
                              List<String> addedExamples, List<String> removedExamples, SideKeys keysBefore,
                              SideKeys keysAfter, List<VariableChanges> variables, List<String> inference,
                              List<Finding> findings, List<String> notes) {

    public ReleaseRevision {
        addedExamples = List.copyOf(addedExamples);
        removedExamples = List.copyOf(removedExamples);
        variables = List.copyOf(variables);
        inference = List.copyOf(inference);
        findings = List.copyOf(findings);
        notes = List.copyOf(notes);
    }

    /**
     * The changed cells of one column among the matched respondents. A cell changed when its text form differs,
     * NULL against a value included (so a numeric 1.0 republished as 1.00 is a change: the published text is).
     *
     * @param comparedCells matched respondents, one cell each
     * @param changedCells  cells whose value differs, NULL against a value included
     * @param becameNull    of those, a value in the earlier release and NULL in the later
     * @param becameValue   of those, NULL in the earlier release and a value in the later
     * @param shareChanged  changedCells / comparedCells, or null when nothing was compared
     * @param examples      up to {@link ReleaseComparison#EXAMPLES} changed cells, the smallest keys first
     */
    public record VariableChanges(String variable, long comparedCells, long changedCells, long becameNull,
                                  long becameValue, Double shareChanged, List<CellChange> examples) {

        public VariableChanges {
            examples = List.copyOf(examples);
        }
    }

    /** One changed cell: the respondent and the value before and after, null for SQL NULL. */
    public record CellChange(String key, String before, String after) {
    }

    /** The distribution comparison of the two releases: the inference it made and its judged findings. */
    public record Distributions(List<String> inference, List<Finding> findings) {

        public Distributions {
            inference = List.copyOf(inference);
            findings = List.copyOf(findings);
        }
    }
}
