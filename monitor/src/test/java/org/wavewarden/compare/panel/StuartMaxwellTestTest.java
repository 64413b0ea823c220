package org.wavewarden.compare.panel;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.proportion.McNemarTest;

/**
 * Test references: python3-statsmodels 0.13.5 (Debian, scipy 1.10.1), with
 * <pre>
 * from statsmodels.stats.contingency_tables import SquareTable
 * r = SquareTable(np.array(t), shift_zeros=False).homogeneity(method='stuart_maxwell')
 * r.statistic, r.df, r.pvalue; scipy.stats.chi2.sf(r.statistic, r.df)   # p to full precision
 * </pre>
 * {@code shift_zeros=False} because statsmodels' default adds 0.5 to every cell of a table with a zero cell.
 * Interval references: R 4.2.2 (Debian r-base-core) with epibasix 1.5 (Debian r-cran-epibasix), on the table
 * collapsed to the category that moved most versus the rest ({@code X = matrix(c(n_ii, b, c, n - n_ii - b - c), 2)},
 * b = n_i. - n_ii, c = n_.i - n_ii): {@code m <- mcNemar(X, alpha = 1 - conf, force = TRUE)}, whose risk-difference
 * interval is the same Wald interval widened by a continuity correction of 1/n on each side, so the reference is
 * {@code 100 * c(m$rd.CIL + 1/n, m$rd.CIU - 1/n)}.
 */
class StuartMaxwellTestTest {

    /** An attitude item (agree, neutral, disagree) asked of the same 404 panel members twice. */
    static final long[][] ATTITUDE = {
        {120, 35, 10},
        {12, 80, 30},
        {4, 9, 104},
    };

    /** Four answers with one empty flow: nobody went from the first answer to the last. */
    static final long[][] FOUR_WITH_ZERO = {
        {60, 12, 5, 0},
        {3, 45, 19, 4},
        {1, 6, 52, 15},
        {2, 1, 3, 38},
    };

    @Test
    void stuartMaxwellMatchesStatsmodelsOnThreeByThreeTable() {
        StuartMaxwellResult r = StuartMaxwellTest.test(ATTITUDE, 0.95);
        // statsmodels 0.13.5: statistic 22.10009878169247, df 2, pvalue 1.5886364570505407e-05 (1 - cdf);
        // scipy 1.10.1 chi2.sf: 1.5886364570521406e-05
        assertEquals(22.10009878169247, r.test().statistic(), 1e-10);
        assertEquals(2, r.test().df());
        assertEquals(1.5886364570521406e-05, r.test().pValue(), 1e-15);
        assertArrayEquals(new int[] {0, 1, 2}, r.testedCategories());
        assertEquals("", r.droppedNote());
        // margins: 165 / 122 / 117 before, 136 / 124 / 144 after, of 404
        assertArrayEquals(new double[] {165 / 404.0, 122 / 404.0, 117 / 404.0}, r.sharesBefore(), 1e-15);
        assertArrayEquals(new double[] {136 / 404.0, 124 / 404.0, 144 / 404.0}, r.sharesAfter(), 1e-15);
        assertArrayEquals(new double[] {-29 / 404.0, 2 / 404.0, 27 / 404.0}, r.shareDifferences(), 1e-15);
        // epibasix 1.5 mcNemar on agree versus the rest, 95%: rd = -7.1782178217821775 points,
        // without the 1/n correction -10.9020653589006056 to -3.4543702846637485
        assertEquals(0, r.largestShiftCategory());
        EffectSize e = r.largestShift();
        assertEquals(-7.1782178217821775, e.estimate(), 1e-12);
        assertEquals(-10.9020653589006056, e.ciLow(), 1e-10);
        assertEquals(-3.4543702846637485, e.ciHigh(), 1e-10);
        assertEquals(0.95, e.confidence());
        // same, alpha = 0.1: -10.3033691898472171 to -4.0530664537171388
        EffectSize e90 = StuartMaxwellTest.test(ATTITUDE, 0.9).largestShift();
        assertEquals(-10.3033691898472171, e90.ciLow(), 1e-10);
        assertEquals(-4.0530664537171388, e90.ciHigh(), 1e-10);
    }

    @Test
    void stuartMaxwellMatchesStatsmodelsOnFourByFourTableWithZeroCell() {
        StuartMaxwellResult r = StuartMaxwellTest.test(FOUR_WITH_ZERO, 0.95);
        // statsmodels 0.13.5 (shift_zeros=False): 14.77879656160458, df 3; scipy chi2.sf 0.00201578019143612
        assertEquals(14.77879656160458, r.test().statistic(), 1e-10);
        assertEquals(3, r.test().df());
        assertEquals(0.00201578019143612, r.test().pValue(), 1e-14);
        // epibasix 1.5 mcNemar on the last answer versus the rest: rd = 4.8872180451127818 points,
        // without the 1/n correction 1.2501900260533723 to 8.5242460641721927
        assertEquals(3, r.largestShiftCategory());
        assertEquals(4.8872180451127818, r.largestShift().estimate(), 1e-12);
        assertEquals(1.2501900260533723, r.largestShift().ciLow(), 1e-10);
        assertEquals(8.5242460641721927, r.largestShift().ciHigh(), 1e-10);
    }

    @Test
    void twoCategoriesReduceToMcNemarWithoutContinuityCorrection() {
        // Agresti (2007), section 10.1 (CHECK-SOURCES): 794 / 150 / 86 / 570, X2 = 17.36 without correction
        long[][] approval = {{794, 150}, {86, 570}};
        StuartMaxwellResult r = StuartMaxwellTest.test(approval, 0.95);
        assertEquals(17.36, r.test().statistic(), 0.005);
        TestResult mcNemar = McNemarTest.test(794, 150, 86, 570, false);
        assertEquals(mcNemar.statistic(), r.test().statistic(), 1e-12);
        assertEquals(mcNemar.df(), r.test().df());
        assertEquals(mcNemar.pValue(), r.test().pValue(), 1e-15);
        // statsmodels 0.13.5 on the same table: 17.355932203389855, df 1, pvalue 3.099293441044537e-05
        assertEquals(17.355932203389855, r.test().statistic(), 1e-10);
        // approval fell from 944 to 880 of 1600: -4 points; epibasix 1.5 mcNemar, without the 1/n correction:
        // -5.8716116750331659 to -2.1283883249668341. Both shares move by 4 points; the first category wins the tie.
        assertEquals(0, r.largestShiftCategory());
        assertEquals(-4, r.largestShift().estimate(), 1e-12);
        assertEquals(-5.8716116750331659, r.largestShift().ciLow(), 1e-10);
        assertEquals(-2.1283883249668341, r.largestShift().ciHigh(), 1e-10);

        Random random = new Random(71L);
        for (int rep = 0; rep < 200; rep++) {
            long a = random.nextInt(60);
            long b = random.nextInt(60) + 1;
            long c = random.nextInt(60);
            long d = random.nextInt(60);
            StuartMaxwellResult s = StuartMaxwellTest.test(new long[][] {{a, b}, {c, d}}, 0.95);
            TestResult m = McNemarTest.test(a, b, c, d, false);
            assertEquals(m.statistic(), s.test().statistic(), 1e-9 * Math.max(1, m.statistic()));
            assertEquals(m.pValue(), s.test().pValue(), 1e-12);
        }
    }

    @Test
    void categoryChosenOnlyByStayersIsDroppedAndCostsADegreeOfFreedom() {
        // Category 1 only on the diagonal: V would be singular. The reference is statsmodels 0.13.5 on the table
        // without it, {{30, 7, 2}, {4, 25, 6}, {1, 9, 40}}: 1.6131687242798374, df 2, p 0.44638013821988287.
        // (statsmodels on the 4 x 4 table itself returns NaN: "Unable to invert covariance matrix".)
        long[][] t = {
            {30, 0, 7, 2},
            {0, 17, 0, 0},
            {4, 0, 25, 6},
            {1, 0, 9, 40},
        };
        StuartMaxwellResult r = StuartMaxwellTest.test(t, 0.95);
        assertEquals(1.6131687242798374, r.test().statistic(), 1e-10);
        assertEquals(2, r.test().df());
        assertEquals(0.44638013821988287, r.test().pValue(), 1e-14);
        assertArrayEquals(new int[] {0, 2, 3}, r.testedCategories());
        assertEquals("category 1 was left out: everyone who chose it kept the same answer at both waves, so the share"
                + " cannot have moved.", r.droppedNote());
        // its share is still reported, unchanged
        assertEquals(17 / 141.0, r.sharesBefore()[1], 1e-15);
        assertEquals(0, r.shareDifferences()[1]);
    }

    @Test
    void categoryNobodyChoseIsDroppedWithoutChangingTheTest() {
        long[][] padded = new long[5][5];
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                padded[i < 1 ? i : i + 2][j < 1 ? j : j + 2] = ATTITUDE[i][j];
            }
        }
        StuartMaxwellResult r = StuartMaxwellTest.test(padded, 0.95);
        StuartMaxwellResult plain = StuartMaxwellTest.test(ATTITUDE, 0.95);
        assertEquals(plain.test(), r.test());
        assertEquals(plain.largestShift(), r.largestShift());
        assertArrayEquals(new int[] {0, 3, 4}, r.testedCategories());
        assertEquals("categories [1, 2] were left out: chosen by nobody at either wave.", r.droppedNote());
    }

    @Test
    void groupsThatExchangeNoRespondentsAreTestedSeparatelyAndSummed() {
        // {0, 1} and {2, 3} never swap. statsmodels 0.13.5 per block: {{50, 10}, {4, 40}} 2.571428571428571 and
        // {{30, 12}, {3, 35}} 5.400000000000004 (df 1 each); sum 7.971428571428575 on 2 df, scipy 1.10.1
        // chi2.sf = 0.018579168747205794. (statsmodels on the whole table also gives 7.9714 but with df 3.)
        long[][] t = {
            {50, 10, 0, 0},
            {4, 40, 0, 0},
            {0, 0, 30, 12},
            {0, 0, 3, 35},
        };
        StuartMaxwellResult r = StuartMaxwellTest.test(t, 0.95);
        assertEquals(7.971428571428575, r.test().statistic(), 1e-10);
        assertEquals(2, r.test().df());
        assertEquals(0.018579168747205794, r.test().pValue(), 1e-14);
        assertTrue(r.droppedNote().startsWith("No respondent moved between the groups {0, 1}, {2, 3}"),
                r.droppedNote());
    }

    @Test
    void nobodyMovingMeansNoEvidenceAndAZeroWidthShift() {
        StuartMaxwellResult r = StuartMaxwellTest.test(new long[][] {{5, 0}, {0, 7}}, 0.95);
        assertEquals(new TestResult(StuartMaxwellTest.NAME, 0, 0, 1, "categories - 1, summed over the groups tested"),
                r.test());
        assertEquals(0, r.largestShift().estimate());
        assertEquals(0, r.largestShift().ciLow());
        assertEquals(0, r.largestShift().ciHigh());
    }

    @Test
    void relabellingChangesNothingAndSwappingWavesFlipsTheShift() {
        Random random = new Random(29L);
        for (int rep = 0; rep < 100; rep++) {
            int k = 2 + random.nextInt(4);
            long[][] t = new long[k][k];
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    t[i][j] = random.nextInt(i == j ? 80 : 15) + 1;
                }
            }
            StuartMaxwellResult r = StuartMaxwellTest.test(t, 0.95);
            int[] perm = shuffled(random, k);
            long[][] relabelled = new long[k][k];
            long[][] swapped = new long[k][k];
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    relabelled[i][j] = t[perm[i]][perm[j]];
                    swapped[i][j] = t[j][i];
                }
            }
            StuartMaxwellResult p = StuartMaxwellTest.test(relabelled, 0.95);
            assertEquals(r.test().statistic(), p.test().statistic(), 1e-8 * Math.max(1, r.test().statistic()));
            assertEquals(r.test().df(), p.test().df());
            assertEquals(Math.abs(r.largestShift().estimate()), Math.abs(p.largestShift().estimate()), 1e-12);
            StuartMaxwellResult s = StuartMaxwellTest.test(swapped, 0.95);
            assertEquals(r.test().statistic(), s.test().statistic(), 1e-8 * Math.max(1, r.test().statistic()));
            assertEquals(r.largestShiftCategory(), s.largestShiftCategory());
            assertEquals(-r.largestShift().estimate(), s.largestShift().estimate(), 1e-12);
            assertEquals(-r.largestShift().ciHigh(), s.largestShift().ciLow(), 1e-12);
            // shares sum to one at each wave; the differences to zero
            assertEquals(1, Arrays.stream(r.sharesBefore()).sum(), 1e-12);
            assertEquals(1, Arrays.stream(r.sharesAfter()).sum(), 1e-12);
            assertEquals(0, Arrays.stream(r.shareDifferences()).sum(), 1e-12);
        }
    }

    @Test
    void rejectsTablesThatAreNotSquareOrHoldNoPairs() {
        assertEquals("table must be square: row 1 has 3 columns, expected 2",
                assertThrows(IllegalArgumentException.class,
                        () -> StuartMaxwellTest.test(new long[][] {{1, 2}, {3, 4, 5}}, 0.95)).getMessage());
        assertEquals("table[0][1] must not be negative, was -2", assertThrows(IllegalArgumentException.class,
                () -> StuartMaxwellTest.test(new long[][] {{1, -2}, {3, 4}}, 0.95)).getMessage());
        assertEquals("table holds no pairs: every count is 0", assertThrows(IllegalArgumentException.class,
                () -> StuartMaxwellTest.test(new long[2][2], 0.95)).getMessage());
        assertEquals("confidence must lie in (0, 1), was 95.0", assertThrows(IllegalArgumentException.class,
                () -> StuartMaxwellTest.test(ATTITUDE, 95)).getMessage());
    }

    private static int[] shuffled(Random random, int k) {
        int[] perm = new int[k];
        for (int i = 0; i < k; i++) {
            perm[i] = i;
        }
        for (int i = k - 1; i > 0; i--) {
            int j = random.nextInt(i + 1);
            int tmp = perm[i];
            perm[i] = perm[j];
            perm[j] = tmp;
        }
        return perm;
    }
}
