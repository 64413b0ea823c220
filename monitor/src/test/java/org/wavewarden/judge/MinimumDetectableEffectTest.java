package org.wavewarden.judge;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.compare.categorical.CramersV;
import org.wavewarden.compare.location.HedgesG;
import org.wavewarden.config.Threshold;
import org.wavewarden.config.WardenConfig.FdrMethod;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The minimum detectable effect a finding reports is the smallest change its two waves could show at alpha: for a
 * test of no change, the change it calls significant half the time (power 0.5). R's power functions give exactly
 * that change, so they are the reference. Whether a threshold can be resolved at all follows from it.
 */
class MinimumDetectableEffectTest {

    static final double ALPHA = 0.05;

    static Finding judged(Comparison c) {
        return Judge.judge(List.of(c), ALPHA, FdrMethod.BENJAMINI_HOCHBERG).get(0);
    }

    /**
     * Two waves of n answers with a share of one half in both, the threshold 2 percentage points. The reference is
     * R 4.2.2, {@code power.prop.test(n = n, p1 = 0.5, power = 0.5, sig.level = 0.05)}, p2 - p1. Tolerance 0.5%
     * relative: power.prop.test puts the variance at the alternative (p2 (1 - p2) is a little below 1/4), Newcombe's
     * interval of the difference takes Wilson limits around 1/2; both differ from z sqrt(0.5 / n) by less than that.
     */
    @ParameterizedTest(name = "{0} answers a wave: MDE {1} (power.prop.test), threshold 2 points resolvable: {2}")
    @CsvSource({
            "2000,  0.030974, false",   // power.prop.test(n=2000, p1=0.5, power=0.5)$p2 - 0.5, R 4.2.2
            "20000, 0.009799, true",    // power.prop.test(n=20000, p1=0.5, power=0.5)$p2 - 0.5, R 4.2.2
    })
    void aShareDifferenceInPointsIsDetectableFromItsSignificanceBoundary(long n, double powerProp,
                                                                        boolean resolvable) {
        Comparison c = new VariableComparator(1 - ALPHA).proportion("owns_boat", FindingKind.SHIFT,
                "answering 'yes'", n / 2, n, n / 2, n, new Threshold(null, 2.0, null));
        Finding f = judged(c);
        assertEquals(powerProp, f.effect().minimumDetectable(), 0.005 * powerProp);
        assertEquals(resolvable, f.effect().resolvable());
        assertEquals(resolvable ? Verdict.STABLE : Verdict.UNCERTAIN, f.verdict());
        if (resolvable) {
            assertFalse(f.sentence().contains("Too few answers"), f.sentence());
        } else {
            assertTrue(f.sentence().startsWith(String.format(java.util.Locale.ROOT, "Too few answers to judge:"
                    + " with %,d and %,d answers, these waves can only show changes of at least 3.1 percentage"
                    + " points; the threshold 2 percentage points cannot be resolved at this sample size. ", n, n)),
                    f.sentence());
            assertTrue(f.sentence().endsWith(": UNCERTAIN."), f.sentence());
        }
    }

    /**
     * Two waves of n answers each with the same mean (g = 0). The reference is R 4.2.2,
     * {@code power.t.test(n = n, sd = 1, power = 0.5, sig.level = 0.05)$delta}: the significance boundary
     * qt(0.975, 2n - 2) sqrt(2 / n), up to the noncentral t. Our interval's limit at g = 0 is where the noncentral t
     * puts 2.5% below 0, which is exactly the normal quantile 1.96, times Hedges' correction J; the two differ by the
     * t against the normal quantile and by J, which shrink with n (tolerance per row: 3% at 34, 1% at 100, 0.2% at
     * 1,000).
     */
    @ParameterizedTest(name = "{0} answers a wave: MDE {1} (power.t.test), within {2} relative")
    @CsvSource({
            "34,   0.482362, 0.03",   // power.t.test(n=34, sd=1, power=0.5)$delta, R 4.2.2
            "100,  0.278532, 0.01",   // power.t.test(n=100, sd=1, power=0.5)$delta, R 4.2.2
            "1000, 0.087689, 0.002",  // power.t.test(n=1000, sd=1, power=0.5)$delta, R 4.2.2
    })
    void aStandardisedMeanDifferenceIsDetectableFromItsSignificanceBoundary(int n, double powerT, double tolerance) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = 100 + (i * 37 % n);
        }
        EffectSize g = HedgesG.estimate(NumericDistribution.ofSample(x), NumericDistribution.ofSample(x), 1 - ALPHA);
        assertEquals(0, g.estimate(), 1e-12);
        Finding.Effect e = new Finding.Effect(g.name(), g.estimate(), g.ciLow(), g.ciHigh(), 0.2);
        assertEquals(powerT, e.minimumDetectable(), tolerance * powerT);
        assertEquals(powerT < 0.2, e.resolvable());
    }

    /**
     * Cliff's delta is bounded by -1 and 1, but near no change its interval is close to symmetric, so its half-width
     * stands for the significance boundary too. n answers a wave, 1 to n against 1.5 to n + 0.5 (delta 1 / n).
     * Reference: R 4.2.2, the exact Mann-Whitney boundary 2 * qwilcox(0.975, n, n) / n^2 - 1. Tolerance 4%
     * at 40, 1% at 200 (measured 2.8% and 0.6%): the interval is built around the observed delta from its
     * estimated variance, not from the exact null distribution.
     */
    @ParameterizedTest(name = "{0} answers a wave: MDE of Cliff's delta {1} (qwilcox), within {2} relative")
    @CsvSource({
            "40,  0.253750, 0.04",   // R 4.2.2: 2 * qwilcox(0.975, 40, 40) / 40^2 - 1
            "200, 0.113250, 0.01",   // R 4.2.2: 2 * qwilcox(0.975, 200, 200) / 200^2 - 1
    })
    void cliffsDeltaNearNoChangeIsDetectableFromItsSignificanceBoundary(int n, double boundary, double tolerance) {
        double[] b = new double[n];
        double[] c = new double[n];
        for (int i = 0; i < n; i++) {
            b[i] = i + 1;
            c[i] = i + 1.5;
        }
        EffectSize d = org.wavewarden.compare.rank.CliffsDelta.estimate(NumericDistribution.ofSample(b),
                NumericDistribution.ofSample(c), 1 - ALPHA);
        assertEquals(1.0 / n, d.estimate(), 1e-12);
        Finding.Effect e = new Finding.Effect(d.name(), d.estimate(), d.ciLow(), d.ciHigh(), 0.147);
        assertEquals(boundary, e.minimumDetectable(), tolerance * boundary);
    }

    /**
     * A threshold in the variable's own units is answered in them. Two waves of 40 answers with the same mean (0 to
     * 39 around 100, Welch pinned): the detectable mean difference is the half-width of Welch's interval, reference
     * R 4.2.2, diff(t.test(x, x)$conf.int) / 2 = 5.20420269 (exact: the same quantile and standard error).
     */
    @ParameterizedTest(name = "{0} answers, threshold {1} a year: MDE {2}")
    @CsvSource({
            // R 4.2.2: n <- 40; x <- 100 + ((0:(n-1)) * 37) %% n; diff(t.test(x, x)$conf.int) / 2
            "40, 5, 5.20420269",
    })
    void aRawThresholdIsAnsweredInTheVariablesUnits(int n, double threshold, double halfWidth) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = 100 + (i * 37 % n);
        }
        Comparison c = new VariableComparator(1 - ALPHA).numeric("mooring_fee", false, NumericDistribution.ofSample(x),
                NumericDistribution.ofSample(x), new Threshold(threshold, null, null), "currency per year",
                new org.wavewarden.compare.location.LocationTestChoice.Choice(
                        org.wavewarden.compare.location.LocationTestChoice.LocationTest.WELCH_T, "pinned", null));
        Finding f = judged(c);
        assertEquals("mean difference", f.effect().name());
        assertEquals(halfWidth, f.effect().minimumDetectable(), 1e-6);
        assertEquals(Verdict.UNCERTAIN, f.verdict());
        assertTrue(f.sentence().startsWith("Too few answers to judge: with 40 and 40 answers, these waves can only"
                + " show changes of at least 5.20 currency per year (mean difference); the threshold 5 currency per"
                + " year cannot be resolved at this sample size. "), f.sentence());
    }

    /**
     * A reference is a fixed value, so only the current wave's answers limit what can be shown. 30 answers from 11
     * up against a reference mean of 25.5 (their own), threshold 2 (raw): the detectable difference is the half-width
     * of the one-sample t interval, reference R 4.2.2, diff(t.test(0:29 + 11, mu = 25.5)$conf.int) / 2 = 3.28724673.
     */
    @ParameterizedTest(name = "{0} answers against a reference, threshold {1}: MDE {2}")
    @CsvSource({
            "30, 2, 3.28724673",   // R 4.2.2: diff(t.test(0:29 + 11, mu = 25.5)$conf.int) / 2
    })
    void aReferenceComparisonCountsOnlyTheCurrentWavesAnswers(int n, double threshold, double halfWidth) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = 11 + i;
        }
        Comparison c = new VariableComparator(1 - ALPHA).referenceMean("score", NumericDistribution.ofSample(x),
                11 + (n - 1) / 2.0, new Threshold(threshold, null, null), null);
        Finding f = judged(c);
        assertEquals(halfWidth, f.effect().minimumDetectable(), 1e-6);
        assertEquals(Verdict.UNCERTAIN, f.verdict(), f.sentence());
        assertTrue(f.sentence().startsWith("Too few answers to judge: with 30 answers, this wave can only show"
                + " differences from the reference of at least 3.29 (mean difference from the reference); the"
                + " threshold 2 cannot be resolved at this sample size. "), f.sentence());
    }

    /**
     * A measure that cannot be negative needs its whole interval below T, so its detectable change is the whole
     * width. A 2 x 3 table of 300 and 300 with V = 0.035: the reference is R 4.2.2, chisq.test(m, correct =
     * FALSE)$statistic = 0.7326 and uniroot(function(l) pchisq(x2, 2, ncp = l) - 0.025)$root = ncp 5.9696, V's
     * upper limit sqrt(ncp / 600) = 0.099747; the lower limit is 0 since pchisq(x2, 2) is below 0.975.
     */
    @ParameterizedTest(name = "V from {0}/{1}/{2} and {3}/{4}/{5}: MDE {6}")
    @CsvSource({
            "100, 100, 100, 110, 95, 95, 0.09974686",   // R 4.2.2 chisq.test + pchisq(ncp) + uniroot, see above
    })
    void aMeasureThatCannotBeNegativeIsDetectableFromItsWholeInterval(long b1, long b2, long b3, long c1, long c2,
                                                                      long c3, double upper) {
        EffectSize v = CramersV.estimate(new long[][]{{b1, b2, b3}, {c1, c2, c3}}, 1 - ALPHA);
        assertEquals(0, v.ciLow());
        Finding.Effect e = new Finding.Effect(v.name(), v.estimate(), v.ciLow(), v.ciHigh(), 0.1);
        assertEquals(upper, e.minimumDetectable(), 1e-6);
        assertTrue(e.resolvable(), "0.0997 is just below V 0.1");
        assertFalse(new Finding.Effect(v.name(), v.estimate(), v.ciLow(), v.ciHigh(), 0.09).resolvable());
    }

    /**
     * The demo's boat owners: 35 and 37 answers (2025-Q2 against 2025-Q1). R 4.2.2 gives Hedges' g 0.394 with the
     * interval -0.073 to 0.860 (demo-data/manifest.yaml, measured), half-width 0.4665; the significance boundary
     * for 35 and 37 (the computation of power.t.test for unequal groups, R 4.2.2: uniroot over d of
     * pt(qt(0.975, 70), 70, ncp = d sqrt(35 * 37 / 72), lower.tail = FALSE) + pt(-qt(0.975, 70), 70, ncp = ...) =
     * 0.5) is 0.468556. Far above the default 0.2 (Cohen 1988): no estimate could be shown STABLE.
     */
    @ParameterizedTest(name = "g {0} ({1} to {2}) on {3} and {4} answers: MDE {5}")
    @CsvSource({
            "0.394, -0.073, 0.860, 35, 37, 0.468556",
    })
    void theDemosBoatOwnersCannotResolveTheDefaultThreshold(double g, double low, double high, long nB, long nC,
                                                            double boundary) {
        Finding.Effect e = new Finding.Effect(HedgesG.NAME, g, low, high, 0.2);
        assertEquals((high - low) / 2, e.minimumDetectable(), 1e-12);
        assertEquals(boundary, e.minimumDetectable(), 0.01 * boundary, "half-width against the power boundary");
        assertFalse(e.resolvable());
    }

    @ParameterizedTest(name = "a census collapses the interval: MDE 0 for {0}")
    @CsvSource({"Hedges' g", "Cramér's V", "risk difference"})
    void aCompleteEnumerationDetectsEveryChange(String name) {
        Finding.Effect e = new Finding.Effect(name, 0.05, 0.05, 0.05, 0.2);
        assertEquals(0, e.minimumDetectable());
        assertTrue(e.resolvable());
    }
}
