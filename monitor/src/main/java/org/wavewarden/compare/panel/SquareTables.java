package org.wavewarden.compare.panel;

/** Argument checks and margins shared by the paired-table methods. */
final class SquareTables {

    private SquareTables() {
    }

    /** Checks that {@code table} is a non-empty square array of non-negative counts with at least one pair. */
    static void check(long[][] table, String name) {
        if (table == null || table.length == 0) {
            throw new IllegalArgumentException(name + " must have at least one row");
        }
        int k = table.length;
        long n = 0;
        for (int i = 0; i < k; i++) {
            if (table[i] == null || table[i].length != k) {
                throw new IllegalArgumentException(name + " must be square: row " + i + " has "
                        + (table[i] == null ? "no" : String.valueOf(table[i].length)) + " columns, expected " + k);
            }
            for (int j = 0; j < k; j++) {
                if (table[i][j] < 0) {
                    throw new IllegalArgumentException(name + "[" + i + "][" + j + "] must not be negative, was "
                            + table[i][j]);
                }
                n = Math.addExact(n, table[i][j]);
            }
        }
        if (n == 0) {
            throw new IllegalArgumentException(name + " holds no pairs: every count is 0");
        }
    }

    /** Row totals: each category's count at the earlier wave. */
    static long[] rowTotals(long[][] t) {
        long[] r = new long[t.length];
        for (int i = 0; i < t.length; i++) {
            for (long v : t[i]) {
                r[i] += v;
            }
        }
        return r;
    }

    /** Column totals: each category's count at the later wave. */
    static long[] columnTotals(long[][] t) {
        long[] c = new long[t.length];
        for (long[] row : t) {
            for (int j = 0; j < row.length; j++) {
                c[j] += row[j];
            }
        }
        return c;
    }

    static long total(long[] totals) {
        long n = 0;
        for (long v : totals) {
            n += v;
        }
        return n;
    }

    static long[][] deepCopy(long[][] t) {
        long[][] out = new long[t.length][];
        for (int i = 0; i < t.length; i++) {
            out[i] = t[i].clone();
        }
        return out;
    }
}
