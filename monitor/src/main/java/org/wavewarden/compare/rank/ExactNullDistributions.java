package org.wavewarden.compare.rank;

/**
 * Exact permutation null distributions of the rank statistics for small samples without ties.
 *
 * <p>Counts are built by adding non-negative terms only (subset-sum recursions), so tail probabilities keep full
 * relative precision; the lower tail of U is the number of m-subsets of the ranks 1..m+n whose sum is small
 * (Mann &amp; Whitney 1947), the lower tail of V the number of subsets of 1..n with a small sum (Wilcoxon 1945).
 */
final class ExactNullDistributions {

    private ExactNullDistributions() {
    }

    /** Probability of each value 0..m*n of the Mann-Whitney U for samples of sizes m and n. */
    static double[] mannWhitney(int m, int n) {
        int big = m + n;
        int maxSum = 0;
        for (int r = big - m + 1; r <= big; r++) {
            maxSum += r;
        }
        // ways[k][s]: number of k-subsets of the ranks seen so far with rank sum s
        double[][] ways = new double[m + 1][maxSum + 1];
        ways[0][0] = 1;
        for (int r = 1; r <= big; r++) {
            for (int k = Math.min(r, m); k >= 1; k--) {
                double[] to = ways[k];
                double[] from = ways[k - 1];
                for (int s = maxSum; s >= r; s--) {
                    to[s] += from[s - r];
                }
            }
        }
        int offset = m * (m + 1) / 2;
        double[] p = new double[m * n + 1];
        double total = 0;
        for (int u = 0; u <= m * n; u++) {
            p[u] = ways[m][u + offset];
            total += p[u];
        }
        for (int u = 0; u <= m * n; u++) {
            p[u] /= total;
        }
        return p;
    }

    /** Probability of each value 0..n(n+1)/2 of the signed-rank V for n non-zero differences. */
    static double[] signedRank(int n) {
        int maxSum = n * (n + 1) / 2;
        double[] ways = new double[maxSum + 1];
        ways[0] = 1;
        for (int r = 1; r <= n; r++) {
            for (int s = maxSum; s >= r; s--) {
                ways[s] += ways[s - r];
            }
        }
        double total = Math.pow(2, n);
        for (int s = 0; s <= maxSum; s++) {
            ways[s] /= total;
        }
        return ways;
    }

    /**
     * Two-sided p-value as R's {@code wilcox.test} forms it from a discrete symmetric null: twice the smaller tail
     * that contains the observed value, capped at 1.
     */
    static double twoSided(double[] p, int observed, double centre) {
        double tail = 0;
        if (observed > centre) {
            for (int s = observed; s < p.length; s++) {
                tail += p[s];
            }
        } else {
            for (int s = 0; s <= observed; s++) {
                tail += p[s];
            }
        }
        return Math.min(1.0, 2 * tail);
    }
}
