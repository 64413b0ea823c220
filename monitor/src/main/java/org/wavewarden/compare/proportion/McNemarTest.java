package org.wavewarden.compare.proportion;

import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.TestResult;

/**
 * McNemar's (1947, Psychometrika 12) test that a binary answer has the same marginal proportion at two waves when
 * the same respondents answered both (Agresti 2007, section 8.1). Only the discordant pairs carry information:
 * with b = yes then no and c = no then yes, X2 = (|c - b| - k)^2 / (b + c) on 1 degree of freedom, where k = 1 with
 * the continuity correction and 0 without (R's {@code mcnemar.test}, which applies k even when |c - b| < 1).
 *
 * <p>When no pair is discordant there is no evidence of change: X2 = 0 and p = 1.
 */
public final class McNemarTest {

    static final String NAME = "McNemar";
    static final String NAME_CORRECTED = "McNemar, continuity corrected";

    private McNemarTest() {
    }

    /**
     * @param bothYes              yes at the baseline and at the current wave
     * @param yesNo                yes at the baseline, no at the current wave
     * @param noYes                no at the baseline, yes at the current wave
     * @param bothNo               no at both waves
     * @param continuityCorrection subtract 1 from |c - b| before squaring
     */
    public static TestResult test(long bothYes, long yesNo, long noYes, long bothNo, boolean continuityCorrection) {
        check(bothYes, yesNo, noYes, bothNo);
        String name = continuityCorrection ? NAME_CORRECTED : NAME;
        long discordant = yesNo + noYes;
        if (discordant == 0) {
            return new TestResult(name, 0, 1, 1, "1");
        }
        double k = continuityCorrection ? 1 : 0;
        double diff = Math.abs(noYes - yesNo) - k;
        double x2 = diff * diff / discordant;
        return new TestResult(name, x2, 1, StandardNormal.twoSidedP(Math.sqrt(x2)), "1");
    }

    /**
     * The signed statistic z = (c - b) / sqrt(b + c) without continuity correction; positive when the share
     * answering yes rose from the baseline to the current wave. 0 when no pair is discordant.
     */
    public static double signedZ(long bothYes, long yesNo, long noYes, long bothNo) {
        check(bothYes, yesNo, noYes, bothNo);
        long discordant = yesNo + noYes;
        return discordant == 0 ? 0 : (noYes - yesNo) / Math.sqrt(discordant);
    }

    private static void check(long bothYes, long yesNo, long noYes, long bothNo) {
        long[] v = {bothYes, yesNo, noYes, bothNo};
        String[] names = {"bothYes", "yesNo", "noYes", "bothNo"};
        for (int i = 0; i < v.length; i++) {
            if (v[i] < 0) {
                throw new IllegalArgumentException(names[i] + " must not be negative, was " + v[i]);
            }
        }
    }
}
