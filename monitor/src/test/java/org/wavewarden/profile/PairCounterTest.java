package org.wavewarden.profile;

import org.junit.jupiter.api.Test;
import org.wavewarden.deliver.Json;

import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The joint tally of two columns is exact within its budget, bounded beyond it, and never depends on row order. */
class PairCounterTest {

    /** Invented answers: amounts over many magnitudes, some ages, the codes -9 and 999 now and then. */
    private static List<double[]> rows(int n, long seed) {
        Random r = new Random(seed);
        List<double[]> out = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            double x = r.nextInt(20) == 0 ? -9 : Math.round(Math.exp(6 + 2 * r.nextGaussian()) * 100) / 100.0;
            double y = r.nextInt(30) == 0 ? 999 : 16 + r.nextInt(80) + (r.nextBoolean() ? 0.5 : 0);
            out.add(new double[] {x, y});
        }
        return out;
    }

    private static JointTally tally(List<double[]> rows, int maxPairs) {
        PairCounter c = new PairCounter(maxPairs);
        rows.forEach(p -> c.add(p[0], p[1]));
        return c.tally("x", "y");
    }

    @Test
    void withinTheBudgetEveryPairIsCountedExactly() {
        List<double[]> rows = new ArrayList<>();
        Random r = new Random(3);
        Map<List<Double>, Long> expected = new HashMap<>();
        for (int i = 0; i < 5000; i++) {
            double x = r.nextInt(40);
            double y = r.nextInt(40) / 4.0;
            rows.add(new double[] {x, y});
            expected.merge(List.of(x, y), 1L, Long::sum);
        }
        JointTally t = tally(rows, PairCounter.DEFAULT_MAX_PAIRS);
        assertTrue(t.binning().isExact());
        Map<List<Double>, Long> got = new HashMap<>();
        for (int i = 0; i < t.entries(); i++) {
            got.put(List.of(t.xs()[i], t.ys()[i]), t.counts()[i]);
        }
        assertEquals(expected, got);
        for (int i = 1; i < t.entries(); i++) {
            assertTrue(t.xs()[i - 1] < t.xs()[i] || (t.xs()[i - 1] == t.xs()[i] && t.ys()[i - 1] < t.ys()[i]),
                    "sorted by x, then y, each pair once");
        }
    }

    @Test
    void beyondTheBudgetTheSummaryKeepsEveryRowAndItsStatedError() {
        List<double[]> rows = rows(60_000, 11);
        JointTally t = tally(rows, PairCounter.DEFAULT_MAX_PAIRS);
        assertTrue(t.binning().level() >= PairCounter.FIRST_SUMMARY_LEVEL, "summarised: " + t);
        assertTrue(t.entries() <= PairCounter.DEFAULT_MAX_PAIRS, "within budget: " + t);
        assertEquals(rows.size(), t.pairCount(), "no row is lost");
        // Each row's pair is an entry of the tally, each coordinate within the stated error of the row's value.
        Map<List<Double>, Long> byEntry = new HashMap<>();
        for (int i = 0; i < t.entries(); i++) {
            byEntry.put(List.of(t.xs()[i], t.ys()[i]), t.counts()[i]);
        }
        double err = t.binning().relativeError();
        Map<List<Double>, Long> recounted = new HashMap<>();
        for (double[] p : rows) {
            double bx = RelativeBins.binnedValue(p[0], t.binning().level());
            double by = RelativeBins.binnedValue(p[1], t.binning().level());
            assertTrue(Math.abs(bx - p[0]) <= err * Math.abs(p[0]) && Math.abs(by - p[1]) <= err * Math.abs(p[1]));
            recounted.merge(List.of(bx, by), 1L, Long::sum);
        }
        assertEquals(byEntry, recounted, "every entry is the rows binned at the tally's level");
        assertTrue(byEntry.keySet().stream().anyMatch(k -> k.get(0) == -9.0), "the code -9 stays exact");
        assertTrue(byEntry.keySet().stream().anyMatch(k -> k.get(1) == 999.0), "the code 999 stays exact");
    }

    @Test
    void theTallyDoesNotDependOnTheOrderRowsArriveIn() {
        List<double[]> rows = rows(60_000, 17);
        JointTally first = tally(rows, PairCounter.DEFAULT_MAX_PAIRS);
        Collections.shuffle(rows, new Random(1));
        assertEquals(first, tally(rows, PairCounter.DEFAULT_MAX_PAIRS));
        rows.sort((a, b) -> a[0] != b[0] ? Double.compare(a[0], b[0]) : Double.compare(a[1], b[1]));
        assertEquals(first, tally(rows, PairCounter.DEFAULT_MAX_PAIRS), "sorted: the budget fills as late as can be");
        Collections.reverse(rows);
        assertEquals(first, tally(rows, PairCounter.DEFAULT_MAX_PAIRS), "reversed");
    }

    @Test
    void aSmallBudgetRaisesTheLevelUntilTheTableFits() {
        List<double[]> rows = rows(20_000, 23);
        JointTally t = tally(rows, 500);
        assertTrue(t.binning().level() > PairCounter.FIRST_SUMMARY_LEVEL, t.toString());
        assertTrue(t.entries() <= 500, t.toString());
        assertEquals(rows.size(), t.pairCount());
        Collections.shuffle(rows, new Random(2));
        assertEquals(t, tally(rows, 500));
    }

    @Test
    void poolingWavesAddsCountsAndSummarisesAtTheCoarserLevel() {
        List<double[]> small = rows(3000, 29).subList(0, 50);
        List<double[]> big = rows(60_000, 31);
        JointTally a = tally(small, PairCounter.DEFAULT_MAX_PAIRS);
        JointTally b = tally(big, PairCounter.DEFAULT_MAX_PAIRS);
        JointTally pooled = WaveProfile.pooled(List.of(a, b));
        List<double[]> all = new ArrayList<>(small);
        all.addAll(big);
        assertEquals(tally(all, PairCounter.DEFAULT_MAX_PAIRS), pooled, "pooling equals counting both waves at once");
        assertEquals(a.pairCount() + b.pairCount(), pooled.pairCount());
        assertTrue(pooled.binning().level() >= b.binning().level());
        JointTally exact = WaveProfile.pooled(List.of(a, a));
        assertTrue(exact.binning().isExact());
        assertEquals(2 * a.pairCount(), exact.pairCount());
        assertEquals(a.entries(), exact.entries());
    }

    @Test
    void aStoredSummaryKeepsItsPairsAndOneStoredBeforePairsReadsAsHavingNone() {
        JointTally t = tally(rows(60_000, 37), PairCounter.DEFAULT_MAX_PAIRS);
        ColumnTally col = new ColumnTally("x", ColumnType.DECIMAL, 3, 0, Map.of("1.5", 3L), false);
        WaveProfile p = new WaveProfile("w1", 3, Map.of("x", ColumnType.DECIMAL), Map.of("x", col), Map.of(),
                null, List.of(t));
        WaveProfile back = Json.read(Json.write(p), WaveProfile.class);
        assertEquals(List.of(t), back.pairs());
        assertEquals(p.checksum(), back.checksum());

        String legacy = Json.write(new WaveProfile("w1", 3, Map.of("x", ColumnType.DECIMAL), Map.of("x", col)))
                .replace(",\"pairs\":[]", "");
        assertTrue(!legacy.contains("pairs"), legacy);
        WaveProfile old = Json.read(legacy, WaveProfile.class);
        assertEquals(List.of(), old.pairs());
        assertTrue(old.pair("x", "y").isEmpty());
        assertEquals(new WaveProfile("w1", 3, Map.of("x", ColumnType.DECIMAL), Map.of("x", col)).checksum(),
                old.checksum(), "a summary without pairs keeps the checksum it had");
        assertNotEquals(old.checksum(), p.checksum(), "pairs are part of the checksum");
        JointTally noBinning = Json.read(Json.write(tally(rows(10, 1), 100)).replaceAll(",\"binning\":\\{[^}]*}", ""),
                JointTally.class);
        assertTrue(noBinning.binning().isExact(), "a tally without binning was exact");
    }

    @Test
    void onlyFinitePairsAreCounted() {
        PairCounter c = new PairCounter();
        assertThrows(IllegalArgumentException.class, () -> c.add(Double.NaN, 1));
        assertThrows(IllegalArgumentException.class, () -> c.add(1, Double.POSITIVE_INFINITY));
        assertThrows(IllegalArgumentException.class, () -> c.add(1, 1, 0));
        c.add(-0.0, 1);
        c.add(0.0, 1);
        JointTally t = c.tally("x", "y");
        assertEquals(1, t.entries(), "-0 and 0 are one answer");
        assertEquals(2, t.counts()[0]);
    }
}
