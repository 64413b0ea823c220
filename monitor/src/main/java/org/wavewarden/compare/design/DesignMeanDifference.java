package org.wavewarden.compare.design;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StudentT;
import org.wavewarden.compare.TestResult;

/**
 * Difference of weighted means (or shares) between two independently sampled waves, each under its own survey
 * design: {@code d = ybar_current - ybar_baseline}, {@code SE = sqrt(SE_baseline^2 + SE_current^2)} with each SE by
 * Taylor linearisation ({@link WeightedEstimates}), and a design-based t test.
 *
 * <p>Reference distribution: Student t on the design degrees of freedom {@code df = sum over waves of
 * (#PSU - #strata)} (Korn, E. L. and Graubard, B. I. (1999), Analysis of Health Surveys, Wiley), which
 * for many PSUs approaches the normal. R's {@code svyttest(y ~ wave, design)} on the two waves stacked with strata
 * wave x stratum gives the same difference and the same t (its regression sandwich variance reduces to the sum of the
 * two wave variances because the waves share no stratum) but uses one degree of freedom fewer, the residual df of
 * its two-coefficient regression; with few PSUs the p-values therefore differ slightly.
 *
 * <p>The same test is computed from per-value tallies under weights-only designs ({@link WeightedTally}) and from
 * PSU sums under stratified cluster designs ({@link PsuTotals}, {@link PsuTally}); with missing answers the design
 * df of a wave counts the PSUs and strata that hold answers, as R's {@code degf} and {@code svyttest} on the
 * answering subset.
 */
public final class DesignMeanDifference {

    public static final String NAME = "design-based t";
    /** The df of a test under weights-only designs, named so that a reader can reproduce the p-value. */
    public static final String DF_WEIGHTS_ONLY = "n_baseline + n_current - 2: each respondent its own PSU, one"
            + " stratum per wave (R survey degf of the two waves stacked with the wave as stratum)";
    /** The df of a test under stratified cluster designs. */
    public static final String DF_DESIGN = "sum over the two waves of #PSU - #strata with answers (R survey degf"
            + " of the two waves stacked with strata wave x stratum)";
    /** Why R's two-group {@code svyttest} reports another p-value for the same t. */
    public static final String SVYTTEST_NOTE = "R survey's svyttest(y ~ wave) on the two waves stacked gives the"
            + " same difference and t but refers t to one degree of freedom fewer (degf - 1, the residual df of its"
            + " two-coefficient regression)";

    private DesignMeanDifference() {
    }

    /**
     * @param baselineValues values of the earlier wave
     * @param baseline       its design
     * @param currentValues  values of the wave being judged
     * @param current        its design
     * @param confidence     level of the interval of the difference, in (0, 1)
     * @throws IllegalArgumentException on mismatched lengths, no design degrees of freedom or a zero standard error
     */
    public static DesignMeanDifferenceResult test(double[] baselineValues, SurveyDesign baseline,
                                                  double[] currentValues, SurveyDesign current, double confidence) {
        Checks.confidence(confidence);
        DesignEstimate a = WeightedEstimates.mean(baselineValues, baseline);
        DesignEstimate b = WeightedEstimates.mean(currentValues, current);
        return combine(a, b, baseline.degreesOfFreedom() + current.degreesOfFreedom(), DF_DESIGN, confidence,
                "difference of weighted means");
    }

    /**
     * The same from the waves' tallies under weights-only designs: each wave has {@code n - 1} design degrees of
     * freedom (n respondents, each its own PSU, one stratum), so {@code df = n_baseline + n_current - 2}.
     */
    public static DesignMeanDifferenceResult test(WeightedTally baseline, WeightedTally current, double confidence) {
        Checks.confidence(confidence);
        DesignEstimate a = TallyEstimates.mean(baseline);
        DesignEstimate b = TallyEstimates.mean(current);
        return combine(a, b, baseline.n() - 1 + current.n() - 1, DF_WEIGHTS_ONLY, confidence,
                "difference of weighted means");
    }

    /**
     * The difference of weighted shares from 0/1 tallies ({@link WeightedTally#indicator}) under weights-only
     * designs; the effect is in proportion units.
     */
    public static DesignMeanDifferenceResult testShares(WeightedTally baseline, WeightedTally current,
                                                        double confidence) {
        Checks.confidence(confidence);
        checkBinary(baseline == null ? null : baseline.values(), current == null ? null : current.values());
        DesignEstimate a = TallyEstimates.mean(baseline);
        DesignEstimate b = TallyEstimates.mean(current);
        return combine(a, b, baseline.n() - 1 + current.n() - 1, DF_WEIGHTS_ONLY, confidence,
                "difference of weighted shares");
    }

    /**
     * The same from the waves' PSU sums under stratified cluster designs ({@link PsuTotals#mean()}), with
     * {@code df} the sum over waves of {@link PsuTotals#degreesOfFreedom()}: PSUs with answers minus strata with
     * answers, which is the design's #PSU - #strata when no answer is missing.
     */
    public static DesignMeanDifferenceResult test(PsuTotals baseline, PsuTotals current, double confidence) {
        Checks.confidence(confidence);
        if (baseline == null || current == null) {
            throw new IllegalArgumentException("baseline and current totals must not be null");
        }
        return combine(baseline.mean(), current.mean(), baseline.degreesOfFreedom() + current.degreesOfFreedom(),
                DF_DESIGN, confidence, "difference of weighted means");
    }

    /**
     * The difference of weighted shares from 0/1 PSU tallies ({@link PsuTally#indicator}) under stratified cluster
     * designs; the effect is in proportion units and df as in {@link #test(PsuTotals, PsuTotals, double)}.
     */
    public static DesignMeanDifferenceResult testShares(PsuTally baseline, PsuTally current, double confidence) {
        Checks.confidence(confidence);
        if (baseline == null || current == null) {
            throw new IllegalArgumentException("baseline and current tallies must not be null");
        }
        checkBinary(baseline.values(), current.values());
        PsuTotals a = baseline.totals();
        PsuTotals b = current.totals();
        return combine(a.mean(), b.mean(), a.degreesOfFreedom() + b.degreesOfFreedom(), DF_DESIGN, confidence,
                "difference of weighted shares");
    }

    /** The same for the shares of respondents with {@code hit[i] == true}; the effect is in proportion units. */
    public static DesignMeanDifferenceResult testShares(boolean[] baselineHits, SurveyDesign baseline,
                                                        boolean[] currentHits, SurveyDesign current,
                                                        double confidence) {
        Checks.confidence(confidence);
        DesignEstimate a = WeightedEstimates.share(baselineHits, baseline);
        DesignEstimate b = WeightedEstimates.share(currentHits, current);
        return combine(a, b, baseline.degreesOfFreedom() + current.degreesOfFreedom(), DF_DESIGN, confidence,
                "difference of weighted shares");
    }

    private static DesignMeanDifferenceResult combine(DesignEstimate a, DesignEstimate b, double df,
                                                      String dfConvention, double confidence, String effectName) {
        if (!(df > 0)) {
            throw new IllegalArgumentException("the designs have no degrees of freedom (#PSU - #strata = 0 in both)");
        }
        double se = Math.sqrt(a.standardError() * a.standardError() + b.standardError() * b.standardError());
        if (!(se > 0)) {
            throw new IllegalArgumentException("standard error of the difference is " + se
                    + ": neither wave varies, so the test is undefined");
        }
        double d = b.estimate() - a.estimate();
        double t = d / se;
        double p = StudentT.twoSidedP(t, df);
        double half = StudentT.twoSidedQuantile(df, confidence) * se;
        // The same t referred to R's svyttest df, so that a reader checking with it can see where the p differs.
        TestResult svyttest = df > 1 ? new TestResult("R survey svyttest", t, df - 1,
                StudentT.twoSidedP(t, df - 1), "degf - 1") : null;
        return new DesignMeanDifferenceResult(a, b, se, new TestResult(NAME, t, df, p, dfConvention),
                new EffectSize(effectName, d, d - half, d + half, confidence), svyttest);
    }

    private static void checkBinary(double[]... waves) {
        for (double[] values : waves) {
            for (double v : values == null ? new double[0] : values) {
                if (v != 0 && v != 1) {
                    throw new IllegalArgumentException("share tallies must hold the values 0 and 1 only, found " + v);
                }
            }
        }
    }
}
