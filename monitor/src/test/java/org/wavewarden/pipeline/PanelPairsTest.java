package org.wavewarden.pipeline;

import org.junit.jupiter.api.Test;
import org.wavewarden.config.CompareWith;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.compare.panel.PairedPanel.BinaryPairs;
import org.wavewarden.compare.panel.PairedPanel.CategoricalPairs;
import org.wavewarden.compare.panel.PairedPanel.NumericPairs;
import org.wavewarden.compare.panel.PairedPanel.Panel;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.profile.WaveProfile;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The accumulators, without a database: rows handed to the visitor as {@link org.wavewarden.read.KeyedPairReader}
 * hands them on, the waves' summaries tallied from the same rows, so that each wave's screen decides which answers
 * enter a pair.
 */
class PanelPairsTest {

    static final List<String> COLUMNS = List.of("hours", "mood", "works", "region");

    static DatasetConfig dataset(CompareWith compareWith, String key) {
        List<VariableConfig> vs = List.of(
                new VariableConfig("hours", VariableKind.CONTINUOUS, "hours", null,
                        List.of(new MissingCodeSpec("-99", "refused")), null, null, List.of(), null),
                new VariableConfig("mood", VariableKind.ORDINAL, null, null, List.of(), null, null,
                        List.of("low", "mid", "high"), null),
                new VariableConfig("works", VariableKind.BINARY, null, null, List.of(), null, "yes", List.of(), null),
                VariableConfig.inferred("region", VariableKind.CATEGORICAL));
        return new DatasetConfig("panel", "s.t", "wave", null, null, compareWith, null, List.of(), vs, null, null,
                null, null, null, key, null, null, List.of());
    }

    /** A wave's summary as the scanner would tally these rows (key first, then {@link #COLUMNS}). */
    static WaveProfile profile(String wave, List<String[]> rows) {
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        schema.put("pid", ColumnType.INTEGER);
        Map<String, ColumnTally> tallies = new LinkedHashMap<>();
        for (int c = 0; c < COLUMNS.size(); c++) {
            String name = COLUMNS.get(c);
            schema.put(name, c == 0 ? ColumnType.DECIMAL : ColumnType.TEXT);
            Map<String, Long> counts = new HashMap<>();
            long nulls = 0;
            for (String[] r : rows) {
                if (r[c + 1] == null) {
                    nulls++;
                } else {
                    counts.merge(r[c + 1], 1L, Long::sum);
                }
            }
            tallies.put(name, new ColumnTally(name, c == 0 ? ColumnType.DECIMAL : ColumnType.TEXT, rows.size(), nulls,
                    counts, false));
        }
        return new WaveProfile(wave, rows.size(), schema, tallies);
    }

    static String[] row(String key, String hours, String mood, String works, String region) {
        return new String[] {key, hours, mood, works, region};
    }

    /** Feeds both waves to the visitor as a full join on the key would. */
    static Panel pair(PanelPairs plan, List<String[]> before, List<String[]> after) {
        Map<String, String[]> a = new LinkedHashMap<>();
        after.forEach(r -> a.put(r[0], r));
        for (String[] b : before) {
            String[] c = a.remove(b[0]);
            plan.row(b[0], tail(b, plan.columns()), c == null ? null : tail(c, plan.columns()));
        }
        a.values().forEach(c -> plan.row(c[0], null, tail(c, plan.columns())));
        return plan.finish(null);
    }

    static String[] tail(String[] r, List<String> columns) {
        String[] out = new String[columns.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = r[1 + COLUMNS.indexOf(columns.get(i))];
        }
        return out;
    }

    static final List<String[]> W1 = List.of(
            row("1", "40", "low", "yes", "north"),
            row("2", "35.5", "mid", "no", "south"),
            row("3", "-99", "high", "yes", "north"),
            row("4", "20", null, "no", "east"),
            row("5", "30", "mid", "yes", "south"),
            row("6", "12", "low", "no", "north"));
    static final List<String[]> W2 = List.of(
            row("1", "38", "mid", "yes", "south"),
            row("2", "35.5", "high", "yes", "south"),
            row("3", "41", "high", "no", "north"),
            row("4", null, "low", "no", "north"),
            row("5", "33", "low", "yes", "east"),
            row("7", "44", "mid", "yes", "east"));

    @Test
    void eachWavesScreenDecidesWhichPairsEnter() {
        DatasetConfig d = dataset(CompareWith.PREVIOUS, "pid");
        PanelPairs plan = PanelPairs.plan(d, List.of("w1"), profile("w1", W1), profile("w2", W2));
        assertTrue(plan.needsRead());
        assertEquals(COLUMNS, plan.columns());
        Panel p = pair(plan, W1, W2);
        assertEquals(5, p.matched());
        assertEquals(1, p.onlyBaseline()); // respondent 6
        assertEquals(1, p.onlyCurrent()); // respondent 7
        assertTrue(p.notes().isEmpty(), p.notes().toString());

        // hours: respondent 3 refused (-99, a codebook code) in w1 and 4 is NULL in w2, so 3 pairs are left
        NumericPairs hours = (NumericPairs) p.variables().get(0);
        assertEquals(3, hours.pairs());
        assertEquals(2, hours.leftOut());
        assertEquals(NumericDistribution.ofSample(-2, 0, 3), hours.differences());
        assertEquals(1.0 / 3, hours.meanDifference(), 1e-15);
        assertEquals(NumericDistribution.ofSample(-2, 0, 3).standardDeviation(), hours.sdDifference(), 1e-15);
        assertEquals((40 + 35.5 + 30) / 3, hours.meanBaseline(), 1e-12);
        assertEquals((38 + 35.5 + 33) / 3, hours.meanCurrent(), 1e-12);
        // mood: levels are ranks (low 1, mid 2, high 3); respondent 4 has no mood in w1
        NumericPairs mood = (NumericPairs) p.variables().get(1);
        assertEquals(NumericDistribution.ofSample(1, 1, 0, -1), mood.differences());
        assertEquals(1, mood.leftOut());
        // works: yes/yes 1, yes/no 1 (3), no/yes 1 (2), no/no 1 (4); 1 and 5 yes at both
        BinaryPairs works = (BinaryPairs) p.variables().get(2);
        assertEquals("yes", works.successValue());
        assertEquals(List.of(2L, 1L, 1L, 1L), List.of(works.bothYes(), works.yesNo(), works.noYes(), works.bothNo()));
        // region: categories in the waves' union order
        CategoricalPairs region = (CategoricalPairs) p.variables().get(3);
        assertEquals(List.of("east", "north", "south"), region.labels());
        assertArrayEquals(new long[][] {{0, 1, 0}, {0, 1, 1}, {1, 0, 1}}, region.counts());
        assertEquals(5, region.pairs());
    }

    @Test
    void noKeyNoBaselineOrAPooledBaselineMeansNoPairs() {
        WaveProfile w1 = profile("w1", W1);
        WaveProfile w2 = profile("w2", W2);
        assertNull(PanelPairs.plan(dataset(CompareWith.PREVIOUS, null), List.of("w1"), w1, w2));
        assertNull(PanelPairs.plan(dataset(CompareWith.PREVIOUS, "pid"), List.of(), null, w2));
        PanelPairs pooled = PanelPairs.plan(dataset(new CompareWith.PooledLast(2), "pid"), List.of("w0", "w1"),
                WaveProfile.pooled("pooled w0 .. w1", List.of(w1, w1)), w2);
        assertFalse(pooled.needsRead());
        Panel p = pooled.read(null, null, null);
        assertTrue(p.variables().isEmpty());
        assertEquals(List.of("panel comparisons skipped: the baseline pools 2 waves (w0, w1); pairing respondents"
                + " needs one earlier wave"), p.notes());
        PanelPairs noKey = PanelPairs.plan(dataset(CompareWith.PREVIOUS, "person"), List.of("w1"), w1, w2);
        assertEquals(List.of("panel comparisons skipped: wave w1 has no column person (the respondent key)"),
                noKey.read(null, null, null).notes());
    }

    @Test
    void manyDistinctDifferencesAreBinnedWhileTheMomentsStayExact() {
        List<String[]> before = new ArrayList<>();
        List<String[]> after = new ArrayList<>();
        Random rng = new Random(12L);
        double sum = 0;
        for (int i = 0; i < PanelPairs.MAX_EXACT_DIFFERENCES + 2_000; i++) {
            double b = 10 + i;
            double c = b + 1 + i * 1e-3 + rng.nextInt(1000) * 1e-7;
            String cb = Double.toString(b);
            String cc = Double.toString(c);
            sum += Double.parseDouble(cc) - Double.parseDouble(cb);
            before.add(row(Integer.toString(i), cb, "low", "yes", "north"));
            after.add(row(Integer.toString(i), cc, "low", "yes", "north"));
        }
        DatasetConfig d = dataset(CompareWith.PREVIOUS, "pid");
        Panel p = pair(PanelPairs.plan(d, List.of("w1"), profile("w1", before), profile("w2", after)), before,
                after);
        NumericPairs hours = (NumericPairs) p.variables().get(0);
        long n = PanelPairs.MAX_EXACT_DIFFERENCES + 2_000;
        assertEquals(n, hours.pairs());
        assertFalse(hours.binning().isExact());
        assertEquals(n, hours.differences().n());
        assertTrue(hours.differences().size() < n);
        assertEquals(sum / n, hours.meanDifference(), 1e-9);
        double bound = hours.binning().relativeError();
        assertEquals(hours.meanDifference(), hours.differences().mean(), bound * Math.abs(hours.meanDifference()));
    }
}
