package org.wavewarden.compare.release;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.release.ReleaseComparison.ComparedColumn;
import org.wavewarden.compare.release.ReleaseRevision.CellChange;
import org.wavewarden.compare.release.ReleaseRevision.VariableChanges;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.read.KeyedPairReader.SideKeys;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The release comparison on rows handed to it directly: counts, examples and tallies, no database. */
class ReleaseComparisonTest {

    static final SideKeys CLEAN = new SideKeys(0, 0, 0, 0, List.of());

    static ComparedColumn text(String name) {
        return new ComparedColumn(name, ColumnType.TEXT, ColumnType.TEXT, true);
    }

    /** The tallies the distribution judge was given, and no findings. */
    static final class Captured implements ReleaseComparison.DistributionJudge {
        Map<String, ColumnTally> before;
        Map<String, ColumnTally> after;

        @Override
        public ReleaseRevision.Distributions judge(Map<String, ColumnTally> b, Map<String, ColumnTally> a) {
            before = b;
            after = a;
            return new ReleaseRevision.Distributions(List.of("x: categorical"), List.of());
        }
    }

    static ReleaseComparison comparison(ComparedColumn... columns) {
        return new ReleaseComparison(List.of(columns), "release 1", "release 2", 100);
    }

    @Test
    void aNullAgainstAValueIsAChangeEitherWay() {
        ReleaseComparison c = comparison(text("a"), text("b"));
        c.row("1", new String[] {"x", null}, new String[] {"x", "y"});
        c.row("2", new String[] {"x", "y"}, new String[] {"z", null});
        c.row("3", new String[] {null, null}, new String[] {null, null});
        ReleaseRevision r = c.finish(CLEAN, CLEAN, new Captured());
        assertEquals(new VariableChanges("a", 3, 1, 0, 0, 1 / 3.0, List.of(new CellChange("2", "x", "z"))),
                r.variables().get(0));
        assertEquals(new VariableChanges("b", 3, 2, 1, 1, 2 / 3.0, List.of(new CellChange("1", null, "y"),
                new CellChange("2", "y", null))), r.variables().get(1));
        assertEquals(3, r.matched());
    }

    @Test
    void examplesAreTheSmallestKeysWhateverOrderTheRowsCameIn() {
        List<String> keys = new ArrayList<>(List.of("12", "3", "100", "7", "25", "9", "1", "40", "2b"));
        List<List<String>> seen = new ArrayList<>();
        Random random = new Random(3);
        for (int round = 0; round < 5; round++) {
            Collections.shuffle(keys, random);
            ReleaseComparison c = comparison(text("a"));
            keys.forEach(k -> c.row(k, new String[] {"old"}, new String[] {"new"}));
            ReleaseRevision r = c.finish(CLEAN, CLEAN, new Captured());
            seen.add(r.variables().get(0).examples().stream().map(CellChange::key).toList());
            assertEquals(9, r.variables().get(0).changedCells());
        }
        // As numbers, not as text (which would put 100 before 12 and 3); text keys after the numbers.
        seen.forEach(s -> assertEquals(List.of("1", "3", "7", "9", "12"), s));
    }

    @Test
    void addedAndRemovedRespondentsAreCountedAndTheirRowsTallied() {
        ReleaseComparison c = comparison(text("a"));
        c.row("1", new String[] {"x"}, new String[] {"x"});
        c.row("30", null, new String[] {"y"});
        c.row("4", null, new String[] {null});
        c.row("5", new String[] {"z"}, null);
        Captured judge = new Captured();
        ReleaseRevision r = c.finish(CLEAN, CLEAN, judge);
        assertEquals(2, r.added());
        assertEquals(List.of("4", "30"), r.addedExamples());
        assertEquals(1, r.removed());
        assertEquals(List.of("5"), r.removedExamples());
        assertEquals(2, r.rowsBefore());
        assertEquals(3, r.rowsAfter());
        assertEquals(1, r.variables().get(0).comparedCells());
        assertEquals(0, r.variables().get(0).changedCells());
        assertEquals(new ColumnTally("a", ColumnType.TEXT, 2, 0, Map.of("x", 1L, "z", 1L), false),
                judge.before.get("a"));
        assertEquals(new ColumnTally("a", ColumnType.TEXT, 3, 1, Map.of("x", 1L, "y", 1L), false),
                judge.after.get("a"));
        assertEquals(List.of("x: categorical"), r.inference());
    }

    @Test
    void unmatchedRowsCountInTheirReleasesTalliesButInNoCellComparison() {
        ReleaseComparison c = comparison(text("a"));
        c.unmatched("8", new String[] {"x"}, new String[] {"y"});
        c.unmatched(null, null, new String[] {"y"});
        Captured judge = new Captured();
        ReleaseRevision r = c.finish(CLEAN, new SideKeys(2, 1, 1, 1, List.of("8")), judge);
        assertEquals(0, r.matched());
        assertEquals(0, r.added() + r.removed());
        assertNull(r.variables().get(0).shareChanged(), "nothing compared, no share");
        assertEquals(Map.of("x", 1L), judge.before.get("a").valueCounts());
        assertEquals(Map.of("y", 2L), judge.after.get("a").valueCounts());
        assertEquals(List.of("1 respondent key(s) occur more than once in release 2 (1 rows), for example 8: those"
                        + " rows count in the distributions but are matched to no one.",
                "1 row(s) of release 2 have no respondent key (NULL): they count in the distributions but are matched"
                        + " to no one."), r.notes());
    }

    @Test
    void aColumnThatIsNoAnswerIsComparedCellByCellButNotTallied() {
        ReleaseComparison c = comparison(text("a"), new ComparedColumn("w", ColumnType.DECIMAL, ColumnType.DECIMAL,
                false));
        c.row("1", new String[] {"x", "1.5"}, new String[] {"x", "1.75"});
        Captured judge = new Captured();
        ReleaseRevision r = c.finish(CLEAN, CLEAN, judge);
        assertEquals(1, r.variables().get(1).changedCells());
        assertEquals(List.of("a"), List.copyOf(judge.after.keySet()));
    }

    @Test
    void beyondTheCapOfDistinctValuesATallyIsMarkedTruncated() {
        ReleaseComparison c = new ReleaseComparison(List.of(text("a")), "1", "2", 2);
        for (String v : new String[] {"p", "q", "r", "p"}) {
            c.row(v, new String[] {v}, new String[] {v});
        }
        Captured judge = new Captured();
        c.finish(CLEAN, CLEAN, judge);
        assertTrue(judge.before.get("a").truncated());
        assertEquals(Map.of("p", 2L, "q", 1L), judge.before.get("a").valueCounts());
    }

    @Test
    void longValuesAreComparedInFullButShownAndTalliedShortened() {
        String longA = "a".repeat(300);
        String longB = "a".repeat(299) + "b";
        ReleaseComparison c = comparison(text("essay"));
        c.row("1", new String[] {longA}, new String[] {longB});
        Captured judge = new Captured();
        ReleaseRevision r = c.finish(CLEAN, CLEAN, judge);
        CellChange e = r.variables().get(0).examples().get(0);
        assertEquals(1, r.variables().get(0).changedCells());
        assertTrue(e.before().length() < 250 && e.before().contains("300 chars"), e.before());
        assertFalse(e.before().equals(e.after()), "distinct values stay distinct when shortened");
        assertFalse(judge.before.get("essay").valueCounts().containsKey(longA));
    }

    @Test
    void theRevisionCannotBeChangedAfterwards() {
        ReleaseComparison c = comparison(text("a"));
        c.row("1", new String[] {"x"}, new String[] {"y"});
        ReleaseRevision r = c.finish(CLEAN, CLEAN, new Captured());
        assertThrows(UnsupportedOperationException.class, () -> r.variables().get(0).examples().clear());
        assertThrows(UnsupportedOperationException.class, () -> r.variables().clear());
        assertThrows(UnsupportedOperationException.class, () -> r.addedExamples().add("2"));
    }
}
