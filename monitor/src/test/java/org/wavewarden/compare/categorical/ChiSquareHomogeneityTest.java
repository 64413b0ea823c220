package org.wavewarden.compare.categorical;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.wavewarden.compare.categorical.RandomTables.assertClose;

import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.CategoryCounts;

class ChiSquareHomogeneityTest {

    private static final long[] FEMALE = {762, 327, 468};
    private static final long[] MALE = {484, 239, 477};

    @Test
    void chiSquareMatchesAgrestiPartyIdentificationTable() {
        ChiSquareResult r = ChiSquareHomogeneity.test(FEMALE, MALE);
        // Agresti (2007), An Introduction to Categorical Data Analysis, 2nd ed., Tables 2.5 and 2.6
        assertEquals(30.07, r.test().statistic(), 0.005);
        assertEquals(2, r.test().df());
        assertEquals(2.954e-07, r.test().pValue(), 0.0005e-07);
        double[][] res = r.adjustedResiduals();
        assertEquals(4.50, res[0][0], 0.005);
        assertEquals(0.70, res[0][1], 0.005);
        assertEquals(-5.32, res[0][2], 0.005);
        // R 4.2.2 (Debian r-base-core): chisq.test(rbind(c(762,327,468), c(484,239,477)), correct = FALSE)
        assertClose(30.070149095754672, r.test().statistic(), 1e-12, "X2");
        assertClose(2.9535891832117569e-07, r.test().pValue(), 1e-9, "p");
        double[] stdres = {4.50205352108670542, 0.69945173298442975, -5.31594554270492914};
        double[] expected = {703.67138193688788, 319.64526659412405, 533.68335146898801};
        for (int j = 0; j < 3; j++) {
            assertClose(stdres[j], res[0][j], 1e-12, "$stdres[1," + (j + 1) + "]");
            assertClose(-stdres[j], res[1][j], 1e-12, "$stdres[2," + (j + 1) + "]");
            assertClose(expected[j], r.expected()[0][j], 1e-12, "$expected[1," + (j + 1) + "]");
        }
        assertTrue(r.cochranSatisfied());
        assertEquals("", r.droppedNote());
    }

    @Test
    void chiSquareMatchesROnAThreeByFourTable() {
        long[][] t = {{12, 5, 9, 30}, {7, 14, 3, 22}, {9, 11, 6, 18}};
        ChiSquareResult r = ChiSquareHomogeneity.test(t);
        // R 4.2.2: chisq.test(matrix(c(12,5,9,30, 7,14,3,22, 9,11,6,18), 3, byrow = TRUE), correct = FALSE)
        assertClose(9.633375682288726, r.test().statistic(), 1e-12, "X2");
        assertEquals(6, r.test().df());
        assertClose(0.14096478199063342, r.test().pValue(), 1e-10, "p");
        double[] stdres = {0.544827428513965151, -2.740912320132125046, 1.085029007183020644, 1.073403915637417327,
            -0.824440141872846310, 2.005284373172881107, -1.447507696908273855, -0.019540320507381595,
            0.257302399820286742, 0.874432750223286259, 0.315637105757853142, -1.117718971450740506};
        for (int k = 0; k < stdres.length; k++) {
            assertClose(stdres[k], r.adjustedResiduals()[k / 4][k % 4], 1e-10, "$stdres " + k);
        }
    }

    @Test
    void sparseCellFailsCochranRuleAndSaysSo() {
        // R 4.2.2: chisq.test(matrix(c(40,25,3, 31,36,9), 2, byrow = TRUE), correct = FALSE)
        ChiSquareResult r = ChiSquareHomogeneity.test(new long[] {40, 25, 3}, new long[] {31, 36, 9});
        assertClose(5.6975923449135157, r.test().statistic(), 1e-12, "X2");
        assertClose(0.057913997392368584, r.test().pValue(), 1e-10, "p");
        assertClose(2.1609529017835585, r.adjustedResiduals()[0][0], 1e-12, "$stdres[1,1]");
        // expected counts 5.67 and 6.33 for the third category: both at least 5, the rule holds
        assertTrue(r.cochranSatisfied());

        ChiSquareResult sparse = ChiSquareHomogeneity.test(new long[] {40, 25, 1, 0}, new long[] {31, 36, 2, 1});
        // expected counts of the last two categories are 1.46, 1.54, 0.49, 0.51: 4 of 8 below 5, 2 below 1
        assertFalse(sparse.cochranSatisfied());
        assertTrue(sparse.cochranNote().contains("2 of 8 expected counts below 1, 4 below 5"), sparse.cochranNote());
    }

    @Test
    void categoriesEmptyInBothWavesAreDroppedWithTheReason() {
        ChiSquareResult withGap = ChiSquareHomogeneity.test(new long[] {762, 0, 327, 468}, new long[] {484, 0, 239, 477});
        ChiSquareResult plain = ChiSquareHomogeneity.test(FEMALE, MALE);
        assertEquals(plain.test(), withGap.test());
        assertArrayEquals(new int[] {0, 2, 3}, withGap.keptColumns());
        assertEquals("category 1 was dropped: zero count in every row.", withGap.droppedNote());
        assertArrayEquals(plain.adjustedResiduals()[0], withGap.adjustedResiduals()[0]);
    }

    @Test
    void aSingleCategoryLeftShowsNoDeparture() {
        ChiSquareResult r = ChiSquareHomogeneity.test(new long[] {5, 0}, new long[] {9, 0});
        assertEquals(0, r.test().statistic());
        assertEquals(0, r.test().df());
        assertEquals(1, r.test().pValue());
        assertArrayEquals(new int[] {0}, r.keptColumns());
    }

    @Test
    void relabellingCategoriesOrSwappingWavesChangesNothing() {
        Random random = new Random(20240611L);
        for (int rep = 0; rep < 200; rep++) {
            int rows = 2 + random.nextInt(3);
            int cols = 2 + random.nextInt(5);
            long[][] t = RandomTables.table(random, rows, cols, 1 + random.nextInt(60));
            ChiSquareResult base = ChiSquareHomogeneity.test(t);
            int[] colPerm = RandomTables.permutation(random, cols);
            int[] rowPerm = RandomTables.permutation(random, rows);
            ChiSquareResult moved = ChiSquareHomogeneity.test(
                    RandomTables.permuteRows(RandomTables.permuteColumns(t, colPerm), rowPerm));
            assertClose(base.test().statistic(), moved.test().statistic(), 1e-12, "X2 rep " + rep);
            assertClose(base.test().pValue(), moved.test().pValue(), 1e-10, "p rep " + rep);
            assertEquals(base.test().df(), moved.test().df());
            assertEquals(base.cochranSatisfied(), moved.cochranSatisfied());
            for (int i = 0; i < rows; i++) {
                for (int j = 0; j < cols; j++) {
                    assertEquals(base.adjustedResiduals()[rowPerm[i]][colPerm[j]], moved.adjustedResiduals()[i][j],
                            1e-12, "residual follows its cell");
                }
            }
        }
    }

    @Test
    void countsTalliedFromRawAnswersAgreeWithCommonsMathChiSquareTest() {
        Random random = new Random(77L);
        List<String> labels = List.of("poor", "fair", "good", "very good", "excellent");
        ChiSquareTest reference = new ChiSquareTest(); // commons-math3 3.6.1
        for (int rep = 0; rep < 100; rep++) {
            Map<String, Long> baselineTally = new TreeMap<>();
            Map<String, Long> currentTally = new TreeMap<>();
            int nB = 20 + random.nextInt(400);
            int nC = 20 + random.nextInt(400);
            double tilt = random.nextDouble();
            for (int i = 0; i < nB; i++) {
                baselineTally.merge(labels.get(random.nextInt(labels.size())), 1L, Long::sum);
            }
            for (int i = 0; i < nC; i++) {
                int k = random.nextDouble() < tilt ? random.nextInt(2) : random.nextInt(labels.size());
                currentTally.merge(labels.get(k), 1L, Long::sum);
            }
            CategoryCounts baseline = CategoryCounts.ofTally(baselineTally);
            CategoryCounts current = CategoryCounts.ofTally(currentTally);
            List<String> order = baseline.unionOrder(current);
            long[] b = baseline.alignedTo(order);
            long[] c = current.alignedTo(order);
            ChiSquareResult ours = ChiSquareHomogeneity.test(b, c);
            long[][] t = {b, c};
            assertClose(reference.chiSquare(t), ours.test().statistic(), 1e-11, "X2 rep " + rep);
            assertClose(reference.chiSquareDataSetsComparison(b, c), ours.test().statistic(), 1e-11, "X2 rep " + rep);
            assertEquals(reference.chiSquareTest(t), ours.test().pValue(), 1e-12 + 1e-9 * ours.test().pValue());
        }
    }

    @Test
    void malformedTablesAreRejectedNamingTheArgument() {
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> ChiSquareHomogeneity.test(new long[] {1, 2}, new long[] {1})).getMessage().contains("baseline"));
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> ChiSquareHomogeneity.test(new long[][] {{1, -2}, {1, 1}})).getMessage().contains("table[0][1]"));
        assertTrue(assertThrows(IllegalArgumentException.class,
                () -> ChiSquareHomogeneity.test(new long[][] {{1, 2}, {1}})).getMessage().contains("rectangular"));
    }
}
