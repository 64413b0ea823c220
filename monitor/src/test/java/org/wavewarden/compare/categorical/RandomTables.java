package org.wavewarden.compare.categorical;

import java.util.Random;

/** Seeded random contingency tables for the property tests. */
final class RandomTables {

    private RandomTables() {
    }

    /** An r x c table whose rows and columns all have positive totals. */
    static long[][] table(Random random, int rows, int cols, int maxCount) {
        long[][] t = new long[rows][cols];
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < cols; j++) {
                t[i][j] = random.nextInt(maxCount + 1);
            }
        }
        for (int i = 0; i < rows; i++) {
            t[i][i % cols] += 1;
        }
        for (int j = 0; j < cols; j++) {
            t[j % rows][j] += 1;
        }
        return t;
    }

    static long[][] permuteColumns(long[][] t, int[] perm) {
        long[][] out = new long[t.length][perm.length];
        for (int i = 0; i < t.length; i++) {
            for (int j = 0; j < perm.length; j++) {
                out[i][j] = t[i][perm[j]];
            }
        }
        return out;
    }

    static long[][] permuteRows(long[][] t, int[] perm) {
        long[][] out = new long[perm.length][];
        for (int i = 0; i < perm.length; i++) {
            out[i] = t[perm[i]].clone();
        }
        return out;
    }

    static long[][] transpose(long[][] t) {
        long[][] out = new long[t[0].length][t.length];
        for (int i = 0; i < t.length; i++) {
            for (int j = 0; j < t[0].length; j++) {
                out[j][i] = t[i][j];
            }
        }
        return out;
    }

    /** A uniformly random permutation of 0..n-1 that is not the identity when n > 1. */
    static int[] permutation(Random random, int n) {
        int[] p = new int[n];
        for (int i = 0; i < n; i++) {
            p[i] = i;
        }
        do {
            for (int i = n - 1; i > 0; i--) {
                int k = random.nextInt(i + 1);
                int tmp = p[i];
                p[i] = p[k];
                p[k] = tmp;
            }
        } while (n > 1 && isIdentity(p));
        return p;
    }

    private static boolean isIdentity(int[] p) {
        for (int i = 0; i < p.length; i++) {
            if (p[i] != i) {
                return false;
            }
        }
        return true;
    }

    static void assertClose(double expected, double actual, double relative, String what) {
        double tol = relative * Math.max(1e-300, Math.abs(expected));
        if (!(Math.abs(expected - actual) <= tol)) {
            throw new AssertionError(what + ": expected " + expected + " but was " + actual + " (relative tolerance "
                    + relative + ")");
        }
    }
}
