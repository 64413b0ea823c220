package org.wavewarden.missing;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.NumericDistribution;

class CodeFrameChangeTest {

    static CategoryCounts counts(List<String> cats, long... c) {
        return new CategoryCounts(cats, c);
    }

    @Test
    void aNewOptionAppearsAndADroppedOneVanishes() {
        CategoryCounts base = counts(List.of("north", "south", "east"), 100, 80, 60);
        CategoryCounts cur = counts(List.of("north", "south", "central"), 110, 70, 40);
        CodeFrameChange c = CodeFrameChange.between(base, cur, 1);
        assertEquals(List.of("central"), c.appeared());
        assertEquals(List.of("east"), c.vanished());
        assertTrue(c.changed());
    }

    @Test
    void renamedOrAddedCodesOutgrowABinaryFrameButALostAnswerOrAStrayOneDoesNot() {
        CategoryCounts oneTwo = counts(List.of("1", "2"), 210, 190);
        assertTrue(CodeFrameChange.outgrowsTwoCodes(oneTwo, counts(List.of("no", "yes"), 180, 220), 5));
        assertTrue(CodeFrameChange.outgrowsTwoCodes(oneTwo, counts(List.of("1", "2", "3"), 200, 150, 50), 5));
        assertFalse(CodeFrameChange.outgrowsTwoCodes(oneTwo, counts(List.of("1"), 400), 5));
        assertFalse(CodeFrameChange.outgrowsTwoCodes(oneTwo, counts(List.of("1", "2", "yes"), 200, 198, 2), 5));
        assertEquals(List.of("1", "2", "no", "yes"),
                CodeFrameChange.codesInUse(oneTwo, counts(List.of("no", "yes"), 180, 220), 5));
    }

    @Test
    void oneStrayAnswerDoesNotMakeACodeAppearWhenMinCountIsAboveOne() {
        CategoryCounts base = counts(List.of("yes", "no"), 500, 400);
        CategoryCounts cur = counts(List.of("yes", "no", "Yes "), 480, 410, 1);
        assertEquals(List.of("Yes "), CodeFrameChange.between(base, cur, 1).appeared());
        assertFalse(CodeFrameChange.between(base, cur, 5).changed());
        // A code dwindling to a handful of answers counts as vanished at that threshold.
        CategoryCounts later = counts(List.of("yes", "no"), 890, 3);
        assertEquals(List.of("no"), CodeFrameChange.between(base, later, 5).vanished());
        assertThrows(IllegalArgumentException.class, () -> CodeFrameChange.between(base, cur, 0));
    }

    @Test
    void swappingTheWavesSwapsAppearedAndVanishedAndOrderDoesNotMatter() {
        Random rnd = new Random(9);
        for (int rep = 0; rep < 100; rep++) {
            List<String> a = new ArrayList<>();
            List<String> b = new ArrayList<>();
            for (int i = 0; i < 12; i++) {
                if (rnd.nextDouble() < 0.7) {
                    a.add("c" + i);
                }
                if (rnd.nextDouble() < 0.7) {
                    b.add("c" + i);
                }
            }
            long[] ca = rnd.longs(a.size(), 0, 20).toArray();
            long[] cb = rnd.longs(b.size(), 0, 20).toArray();
            CategoryCounts x = counts(a, ca);
            CategoryCounts y = counts(b, cb);
            long min = 1 + rnd.nextInt(6);
            CodeFrameChange f = CodeFrameChange.between(x, y, min);
            CodeFrameChange r = CodeFrameChange.between(y, x, min);
            assertEquals(sorted(f.appeared()), sorted(r.vanished()));
            assertEquals(sorted(f.vanished()), sorted(r.appeared()));
            List<Integer> idx = new ArrayList<>();
            for (int i = 0; i < a.size(); i++) {
                idx.add(i);
            }
            Collections.shuffle(idx, rnd);
            List<String> a2 = idx.stream().map(a::get).toList();
            long[] ca2 = idx.stream().mapToLong(i -> ca[i]).toArray();
            CodeFrameChange g = CodeFrameChange.between(counts(a2, ca2), y, min);
            assertEquals(sorted(f.appeared()), sorted(g.appeared()));
            assertEquals(sorted(f.vanished()), sorted(g.vanished()));
        }
    }

    private static List<String> sorted(List<String> s) {
        return s.stream().sorted().toList();
    }

    @Test
    void rangeViolationsCountBothSidesAndShowTheMostFrequentOffenders() {
        NumericDistribution d = NumericDistribution.ofTally(new java.util.TreeMap<>(java.util.Map.of(
                -9.0, 4L, 0.0, 12L, 1.0, 50L, 3.0, 40L, 5.0, 20L, 9.0, 30L, 99.0, 2L)));
        RangeViolation v = RangeViolation.check(d, ValueRange.between(1, 5));
        assertEquals(16, v.below());
        assertEquals(32, v.above());
        assertEquals(List.of(0.0, -9.0), v.examplesBelow());
        assertEquals(List.of(9.0, 99.0), v.examplesAbove());
        assertEquals(48.0 / 158, v.share(), 1e-12);
        RangeViolation open = RangeViolation.check(d, ValueRange.atLeast(0));
        assertEquals(4, open.below());
        assertEquals(0, open.above());
        assertThrows(IllegalArgumentException.class, () -> ValueRange.between(5, 1));
    }

    @Test
    void rangeViolationsOnATableEqualCountsOnTheRawData() {
        Random rnd = new Random(21);
        for (int rep = 0; rep < 50; rep++) {
            double[] raw = new double[300];
            for (int i = 0; i < raw.length; i++) {
                raw[i] = rnd.nextInt(30) - 5;
            }
            ValueRange r = ValueRange.between(0, 20);
            RangeViolation v = RangeViolation.check(NumericDistribution.ofSample(raw), r);
            long below = java.util.Arrays.stream(raw).filter(x -> x < 0).count();
            long above = java.util.Arrays.stream(raw).filter(x -> x > 20).count();
            assertEquals(below, v.below());
            assertEquals(above, v.above());
        }
    }
}
