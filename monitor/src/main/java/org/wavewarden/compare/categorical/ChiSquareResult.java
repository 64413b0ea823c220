package org.wavewarden.compare.categorical;

import java.util.Arrays;
import org.wavewarden.compare.TestResult;

/**
 * Pearson's chi-square test of a contingency table with the per-cell diagnostics a reader needs to see where the
 * table departs from independence.
 *
 * <p>The arrays cover the table after rows and columns with a zero total were dropped; {@code keptRows} and
 * {@code keptColumns} map their indices back to the table that was passed in, and {@code droppedNote} says what was
 * dropped and why (empty when nothing was).
 *
 * @param test              the test: X2, its degrees of freedom and the upper-tail p-value
 * @param expected          expected counts under independence, row total times column total over n
 * @param adjustedResiduals Agresti's adjusted (standardized) residuals, approximately standard normal under
 *                          independence (Agresti 2007, section 2.4.5)
 * @param cochranSatisfied  whether Cochran's (1954) rule holds: no expected count below 1, at most 20% below 5
 * @param cochranNote       a plain statement of how the expected counts fare against Cochran's rule
 * @param keptRows          indices, in the input table, of the rows used
 * @param keptColumns       indices, in the input table, of the columns (categories) used
 * @param droppedNote       which rows or columns were dropped and why, or an empty string
 */
public record ChiSquareResult(TestResult test, double[][] expected, double[][] adjustedResiduals,
                              boolean cochranSatisfied, String cochranNote, int[] keptRows, int[] keptColumns,
                              String droppedNote) {

    public ChiSquareResult {
        expected = deepCopy(expected);
        adjustedResiduals = deepCopy(adjustedResiduals);
        keptRows = keptRows.clone();
        keptColumns = keptColumns.clone();
    }

    @Override
    public double[][] expected() {
        return deepCopy(expected);
    }

    @Override
    public double[][] adjustedResiduals() {
        return deepCopy(adjustedResiduals);
    }

    @Override
    public int[] keptRows() {
        return keptRows.clone();
    }

    @Override
    public int[] keptColumns() {
        return keptColumns.clone();
    }

    private static double[][] deepCopy(double[][] a) {
        double[][] out = new double[a.length][];
        for (int i = 0; i < a.length; i++) {
            out[i] = a[i].clone();
        }
        return out;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof ChiSquareResult r && test.equals(r.test) && Arrays.deepEquals(expected, r.expected)
                && Arrays.deepEquals(adjustedResiduals, r.adjustedResiduals) && cochranSatisfied == r.cochranSatisfied
                && cochranNote.equals(r.cochranNote) && Arrays.equals(keptRows, r.keptRows)
                && Arrays.equals(keptColumns, r.keptColumns) && droppedNote.equals(r.droppedNote);
    }

    @Override
    public int hashCode() {
        return 31 * test.hashCode() + Arrays.deepHashCode(adjustedResiduals);
    }
}
