package org.wavewarden.judge;

import org.wavewarden.compare.Comparison;
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
 */
public final class Judge {

    private Judge() {
    }

    public static List<Finding> judge(List<Comparison> comparisons, double alpha, FdrMethod method) {
        double[] p = comparisons.stream().mapToDouble(c -> c.test().pValue()).toArray();
        double[] q = p.length == 0 ? p : method == FdrMethod.BENJAMINI_YEKUTIELI ? BenjaminiYekutieli.adjust(p)
                : BenjaminiHochberg.adjust(p);
        List<Finding> out = new ArrayList<>(comparisons.size());
        for (int i = 0; i < comparisons.size(); i++) {
            Comparison c = comparisons.get(i);
            Verdict v = VerdictRule.judge(q[i], c, alpha);
            Finding.Effect e = new Finding.Effect(c.effect().name(), c.effect().estimate(), c.effect().ciLow(),
                    c.effect().ciHigh(), c.threshold());
            double df = c.test().df();
            out.add(new Finding(c.variable(), c.kind(), c.test().test(), c.test().statistic(), c.test().pValue(), q[i],
                    e, v, c.kind() == FindingKind.REFERENCE ? null : c.nBaseline(), c.nCurrent(),
                    Sentences.shift(c, q[i], v, alpha, comparisons.size()), c.detail(), Double.isNaN(df) ? null : df,
                    Double.isNaN(df) ? null : c.test().dfConvention(), p.length, method.name()));
        }
        return out;
    }
}
