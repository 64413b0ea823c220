package org.wavewarden.profile;

import org.junit.jupiter.api.Test;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

/**
 * A summary's checksum is its identity in the results schema (a stored summary is found and kept by it), so the
 * canonical rendering it hashes must never change from one build to the next: the value below was computed by the
 * build before the checksum was written in larger pieces, over a summary with every part a checksum covers.
 */
class WaveProfileChecksumTest {

    static WaveProfile everyPart(Map<String, Long> ageCounts) {
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        schema.put("district", ColumnType.TEXT);
        schema.put("age", ColumnType.INTEGER);
        schema.put("income", ColumnType.DECIMAL);
        Map<String, ColumnTally> columns = new LinkedHashMap<>();
        columns.put("age", new ColumnTally("age", ColumnType.INTEGER, 6, 1, ageCounts, false, Binning.EXACT));
        columns.put("income", new ColumnTally("income", ColumnType.DECIMAL, 6, 0,
                Map.of("1200.5", 2L, "-9", 1L, "\u00e9t\u00e9 \"x\"", 3L), false, new Binning(2)));
        Map<String, Map<String, double[]>> weights = Map.of("age", Map.of("34", new double[]{1.5, 2.25},
                "-9", new double[]{0.1, 0.01}));
        DesignSummary design = new DesignSummary(List.of("s1", "s2"), List.of("p1", "p2"), 0, Map.of("age",
                new DesignSummary.ColumnDesign(Map.of("34", new double[]{1.5, 0}, "-9", new double[]{0, 0.1}), true,
                        new double[]{1.5, 0.1}, new double[]{51, -0.9}, new double[]{1734, 8.1})));
        JointTally pair = new JointTally("age", "income", new double[]{34, 41}, new double[]{1200.5, -9},
                new long[]{2, 1}, Binning.EXACT);
        DomainTally byDistrict = new DomainTally("district", List.of("KES", "GUL"), new long[]{4, 2}, 0, 1, 3,
                Map.of("age", List.of(
                        new ColumnTally("age", ColumnType.INTEGER, 4, 1, Map.of("34", 2L, "41", 1L), false,
                                Binning.EXACT),
                        new ColumnTally("age", ColumnType.INTEGER, 2, 0, Map.of("-9", 2L), false, Binning.EXACT))),
                Map.of("age", List.of(Map.of("34", new double[]{1.5, 2.25}), Map.of("-9", new double[]{0.1, 0.01}))),
                Map.of("age", List.of(
                        new DesignSummary.ColumnDesign(Map.of("34", new double[]{1.5, 0}), true,
                                new double[]{1.5, 0}, new double[]{51, 0}, new double[]{1734, 0}),
                        new DesignSummary.ColumnDesign(Map.of("-9", new double[]{0, 0.1}), false,
                                new double[]{0, 0.1}, new double[]{0, -0.9}, new double[]{0, 8.1}))));
        return new WaveProfile("2025-Q1", 6, schema, columns, weights, design, List.of(pair), List.of(byDistrict));
    }

    @Test
    void theChecksumOfASummaryWithEveryPartIsTheOneEarlierBuildsStored() {
        WaveProfile p = everyPart(Map.of("34", 3L, "41", 1L, "-9", 1L));
        assertEquals("f9979c354b23543b57f1e02766d2f457e8792b9aac7036555e063e6f9df1ff8a", p.checksum());
        assertEquals(p.checksum(), everyPart(new java.util.TreeMap<>(Map.of("-9", 1L, "41", 1L, "34", 3L)))
                .checksum(), "the order the values came in does not count");
        assertNotEquals(p.checksum(), everyPart(Map.of("34", 3L, "41", 2L, "-9", 1L)).checksum(),
                "one count more is another summary");
    }
}
