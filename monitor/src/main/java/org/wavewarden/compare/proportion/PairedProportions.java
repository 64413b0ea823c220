package org.wavewarden.compare.proportion;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;

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
     * Cohen's h of the two shares, {@code g(pC) - g(pB)} with {@code g(p) = 2 asin(sqrt(p))} (Cohen 1988, chapter 6),
     * with Newcombe's interval of the difference ({@link #riskDifference}) carried onto the h scale: with the mean
     * share {@code m = (pB + pC) / 2} held at its estimate, {@code h(D) = g(m + D/2 + s) - g(m - D/2 + s)}, s the
     * least shift that keeps both shares in [0, 1] (so that their difference stays D). h(D) is increasing in D,
     * equals h at the observed D and 0 at D = 0, so its limits are h(L) and h(U), and h's interval includes no
     * change exactly when the difference's interval, which the sentence prints beside h, does. To first order
     * h = g'(m) D; the error of m enters only at the order of D times that error. Measured by simulation (R 4.2.2,
     * 2,000 tables per case from a multinomial, n = 30 and 100, six cell-probability settings including a share
     * of exactly 0 and heavy correlation; the test resource proportion/paired-cohens-h-coverage.R) the 95% interval
     * covered the true h in 95.3% to 100% of tables, each time at least as often as Newcombe's covered the true
     * difference, within 0.5 points.
     *
     * <p>The Wald interval {@code h +- z sqrt(2 (1 - phi) / n)} excluded 0 at 4 pairs moving away and none towards
     * (4/31 to 0/31) while Newcombe's interval included it; a MOVER interval of the Wilson limits on the arcsine
     * scale (what {@link CohensH} uses for independent waves) still did there (upper limit -0.003).
     */
    public static EffectSize cohensH(long bothYes, long yesNo, long noYes, long bothNo, double confidence) {
        EffectSize d = riskDifference(bothYes, yesNo, noYes, bothNo, confidence);
        long n = bothYes + yesNo + noYes + bothNo;
        double pB = (double) (bothYes + yesNo) / n;
        double pC = (double) (bothYes + noYes) / n;
        double m = (pB + pC) / 2;
        double h = CohensH.transform(pC) - CohensH.transform(pB);
        return new EffectSize(CohensH.NAME, h, hAt(m, d.ciLow()), hAt(m, d.ciHigh()), confidence);
    }

    private static double hAt(double meanShare, double difference) {
        double current = meanShare + difference / 2;
        double baseline = meanShare - difference / 2;
        double low = Math.min(current, baseline);
        double high = Math.max(current, baseline);
        double shift = low < 0 ? -low : high > 1 ? 1 - high : 0;
        // rounding of m +- D/2 must not take a share a hair outside [0, 1], where asin(sqrt(p)) is NaN
        return CohensH.transform(clamp(current + shift)) - CohensH.transform(clamp(baseline + shift));
    }

    private static double clamp(double p) {
        return Math.min(1, Math.max(0, p));
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
