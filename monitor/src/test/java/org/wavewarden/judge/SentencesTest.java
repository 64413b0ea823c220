package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.Change;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig.FdrMethod;

import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Each sentence says only what the numbers it prints show. */
class SentencesTest {

    static final double ALPHA = 0.05;

    static Comparison comparison(String name, double p, EffectSize effect, double threshold, Change change) {
        return new Comparison(name, FindingKind.SHIFT, new TestResult("Welch t", 1.0, 30, p), effect, threshold,
                "default", 30, 30, change, null);
    }

    static Comparison meanShift(String name, double p) {
        return comparison(name, p, new EffectSize("Hedges' g", 0.1, -0.1, 0.3, 0.95), 0.2,
                new Change("mean " + name, 1.0, 1.1, false, null, 0.1, -0.1, 0.3, ""));
    }

    static Finding judgedAlone(Comparison c) {
        return Judge.judge(List.of(c), ALPHA, FdrMethod.BENJAMINI_HOCHBERG).get(0);
    }

    @Test
    void theOneInNIsReadFromThePrintedPAndTheQNamesTheFamilyItWasAdjustedOver() {
        List<Finding> f = Judge.judge(List.of(meanShift("a", 0.1432), meanShift("b", 0.5), meanShift("c", 0.9)),
                ALPHA, FdrMethod.BENJAMINI_HOCHBERG);
        // Benjamini-Hochberg by hand: the smallest of 3 p-values gets min(3 p / 1, q of the next) = 0.4296.
        assertTrue(f.get(0).sentence().contains("p = 0.14: chance alone would give a gap this large in about 1 in 7"
                + " comparisons; after false-discovery control over the 3 tests of this run, q = 0.4296"),
                f.get(0).sentence());
    }

    @Test
    void aHodgesLehmannShiftOfTheOtherSignGetsNoDirectionWordAndIsNamed() {
        Change change = new Change("median wait", 42, 40, false, "minutes", 7.0, 5.0, 9.0,
                "the shift is the Hodges-Lehmann estimate");
        String s = judgedAlone(comparison("wait", 0.001, new EffectSize("Cliff's delta", 0.3, 0.2, 0.4, 0.95), 0.147,
                change)).sentence();
        assertFalse(s.contains(" fell") || s.contains(" rose"), s);
        assertTrue(s.startsWith("Median wait went from 42.00 to 40.00 minutes (Hodges-Lehmann shift +7.00, 95% CI"
                + " +5.00 to +9.00 minutes, the typical difference between answers of the two waves)"), s);
    }

    @Test
    void aHodgesLehmannShiftOfTheSameSignKeepsTheDirectionWord() {
        Change change = new Change("median wait", 24, 32, false, "minutes", 7.0, 7.0, 8.0,
                "the shift is the Hodges-Lehmann estimate");
        String s = judgedAlone(comparison("wait", 0.001, new EffectSize("Cliff's delta", 0.3, 0.2, 0.4, 0.95), 0.147,
                change)).sentence();
        assertTrue(s.startsWith("Median wait rose from 24.00 to 32.00 minutes (Hodges-Lehmann shift +7.00"), s);
    }

    @Test
    void equalValuesStayAtOneValue() {
        Change change = new Change("mean score", 6.0, 6.0, false, null, 0.0, -0.1, 0.1, "");
        String s = judgedAlone(comparison("score", 0.9, new EffectSize("Hedges' g", 0, -0.05, 0.05, 0.95), 0.2,
                change)).sentence();
        assertTrue(s.startsWith("Mean score stayed at 6.000 ("), s);
        assertFalse(s.contains("from 6.000 to 6.000"), s);
    }

    @Test
    void equalMediansWithAShiftSayThatTheAnswersMovedAllTheSame() {
        Change change = new Change("median wait", 24, 24, false, "minutes", 1.0, 0.0, 1.0,
                "the shift is the Hodges-Lehmann estimate");
        String s = judgedAlone(comparison("wait", 0.3, new EffectSize("Cliff's delta", 0.01, -0.02, 0.04, 0.95), 0.147,
                change)).sentence();
        assertTrue(s.startsWith("Median wait stayed at 24.00 minutes, but the answers as a whole moved"
                + " (Hodges-Lehmann shift +1.00"), s);
    }

    @Test
    void equalMediansAndNoShiftStillNameTheShiftTheIntervalBelongsTo() {
        Change change = new Change("median age", 50, 50, false, "years", 0.0, -1.0, 1.0,
                "the shift is the Hodges-Lehmann estimate");
        String s = judgedAlone(comparison("age", 0.8, new EffectSize("Cliff's delta", 0.0, -0.02, 0.02, 0.95), 0.147,
                change)).sentence();
        assertTrue(s.startsWith("Median age stayed at 50.000 years (Hodges-Lehmann shift +0.000, 95% CI -1.00 to"
                + " +1.00 years, the typical difference between answers of the two waves)"), s);
    }

    @Test
    void aMissingRateLeadsWithTheRatioAndPointsAndCarriesNoMagnitudeWord() {
        Comparison c = new VariableComparator(0.95).proportion("income", FindingKind.MISSING_RATE_CHANGE,
                "missing (NULL)", 18, 1000, 118, 1000, null);
        String s = judgedAlone(c).sentence();
        // 11.8 / 1.8 = 6.56 (arithmetic on the printed shares).
        assertTrue(s.startsWith("Share missing (NULL) rose from 1.8% to 11.8% of rows, 6.6 times as many (+10.0"
                + " points, 95% CI"), s);
        assertFalse(s.matches(".*\\((negligible|small|medium|large)[,)].*"), s);
    }

    @Test
    void aMissingRateFromNoneSaysSoInsteadOfARatio() {
        Comparison c = new VariableComparator(0.95).proportion("height", FindingKind.MISSING_RATE_CHANGE,
                "missing (disguised: numeric sentinel)", 0, 3900, 105, 3900, null);
        assertTrue(judgedAlone(c).sentence().startsWith("Share missing (disguised: numeric sentinel) rose from 0.0% to"
                + " 2.7% of rows, where the baseline had none (+2.7 points"), judgedAlone(c).sentence());
    }

    @ParameterizedTest(name = "{0} {1} -> ({2})")
    @CsvSource({
            // effect name, estimate, the conventional word and its source (Cohen 1988; Romano et al. 2006)
            "Hedges' g, 0.533, 'medium, Cohen 1988'",
            "Cramér's V, 0.182, 'small, Cohen 1988'",
            "Cliff's delta, 0.276, 'small, Romano et al. 2006'",
    })
    void aMagnitudeWordNamesTheConventionItComesFrom(String name, double estimate, String expected) {
        String s = judgedAlone(comparison("x", 0.0001, new EffectSize(name, estimate, estimate - 0.05,
                estimate + 0.05, 0.95), 0.1, new Change("mean x", 1, 2, false, null, 1, 0.5, 1.5, ""))).sentence();
        assertTrue(s.contains(name + " " + String.format(java.util.Locale.ROOT, "%.3f", estimate) + " (" + expected
                + ")"), s);
    }

    /** The interval clause of a sentence, read back from the sentence: limits and what it claims. */
    record Claim(double lo, double hi, String clause) {
        static final Pattern INTERVAL = Pattern.compile("interval \\((-?[0-9.]+) to (-?[0-9.]+)\\)");

        static Claim of(String sentence) {
            Matcher m = INTERVAL.matcher(sentence);
            assertTrue(m.find(), sentence);
            return new Claim(Double.parseDouble(m.group(1)), Double.parseDouble(m.group(2)), sentence);
        }
    }

    @ParameterizedTest(name = "estimate {0}, interval {1} to {2}, threshold {3}")
    @CsvSource({
            // estimate, ciLow, ciHigh, threshold, q: each UNCERTAIN or STABLE case with its printed interval
            "-0.738, -1.240, -0.236, 0.2, 0.11",   // the 4/31 -> 0/30 shape: wholly beyond the threshold
            "0.180, -0.025, 0.385, 0.2, 0.44",     // below the threshold, the interval reaches it
            "0.394, -0.069, 0.854, 0.2, 0.58",     // above the threshold, the interval takes in smaller changes
            "0.150, 0.10004, 0.19996, 0.2, 0.60",  // STABLE by a hair: printed so that it shows
            "0.100, -0.10004, 0.2000004, 0.2, 0.60",
    })
    void theIntervalClauseSaysOnlyWhatThePrintedIntervalShows(double estimate, double lo, double hi, double t,
                                                             double p) {
        Comparison c = comparison("x", p, new EffectSize("Hedges' g", estimate, lo, hi, 0.95), t,
                new Change("mean x", 1, 1 + estimate, false, null, estimate, lo, hi, ""));
        Finding f = judgedAlone(c);
        Claim claim = Claim.of(f.sentence());
        boolean reaches = claim.hi() >= t || claim.lo() <= -t;
        boolean whollyBeyond = claim.lo() >= t || claim.hi() <= -t;
        String s = f.sentence();
        assertFalse(s.contains("still reaches"), s);
        if (f.verdict() == Verdict.STABLE) {
            assertFalse(reaches, "a STABLE sentence must print an interval inside the threshold: " + s);
            assertTrue(s.contains("rules out a change that large"), s);
        } else {
            assertEquals(Verdict.UNCERTAIN, f.verdict());
            assertTrue(reaches, "an UNCERTAIN sentence must print an interval that reaches the threshold: " + s);
            assertEquals(whollyBeyond, s.contains("and so does all of the interval"), s);
            assertEquals(!whollyBeyond && Math.abs(estimate) < t, s.contains(") reaches it"), s);
        }
    }

    @Test
    void theZeroCountMissingRateOfFourInThirtyOneAgainstNoneInThirtyIsDescribedByItsPrintedInterval() {
        Comparison c = new VariableComparator(0.95).proportion("x", FindingKind.MISSING_RATE_CHANGE, "missing (NULL)",
                4, 31, 0, 30, null);
        Finding f = judgedAlone(c);
        String s = f.sentence();
        assertFalse(s.contains("still reaches"), s);
        if (f.verdict() == Verdict.UNCERTAIN) {
            Claim claim = Claim.of(s.substring(s.indexOf(c.effect().name())));
            double t = c.threshold();
            boolean whollyBeyond = claim.lo() >= t || claim.hi() <= -t;
            assertEquals(whollyBeyond, s.contains("and so does all of the interval"), s);
        }
    }

    @Test
    void aSingleTestIsNamedAsTheOnlyTestOfTheRun() {
        assertTrue(judgedAlone(meanShift("a", 0.2)).sentence().contains("after false-discovery control over the single"
                + " test of this run, q = 0.2000"));
    }

    @Test
    void everySentenceOfManyRandomComparisonsPrintsItsPAndQ() {
        // Property: whatever p and the family, the sentence prints p to two significant digits and q to four.
        java.util.SplittableRandom r = new java.util.SplittableRandom(7);
        List<Comparison> cs = new ArrayList<>();
        for (int i = 0; i < 200; i++) {
            cs.add(meanShift("v" + i, Math.max(1e-6, r.nextDouble())));
        }
        List<Finding> f = Judge.judge(cs, ALPHA, FdrMethod.BENJAMINI_HOCHBERG);
        for (Finding x : f) {
            String p = x.pValue() < 0.001 ? "p < 0.001"
                    : "p = " + String.format(java.util.Locale.ROOT, "%.2g", x.pValue());
            assertTrue(x.sentence().contains(p + ": "), x.sentence());
            assertTrue(x.sentence().contains("over the 200 tests of this run, "), x.sentence());
        }
    }

    @Test
    void aShareMadeUncertainBecauseItsTwoIntervalsDisagreeAboutNoChangeSaysSoWithBothIntervals() {
        // 2/14 -> 17/39 (VerdictRuleTest): p = 0.0498 below alpha, h 0.63 beyond 0.2, but Newcombe's interval of
        // the difference, -0.06 to +47.8 points, includes no change while h's interval does not.
        Comparison c = new VariableComparator(0.95).proportion("v", FindingKind.SHIFT, "answering 'yes'", 2, 14, 17,
                39, null);
        Finding f = judgedAlone(c);
        String s = f.sentence();
        assertEquals(Verdict.UNCERTAIN, f.verdict());
        assertTrue(f.qValue() < ALPHA);
        Matcher m = Pattern.compile("but its interval \\((-?[0-9.]+) to (-?[0-9.]+)\\) excludes no change while the"
                + " interval of the difference in points \\(([-+][0-9.]+) to ([-+][0-9.]+)\\) includes it; the two"
                + " intervals disagree on whether the share changed at all, so the change is called neither MATERIAL"
                + " nor STABLE: UNCERTAIN\\.$").matcher(s);
        assertTrue(m.find(), s);
        double hLow = Double.parseDouble(m.group(1));
        double hHigh = Double.parseDouble(m.group(2));
        double dLow = Double.parseDouble(m.group(3));
        double dHigh = Double.parseDouble(m.group(4));
        assertTrue(hLow > 0 && hHigh > hLow, "the printed h interval excludes 0: " + s);
        assertTrue(dLow < 0 && dHigh > 0, "the printed difference interval includes 0: " + s);
        assertEquals(c.effect().ciLow(), hLow, 0.0005);
        assertEquals(c.change().ciLow() * 100, dLow, 0.05);
        assertEquals(c.change().ciHigh() * 100, dHigh, 0.05);
        assertFalse(s.contains("cannot tell it from chance"), s);
        assertFalse(s.contains("also holds changes smaller"), s);
    }

    @Test
    void aShareWhoseHIntervalIsQuietButWhoseDifferenceExcludesNoChangeSaysWhyItIsNotStable() {
        // Constructed case (the numbers need no outside reference: only the wording is under test): h's interval
        // lies inside 0.2 and includes 0, the difference's interval, +0.04 to +5.0 points, excludes it.
        EffectSize h = new EffectSize("Cohen's h", 0.05, -0.01, 0.15, 0.95);
        EffectSize rd = new EffectSize("risk difference", 0.02, 0.0004, 0.05, 0.95);
        Comparison c = new Comparison("v", FindingKind.SHIFT, new TestResult("two-proportion z", 1.2, Double.NaN, 0.2),
                h, 0.2, "default", 300, 300, new Change("share answering 'yes'", 0.30, 0.32, true, null, 0.02, 0.0004,
                0.05, ""), new VariableComparator.ProportionDetail("yes", 0.30, 0.32, rd, h, "", null));
        Finding f = judgedAlone(c);
        assertEquals(Verdict.UNCERTAIN, f.verdict());
        assertTrue(f.sentence().endsWith(", but its interval (-0.010 to 0.150) includes no change while the interval"
                + " of the difference in points (+0.04 to +5.0) excludes it; the two intervals disagree on whether the"
                + " share changed at all, so the change is called neither MATERIAL nor STABLE: UNCERTAIN."),
                f.sentence());
        assertFalse(f.sentence().contains("rules out"), f.sentence());
    }

    @Test
    void aDetectableChangeJustAboveTheThresholdIsPrintedWithTheDigitsThatShowIt() {
        Finding f = judgedAlone(comparison("fee", 0.9, new EffectSize("Hedges' g", 0, -0.2004, 0.2004, 0.95), 0.2,
                new Change("mean fee", 1.0, 1.0, false, null, 0, -0.2004, 0.2004, "")));
        assertEquals(Verdict.UNCERTAIN, f.verdict());
        assertTrue(f.sentence().startsWith("Too few answers to judge: with "), f.sentence());
        assertTrue(f.sentence().contains("can only show changes of at least 0.2004 (Hedges' g); the threshold 0.200"
                + " cannot be resolved at this sample size. Mean fee stayed at"), f.sentence());
    }

    @Test
    void aResolvableUncertainChangeSaysNothingAboutTooFewAnswers() {
        // Half-width 0.15 fits inside the band of 0.2, but this interval reaches beyond it: more data would settle it.
        Finding f = judgedAlone(comparison("fee", 0.4, new EffectSize("Hedges' g", 0.1, -0.05, 0.25, 0.95), 0.2,
                new Change("mean fee", 1.0, 1.1, false, null, 0.1, -0.05, 0.25, "")));
        assertEquals(Verdict.UNCERTAIN, f.verdict());
        assertTrue(f.effect().resolvable());
        assertTrue(f.sentence().startsWith("Mean fee rose"), f.sentence());
    }
}
