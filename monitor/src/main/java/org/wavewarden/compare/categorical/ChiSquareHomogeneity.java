package org.wavewarden.compare.categorical;

import java.util.Arrays;
import java.util.stream.IntStream;
import org.apache.commons.math3.special.Gamma;
import org.wavewarden.compare.TestResult;

/**
 * Pearson's chi-square test of homogeneity (equivalently, independence) for a contingency table, with expected
 * counts, Agresti's adjusted residuals and Cochran's rule of thumb.
 *
 * <p>The statistic is X2 = sum (O - E)^2 / E with E = row total x column total / n and (r - 1)(c - 1) degrees of
 * freedom (Pearson 1900; Agresti 2007, An Introduction to Categorical Data Analysis, 2nd ed., section 2.4). The
 * adjusted residual of a cell is (O - E) / sqrt(E (1 - row share)(1 - column share)) (Agresti 2007, section 2.4.5;
 * R's {@code chisq.test(...)$stdres}). No continuity correction is applied. Cochran's rule (Cochran 1954): no expected
 * count below 1 and at most 20% of them below 5.
 *
 * <p>Rows or columns whose total is zero carry no information and would make expected counts zero; they are dropped
 * before the test and the result says so. A table left with fewer than two rows or two columns shows no departure
 * from homogeneity: X2 = 0 on 0 degrees of freedom with p = 1.
 */
public final class ChiSquareHomogeneity {

    static final String NAME = "Pearson chi-square";

    /** How the df of this test are counted. */

    static final String DF_CONVENTION = "(rows - 1)(columns - 1) of the table tested";

    private ChiSquareHomogeneity() {
    }

    /**
     * Compares two waves' counts over the same categories (row 0 the baseline, row 1 the current wave). Categories
     * with a zero count in both waves are dropped.
     */
    public static ChiSquareResult test(long[] baseline, long[] current) {
        return test(ContingencyTables.twoRows(baseline, current));
    }

    /** Tests a general r x c table of counts (rows: waves or groups; columns: categories). */
    public static ChiSquareResult test(long[][] table) {
        ContingencyTables.checkTable(table, "table");
        long[] rowAll = ContingencyTables.rowTotals(table);
        long[] colAll = ContingencyTables.columnTotals(table);
        int[] rows = ContingencyTables.nonZero(rowAll);
        int[] cols = ContingencyTables.nonZero(colAll);
        String dropped = (droppedNote(table.length, rows, "row", "rows", "category")
                + droppedNote(table[0].length, cols, "category", "categories", "row")).trim();
        long[][] t = ContingencyTables.submatrix(table, rows, cols);
        int r = rows.length;
        int c = cols.length;
        long[] rt = ContingencyTables.rowTotals(t);
        long[] ct = ContingencyTables.columnTotals(t);
        double n = ContingencyTables.total(rt);

        double[][] expected = new double[r][c];
        double[][] residuals = new double[r][c];
        double x2 = 0;
        int below1 = 0;
        int below5 = 0;
        for (int i = 0; i < r; i++) {
            for (int j = 0; j < c; j++) {
                double e = rt[i] * (double) ct[j] / n;
                expected[i][j] = e;
                double d = t[i][j] - e;
                x2 += d * d / e;
                double v = e * (1 - rt[i] / n) * (1 - ct[j] / n);
                // A single row or column gives zero variance and zero deviation: nothing departs, so report 0.
                residuals[i][j] = v > 0 ? d / Math.sqrt(v) : 0;
                if (e < 1) {
                    below1++;
                }
                if (e < 5) {
                    below5++;
                }
            }
        }
        int cells = r * c;
        TestResult test;
        if (r < 2 || c < 2) {
            test = new TestResult(NAME, 0, 0, 1, DF_CONVENTION);
        } else {
            int df = (r - 1) * (c - 1);
            test = new TestResult(NAME, x2, df, upperTail(x2, df), DF_CONVENTION);
        }
        boolean cochran = cells > 0 && below1 == 0 && below5 <= 0.2 * cells;
        String note = cochranNote(cells, below1, below5, cochran);
        return new ChiSquareResult(test, expected, residuals, cochran, note, rows, cols, dropped);
    }

    /**
     * Upper tail of the central chi-square distribution, computed as the regularized upper incomplete gamma
     * function so that very small p-values keep their relative precision.
     */
    public static double upperTail(double x2, double df) {
        if (df <= 0) {
            return 1;
        }
        if (!(x2 > 0)) {
            return 1;
        }
        double p = Gamma.regularizedGammaQ(df / 2, x2 / 2);
        return Math.min(1, Math.max(0, p));
    }

    private static String droppedNote(int total, int[] kept, String one, String many, String across) {
        if (kept.length == total) {
            return "";
        }
        boolean[] keep = new boolean[total];
        for (int k : kept) {
            keep[k] = true;
        }
        int[] gone = IntStream.range(0, total).filter(i -> !keep[i]).toArray();
        return (gone.length == 1 ? one + " " + gone[0] + " was" : many + " " + Arrays.toString(gone) + " were")
                + " dropped: zero count in every " + across + ". ";
    }

    private static String cochranNote(int cells, int below1, int below5, boolean ok) {
        String counts = below1 + " of " + cells + " expected counts below 1, " + below5 + " below 5";
        return ok ? "Cochran's rule holds: " + counts + "."
                : "Cochran's rule fails (" + counts + "); the chi-square approximation may be poor, prefer the"
                + " Monte Carlo or exact p-value.";
    }
}
