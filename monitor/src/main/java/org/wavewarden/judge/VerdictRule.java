package org.wavewarden.judge;

import org.wavewarden.compare.EffectSize;

/**
 * The verdict rule: q-value against alpha, |effect| against the threshold T, and the confidence interval against
 * (-T, T). The equivalence reading of the interval follows the two one-sided tests logic (Schuirmann 1987): an
 * interval inside (-T, T) rules out every change of size T or more.
 */
public final class VerdictRule {

    private VerdictRule() {
    }

    public static Verdict judge(double qValue, EffectSize effect, double threshold, double alpha) {
        if (!(threshold > 0)) {
            throw new IllegalArgumentException("threshold must be positive, was " + threshold);
        }
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must lie in (0, 1), was " + alpha);
        }
        if (Double.isNaN(qValue)) {
            throw new IllegalArgumentException("qValue is NaN for " + effect.name());
        }
        if (qValue < alpha) {
            return Math.abs(effect.estimate()) >= threshold ? Verdict.MATERIAL : Verdict.MINOR;
        }
        return effect.intervalWithin(threshold) ? Verdict.STABLE : Verdict.UNCERTAIN;
    }
}
