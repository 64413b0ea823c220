package org.wavewarden.compare.categorical;

import java.util.ArrayList;
import java.util.List;

/** Argument checks and small helpers shared by the tests on contingency tables. */
final class ContingencyTables {

    private ContingencyTables() {
    }

    /** Checks that {@code table} is a non-empty rectangular array of non-negative counts. */
    static void checkTable(long[][] table, String name) {
        if (table == null || table.length == 0) {
            throw new IllegalArgumentException(name + " must have at least one row");
        }
        int cols = -1;
        for (int i = 0; i < table.length; i++) {
            if (table[i] == null || table[i].length == 0) {
                throw new IllegalArgumentException(name + "[" + i + "] must have at least one column");
            }
            if (cols >= 0 && table[i].length != cols) {
                throw new IllegalArgumentException(name + " must be rectangular: row " + i + " has " + table[i].length
                        + " columns, row 0 has " + cols);
            }
            cols = table[i].length;
            for (int j = 0; j < cols; j++) {
                if (table[i][j] < 0) {
                    throw new IllegalArgumentException(name + "[" + i + "][" + j + "] must not be negative, was "
                            + table[i][j]);
                }
            }
        }
    }

    static long[][] twoRows(long[] baseline, long[] current) {
        if (baseline == null || current == null) {
            throw new IllegalArgumentException((baseline == null ? "baseline" : "current") + " must not be null");
        }
        if (baseline.length != current.length) {
            throw new IllegalArgumentException("baseline has " + baseline.length + " categories but current has "
                    + current.length + "; align both waves to one category order first");
        }
        return new long[][] {baseline.clone(), current.clone()};
    }

    static long[] rowTotals(long[][] t) {
        long[] r = new long[t.length];
        for (int i = 0; i < t.length; i++) {
            for (long v : t[i]) {
                r[i] = Math.addExact(r[i], v);
            }
        }
        return r;
    }

    static long[] columnTotals(long[][] t) {
        long[] c = new long[t[0].length];
        for (long[] row : t) {
            for (int j = 0; j < row.length; j++) {
                c[j] = Math.addExact(c[j], row[j]);
            }
        }
        return c;
    }

    static int[] nonZero(long[] totals) {
        List<Integer> keep = new ArrayList<>();
        for (int i = 0; i < totals.length; i++) {
            if (totals[i] > 0) {
                keep.add(i);
            }
        }
        return keep.stream().mapToInt(Integer::intValue).toArray();
    }

    static long[][] submatrix(long[][] t, int[] rows, int[] cols) {
        long[][] out = new long[rows.length][cols.length];
        for (int i = 0; i < rows.length; i++) {
            for (int j = 0; j < cols.length; j++) {
                out[i][j] = t[rows[i]][cols[j]];
            }
        }
        return out;
    }

    /** Pearson's X2 against independence; rows and columns must have positive totals. */
    static double pearsonStatistic(long[][] t, long[] rowTotals, long[] colTotals, double n) {
        double x2 = 0;
        for (int i = 0; i < t.length; i++) {
            for (int j = 0; j < t[i].length; j++) {
                double e = rowTotals[i] * (double) colTotals[j] / n;
                double d = t[i][j] - e;
                x2 += d * d / e;
            }
        }
        return x2;
    }

    static long total(long[] totals) {
        long n = 0;
        for (long v : totals) {
            n = Math.addExact(n, v);
        }
        return n;
    }

    static int minDimension(long[][] table) {
        return Math.min(table.length, table[0].length);
    }
}
