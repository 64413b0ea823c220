package org.wavewarden.compare.rank;

import java.util.Arrays;
import org.wavewarden.profile.NumericDistribution;

/**
 * The multiset of all differences current_i - baseline_j, held implicitly by the two frequency tables.
 *
 * <p>For a fixed current value the differences fall as the baseline value rises, so the pairs with a difference
 * at most d form a suffix of the baseline table whose start only moves forward as the current value rises: one
 * merge counts them in O(k1 + k2). The k-th smallest difference is found by bisection on d until the bracket holds
 * few enough distinct cells to list and sort (a rank-selection scheme in the spirit of Johnson &amp; Mizoguchi 1978
 * for X + Y), so n1 * n2 pairs are never formed.
 */
final class PairwiseDifferences {

    private final NumericDistribution baseline;
    private final NumericDistribution current;
    /** suffixWeight[j]: baseline observations at index j and above. */
    private final long[] suffixWeight;
    private final long pairs;
    private final int listLimit;

    PairwiseDifferences(NumericDistribution baseline, NumericDistribution current) {
        this.baseline = baseline;
        this.current = current;
        int kb = baseline.size();
        suffixWeight = new long[kb + 1];
        for (int j = kb - 1; j >= 0; j--) {
            suffixWeight[j] = suffixWeight[j + 1] + baseline.count(j);
        }
        pairs = Math.multiplyExact(baseline.n(), current.n());
        // one difference value spans at most min(k1, k2) cells, so a bracket that narrow always fits the list
        listLimit = 4 * (kb + current.size()) + 64;
    }

    long pairs() {
        return pairs;
    }

    double min() {
        return current.value(0) - baseline.value(baseline.size() - 1);
    }

    double max() {
        return current.value(current.size() - 1) - baseline.value(0);
    }

    /** Number of pairs (with multiplicity) whose difference is at most d. */
    long countAtMost(double d) {
        long total = 0;
        int p = 0;
        int kb = baseline.size();
        for (int i = 0; i < current.size(); i++) {
            double c = current.value(i);
            while (p < kb && c - baseline.value(p) > d) {
                p++;
            }
            total += current.count(i) * suffixWeight[p];
        }
        return total;
    }

    /** Number of distinct (value, value) cells whose difference is at most d. */
    private long cellsAtMost(double d) {
        long total = 0;
        int p = 0;
        int kb = baseline.size();
        for (int i = 0; i < current.size(); i++) {
            double c = current.value(i);
            while (p < kb && c - baseline.value(p) > d) {
                p++;
            }
            total += kb - p;
        }
        return total;
    }

    /** The k-th smallest difference, k from 1 to pairs(). */
    double kthSmallest(long k) {
        if (k < 1 || k > pairs) {
            throw new IllegalArgumentException("k must lie in [1, " + pairs + "], was " + k);
        }
        double lo = Math.nextDown(min()); // countAtMost(lo) = 0 < k
        double hi = max(); // countAtMost(hi) = pairs >= k
        long belowLo = 0;
        long cellsLo = 0;
        long cellsHi = (long) baseline.size() * current.size();
        while (cellsHi - cellsLo > listLimit) {
            double mid = 0.5 * lo + 0.5 * hi;
            if (!(mid > lo && mid < hi)) {
                break; // adjacent doubles: the bracket holds one difference value only
            }
            long atMost = countAtMost(mid);
            if (atMost >= k) {
                hi = mid;
                cellsHi = cellsAtMost(mid);
            } else {
                lo = mid;
                belowLo = atMost;
                cellsLo = cellsAtMost(mid);
            }
        }
        return selectInBracket(lo, hi, k - belowLo);
    }

    /** Lists the cells with lo < difference <= hi and picks the one holding the rank-th pair among them. */
    private double selectInBracket(double lo, double hi, long rank) {
        int kb = baseline.size();
        int size = (int) Math.min(Integer.MAX_VALUE - 8, cellsAtMost(hi) - cellsAtMost(lo));
        double[] diffs = new double[size];
        long[] weights = new long[size];
        int filled = 0;
        int pHi = 0;
        int pLo = 0;
        for (int i = 0; i < current.size(); i++) {
            double c = current.value(i);
            while (pHi < kb && c - baseline.value(pHi) > hi) {
                pHi++;
            }
            while (pLo < kb && c - baseline.value(pLo) > lo) {
                pLo++;
            }
            for (int j = pHi; j < pLo; j++) {
                diffs[filled] = c - baseline.value(j);
                weights[filled] = current.count(i) * baseline.count(j);
                filled++;
            }
        }
        Integer[] order = new Integer[filled];
        for (int t = 0; t < filled; t++) {
            order[t] = t;
        }
        Arrays.sort(order, (a, b) -> Double.compare(diffs[a], diffs[b]));
        long seen = 0;
        for (Integer t : order) {
            seen += weights[t];
            if (seen >= rank) {
                return diffs[t];
            }
        }
        throw new IllegalStateException("rank " + rank + " not found in bracket (" + lo + ", " + hi + "]");
    }
}
