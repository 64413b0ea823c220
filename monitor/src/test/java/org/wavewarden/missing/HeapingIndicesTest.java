package org.wavewarden.missing;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.NumericDistribution;

class HeapingIndicesTest {

    /**
     * Males by single year of age 0..99: the sample data of the U.S. Census Bureau's Population Analysis Spreadsheets
     * (PAS), workbook SINGAGE, as reproduced in the test suite of the DemoTools R package (which states the
     * spreadsheet's Whipple index, 2.34 as a ratio). DemoTools is not packaged in Debian, so the
     * package itself was not run for these checks; Myers' index is checked against the formula written out in R.
     */
    static final long[] PAS_MALES = {80626, 95823, 104315, 115813, 100796, 105086, 97266, 116328, 75984, 89982, 95525,
            56973, 78767, 65672, 53438, 85014, 47600, 64363, 42195, 42262, 73221, 30080, 34391, 29072, 20531, 66171,
            24029, 44227, 24128, 23599, 82088, 16454, 22628, 17108, 12531, 57325, 17220, 28425, 16206, 17532, 65976,
            11593, 15828, 13541, 8133, 44696, 11165, 18543, 12614, 12041, 55798, 9324, 10772, 10453, 6773, 28358, 9916,
            13348, 8039, 7583, 42470, 5288, 5317, 6582, 3361, 17949, 3650, 5873, 3279, 3336, 27368, 1965, 2495, 2319,
            1335, 12022, 1401, 1668, 1360, 1185, 9167, 424, 568, 462, 282, 6206, 343, 409, 333, 291, 4137, 133, 169,
            157, 89, 2068, 68, 81, 66, 57};

    static NumericDistribution ages(long[] byAge, int firstAge) {
        TreeMap<Double, Long> t = new TreeMap<>();
        for (int i = 0; i < byAge.length; i++) {
            if (byAge[i] > 0) {
                t.put((double) (firstAge + i), byAge[i]);
            }
        }
        return NumericDistribution.ofTally(t);
    }

    @Test
    void whippleMatchesThePasSingleAgeWorkbook() {
        WhippleIndex w = WhippleIndex.compute(ages(PAS_MALES, 0));
        // Published (PAS SINGAGE via DemoTools tests): 2.34 as a ratio. The exact value from the UN formula,
        // R 4.2.2: sum(v[age %in% seq(25,60,5)]) / (sum(v[age >= 23 & age <= 62]) / 5) * 100 = 233.8729863346
        assertEquals(234, w.index(), 0.5);
        assertEquals(233.8729863346, w.index(), 1e-9);
        assertEquals(WhippleIndex.QualityBand.VERY_ROUGH, w.qualityBand());
    }

    @Test
    void whippleBandsFollowTheUnitedNationsCutPoints() {
        // Bands as in CHECK-SOURCES (UN recommendation, in Shryock & Siegel): < 105, 105-109.9, 110-124.9,
        // 125-174.9, >= 175. A total of 40 persons aged 23..62, of whom h end in 0 or 5, gives 100 * h / 8.
        assertEquals(WhippleIndex.QualityBand.HIGHLY_ACCURATE, new WhippleIndex(104.99, 1, 10).qualityBand());
        assertEquals(WhippleIndex.QualityBand.FAIRLY_ACCURATE, new WhippleIndex(105, 1, 10).qualityBand());
        assertEquals(WhippleIndex.QualityBand.APPROXIMATE, new WhippleIndex(110, 1, 10).qualityBand());
        assertEquals(WhippleIndex.QualityBand.ROUGH, new WhippleIndex(125, 1, 10).qualityBand());
        assertEquals(WhippleIndex.QualityBand.ROUGH, new WhippleIndex(174.99, 1, 10).qualityBand());
        assertEquals(WhippleIndex.QualityBand.VERY_ROUGH, new WhippleIndex(175, 1, 10).qualityBand());
    }

    @Test
    void whippleIsOneHundredWithoutPreferenceAndFiveHundredWhenAllAgesEndInZeroOrFive() {
        long[] flat = new long[100];
        java.util.Arrays.fill(flat, 7);
        assertEquals(100, WhippleIndex.compute(ages(flat, 0)).index(), 1e-12);
        long[] heaped = new long[100];
        for (int a = 25; a <= 60; a += 5) {
            heaped[a] = 3;
        }
        assertEquals(500, WhippleIndex.compute(ages(heaped, 0)).index(), 1e-12);
        assertThrows(IllegalArgumentException.class, () -> WhippleIndex.compute(ages(new long[]{5}, 70)));
    }

    @Test
    void myersMatchesTheFormulaWrittenOutInR() {
        // R 4.2.2, Myers' blended method written out on the PAS data above (no R package used):
        //   s1 <- sapply(0:9, function(d) sum(v[age >= low & age <= low + 79 & age %% 10 == d]))
        //   s2 <- sapply(0:9, function(d) sum(v[age >= low + 10 & age <= low + 89 & age %% 10 == d]))
        //   j <- (0:9 - low) %% 10; b <- (j + 1) * s1 + (9 - j) * s2; p <- 100 * b / sum(b); sum(abs(p - 10)) / 2
        // low = 10: 23.8553375336 (digit 0: 24.320308%, digit 5: 18.736677%); low = 5: 20.3530953574
        MyersIndex m = MyersIndex.compute(ages(PAS_MALES, 0), 10);
        assertEquals(23.8553375336, m.index(), 1e-9);
        assertEquals(24.320308, m.blendedPercent().get(0), 1e-6);
        assertEquals(18.736677, m.blendedPercent().get(5), 1e-6);
        assertEquals(20.3530953574, MyersIndex.compute(ages(PAS_MALES, 0), 5).index(), 1e-9);
        // Whipple and Myers agree that this population heaps on 0 and 5 above all.
        assertTrue(m.blendedPercent().get(0) > 20 && m.blendedPercent().get(5) > 15);
    }

    @Test
    void myersIsZeroForAFlatPopulationAndNinetyWhenEveryAgeEndsInZero() {
        long[] flat = new long[100];
        java.util.Arrays.fill(flat, 11);
        assertEquals(0, MyersIndex.compute(ages(flat, 0), 10).index(), 1e-9);
        long[] zeros = new long[100];
        for (int a = 10; a < 100; a += 10) {
            zeros[a] = 100 - a;
        }
        assertEquals(90, MyersIndex.compute(ages(zeros, 0), 10).index(), 1e-9);
    }

    @Test
    void myersBlendingRemovesTheBiasOfALinearlyFallingPopulation() {
        // Without the blend, a population falling steadily with age favours low digits; the weights cancel it.
        long[] falling = new long[100];
        for (int a = 0; a < 100; a++) {
            falling[a] = 10_000 - 90L * a;
        }
        assertEquals(0, MyersIndex.compute(ages(falling, 0), 10).index(), 1e-9);
    }

    @Test
    void heapingIndicesDependOnlyOnProportionsAndEqualRawDataResults() {
        Random rnd = new Random(5);
        for (int rep = 0; rep < 20; rep++) {
            double[] raw = new double[2000];
            for (int i = 0; i < raw.length; i++) {
                int a = 10 + rnd.nextInt(85);
                raw[i] = rnd.nextDouble() < 0.2 ? 5 * Math.round(a / 5.0) : a;
            }
            NumericDistribution d = NumericDistribution.ofSample(raw);
            TreeMap<Double, Long> doubled = new TreeMap<>();
            for (int i = 0; i < d.size(); i++) {
                doubled.put(d.value(i), 3 * d.count(i));
            }
            NumericDistribution tripled = NumericDistribution.ofTally(doubled);
            assertEquals(WhippleIndex.compute(d).index(), WhippleIndex.compute(tripled).index(), 1e-9);
            assertEquals(MyersIndex.compute(d, 10).index(), MyersIndex.compute(tripled, 10).index(), 1e-9);
            long heaped = 0;
            long total = 0;
            for (double a : raw) {
                if (a >= 23 && a <= 62) {
                    total++;
                    heaped += ((long) a) % 5 == 0 ? 1 : 0;
                }
            }
            assertEquals(500.0 * heaped / total, WhippleIndex.compute(d).index(), 1e-9);
            assertTrue(WhippleIndex.compute(d).index() > 110, "20% heaping must raise Whipple well above 100");
        }
    }

    @Test
    void terminalDigitChiSquareMatchesR() {
        // R 4.2.2: digits <- c(130, 41, 52, 47, 38, 121, 44, 50, 39, 43); chisq.test(digits)
        //   X-squared = 178.2231404959, df = 9, p-value = 1.1903125345e-33
        //   sum(abs(digits / sum(digits) - 0.1)) / 2 = 0.2148760331
        long[] digits = {130, 41, 52, 47, 38, 121, 44, 50, 39, 43};
        TreeMap<Double, Long> t = new TreeMap<>();
        for (int d = 0; d < 10; d++) {
            // Minutes 0..59 spread over six decades, keeping each digit's total.
            long left = digits[d];
            for (int decade = 0; decade < 6; decade++) {
                long c = decade < 5 ? left / 6 : left - 5 * (digits[d] / 6);
                if (c > 0) {
                    t.put((double) (10 * decade + d), c);
                }
            }
        }
        TerminalDigitPreference r = TerminalDigitPreference.test(NumericDistribution.ofTally(t));
        assertTrue(r.applicable(), r.reason());
        assertArrayEquals(digits, r.digitCounts());
        assertEquals(178.2231404959, r.chiSquare(), 1e-8);
        assertEquals(1.1903125345e-33, r.pValue(), 1e-30);
        assertEquals(0.2148760331, r.dissimilarity(), 1e-9);
        assertEquals(9, r.toTestResult().df());
    }

    @Test
    void terminalDigitTestDeclinesFractionsSmallSamplesAndNarrowRanges() {
        assertFalse(TerminalDigitPreference.test(NumericDistribution.ofSample(1.5, 2, 3)).applicable());
        double[] few = new double[40];
        for (int i = 0; i < few.length; i++) {
            few[i] = i;
        }
        assertFalse(TerminalDigitPreference.test(NumericDistribution.ofSample(few)).applicable());
        double[] narrow = new double[500];
        for (int i = 0; i < narrow.length; i++) {
            narrow[i] = 1 + i % 5; // a 1..5 scale: its last digit is never uniform, and that is no heaping
        }
        TerminalDigitPreference r = TerminalDigitPreference.test(NumericDistribution.ofSample(narrow));
        assertFalse(r.applicable());
        assertTrue(r.reason().contains("span"), r.reason());
        assertThrows(IllegalStateException.class, r::toTestResult);
    }

    @Test
    void uniformLastDigitsAreNotRejectedAndRoundedAmountsAre() {
        Random rnd = new Random(11);
        int rejected = 0;
        for (int rep = 0; rep < 200; rep++) {
            double[] x = new double[600];
            for (int i = 0; i < x.length; i++) {
                x[i] = rnd.nextInt(200);
            }
            rejected += TerminalDigitPreference.test(NumericDistribution.ofSample(x)).pValue() < 0.01 ? 1 : 0;
        }
        assertTrue(rejected <= 8, "uniform digits rejected " + rejected + " times of 200 at the 1% level");
        double[] rounded = new double[600];
        for (int i = 0; i < rounded.length; i++) {
            int m = rnd.nextInt(200);
            rounded[i] = rnd.nextDouble() < 0.3 ? 10 * Math.round(m / 10.0) : m;
        }
        TerminalDigitPreference r = TerminalDigitPreference.test(NumericDistribution.ofSample(rounded));
        assertTrue(r.pValue() < 1e-6 && r.dissimilarity() > 0.2, "p " + r.pValue() + ", dissimilarity " + r.dissimilarity());
    }

    @Test
    void theLastDigitOfTheLargestDoublesIsCountedWithoutOverflow() {
        TreeMap<Double, Long> t = new TreeMap<>();
        for (int i = 0; i < 60; i++) {
            t.merge(20.0 + i, 1L, Long::sum);
        }
        t.put(1e308, 1L);
        t.put(-1e308, 1L);
        TerminalDigitPreference r = TerminalDigitPreference.test(NumericDistribution.ofTally(t));
        assertEquals(62, java.util.Arrays.stream(r.digitCounts()).sum(), "every answer has a last digit in 0..9");
    }
}
