package org.wavewarden.compare.design;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.WeightedComparator;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A weighted finding states its design-based t with the df it used and their convention, and beside it the p-value
 * R's two-group {@code svyttest} gives for the same t, so that a statistician checking with R sees why the two
 * differ. Reference values: R 4.2.2 (Debian r-base-core), survey 4.1.1, on the committed {@code weights_only}
 * waves stacked with the wave as stratum ({@code svydesign(ids = ~1, strata = ~wave, weights = ~w, data = d)}):
 * {@code svyttest(y ~ wave, st)} and {@code svyttest(bin ~ wave, st)}: t, df, p; {@code degf(st)} = 458.
 */
class WeightedDetailReproducesSvyttestTest {

    @ParameterizedTest(name = "{0}")
    @CsvSource({
            // what, R t, R svyttest df, R svyttest p, degf(st)
            "mean, 2.86581425354248, 457, 0.00435128743121889, 458",
            "share, 0.627008792839461, 457, 0.530966580808352, 458"})
    void theDetailStatesTheDesignDfAndTheSvyttestPValue(String what, double t, double svyDf, double svyP,
                                                        double degf) {
        DesignData.Wave a = DesignData.wave("weights_only", "A");
        DesignData.Wave b = DesignData.wave("weights_only", "B");
        WeightedComparator comparator = new WeightedComparator(0.95);
        Comparison c;
        WeightedComparator.Reproduce r;
        if (what.equals("mean")) {
            c = comparator.numeric("y", WeightedTally.ofSample(a.y(), a.w()), WeightedTally.ofSample(b.y(), b.w()),
                    null, null);
            r = ((WeightedComparator.LocationDetail) c.detail()).reproduce();
        } else {
            c = comparator.proportion("bin", "answering '1'", WeightedTally.ofSample(zeroOne(a.bin()), a.w()),
                    WeightedTally.ofSample(zeroOne(b.bin()), b.w()), null);
            r = ((WeightedComparator.ProportionDetail) c.detail()).reproduce();
        }
        assertEquals(t, c.test().statistic(), 1e-9 * Math.abs(t), "t");
        assertEquals(degf, c.test().df(), 0, "the design df, degf of the stacked design");
        assertEquals(DesignMeanDifference.DF_WEIGHTS_ONLY, c.test().dfConvention());
        assertEquals(c.test(), r.designT());
        TestResult svy = r.svyttest();
        assertEquals(svyDf, svy.df(), 0, "svyttest df");
        assertEquals(svyP, svy.pValue(), 1e-9 * svyP, "svyttest p");
        assertEquals(DesignMeanDifference.SVYTTEST_NOTE, r.svyttestNote());
    }

    private static double[] zeroOne(boolean[] hits) {
        double[] v = new double[hits.length];
        for (int i = 0; i < v.length; i++) {
            v[i] = hits[i] ? 1 : 0;
        }
        return v;
    }
}
