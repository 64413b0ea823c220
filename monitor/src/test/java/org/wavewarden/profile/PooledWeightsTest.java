package org.wavewarden.profile;

import org.junit.jupiter.api.Test;

import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Pooling waves pools their weight sums with their counts, value by value. */
class PooledWeightsTest {

    private static WaveProfile wave(String label, Map<String, Long> counts, Map<String, double[]> weights,
                                    Binning binning) {
        long rows = counts.values().stream().mapToLong(Long::longValue).sum();
        ColumnTally t = new ColumnTally("x", ColumnType.DECIMAL, rows, 0, counts, false, binning);
        return new WaveProfile(label, rows, Map.of("x", ColumnType.DECIMAL), Map.of("x", t),
                weights == null ? Map.of() : Map.of("x", weights));
    }

    @Test
    void exactTalliesAddTheirWeightSumsPerValue() {
        WaveProfile a = wave("a", Map.of("1", 3L, "2", 1L), Map.of("1", new double[] {6, 14}, "2",
                new double[] {0.5, 0.25}), Binning.EXACT);
        WaveProfile b = wave("b", Map.of("2", 2L, "3", 4L), Map.of("2", new double[] {3, 5}, "3",
                new double[] {4, 4}), Binning.EXACT);
        WaveProfile p = WaveProfile.pooled("a .. b", List.of(a, b));
        Map<String, double[]> w = p.weights().get("x");
        assertEquals(6, w.get("1")[0]);
        assertEquals(14, w.get("1")[1]);
        assertEquals(3.5, w.get("2")[0]);
        assertEquals(5.25, w.get("2")[1]);
        assertEquals(4, w.get("3")[1]);
        assertEquals(3L, p.columns().get("x").valueCounts().get("2"));
        // the parts are left as they were
        assertEquals(3, b.weights().get("x").get("2")[0]);
    }

    @Test
    void summarisedTalliesKeepEveryWeightInTheCoarserBins() {
        Random r = new Random(9);
        Map<String, Long> ca = new HashMap<>();
        Map<String, double[]> wa = new HashMap<>();
        Map<String, Long> cb = new HashMap<>();
        Map<String, double[]> wb = new HashMap<>();
        double total = 0;
        double totalSq = 0;
        for (int i = 0; i < 3000; i++) {
            boolean first = i % 2 == 0;
            String v = i % 100 < 2 ? "-9" : Double.toString(1 + 1000 * r.nextDouble());
            double w = 0.5 + r.nextDouble();
            (first ? ca : cb).merge(v, 1L, Long::sum);
            double[] cell = (first ? wa : wb).computeIfAbsent(v, k -> new double[2]);
            cell[0] += w;
            cell[1] += w * w;
            total += w;
            totalSq += w * w;
        }
        WaveProfile a = wave("a", ca, wa, new Binning(1));
        WaveProfile b = wave("b", cb, wb, new Binning(2));
        WaveProfile p = WaveProfile.pooled("a .. b", List.of(a, b));
        ColumnTally t = p.columns().get("x");
        assertFalse(t.binning().isExact());
        Map<String, double[]> w = p.weights().get("x");
        assertEquals(t.valueCounts().keySet(), w.keySet(), "a weight entry for every value and no other");
        assertEquals(total, w.values().stream().mapToDouble(x -> x[0]).sum(), 1e-8);
        assertEquals(totalSq, w.values().stream().mapToDouble(x -> x[1]).sum(), 1e-8);
        assertEquals(wa.get("-9")[0] + wb.get("-9")[0], w.get("-9")[0], 1e-12, "the code -9 keeps its exact weight");
    }

    @Test
    void aPoolWithAnUnweightedWaveHasNoWeightsForThatColumn() {
        Map<String, double[]> w = new LinkedHashMap<>();
        w.put("1", new double[] {2, 4});
        WaveProfile weighted = wave("a", Map.of("1", 1L), w, Binning.EXACT);
        WaveProfile plain = wave("b", Map.of("1", 1L), null, Binning.EXACT);
        assertNull(WaveProfile.pooled("p", List.of(weighted, plain)).weights().get("x"));
        assertNull(WaveProfile.pooled("p", List.of(plain, weighted)).weights().get("x"));
        assertTrue(WaveProfile.pooled("p", List.of(weighted, weighted)).weights().containsKey("x"));
    }
}
