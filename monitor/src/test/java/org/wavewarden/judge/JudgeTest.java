package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.WardenConfig.FdrMethod;
import org.wavewarden.profile.NumericDistribution;

import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

/**
 * A q-value cannot be checked without the family it was adjusted in: every judged finding carries the family's size
 * and method, and its test's df with their convention, so that a reader can recompute both the p- and the q-value.
 */
class JudgeTest {

    private static final double[] B = {10.1, 11.3, 9.8, 10.7, 12.0, 10.4, 11.1, 9.5, 10.9, 11.6};
    private static final double[] C = {11.2, 12.4, 10.9, 11.8, 12.9, 11.5, 12.2, 10.6, 13.1, 11.9};

    private static List<Comparison> three() {
        VariableComparator v = new VariableComparator(0.95);
        List<Comparison> out = new ArrayList<>();
        out.add(v.numeric("score", false, NumericDistribution.ofSample(B), NumericDistribution.ofSample(C), null,
                null));
        out.add(v.proportion("smoker", FindingKind.SHIFT, "answering 'yes'", 40, 200, 62, 210, null));
        out.add(v.referenceMean("score", NumericDistribution.ofSample(C), 11.0, null, null));
        return out;
    }

    @Test
    void everyFindingStatesTheSizeAndMethodOfItsFalseDiscoveryFamily() {
        List<Finding> f = Judge.judge(three(), 0.05, FdrMethod.BENJAMINI_HOCHBERG);
        for (Finding x : f) {
            assertEquals(3, x.fdrFamilySize(), x.variable());
            assertEquals("BENJAMINI_HOCHBERG", x.fdrMethod());
        }
        List<Finding> two = Judge.judge(three().subList(0, 2), 0.05, FdrMethod.BENJAMINI_YEKUTIELI);
        assertEquals(2, two.get(0).fdrFamilySize());
        assertEquals("BENJAMINI_YEKUTIELI", two.get(1).fdrMethod());
    }

    @Test
    void aReaderRecomputesEachQValueFromThePValuesAndTheStatedFamilySize() {
        // Benjamini and Hochberg (1995): q_(i) = min over j >= i of p_(j) m / j, the p-values sorted ascending
        List<Finding> f = Judge.judge(three(), 0.05, FdrMethod.BENJAMINI_HOCHBERG);
        int m = f.get(0).fdrFamilySize();
        for (Finding x : f) {
            double q = 1;
            for (Finding y : f) {
                if (y.pValue() >= x.pValue()) {
                    long rank = f.stream().filter(z -> z.pValue() <= y.pValue()).count();
                    q = Math.min(q, y.pValue() * m / rank);
                }
            }
            assertEquals(q, x.qValue(), 1e-15, x.variable() + " " + x.kind());
        }
    }

    @Test
    void aTFindingCarriesItsDfAndConventionAndAZTestNone() {
        List<Comparison> c = three();
        List<Finding> f = Judge.judge(c, 0.05, FdrMethod.BENJAMINI_HOCHBERG);
        assertEquals(c.get(0).test().df(), f.get(0).df());
        assertEquals(TestResult.DF_WELCH, f.get(0).dfConvention());
        assertNull(f.get(1).df(), "the two-proportion z-test has no df");
        assertNull(f.get(1).dfConvention());
        assertEquals(C.length - 1, f.get(2).df());
        assertEquals(TestResult.DF_ONE_SAMPLE, f.get(2).dfConvention());
    }

    @Test
    void aDataQualityFindingBelongsToNoFamily() {
        Finding d = Finding.dataQuality("x", FindingKind.CONSTANT, 3L, 4L, "Every valid answer is 1.", null);
        assertNull(d.fdrFamilySize());
        assertNull(d.df());
    }
}
