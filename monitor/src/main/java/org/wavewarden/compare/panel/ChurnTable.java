package org.wavewarden.compare.panel;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * Who moved from which answer to which between two panel waves: a k x k table of the same respondents' answers,
 * rows the earlier wave and columns the later one, with its category labels.
 *
 * <p>Everything else is arithmetic on the counts, computed when asked: the row-conditional shares
 * {@code n_ij / n_i.} (of those who gave answer i at the earlier wave, the share giving j at the later one), the
 * stayers (the diagonal) and movers (the rest), and the flows between different answers, largest first. Ties
 * between flows of equal count are broken by the table's order, earlier-wave category first, so the ranking is the
 * same on every run. The record is immutable: the counts are copied in and out.
 *
 * @param labels the k category labels in table order, distinct and not null
 * @param counts k x k counts, {@code counts[i][j]} the respondents answering {@code labels[i]} at the earlier wave
 *               and {@code labels[j]} at the later one; at least one pair
 */
public record ChurnTable(List<String> labels, long[][] counts) {

    /**
     * One flow between two different answers.
     *
     * @param from        the answer at the earlier wave
     * @param to          the answer at the later wave
     * @param count       respondents who moved from {@code from} to {@code to}
     * @param shareOfFrom {@code count} over everyone who answered {@code from} at the earlier wave
     */
    public record Flow(String from, String to, long count, double shareOfFrom) {
    }

    public ChurnTable {
        if (labels == null) {
            throw new IllegalArgumentException("labels must not be null");
        }
        SquareTables.check(counts, "counts");
        if (labels.size() != counts.length) {
            throw new IllegalArgumentException("labels has " + labels.size() + " entries but counts is "
                    + counts.length + " x " + counts.length);
        }
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < labels.size(); i++) {
            String label = labels.get(i);
            if (label == null) {
                throw new IllegalArgumentException("labels[" + i + "] must not be null");
            }
            if (!seen.add(label)) {
                throw new IllegalArgumentException("labels[" + i + "] repeats the label '" + label + "'");
            }
        }
        labels = List.copyOf(labels);
        counts = SquareTables.deepCopy(counts);
    }

    @Override
    public long[][] counts() {
        return SquareTables.deepCopy(counts);
    }

    /** The number of respondents in the table. */
    public long total() {
        return SquareTables.total(SquareTables.rowTotals(counts));
    }

    /** Each answer's count at the earlier wave. */
    public long[] rowTotals() {
        return SquareTables.rowTotals(counts);
    }

    /**
     * {@code n_ij / n_i.}: each row sums to 1. A row nobody was in at the earlier wave has no conditional shares
     * and is all zeros.
     */
    public double[][] rowShares() {
        long[] rows = rowTotals();
        double[][] s = new double[counts.length][counts.length];
        for (int i = 0; i < counts.length; i++) {
            for (int j = 0; j < counts.length; j++) {
                s[i][j] = rows[i] == 0 ? 0 : counts[i][j] / (double) rows[i];
            }
        }
        return s;
    }

    /** Respondents who gave the same answer at both waves. */
    public long stayers() {
        long s = 0;
        for (int i = 0; i < counts.length; i++) {
            s += counts[i][i];
        }
        return s;
    }

    /** Respondents who changed answer; {@code stayers() + movers() == total()}. */
    public long movers() {
        return total() - stayers();
    }

    public double stayerShare() {
        return stayers() / (double) total();
    }

    public double moverShare() {
        return movers() / (double) total();
    }

    /** Every flow between different answers with at least one respondent, largest count first. */
    public List<Flow> flows() {
        long[] rows = rowTotals();
        List<int[]> cells = new ArrayList<>();
        for (int i = 0; i < counts.length; i++) {
            for (int j = 0; j < counts.length; j++) {
                if (i != j && counts[i][j] > 0) {
                    cells.add(new int[] {i, j});
                }
            }
        }
        // A stable sort keeps the row-major order among equal counts.
        cells.sort((a, b) -> Long.compare(counts[b[0]][b[1]], counts[a[0]][a[1]]));
        List<Flow> out = new ArrayList<>(cells.size());
        for (int[] c : cells) {
            long count = counts[c[0]][c[1]];
            out.add(new Flow(labels.get(c[0]), labels.get(c[1]), count, count / (double) rows[c[0]]));
        }
        return List.copyOf(out);
    }

    /** The first {@code limit} of {@link #flows()}, fewer when there are fewer flows. */
    public List<Flow> largestFlows(int limit) {
        if (limit < 0) {
            throw new IllegalArgumentException("limit must not be negative, was " + limit);
        }
        List<Flow> all = flows();
        return all.subList(0, Math.min(limit, all.size()));
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof ChurnTable t && labels.equals(t.labels) && Arrays.deepEquals(counts, t.counts);
    }

    @Override
    public int hashCode() {
        return 31 * labels.hashCode() + Arrays.deepHashCode(counts);
    }

    @Override
    public String toString() {
        return "ChurnTable[labels=" + labels + ", counts=" + Arrays.deepToString(counts) + "]";
    }
}
