package org.wavewarden.compare.release;

import org.wavewarden.compare.release.ReleaseRevision.CellChange;
import org.wavewarden.compare.release.ReleaseRevision.VariableChanges;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.read.KeyOrder;
import org.wavewarden.read.KeyedPairReader;
import org.wavewarden.read.KeyedPairReader.SideKeys;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;

/**
 * Compares two publications of one wave from the rows the {@link KeyedPairReader} matches by respondent key, in one
 * pass: respondents added and removed, changed cells per column, and each release's value tallies, whose
 * distributions are then judged as two waves' are. No database, clock or I/O: the rows come in, a
 * {@link ReleaseRevision} comes out.
 *
 * <p>Rows matched to no one (NULL or duplicated keys) still count in their release's tallies: the distribution
 * comparison is about everything published, the cell comparison only about respondents known on both sides.
 */
public final class ReleaseComparison implements KeyedPairReader.Visitor {

    /** Examples kept per list: enough to look a change up, few enough to read. */
    public static final int EXAMPLES = 5;

    /**
     * A column compared between the releases.
     *
     * @param distribution whether its distributions are compared too; a weight column's cells are compared, but it
     *                     is no answer to compare as a variable
     */
    public record ComparedColumn(String name, ColumnType typeBefore, ColumnType typeAfter, boolean distribution) {
    }

    /**
     * Judges the distributions of two sets of tallies, the earlier release as baseline. The pipeline passes the
     * judging a wave gets, so releases and waves are held to one rule.
     */
    @FunctionalInterface
    public interface DistributionJudge {
        ReleaseRevision.Distributions judge(Map<String, ColumnTally> before, Map<String, ColumnTally> after);
    }

    private final List<ComparedColumn> columns;
    private final String beforeLabel;
    private final String afterLabel;
    private final Tallies before;
    private final Tallies after;
    private final long[] changed;
    private final long[] becameNull;
    private final long[] becameValue;
    private final List<KeyOrder.Smallest<CellChange>> examples = new ArrayList<>();
    private final KeyOrder.Smallest<String> addedExamples = new KeyOrder.Smallest<>(EXAMPLES, k -> k);
    private final KeyOrder.Smallest<String> removedExamples = new KeyOrder.Smallest<>(EXAMPLES, k -> k);
    private long matched;
    private long added;
    private long removed;

    /**
     * @param columns     in the order of the reader's arrays
     * @param maxDistinct distinct values kept per column and release, as the wave scanners cap them
     */
    public ReleaseComparison(List<ComparedColumn> columns, String beforeLabel, String afterLabel, int maxDistinct) {
        this.columns = List.copyOf(columns);
        this.beforeLabel = beforeLabel;
        this.afterLabel = afterLabel;
        int k = this.columns.size();
        this.before = new Tallies(this.columns, maxDistinct);
        this.after = new Tallies(this.columns, maxDistinct);
        this.changed = new long[k];
        this.becameNull = new long[k];
        this.becameValue = new long[k];
        for (int i = 0; i < k; i++) {
            examples.add(new KeyOrder.Smallest<>(EXAMPLES, CellChange::key));
        }
    }

    @Override
    public void row(String key, String[] b, String[] a) {
        if (b == null) {
            added++;
            addedExamples.offer(key);
            after.add(a);
            return;
        }
        if (a == null) {
            removed++;
            removedExamples.offer(key);
            before.add(b);
            return;
        }
        matched++;
        before.add(b);
        after.add(a);
        for (int i = 0; i < b.length; i++) {
            if (Objects.equals(b[i], a[i])) {
                continue;
            }
            changed[i]++;
            if (a[i] == null) {
                becameNull[i]++;
            } else if (b[i] == null) {
                becameValue[i]++;
            }
            examples.get(i).offer(new CellChange(key, KeyedPairReader.tallied(b[i]), KeyedPairReader.tallied(a[i])));
        }
    }

    @Override
    public void unmatched(String key, String[] b, String[] a) {
        if (b != null) {
            before.add(b);
        }
        if (a != null) {
            after.add(a);
        }
    }

    /**
     * The revision, once every row has come.
     *
     * @param keysBefore the reader's account of the earlier release's keys
     * @param keysAfter  the same for the later release
     */
    public ReleaseRevision finish(SideKeys keysBefore, SideKeys keysAfter, DistributionJudge judge) {
        List<VariableChanges> changes = new ArrayList<>();
        for (int i = 0; i < columns.size(); i++) {
            changes.add(new VariableChanges(columns.get(i).name(), matched, changed[i], becameNull[i], becameValue[i],
                    matched == 0 ? null : (double) changed[i] / matched, examples.get(i).sorted()));
        }
        ReleaseRevision.Distributions d = judge.judge(before.tallies(true), after.tallies(false));
        List<String> notes = new ArrayList<>();
        note(notes, keysBefore, beforeLabel);
        note(notes, keysAfter, afterLabel);
        return new ReleaseRevision(before.rows, after.rows, matched, added, removed, addedExamples.sorted(),
                removedExamples.sorted(), keysBefore, keysAfter, changes, d.inference(), d.findings(), notes);
    }

    private static void note(List<String> notes, SideKeys keys, String label) {
        if (keys.duplicateKeys() > 0) {
            notes.add(String.format(Locale.ROOT, "%,d respondent key(s) occur more than once in %s (%,d rows), for"
                            + " example %s: those rows count in the distributions but are matched to no one.",
                    keys.duplicateKeys(), label, keys.duplicateKeyRows(), String.join(", ", keys.duplicateExamples())));
        }
        if (keys.nullKeyRows() > 0) {
            notes.add(String.format(Locale.ROOT, "%,d row(s) of %s have no respondent key (NULL): they count in the"
                    + " distributions but are matched to no one.", keys.nullKeyRows(), label));
        }
    }

    /** One release's value tallies of the columns whose distributions are compared. */
    private static final class Tallies {
        final List<ComparedColumn> columns;
        final int maxDistinct;
        final List<Map<String, long[]>> counts = new ArrayList<>();
        final long[] nulls;
        final boolean[] truncated;
        long rows;

        Tallies(List<ComparedColumn> columns, int maxDistinct) {
            this.columns = columns;
            this.maxDistinct = maxDistinct;
            this.nulls = new long[columns.size()];
            this.truncated = new boolean[columns.size()];
            for (ComparedColumn c : columns) {
                counts.add(c.distribution() ? new HashMap<>() : null);
            }
        }

        void add(String[] row) {
            rows++;
            for (int i = 0; i < row.length; i++) {
                Map<String, long[]> t = counts.get(i);
                if (t == null) {
                    continue;
                }
                String v = KeyedPairReader.tallied(row[i]);
                if (v == null) {
                    nulls[i]++;
                    continue;
                }
                long[] cell = t.get(v);
                if (cell != null) {
                    cell[0]++;
                } else if (t.size() < maxDistinct) {
                    t.put(v, new long[] {1});
                } else {
                    truncated[i] = true;
                }
            }
        }

        Map<String, ColumnTally> tallies(boolean earlier) {
            Map<String, ColumnTally> out = new LinkedHashMap<>();
            for (int i = 0; i < columns.size(); i++) {
                if (counts.get(i) == null) {
                    continue;
                }
                Map<String, Long> values = new HashMap<>(counts.get(i).size() * 2);
                counts.get(i).forEach((v, cell) -> values.put(v, cell[0]));
                ComparedColumn c = columns.get(i);
                out.put(c.name(), new ColumnTally(c.name(), earlier ? c.typeBefore() : c.typeAfter(), rows, nulls[i],
                        values, truncated[i]));
            }
            return out;
        }
    }
}
