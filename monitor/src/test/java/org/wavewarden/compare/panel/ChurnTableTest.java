package org.wavewarden.compare.panel;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.panel.ChurnTable.Flow;

/** Specification by arithmetic on a small labour-status panel; no outside reference is needed beyond it. */
class ChurnTableTest {

    static final List<String> STATUS = List.of("employed", "unemployed", "inactive");

    /** 120 panel members: 60 employed, 40 unemployed and 20 inactive at the earlier wave. */
    static final long[][] MOVES = {
        {50, 5, 5},
        {10, 20, 10},
        {0, 4, 16},
    };

    @Test
    void churnTableSpellsOutWhoMovedWhere() {
        ChurnTable t = new ChurnTable(STATUS, MOVES);
        assertEquals(120, t.total());
        assertArrayEquals(new long[] {60, 40, 20}, t.rowTotals());
        assertEquals(86, t.stayers());
        assertEquals(34, t.movers());
        assertEquals(86 / 120.0, t.stayerShare(), 1e-15);
        assertEquals(34 / 120.0, t.moverShare(), 1e-15);
        double[][] s = t.rowShares();
        assertArrayEquals(new double[] {50 / 60.0, 5 / 60.0, 5 / 60.0}, s[0], 1e-15);
        assertArrayEquals(new double[] {0.25, 0.5, 0.25}, s[1], 1e-15);
        assertArrayEquals(new double[] {0, 0.2, 0.8}, s[2], 1e-15);
        // equal counts keep the table's order: earlier-wave answer first, then the later one
        assertEquals(List.of(
                new Flow("unemployed", "employed", 10, 0.25),
                new Flow("unemployed", "inactive", 10, 0.25),
                new Flow("employed", "unemployed", 5, 5 / 60.0),
                new Flow("employed", "inactive", 5, 5 / 60.0),
                new Flow("inactive", "unemployed", 4, 0.2)), t.flows());
        assertEquals(t.flows().subList(0, 2), t.largestFlows(2));
        assertEquals(t.flows(), t.largestFlows(50));
        assertEquals(List.of(), t.largestFlows(0));
    }

    @Test
    void rowNobodyStartedInHasZeroSharesAndNoFlows() {
        ChurnTable t = new ChurnTable(List.of("a", "b", "c"), new long[][] {{3, 1, 0}, {0, 0, 0}, {2, 4, 5}});
        assertArrayEquals(new double[] {0, 0, 0}, t.rowShares()[1]);
        assertEquals(List.of(new Flow("c", "b", 4, 4 / 11.0), new Flow("c", "a", 2, 2 / 11.0),
                new Flow("a", "b", 1, 0.25)), t.flows());
    }

    @Test
    void conditionalSharesSumToOneAndStayersPlusMoversIsEveryone() {
        Random random = new Random(17L);
        for (int rep = 0; rep < 300; rep++) {
            int k = 1 + random.nextInt(6);
            long[][] counts = new long[k][k];
            for (int i = 0; i < k; i++) {
                boolean emptyRow = random.nextInt(5) == 0;
                for (int j = 0; j < k; j++) {
                    counts[i][j] = emptyRow ? 0 : random.nextInt(4) == 0 ? 0 : random.nextInt(200);
                }
            }
            counts[random.nextInt(k)][random.nextInt(k)] += 1;
            List<String> labels = new ArrayList<>();
            for (int i = 0; i < k; i++) {
                labels.add("answer " + i);
            }
            ChurnTable t = new ChurnTable(labels, counts);
            long[] rows = t.rowTotals();
            double[][] shares = t.rowShares();
            for (int i = 0; i < k; i++) {
                double sum = 0;
                for (double v : shares[i]) {
                    sum += v;
                }
                assertEquals(rows[i] == 0 ? 0 : 1, sum, 1e-12);
            }
            assertEquals(t.total(), t.stayers() + t.movers());
            assertEquals(1, t.stayerShare() + t.moverShare(), 1e-12);
            long flowed = 0;
            List<Flow> flows = t.flows();
            for (int f = 0; f < flows.size(); f++) {
                flowed += flows.get(f).count();
                if (f > 0) {
                    assertEquals(true, flows.get(f - 1).count() >= flows.get(f).count());
                }
            }
            assertEquals(t.movers(), flowed);
        }
    }

    @Test
    void countsAreCopiedInAndOut() {
        long[][] counts = {{1, 2}, {3, 4}};
        ChurnTable t = new ChurnTable(List.of("yes", "no"), counts);
        counts[0][0] = 100;
        t.counts()[1][1] = 100;
        assertArrayEquals(new long[][] {{1, 2}, {3, 4}}, t.counts());
        assertEquals(new ChurnTable(List.of("yes", "no"), new long[][] {{1, 2}, {3, 4}}), t);
        assertEquals(new ChurnTable(List.of("yes", "no"), new long[][] {{1, 2}, {3, 4}}).hashCode(), t.hashCode());
    }

    @Test
    void rejectsLabelsThatDoNotFitTheTable() {
        assertEquals("labels has 2 entries but counts is 3 x 3", assertThrows(IllegalArgumentException.class,
                () -> new ChurnTable(List.of("a", "b"), MOVES)).getMessage());
        assertEquals("labels[2] repeats the label 'a'", assertThrows(IllegalArgumentException.class,
                () -> new ChurnTable(List.of("a", "b", "a"), MOVES)).getMessage());
        assertEquals("counts holds no pairs: every count is 0", assertThrows(IllegalArgumentException.class,
                () -> new ChurnTable(List.of("a"), new long[][] {{0}})).getMessage());
        assertEquals("limit must not be negative, was -1", assertThrows(IllegalArgumentException.class,
                () -> new ChurnTable(STATUS, MOVES).largestFlows(-1)).getMessage());
    }
}
