package org.wavewarden.compare;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.categorical.ChiSquareHomogeneity;
import org.wavewarden.profile.CategoryCounts;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Sparse categorical variables (every category answered once or twice, so Cochran's rule fails): the Monte Carlo
 * p-value draws at most its budget of cells, and beyond it the chi-square approximation stands, said in the note.
 */
class ManyCategoriesComparisonTest {

    private final VariableComparator comparator = new VariableComparator(0.95);

    /** Categories 0 .. k-1 once each in the baseline; the current wave answers the first tenth twice. */
    static CategoryCounts[] sparse(int k) {
        List<String> names = new ArrayList<>();
        long[] b = new long[k];
        long[] c = new long[k];
        for (int i = 0; i < k; i++) {
            names.add("code-" + i);
            b[i] = 1;
            c[i] = i < k / 10 ? 2 : 1;
        }
        return new CategoryCounts[] {new CategoryCounts(names, b), new CategoryCounts(names, c)};
    }

    static VariableComparator.CategoryDetail detail(Comparison c) {
        return (VariableComparator.CategoryDetail) c.detail();
    }

    @Test
    void aSmallSparseTableDrawsTheFullTwentyThousandTables() {
        CategoryCounts[] t = sparse(200);
        Comparison c = comparator.categorical("code", t[0], t[1], null);
        assertTrue(detail(c).primaryTestNote().startsWith("Monte Carlo exact p-value (20000 tables"),
                detail(c).primaryTestNote());
    }

    @Test
    void aLargerSparseTableDrawsFewerTablesWithinTheBudget() {
        CategoryCounts[] t = sparse(5_000);
        Comparison c = comparator.categorical("code", t[0], t[1], null);
        assertTrue(detail(c).primaryTestNote().startsWith("Monte Carlo exact p-value (1000 tables"),
                detail(c).primaryTestNote());
    }

    @Test
    void aHundredThousandSparseCategoriesFallBackToTheChiSquareApproximationAndSaySo() {
        CategoryCounts[] t = sparse(100_000);
        Comparison c = comparator.categorical("code", t[0], t[1], null);
        assertTrue(detail(c).primaryTestNote().startsWith("Pearson chi-square approximation, since a Monte Carlo"
                + " p-value over 100000 categories would exceed its budget"), detail(c).primaryTestNote());
        assertEquals(ChiSquareHomogeneity.test(t[0].counts(), t[1].counts()).test().pValue(), c.test().pValue());
        assertEquals(100_000, detail(c).categories().size());
    }

    @Test
    void countsOfAHundredThousandCategoriesAlignInEitherOrder() {
        CategoryCounts[] t = sparse(100_000);
        List<String> reversed = new ArrayList<>(t[1].categories());
        java.util.Collections.reverse(reversed);
        long[] aligned = t[1].alignedTo(reversed);
        assertEquals(2, aligned[aligned.length - 1]);
        assertEquals(1, aligned[0]);
        assertEquals(-1, t[1].indexOf("no such code"));
        assertEquals(0, t[1].count("no such code"));
    }
}
