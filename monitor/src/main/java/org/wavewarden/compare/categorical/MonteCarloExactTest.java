package org.wavewarden.compare.categorical;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.wavewarden.compare.TestResult;

/**
 * A Monte Carlo p-value for Pearson's X2 that does not rely on the chi-square approximation, for tables where
 * Cochran's rule fails.
 *
 * <p>Random tables with the observed row and column totals are drawn from their exact null distribution (the
 * multiple hypergeometric) by Patefield's algorithm (Patefield 1981, Applied Statistics 30, algorithm AS 159, as in
 * R's {@code r2dtable}): cell by cell, each count is drawn from its conditional hypergeometric distribution given the
 * cells already filled, searching outward from the conditional mode. The p-value follows Hope (1968) and R's
 * {@code chisq.test(simulate.p.value = TRUE)}: p = (1 + #{X2_sim >= (1 - 64 eps) X2_obs}) / (1 + B); the tiny
 * relative tolerance keeps tables equal to the observed one up to rounding in the count.
 *
 * <p>The same table, replicate count and seed always give the same p-value, whatever order its rows and columns come
 * in: the simulation only sees the sorted margins.
 */
public final class MonteCarloExactTest {

    static final String NAME = "Pearson chi-square, Monte Carlo p-value";
    private static final double ALMOST_ONE = 1 - 64 * Math.ulp(1.0);

    private MonteCarloExactTest() {
    }

    /**
     * @param table      counts, rows waves and columns categories; rows and columns with zero totals are ignored
     * @param replicates number of simulated tables B, at least 1
     * @param seed       seed of the pseudo-random generator
     */
    public static TestResult test(long[][] table, int replicates, long seed) {
        ContingencyTables.checkTable(table, "table");
        if (replicates < 1) {
            throw new IllegalArgumentException("replicates must be at least 1, was " + replicates);
        }
        long[] rowAll = ContingencyTables.rowTotals(table);
        long[] colAll = ContingencyTables.columnTotals(table);
        int[] rows = ContingencyTables.nonZero(rowAll);
        int[] cols = ContingencyTables.nonZero(colAll);
        if (rows.length < 2 || cols.length < 2) {
            return new TestResult(NAME, 0, Double.NaN, 1);
        }
        long[][] t = ContingencyTables.submatrix(table, rows, cols);
        long[] rt = ContingencyTables.rowTotals(t);
        long[] ct = ContingencyTables.columnTotals(t);
        long n = ContingencyTables.total(rt);
        double observed = ContingencyTables.pearsonStatistic(t, rt, ct, n);

        Arrays.sort(rt);
        Arrays.sort(ct);
        SplittableRandom random = new SplittableRandom(seed);
        long[][] sim = new long[rt.length][ct.length];
        double threshold = ALMOST_ONE * observed;
        long atLeast = 0;
        for (int b = 0; b < replicates; b++) {
            patefield(rt, ct, n, random, sim);
            if (ContingencyTables.pearsonStatistic(sim, rt, ct, n) >= threshold) {
                atLeast++;
            }
        }
        return new TestResult(NAME, observed, Double.NaN, (1.0 + atLeast) / (1.0 + replicates));
    }

    /** Fills {@code out} with one random table having row totals {@code rt} and column totals {@code ct}. */
    static void patefield(long[] rt, long[] ct, long n, SplittableRandom random, long[][] out) {
        int r = rt.length;
        int c = ct.length;
        long[] colLeft = ct.clone();
        long remaining = n; // units in rows i.. (all columns)
        for (int i = 0; i < r - 1; i++) {
            long rowLeft = rt[i];
            long pool = remaining; // units in rows i.. and columns j..
            remaining -= rt[i];
            for (int j = 0; j < c - 1; j++) {
                long x;
                if (rowLeft == 0) {
                    x = 0;
                } else {
                    x = hypergeometric(pool, colLeft[j], rowLeft, random);
                }
                out[i][j] = x;
                pool -= colLeft[j];
                rowLeft -= x;
                colLeft[j] -= x;
            }
            out[i][c - 1] = rowLeft;
            colLeft[c - 1] -= rowLeft;
        }
        for (int j = 0; j < c; j++) {
            out[r - 1][j] = colLeft[j];
        }
    }

    /**
     * One draw of the number of marked units among {@code draws} taken without replacement from {@code population}
     * units of which {@code marked} are marked, by inversion ordered outward from the mode.
     */
    static long hypergeometric(long population, long marked, long draws, SplittableRandom random) {
        long unmarked = population - marked;
        long lo = Math.max(0, draws - unmarked);
        long hi = Math.min(draws, marked);
        if (lo == hi) {
            return lo;
        }
        long mode = (long) Math.floor((draws + 1.0) * (marked + 1.0) / (population + 2.0));
        mode = Math.max(lo, Math.min(hi, mode));
        double pMode = Math.exp(FisherExact.logChoose(marked, mode) + FisherExact.logChoose(unmarked, draws - mode)
                - FisherExact.logChoose(population, draws));
        double u = random.nextDouble();
        double cumulative = pMode;
        if (u <= cumulative) {
            return mode;
        }
        long up = mode;
        long down = mode;
        double pUp = pMode;
        double pDown = pMode;
        while (up < hi || down > lo) {
            if (up < hi) {
                // p(x + 1) / p(x) for the hypergeometric
                pUp *= (double) (marked - up) * (draws - up) / ((up + 1.0) * (unmarked - draws + up + 1.0));
                up++;
                cumulative += pUp;
                if (u <= cumulative) {
                    return up;
                }
            }
            if (down > lo) {
                pDown *= (double) down * (unmarked - draws + down) / ((marked - down + 1.0) * (draws - down + 1.0));
                down--;
                cumulative += pDown;
                if (u <= cumulative) {
                    return down;
                }
            }
        }
        // Rounding left u just above the accumulated total: the draw belongs to the outermost value reached.
        return pUp >= pDown ? up : down;
    }
}
