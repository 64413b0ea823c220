package org.wavewarden.compare.design;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * Property tests: the estimators from PSU sums ({@link PsuTotals}, {@link PsuTally}) give what the row-level classes
 * give on the same respondents, to 1e-10, for random stratified cluster designs with single-PSU strata and missing
 * answers. Where no PSU loses all its answers, the row-level classes on the answering rows are the reference
 * ({@link WeightedEstimates}, {@link DesignMeanDifference}, {@link RaoScott}). Where one does, the domain estimate is
 * rebuilt row by row on the whole design: scores {@code w_i (y_i - ybar) / W} for answering respondents and 0 for
 * the others, their variance by {@link DesignVariance} (the form R's {@code subset} computes, checked against R in
 * {@link PsuTotalsTest}).
 */
class PsuSumsEqualRowsTest {

    private static final double TOL = 1e-10;

    static int[] answered(double[] values) {
        return DesignData.answered(values);
    }

    static double[] pick(double[] values, int[] index) {
        return Arrays.stream(index).mapToDouble(i -> values[i]).toArray();
    }

    static int[] codes(double[] cat) {
        return Arrays.stream(cat).filter(v -> !Double.isNaN(v)).mapToInt(v -> (int) v).toArray();
    }

    /**
     * Domain means of the columns and their covariance, row by row on the whole design: respondents whose column
     * value is NaN have score 0 (all columns share one pattern of missing answers).
     */
    static double[][] domain(SurveyDesign design, double[][] columns, double[] means) {
        int n = design.size();
        double total = 0;
        for (int i = 0; i < n; i++) {
            if (!Double.isNaN(columns[0][i])) {
                total += design.weight(i);
            }
        }
        double[][] scores = new double[columns.length][n];
        for (int c = 0; c < columns.length; c++) {
            double s = 0;
            for (int i = 0; i < n; i++) {
                if (!Double.isNaN(columns[c][i])) {
                    s += design.weight(i) * columns[c][i];
                }
            }
            means[c] = s / total;
            for (int i = 0; i < n; i++) {
                if (!Double.isNaN(columns[c][i])) {
                    scores[c][i] = design.weight(i) * (columns[c][i] - means[c]) / total;
                }
            }
        }
        return DesignVariance.covariance(design, scores);
    }

    static boolean[] hits(int[] codes, int code) {
        boolean[] out = new boolean[codes.length];
        for (int i = 0; i < codes.length; i++) {
            out[i] = codes[i] == code;
        }
        return out;
    }

    static double[][] indicators(double[] cat, int[] codes) {
        double[][] out = new double[codes.length][cat.length];
        for (int j = 0; j < codes.length; j++) {
            for (int i = 0; i < cat.length; i++) {
                out[j][i] = Double.isNaN(cat[i]) ? Double.NaN : cat[i] == codes[j] ? 1 : 0;
            }
        }
        return out;
    }

    private static void same(double expected, double actual, String what) {
        assertEquals(expected, actual, TOL * Math.abs(expected) + 1e-15, what);
    }

    private static void same(DesignEstimate rows, DesignEstimate sums, String what) {
        same(rows.estimate(), sums.estimate(), what + " estimate");
        same(rows.standardError(), sums.standardError(), what + " SE");
        same(rows.designEffect(), sums.designEffect(), what + " deff");
        same(rows.designEffectWithoutReplacement(), sums.designEffectWithoutReplacement(), what + " deff TRUE");
    }

    private static void sameMatrix(double[][] rows, double[][] sums, String what) {
        double scale = Arrays.stream(rows).flatMapToDouble(Arrays::stream).map(Math::abs).max().orElse(0);
        for (int a = 0; a < rows.length; a++) {
            for (int b = 0; b < rows.length; b++) {
                assertEquals(rows[a][b], sums[a][b], TOL * scale + 1e-18, what + "[" + a + "][" + b + "]");
            }
        }
    }

    private static void same(DesignMeanDifferenceResult rows, DesignMeanDifferenceResult sums, String what) {
        same(rows.difference().estimate(), sums.difference().estimate(), what + " difference");
        same(rows.standardError(), sums.standardError(), what + " SE");
        same(rows.test().statistic(), sums.test().statistic(), what + " t");
        assertEquals(rows.test().df(), sums.test().df(), 0, what + " df");
        assertEquals(rows.test().pValue(), sums.test().pValue(), TOL, what + " p");
        same(rows.difference().ciLow(), sums.difference().ciLow(), what + " ci low");
        same(rows.difference().ciHigh(), sums.difference().ciHigh(), what + " ci high");
    }

    @Test
    void meansSharesAndDesignEffectsEqualTheRowLevelClasses() {
        Random rnd = new Random(20240801);
        int withLostPsus = 0;
        for (int rep = 0; rep < 60; rep++) {
            DesignData.Answers r = DesignData.randomAnswers(rnd, 0, rep % 3);
            SurveyDesign full = r.design();
            PsuTotals totals = PsuTotals.ofSample(r.y(), full);
            PsuTally tally = PsuTally.ofSample(r.cat(), full);
            int[] ay = answered(r.y());
            int[] ac = answered(r.cat());
            SurveyDesign dy = r.answering(r.y());
            SurveyDesign dc = r.answering(r.cat());
            assertEquals(ay.length, totals.n());
            assertEquals(full.psuCount(), totals.psuCount());
            assertEquals(full.strataCount(), totals.strataCount());
            // the design df of the answering rows, R's degf(subset(design, !is.na(y)))
            assertEquals(dy.degreesOfFreedom(), totals.degreesOfFreedom(), "df y");
            assertEquals(dc.degreesOfFreedom(), tally.degreesOfFreedom(), "df cat");

            assertTrue(dy.psuCount() >= 2 && dc.psuCount() >= 2, "rep " + rep + ": answers in a single PSU");
            DesignEstimate onRows = WeightedEstimates.mean(pick(r.y(), ay), dy);
            DesignEstimate onSums = totals.mean();
            if (r.everyPsuAnswers(r.y())) {
                same(onRows, onSums, "mean");
            } else {
                withLostPsus++;
            }
            // the domain variance on the whole design, and V_srs, which depends on the answering rows only
            double[] m = new double[1];
            double v = domain(full, new double[][] {r.y()}, m)[0][0];
            same(m[0], onSums.estimate(), "domain mean");
            same(Math.sqrt(v), onSums.standardError(), "domain SE");
            double srs = onRows.standardError() * onRows.standardError() / onRows.designEffect();
            same(v / srs, onSums.designEffect(), "domain deff");

            CategoryShares rowsShares = WeightedEstimates.shares(codes(r.cat()), dc);
            CategoryShares sumShares = tally.shares();
            assertArrayEquals(rowsShares.codes(), sumShares.codes());
            if (r.everyPsuAnswers(r.cat())) {
                for (int j = 0; j < rowsShares.codes().length; j++) {
                    same(rowsShares.estimates()[j], sumShares.estimates()[j], "share " + j);
                }
                sameMatrix(rowsShares.covariance(), sumShares.covariance(), "share covariance");
            }
            double[] p = new double[rowsShares.codes().length];
            double[][] cov = domain(full, indicators(r.cat(), rowsShares.codes()), p);
            for (int j = 0; j < p.length; j++) {
                same(p[j], sumShares.shares()[j], "domain share " + j);
            }
            sameMatrix(cov, sumShares.covariance(), "domain share covariance");
            same(sumShares.of(rowsShares.codes()[0]).standardError(),
                    tally.indicator(rowsShares.codes()[0]).totals().mean().standardError(), "indicator SE");

            // a numeric variable tallied exactly gives the sums of its rows
            double[] whole = Arrays.stream(r.y()).map(Math::rint).toArray();
            DesignEstimate direct = PsuTotals.ofSample(whole, full).mean();
            DesignEstimate viaTally = PsuTally.ofSample(whole, full).totals().mean();
            same(direct, viaTally, "tally totals");
        }
        assertTrue(withLostPsus >= 10, "the random designs lose whole PSUs often enough: " + withLostPsus);
    }

    @Test
    void twoWaveTestsEqualTheRowLevelClasses() {
        Random rnd = new Random(20240802);
        int compared = 0;
        for (int rep = 0; rep < 60; rep++) {
            DesignData.Answers a = DesignData.randomAnswers(rnd, 0, rep % 3);
            DesignData.Answers b = DesignData.randomAnswers(rnd, 0.5 + rnd.nextDouble(), (rep / 3) % 3);
            PsuTotals ta = PsuTotals.ofSample(a.y(), a.design());
            PsuTotals tb = PsuTotals.ofSample(b.y(), b.design());
            int df = ta.degreesOfFreedom() + tb.degreesOfFreedom();
            if (df <= 0) {
                continue;
            }
            DesignMeanDifferenceResult sums = DesignMeanDifference.test(ta, tb, 0.9);
            if (a.everyPsuAnswers(a.y()) && b.everyPsuAnswers(b.y())) {
                int[] ia = answered(a.y());
                int[] ib = answered(b.y());
                same(DesignMeanDifference.test(pick(a.y(), ia), a.answering(a.y()), pick(b.y(), ib),
                        b.answering(b.y()), 0.9), sums, "t");
                compared++;
            }
            // the domain form, row by row: the difference over the root of the summed domain variances
            double[] ma = new double[1];
            double[] mb = new double[1];
            double va = domain(a.design(), new double[][] {a.y()}, ma)[0][0];
            double vb = domain(b.design(), new double[][] {b.y()}, mb)[0][0];
            same((mb[0] - ma[0]) / Math.sqrt(va + vb), sums.test().statistic(), "domain t");
            assertEquals(a.answering(a.y()).degreesOfFreedom() + b.answering(b.y()).degreesOfFreedom(),
                    sums.test().df(), 0, "domain df");
        }
        assertTrue(compared >= 10, "compared " + compared);
    }

    @Test
    void sharesAndRaoScottFromPsuTalliesEqualTheRowLevelClasses() {
        Random rnd = new Random(20240803);
        int compared = 0;
        for (int rep = 0; rep < 60; rep++) {
            DesignData.Answers a = DesignData.randomAnswers(rnd, 0, rep % 2);
            DesignData.Answers b = DesignData.randomAnswers(rnd, 2 * rnd.nextDouble(), (rep / 2) % 2);
            PsuTally ka = PsuTally.ofSample(a.cat(), a.design());
            PsuTally kb = PsuTally.ofSample(b.cat(), b.design());
            if (!(a.everyPsuAnswers(a.cat()) && b.everyPsuAnswers(b.cat()))
                    || ka.degreesOfFreedom() + kb.degreesOfFreedom() <= 0) {
                continue;
            }
            compared++;
            SurveyDesign da = a.answering(a.cat());
            SurveyDesign db = b.answering(b.cat());
            int[] ca = codes(a.cat());
            int[] cb = codes(b.cat());

            same(DesignMeanDifference.testShares(hits(ca, 2), da, hits(cb, 2), db, 0.95),
                    DesignMeanDifference.testShares(ka.indicator(2), kb.indicator(2), 0.95), "share t");

            RaoScottResult rows = RaoScott.test(ca, da, cb, db);
            RaoScottResult sums = RaoScott.test(ka, kb);
            assertArrayEquals(rows.codes(), sums.codes());
            same(rows.pearsonChiSquare(), sums.pearsonChiSquare(), "X2");
            same(rows.meanDesignEffect(), sums.meanDesignEffect(), "mean deff");
            same(rows.firstOrder().statistic(), sums.firstOrder().statistic(), "first-order statistic");
            assertEquals(rows.firstOrder().df(), sums.firstOrder().df(), 0, "first-order df");
            assertEquals(rows.firstOrder().pValue(), sums.firstOrder().pValue(), TOL, "first-order p");
            same(rows.secondOrder().statistic(), sums.secondOrder().statistic(), "F");
            same(rows.secondOrder().df(), sums.secondOrder().df(), "ndf");
            same(rows.denominatorDf(), sums.denominatorDf(), "ddf");
            assertEquals(rows.secondOrder().pValue(), sums.secondOrder().pValue(), TOL, "F p");
            for (int j = 0; j < rows.designEffects().length; j++) {
                same(rows.designEffects()[j], sums.designEffects()[j], "design effect " + j);
            }
        }
        assertTrue(compared >= 20, "compared " + compared);
    }
}
