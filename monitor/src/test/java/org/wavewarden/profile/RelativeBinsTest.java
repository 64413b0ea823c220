package org.wavewarden.profile;

import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.junit.jupiter.api.Test;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The bounded summary of high-cardinality numeric columns keeps its stated error and its counts. */
class RelativeBinsTest {

    @Test
    void everyValueLiesWithinTheStatedRelativeErrorOfItsStandIn() {
        Random r = new Random(7);
        for (int trial = 0; trial < 20; trial++) {
            int maxBins = 64 + r.nextInt(4000);
            RelativeBins bins = new RelativeBins(maxBins, 0, false);
            double[] xs = new double[20_000];
            for (int i = 0; i < xs.length; i++) {
                xs[i] = (r.nextBoolean() ? 1 : -1) * Math.exp(r.nextGaussian() * (1 + trial));
                bins.add(xs[i], Double.NaN);
            }
            Binning b = bins.binning();
            for (double x : xs) {
                if (RelativeBins.isCodeLike(x)) {
                    continue;
                }
                double standIn = Double.parseDouble(RelativeBins.standIn(RelativeBins.key(x, b.level()), b.level()));
                assertTrue(Math.abs(standIn - x) <= b.relativeError() * Math.abs(x),
                        x + " stands as " + standIn + " beyond " + b.relativeError());
            }
            long total = bins.counts().values().stream().mapToLong(Long::longValue).sum();
            assertEquals(xs.length, total, "no value is lost");
            long exact = java.util.Arrays.stream(xs).filter(RelativeBins::isCodeLike).distinct().count();
            assertTrue(bins.size() <= maxBins + exact, bins.size() + " entries for a budget of " + maxBins + " bins");
        }
    }

    @Test
    void theSummaryDoesNotDependOnTheOrderValuesArriveIn() {
        Random r = new Random(11);
        List<Double> xs = new ArrayList<>();
        for (int i = 0; i < 30_000; i++) {
            xs.add(Math.round(r.nextGaussian() * 1e6) / 100.0);
        }
        xs.add(-9.0);
        xs.add(999.0);
        Map<String, Long> first = summary(xs);
        Collections.shuffle(xs, r);
        assertEquals(first, summary(xs));
        Collections.sort(xs);
        assertEquals(first, summary(xs), "sorted input, the worst order for a summary that fills up");
    }

    private static Map<String, Long> summary(List<Double> xs) {
        RelativeBins bins = new RelativeBins(512, 0, false);
        xs.forEach(x -> bins.add(x, 1.0));
        return bins.counts();
    }

    @Test
    void codeLikeNumbersZeroAndSingleValuedBinsStayExact() {
        RelativeBins bins = new RelativeBins();
        for (int i = 0; i < 1000; i++) {
            bins.add(500 + i * 0.0137, Double.NaN);
        }
        for (int i = 0; i < 40; i++) {
            bins.add(-9, Double.NaN);
            bins.add(999, Double.NaN);
            bins.add(0, Double.NaN);
        }
        bins.add(1e6 + 0.25, Double.NaN); // alone in its bin
        Map<String, Long> c = bins.counts();
        assertEquals(40L, c.get("-9"));
        assertEquals(40L, c.get("999"));
        assertEquals(40L, c.get("0"));
        assertEquals(1L, c.get("1000000.25"));
        assertTrue(RelativeBins.isCodeLike(-99) && RelativeBins.isCodeLike(7777) && RelativeBins.isCodeLike(88));
        assertFalse(RelativeBins.isCodeLike(-100) || RelativeBins.isCodeLike(998) || RelativeBins.isCodeLike(9.5));
    }

    @Test
    void quantilesOfTheSummaryMatchCommonsMathOnTheRawDataWithinTheBound() {
        // Reference: commons-math3 3.6.1 Percentile (type R-7 estimation is not needed: we compare the lower
        // empirical quantile, EstimationType.R_1, which is an order statistic and so moves by at most the bound).
        Random r = new Random(3);
        double[] raw = new double[50_001];
        RelativeBins bins = new RelativeBins(1024, 0, false);
        for (int i = 0; i < raw.length; i++) {
            raw[i] = 100 + 15 * r.nextGaussian() + r.nextDouble() * 1e-3;
            bins.add(raw[i], Double.NaN);
        }
        double[][] table = sorted(bins.counts());
        Percentile p = new Percentile().withEstimationType(Percentile.EstimationType.R_1);
        for (double q : new double[] {1, 10, 25, 50, 75, 90, 99}) {
            double exact = p.evaluate(raw, q);
            double approx = quantile(table, q / 100, raw.length);
            assertEquals(exact, approx, bins.binning().relativeError() * Math.abs(exact), "quantile " + q);
        }
    }

    private static double[][] sorted(Map<String, Long> counts) {
        double[][] t = counts.entrySet().stream()
                .map(e -> new double[] {Double.parseDouble(e.getKey()), e.getValue()})
                .sorted((a, b) -> Double.compare(a[0], b[0])).toArray(double[][]::new);
        return t;
    }

    /** The R-1 quantile (inverse of the empirical distribution function) of a value table. */
    private static double quantile(double[][] table, double q, long n) {
        long rank = (long) Math.ceil(q * n);
        long seen = 0;
        for (double[] row : table) {
            seen += (long) row[1];
            if (seen >= rank) {
                return row[0];
            }
        }
        return table[table.length - 1][0];
    }

    @Test
    void binsMergeIntoTheCoarserLevelWhenPooled() {
        RelativeBins fine = new RelativeBins(4096, 0, false);
        RelativeBins coarse = new RelativeBins(4096, 3, false);
        for (int i = 1; i <= 5000; i++) {
            fine.add(i * 0.731, Double.NaN);
            coarse.add(i * 0.913, Double.NaN);
        }
        ColumnTally a = new ColumnTally("x", ColumnType.DECIMAL, 5000, 0, fine.counts(), false, fine.binning());
        ColumnTally b = new ColumnTally("x", ColumnType.DECIMAL, 5000, 0, coarse.counts(), false, coarse.binning());
        ColumnTally pooled = WaveProfile.pooled(a, b);
        assertEquals(3, pooled.binning().level());
        assertEquals(10_000L, pooled.valueCounts().values().stream().mapToLong(Long::longValue).sum());
    }

    @Test
    void aBinnedValueIsItsBinsStandInAndBinningItAgainAtACoarserLevelEqualsBinningTheValueThere() {
        // What makes a joint tally re-binned step by step independent of when the steps happened.
        Random r = new Random(5);
        for (int i = 0; i < 20_000; i++) {
            double x = (r.nextBoolean() ? 1 : -1) * Math.exp(r.nextGaussian() * 20);
            int level = r.nextInt(12);
            double b = RelativeBins.binnedValue(x, level);
            if (RelativeBins.isCodeLike(x)) {
                assertEquals(x, b);
                continue;
            }
            assertEquals(Double.parseDouble(RelativeBins.standIn(RelativeBins.key(x, level), level)), b,
                    1e-6 * Math.abs(b), "the printed stand-in of " + x);
            assertTrue(Math.abs(b - x) <= new Binning(level).relativeError() * Math.abs(x), x + " as " + b);
            assertEquals(b, RelativeBins.binnedValue(b, level), "binning a stand-in again keeps it: " + x);
            assertEquals(RelativeBins.binnedValue(x, level + 1), RelativeBins.binnedValue(b, level + 1),
                    "coarser bin of " + x);
            assertEquals(RelativeBins.binnedValue(x, level + 3), RelativeBins.binnedValue(b, level + 3),
                    "three levels coarser, " + x);
        }
        assertEquals(-9.0, RelativeBins.binnedValue(-9, 5));
        assertEquals(0.0, RelativeBins.binnedValue(-0.0, 5));
        assertTrue(Double.isFinite(RelativeBins.binnedValue(Double.MAX_VALUE, 0)), "the largest double's bin");
        assertTrue(Double.isFinite(RelativeBins.binnedValue(-Double.MAX_VALUE, 0)));
    }

    /**
     * A caller adding one value to several summaries works out its level-0 bin once ({@link RelativeBins#fineKey});
     * adding by that key gives the very summary adding the value gives: the same bins at the same level, the same
     * counts and, bit for bit, the same weight sums, whatever level the summary has coarsened to.
     */
    @org.junit.jupiter.params.ParameterizedTest(name = "{0} bins, spread {1}, weighted {2}")
    @org.junit.jupiter.params.provider.CsvSource({
            "16, 0.5, false",
            "16, 4.0, true",
            "128, 1.0, true",
            "128, 6.0, false",
            "4096, 2.0, true",
    })
    void addingByTheFineKeyGivesTheSummaryAddingTheValueGives(int maxBins, double spread, boolean weighted) {
        Random r = new Random(31);
        RelativeBins byValue = new RelativeBins(maxBins, 0, false);
        RelativeBins byKey = new RelativeBins(maxBins, 0, false);
        for (int i = 0; i < 30_000; i++) {
            double x = r.nextInt(10) == 0 ? -9 : (r.nextBoolean() ? 1 : -1) * Math.exp(r.nextGaussian() * spread);
            double w = weighted ? 0.5 + r.nextDouble() : Double.NaN;
            byValue.add(x, w);
            byKey.add(x, RelativeBins.fineKey(x), w);
        }
        assertEquals(byValue.binning(), byKey.binning());
        assertEquals(byValue.counts(), byKey.counts());
        Map<String, double[]> a = byValue.weights();
        Map<String, double[]> b = byKey.weights();
        assertEquals(a.keySet(), b.keySet());
        a.forEach((text, sums) -> assertTrue(java.util.Arrays.equals(sums, b.get(text)), text));
        assertEquals(RelativeBins.EXACT, RelativeBins.fineKey(-9), "a code is kept exactly");
        assertEquals(RelativeBins.EXACT, RelativeBins.fineKey(Double.NaN), "NaN is kept exactly");
    }
    /**
     * Each bin counts exactly the values whose key it is, however the keys arrive: walking up, walking down, jumping
     * between the two ends of a span far wider than the bins' window of neighbouring keys, or at random. The
     * reference groups the values by their key at the summary's final level, with no index at all.
     */
    @org.junit.jupiter.params.ParameterizedTest(name = "{0} bins, {1}")
    @org.junit.jupiter.params.provider.CsvSource({
            "64, ascending", "64, descending", "64, alternating ends", "64, random",
            "4096, ascending", "4096, descending", "4096, alternating ends", "4096, random",
    })
    void eachBinCountsExactlyTheValuesOfItsKeyWhateverOrderTheKeysComeIn(int maxBins, String order) {
        Random r = new Random(43);
        List<Double> pool = new ArrayList<>();
        for (int i = 0; i < 5_000; i++) {
            pool.add(Math.exp(r.nextDouble() * 12)); // level-0 keys over a span of 12,000: beyond any window
        }
        List<Double> xs = new ArrayList<>();
        for (double x : pool) {
            for (int k = r.nextInt(4); k >= 0; k--) {
                xs.add(x);
            }
        }
        switch (order) {
            case "ascending" -> Collections.sort(xs);
            case "descending" -> xs.sort(Collections.reverseOrder());
            case "alternating ends" -> {
                Collections.sort(xs);
                List<Double> zigzag = new ArrayList<>();
                for (int lo = 0, hi = xs.size() - 1; lo <= hi; lo++, hi--) {
                    zigzag.add(xs.get(lo));
                    if (lo < hi) {
                        zigzag.add(xs.get(hi));
                    }
                }
                xs = zigzag;
            }
            default -> Collections.shuffle(xs, r);
        }
        RelativeBins bins = new RelativeBins(maxBins, 0, false);
        xs.forEach(x -> bins.add(x, Double.NaN));

        int level = bins.binning().level();
        Map<Long, java.util.Set<Double>> distinct = new java.util.HashMap<>();
        Map<Long, Long> count = new java.util.HashMap<>();
        for (double x : xs) {
            long key = RelativeBins.key(x, level);
            distinct.computeIfAbsent(key, k -> new java.util.HashSet<>()).add(x);
            count.merge(key, 1L, Long::sum);
        }
        Map<String, Long> expected = new java.util.HashMap<>();
        count.forEach((key, c) -> {
            java.util.Set<Double> values = distinct.get(key);
            String text = values.size() == 1
                    ? new java.math.BigDecimal(Double.toString(values.iterator().next())).stripTrailingZeros()
                    .toPlainString()
                    : RelativeBins.standIn(key, level);
            expected.merge(text, c, Long::sum);
        });
        assertEquals(expected, bins.counts());
        assertTrue(bins.size() <= maxBins, bins.size() + " bins for a budget of " + maxBins);
    }
}
