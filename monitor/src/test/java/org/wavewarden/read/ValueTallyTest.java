package org.wavewarden.read;

import org.junit.jupiter.api.Test;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.Map;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

/** A column's tally counts and weighs each distinct value once and names it by the server's text. */
class ValueTallyTest {

    @Test
    void countsAndWeightsPerValueEqualThoseOfAMapOverTheValuesText() {
        Random r = new Random(5);
        ValueTally tally = new ValueTally(Decode.INT4, true);
        Map<String, Long> counts = new HashMap<>();
        Map<String, double[]> weights = new HashMap<>();
        for (int i = 0; i < 5000; i++) {
            int v = r.nextInt(300) - 150;
            double w = r.nextInt(10) == 0 ? Double.NaN : r.nextInt(8) * 0.25;
            tally.add(v, Integer.MAX_VALUE, w);
            counts.merge(Integer.toString(v), 1L, Long::sum);
            double[] cell = weights.computeIfAbsent(Integer.toString(v), x -> new double[2]);
            if (!Double.isNaN(w)) {
                cell[0] += w;
                cell[1] += w * w;
            }
        }
        assertEquals(counts, tally.counts());
        Map<String, double[]> got = tally.weights();
        assertEquals(weights.keySet(), got.keySet());
        weights.forEach((v, cell) -> assertArrayEquals(cell, got.get(v), 0.0, v));
    }

    @Test
    void aNewValueBeyondTheCapIsRefusedWhileKnownValuesStillCount() {
        ValueTally tally = new ValueTally(Decode.TEXT, false);
        byte[] a = "a".getBytes(StandardCharsets.UTF_8);
        byte[] b = "b".getBytes(StandardCharsets.UTF_8);
        assertEquals(0, tally.add(a, 0, 1, 1, Double.NaN));
        assertEquals(-1, tally.add(b, 0, 1, 1, Double.NaN));
        assertEquals(0, tally.add(a, 0, 1, 1, Double.NaN));
        assertEquals(Map.of("a", 2L), tally.counts());
    }

    @Test
    void valuesAreNamedByTheServersTextAndReadBackAsNumbers() {
        ValueTally floats = new ValueTally(Decode.FLOAT8, false);
        int e = floats.add(Double.doubleToLongBits(0.1 + 0.2), 10, Double.NaN);
        assertEquals("0.30000000000000004", floats.text(e));
        assertEquals(0.1 + 0.2, floats.number(e), 0.0);
        ValueTally numerics = new ValueTally(Decode.NUMERIC, false);
        byte[] n = ValueTextTest.numeric(2, 0, 16384, 1, "2 5000");
        int f = numerics.add(n, 0, n.length, 10, Double.NaN);
        assertEquals("-2.5", numerics.text(f));
        assertEquals(-2.5, numerics.number(f), 0.0);
        ValueTally dates = new ValueTally(Decode.DATE, false);
        int g = dates.add(Decode.DATE.key(ByteBuffer.allocate(4).putInt(-1).array(), 0), 10, Double.NaN);
        assertEquals("1999-12-31", dates.text(g));
    }

    @Test
    void withoutWeightsEveryEntryWeighsZero() {
        ValueTally tally = new ValueTally(Decode.INT8, false);
        tally.add(7, 10, 3.0);
        tally.forEach((e, count, w, w2) -> {
            assertEquals(1, count);
            assertEquals(0.0, w, 0.0);
            assertEquals(0.0, w2, 0.0);
        });
    }
}
