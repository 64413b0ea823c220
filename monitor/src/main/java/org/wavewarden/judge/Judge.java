package org.wavewarden.judge;

import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.ExactDetail;
import org.wavewarden.config.Population;
import org.wavewarden.config.WardenConfig.FdrMethod;
import org.wavewarden.judge.multiplicity.BenjaminiHochberg;
import org.wavewarden.judge.multiplicity.BenjaminiYekutieli;

import java.util.ArrayList;
import java.util.List;

/**
 * Turns comparisons into findings: adjusts every p-value of the run for the false discovery rate
 * (Benjamini-Hochberg 1995, or Benjamini-Yekutieli 2001 for arbitrary dependence), applies the verdict rule to
 * the q-value and the effect's interval, and writes the sentence. Each finding carries the size of the family its
 * q-value was adjusted in and the method, since a q-value cannot be checked without them.
 *
 * <p>An UNCERTAIN finding whose interval is too wide to ever fit inside the threshold's band
 * ({@link Finding.Effect#resolvable()}) says so: more waves like these cannot settle it, only more answers.
 *
 * <p>A complete enumeration (a census or a full register) observed every unit, so there is no population beyond the
 * data for a test to answer a question about: each change is judged by its size against the threshold alone, with no
 * p-value, q-value, interval or false-discovery-rate family ({@link #bySize}).
 */
public final class Judge {

    private Judge() {
    }

    public static List<Finding> judge(List<Comparison> comparisons, double alpha, FdrMethod method) {
        return judge(comparisons, alpha, method, Population.SAMPLE);
    }

    /**
     * The findings of a run over a dataset that observes {@code population}: tested for a sample, judged by size for
     * a census or a full register.
     */
    public static List<Finding> judge(List<Comparison> comparisons, double alpha, FdrMethod method,
                                      Population population) {
        if (population != null && population.complete()) {
            return comparisons.stream().map(c -> bySize(c, population)).toList();
        }
        double[] p = comparisons.stream().mapToDouble(c -> c.test().pValue()).toArray();
        double[] q = p.length == 0 ? p : method == FdrMethod.BENJAMINI_YEKUTIELI ? BenjaminiYekutieli.adjust(p)
                : BenjaminiHochberg.adjust(p);
        List<Finding> out = new ArrayList<>(comparisons.size());
        for (int i = 0; i < comparisons.size(); i++) {
            Comparison c = comparisons.get(i);
            Verdict v = VerdictRule.judge(q[i], c, alpha);
            Finding.Effect e = new Finding.Effect(c.effect().name(), c.effect().estimate(), c.effect().ciLow(),
                    c.effect().ciHigh(), c.threshold());
            String sentence = Sentences.shift(c, q[i], v, alpha, comparisons.size());
            if (v == Verdict.UNCERTAIN && !e.resolvable()) {
                // First, so that the reader meets the reason before the numbers, and the verdict stays the last word.
                sentence = Sentences.tooFewAnswers(c, e) + " " + sentence;
            }
            double df = c.test().df();
            out.add(new Finding(c.variable(), c.kind(), c.test().test(), c.test().statistic(), c.test().pValue(), q[i],
                    e, v, c.kind() == FindingKind.REFERENCE ? null : c.nBaseline(), c.nCurrent(),
                    sentence, c.detail(), Double.isNaN(df) ? null : df,
                    Double.isNaN(df) ? null : c.test().dfConvention(), p.length, method.name()));
        }
        return out;
    }

    /**
     * One comparison of a complete enumeration, judged by the size of its change: MATERIAL when |estimate| reaches
     * the threshold T, MINOR when it is above 0 but below T, STABLE when it is 0 (common practice, no source: with
     * every unit observed the change is the population's own, so only its size is left to judge). The interval
     * collapses to the estimate (a complete count has no sampling error), so nothing is below detection; so does every
     * interval of the detail ({@link ExactDetail}), which is what the digest plots.
     */
    static Finding bySize(Comparison c, Population population) {
        double estimate = c.effect().estimate();
        Verdict v = Math.abs(estimate) >= c.threshold() ? Verdict.MATERIAL
                : estimate != 0 ? Verdict.MINOR : Verdict.STABLE;
        Finding.Effect e = new Finding.Effect(c.effect().name(), estimate, estimate, estimate, c.threshold());
        return new Finding(c.variable(), c.kind(), null, null, null, null, e, v,
                c.kind() == FindingKind.REFERENCE ? null : c.nBaseline(), c.nCurrent(),
                Sentences.bySize(c, v, population), ExactDetail.of(c.detail()), null, null, null, null);
    }
}
