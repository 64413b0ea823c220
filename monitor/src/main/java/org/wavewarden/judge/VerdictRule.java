package org.wavewarden.judge;

import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.compare.WeightedComparator;

/**
 * The verdict rule: q-value against alpha, |effect| against the threshold T, and the confidence interval against
 * (-T, T). The equivalence reading of the interval follows the two one-sided tests logic (Schuirmann 1987): an
 * interval inside (-T, T) rules out every change of size T or more.
 *
 * <p>A share's change is judged on Cohen's h but shown to the reader as a difference of shares in points. The two
 * intervals come from different constructions and can, at the border of significance, disagree on whether no
 * change at all is plausible. The rule then calls the change neither MATERIAL nor STABLE, since either word would
 * contradict one of the two intervals the finding states: it is UNCERTAIN.
 */
public final class VerdictRule {

    private VerdictRule() {
    }

    /** The verdict of one comparison, with the guard above for the shares it shows in points. */
    public static Verdict judge(double qValue, Comparison c, double alpha) {
        return judge(qValue, c.effect(), c.threshold(), alpha, shownShareDifference(c));
    }

    public static Verdict judge(double qValue, EffectSize effect, double threshold, double alpha) {
        return judge(qValue, effect, threshold, alpha, null);
    }

    /**
     * @param shown the same change on the scale the sentence shows it (the difference of shares, when the verdict
     *              is judged on Cohen's h), or null when the effect is itself what the sentence shows
     */
    public static Verdict judge(double qValue, EffectSize effect, double threshold, double alpha, EffectSize shown) {
        if (!(threshold > 0)) {
            throw new IllegalArgumentException("threshold must be positive, was " + threshold);
        }
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must lie in (0, 1), was " + alpha);
        }
        if (Double.isNaN(qValue)) {
            throw new IllegalArgumentException("qValue is NaN for " + effect.name());
        }
        Verdict v;
        if (qValue < alpha) {
            v = Math.abs(effect.estimate()) >= threshold ? Verdict.MATERIAL : Verdict.MINOR;
        } else {
            v = effect.intervalWithin(threshold) ? Verdict.STABLE : Verdict.UNCERTAIN;
        }
        return overruled(v, effect, shown) ? Verdict.UNCERTAIN : v;
    }

    /**
     * Whether the comparison is UNCERTAIN only because its effect's interval and the interval of the share
     * difference its sentence shows disagree on whether there was any change, so that the sentence can say so.
     */
    public static boolean overruledByShownInterval(double qValue, Comparison c, double alpha) {
        return overruled(judge(qValue, c.effect(), c.threshold(), alpha, null), c.effect(), shownShareDifference(c));
    }

    private static boolean overruled(Verdict v, EffectSize effect, EffectSize shown) {
        return shown != null && (v == Verdict.MATERIAL || v == Verdict.STABLE)
                && includesZero(effect) != includesZero(shown);
    }

    static boolean includesZero(EffectSize e) {
        return e.ciLow() <= 0 && e.ciHigh() >= 0;
    }

    /** The difference of shares a share's finding shows, when its verdict is judged on another scale. */
    static EffectSize shownShareDifference(Comparison c) {
        EffectSize shown = c.detail() instanceof VariableComparator.ProportionDetail d ? d.riskDifference()
                : c.detail() instanceof WeightedComparator.ProportionDetail w ? w.shareDifference() : null;
        return shown == null || shown.equals(c.effect()) ? null : shown;
    }
}
