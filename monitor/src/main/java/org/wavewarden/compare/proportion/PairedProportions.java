package org.wavewarden.compare.proportion;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;

/**
 * Effect sizes for a binary answer given by the same respondents at two waves, from the paired 2 x 2 table
 * (a = yes at both, b = yes then no, c = no then yes, d = no at both; n = a + b + c + d). The baseline share is
 * {@code (a + b) / n}, the current share {@code (a + c) / n}; every effect is current minus baseline.
 */
public final class PairedProportions {

    static final String RISK_DIFFERENCE = "paired share difference";

    private PairedProportions() {
    }

    /**
     * The difference of the two shares, {@code (c - b) / n}, with Newcombe's hybrid score interval for paired data
     * (Newcombe, R. G. (1998), "Improved confidence intervals for the difference between binomial proportions based
     * on paired data", Statistics in Medicine 17, 2635-2650, method 10): the Wilson limits of each share are
     * combined as in the independent case, with the correlation of the two shares estimated by
     * <pre>
     *   phi = (A - n/2) / sqrt(m)  if A &gt; n/2;   0  if 0 &lt;= A &lt;= n/2;   A / sqrt(m)  if A &lt; 0,
     * </pre>
     * {@code A = ad - bc}, m the product of the four margins (phi = 0 when a margin is 0), so that
     * {@code L = D - sqrt((pC - lC)^2 - 2 phi (pC - lC)(uB - pB) + (uB - pB)^2)} and
     * {@code U = D + sqrt((uC - pC)^2 - 2 phi (uC - pC)(pB - lB) + (pB - lB)^2)}. Newcombe found its coverage
     * close to nominal where the Wald interval's is not (few discordant pairs, shares near 0 or 1).
     */
    public static EffectSize riskDifference(long bothYes, long yesNo, long noYes, long bothNo, double confidence) {
        long n = total(bothYes, yesNo, noYes, bothNo);
        Checks.confidence(confidence);
        long yesB = bothYes + yesNo;
        long yesC = bothYes + noYes;
        double pB = (double) yesB / n;
        double pC = (double) yesC / n;
        WilsonInterval wB = WilsonInterval.of(yesB, n, confidence);
        WilsonInterval wC = WilsonInterval.of(yesC, n, confidence);
        double phi = 0;
        long noB = noYes + bothNo;
        long noC = yesNo + bothNo;
        if (yesB > 0 && noB > 0 && yesC > 0 && noC > 0) {
            double a = (double) bothYes * bothNo - (double) yesNo * noYes;
            double root = Math.sqrt((double) yesB * noB * yesC * noC);
            phi = a > n / 2.0 ? (a - n / 2.0) / root : a >= 0 ? 0 : a / root;
        }
        double diff = (double) (noYes - yesNo) / n;
        double dl = pC - wC.lower();
        double du = wB.upper() - pB;
        double el = wC.upper() - pC;
        double eu = pB - wB.lower();
        double low = diff - Math.sqrt(Math.max(0, dl * dl - 2 * phi * dl * du + du * du));
        double high = diff + Math.sqrt(Math.max(0, el * el - 2 * phi * el * eu + eu * eu));
        return new EffectSize(RISK_DIFFERENCE, diff, Math.max(-1, low), Math.min(1, high), confidence);
    }

    /**
     * Cohen's h of the two shares, {@code 2 asin(sqrt(pC)) - 2 asin(sqrt(pB))} (Cohen 1988, chapter 6), with an
     * interval whose variance accounts for the pairing. By the delta method each transformed share has variance
     * close to 1/n whatever its value (Cohen 1988, section 6.2), and their covariance is {@code phi / n}, phi the
     * correlation of the two answers across respondents (the phi coefficient of the paired table,
     * {@code (ad - bc) / sqrt(m)}), so {@code Var(h) = 2 (1 - phi) / n} and the interval is
     * {@code h +- z sqrt(2 (1 - phi) / n)}. When a share is 0 or 1 phi is undefined and taken as 0, which gives
     * the Wald interval {@code h +- z sqrt(2 / n)} of two independent samples of n (the independent samples'
     * {@link CohensH} takes the score-based MOVER interval instead).
     */
    public static EffectSize cohensH(long bothYes, long yesNo, long noYes, long bothNo, double confidence) {
        long n = total(bothYes, yesNo, noYes, bothNo);
        Checks.confidence(confidence);
        long yesB = bothYes + yesNo;
        long yesC = bothYes + noYes;
        long noB = noYes + bothNo;
        long noC = yesNo + bothNo;
        double phi = yesB > 0 && noB > 0 && yesC > 0 && noC > 0
                ? ((double) bothYes * bothNo - (double) yesNo * noYes) / Math.sqrt((double) yesB * noB * yesC * noC)
                : 0;
        double h = 2 * Math.asin(Math.sqrt((double) yesC / n)) - 2 * Math.asin(Math.sqrt((double) yesB / n));
        double half = StandardNormal.twoSidedQuantile(confidence) * Math.sqrt(Math.max(0, 2 * (1 - phi)) / n);
        return new EffectSize(CohensH.NAME, h, h - half, h + half, confidence);
    }

    private static long total(long bothYes, long yesNo, long noYes, long bothNo) {
        long[] v = {bothYes, yesNo, noYes, bothNo};
        String[] names = {"bothYes", "yesNo", "noYes", "bothNo"};
        for (int i = 0; i < v.length; i++) {
            if (v[i] < 0) {
                throw new IllegalArgumentException(names[i] + " must not be negative, was " + v[i]);
            }
        }
        long n = bothYes + yesNo + noYes + bothNo;
        if (n == 0) {
            throw new IllegalArgumentException("the paired table holds no pairs");
        }
        return n;
    }
}
