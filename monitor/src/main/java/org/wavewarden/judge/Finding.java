package org.wavewarden.judge;

import com.fasterxml.jackson.annotation.JsonInclude;

/**
 * One row of {@code findings.json} and of the results table. Field names are the output contract.
 *
 * @param variable      source column
 * @param label         the variable's label ("Tenure of the home") from its YAML or codebook, or null when it has none
 * @param kind          SHIFT or a data-quality kind
 * @param test          the primary test, when there is one
 * @param statistic     its statistic
 * @param pValue        its p-value
 * @param qValue        the p-value adjusted for the false discovery rate across the run
 * @param effect        the primary effect with its interval and threshold
 * @param verdict       for SHIFT, PANEL_SHIFT and MISSING_RATE_CHANGE
 * @param nBaseline     valid observations in the baseline wave
 * @param nCurrent      valid observations in the current wave
 * @param sentence      one plain sentence for a reader who is not a statistician
 * @param detail        kind-specific detail (per-category residuals, per-code counts, ...)
 * @param df            the primary test's degrees of freedom, or null where it has none
 * @param dfConvention  how {@code df} was obtained (e.g. "Welch-Satterthwaite"), so the p-value can be reproduced
 * @param fdrFamilySize how many p-values the false-discovery-rate control adjusted together to give {@code qValue}
 * @param fdrMethod     the adjustment that gave {@code qValue}, e.g. BENJAMINI_HOCHBERG
 * @param repeat        null for a finding that is news; otherwise why a finding worth a person raised no new alert
 *                      (it says what the previous wave's finding said)
 * @param against       the baseline this finding used, when the dataset judges several alongside each other (for
 *                      example "2024-Q1, the same wave 4 waves back"); null when the run has one baseline, named in
 *                      the run's {@code againstWave}
 * @param breakdowns    where the change happened: the variable's breakdown by each configured domain column; empty
 *                      when none was made
 */
@JsonInclude(JsonInclude.Include.ALWAYS)
public record Finding(String variable, String label, FindingKind kind, String test, Double statistic, Double pValue,
                      Double qValue, Effect effect, Verdict verdict, Long nBaseline, Long nCurrent, String sentence,
                      Object detail, Double df, String dfConvention, Integer fdrFamilySize, String fdrMethod,
                      Repeat repeat, String against, java.util.List<org.wavewarden.compare.domain.Breakdown> breakdowns) {

    public Finding {
        breakdowns = breakdowns == null ? java.util.List.of() : java.util.List.copyOf(breakdowns);
    }

    /** A finding with its repeat, made against the run's one baseline and not broken down. */
    public Finding(String variable, String label, FindingKind kind, String test, Double statistic, Double pValue,
                   Double qValue, Effect effect, Verdict verdict, Long nBaseline, Long nCurrent, String sentence,
                   Object detail, Double df, String dfConvention, Integer fdrFamilySize, String fdrMethod,
                   Repeat repeat) {
        this(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline, nCurrent, sentence,
                detail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, null, null);
    }

    /** An effect size as reported: estimate, interval and the threshold T it was judged against. */
    public record Effect(String name, double estimate, double ciLow, double ciHigh, double threshold) {

        /**
         * The smallest change these two waves could show at alpha, in the effect's units: how narrow the effect's
         * (1 - alpha) interval is, read against the band the verdict rule calls STABLE.
         *
         * <ul>
         *   <li>A signed effect (Hedges' g, Cohen's d and h, risk and share differences in points, raw and
         *   design-based mean differences, Cliff's delta, the difference of Spearman correlations): half the
         *   interval's width. STABLE needs the interval inside (-T, T), which an interval of width 2T or more can
         *   never be. Each of these intervals is close to symmetric around an estimate near zero, and an
         *   UNCERTAIN estimate is near zero relative to its interval, so the half-width there is z times the
         *   standard error under no change: the change a test at alpha detects half the time (its significance
         *   boundary), which R's power.prop.test and power.t.test give at power 0.5.</li>
         *   <li>A measure that cannot be negative (Cramér's V, Cohen's w, the KS distance): the whole width. Its
         *   interval is [low, high] with low at least 0, STABLE needs it inside [0, T), and with no change the
         *   interval starts at 0, so its upper end is the smallest value it could rule out: half of it would
         *   promise twice the resolution the verdict rule can use.</li>
         * </ul>
         * A complete enumeration has no sampling interval (low = high = estimate), so every change is detectable: 0.
         */
        @com.fasterxml.jackson.annotation.JsonProperty("minimumDetectable")
        public double minimumDetectable() {
            return nonNegative(name) ? ciHigh - ciLow : (ciHigh - ciLow) / 2;
        }

        /**
         * Whether the samples can resolve the threshold at all: when the interval is too wide to fit inside the band
         * the verdict rule calls STABLE, no estimate could be shown STABLE, so a quiet UNCERTAIN verdict says only
         * that there are too few answers.
         */
        @com.fasterxml.jackson.annotation.JsonProperty("resolvable")
        public boolean resolvable() {
            return minimumDetectable() < threshold;
        }

        /** Effects measured from 0 up (a distance or an association strength), whose interval never goes below 0. */
        static boolean nonNegative(String effectName) {
            return effectName.startsWith("Cramér's V") || effectName.startsWith("Cohen's w")
                    || effectName.startsWith("KS distance");
        }
    }

    /**
     * Why a finding worth a person raised no new alert: the previous wave's finding of the same variable and kind
     * said the same thing.
     *
     * @param kind          what was repeated
     * @param previousWave  the wave whose finding this one repeats
     * @param firstWave     the first wave of the unbroken run of repeats (the wave that alerted)
     */
    public record Repeat(Kind kind, String previousWave, String firstWave) {

        public enum Kind {
            /** A data-quality finding unchanged from the previous wave: same kind, rate within its interval. */
            STILL_PRESENT,
            /** Still too few answers to resolve the threshold, and the verdict has not changed. */
            STILL_UNRESOLVABLE
        }
    }

    /** A finding that is news (no repeat). */
    public Finding(String variable, String label, FindingKind kind, String test, Double statistic, Double pValue,
                   Double qValue, Effect effect, Verdict verdict, Long nBaseline, Long nCurrent, String sentence,
                   Object detail, Double df, String dfConvention, Integer fdrFamilySize, String fdrMethod) {
        this(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline, nCurrent, sentence,
                detail, df, dfConvention, fdrFamilySize, fdrMethod, null);
    }

    /** A finding without a variable label. */
    public Finding(String variable, FindingKind kind, String test, Double statistic, Double pValue, Double qValue,
                   Effect effect, Verdict verdict, Long nBaseline, Long nCurrent, String sentence, Object detail,
                   Double df, String dfConvention, Integer fdrFamilySize, String fdrMethod) {
        this(variable, null, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline, nCurrent, sentence,
                detail, df, dfConvention, fdrFamilySize, fdrMethod);
    }

    /** A finding outside any false-discovery-rate family: no df, q or family of its own. */
    public Finding(String variable, FindingKind kind, String test, Double statistic, Double pValue, Double qValue,
                   Effect effect, Verdict verdict, Long nBaseline, Long nCurrent, String sentence, Object detail) {
        this(variable, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline, nCurrent, sentence, detail,
                null, null, null, null);
    }

    /** A data-quality finding with no test of its own. */
    public static Finding dataQuality(String variable, FindingKind kind, Long nBaseline, Long nCurrent,
                                      String sentence, Object detail) {
        return new Finding(variable, kind, null, null, null, null, null, null, nBaseline, nCurrent, sentence, detail);
    }

    /** The same finding with another sentence; every other field, the test's df and family included, is kept. */
    public Finding withSentence(String newSentence) {
        return new Finding(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline,
                nCurrent, newSentence, detail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, against, breakdowns);
    }

    /** The same finding with another detail; every other field is kept. */
    public Finding withDetail(Object newDetail) {
        return new Finding(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline,
                nCurrent, sentence, newDetail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, against, breakdowns);
    }

    /** The same finding with the variable's label (null: none); every other field is kept. */
    public Finding withLabel(String variableLabel) {
        return new Finding(variable, variableLabel, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline,
                nCurrent, sentence, detail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, against, breakdowns);
    }

    /** The same finding marked as a repeat of the previous wave's (null: news); every other field is kept. */
    public Finding withRepeat(Repeat newRepeat) {
        return new Finding(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline,
                nCurrent, sentence, detail, df, dfConvention, fdrFamilySize, fdrMethod, newRepeat, against, breakdowns);
    }

    /** The same finding with another verdict (for example CLEARED); every other field is kept. */
    public Finding withVerdict(Verdict newVerdict) {
        return new Finding(variable, label, kind, test, statistic, pValue, qValue, effect, newVerdict, nBaseline,
                nCurrent, sentence, detail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, against, breakdowns);
    }

    /** The same finding naming the baseline it used (null: the run's one baseline); every other field is kept. */
    public Finding withAgainst(String baseline) {
        return new Finding(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline,
                nCurrent, sentence, detail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, baseline, breakdowns);
    }

    /** The same finding with its breakdowns; every other field is kept. */
    public Finding withBreakdowns(java.util.List<org.wavewarden.compare.domain.Breakdown> newBreakdowns) {
        return new Finding(variable, label, kind, test, statistic, pValue, qValue, effect, verdict, nBaseline,
                nCurrent, sentence, detail, df, dfConvention, fdrFamilySize, fdrMethod, repeat, against, newBreakdowns);
    }

    /** Ranking for digests and alerts: verdict first, then size of the effect relative to its threshold. */
    public double urgency() {
        double v = verdict == null ? (kind.isDataQuality() ? 2.5 : 5) : verdict.ordinal();
        double size = effect == null || effect.threshold() <= 0 ? 0 : Math.abs(effect.estimate()) / effect.threshold();
        return v * 1000 - Math.min(size, 999);
    }
}
