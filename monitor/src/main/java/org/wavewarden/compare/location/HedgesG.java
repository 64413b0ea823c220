package org.wavewarden.compare.location;

import org.wavewarden.compare.Checks;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.StandardNormal;
import org.wavewarden.profile.NumericDistribution;

/**
 * Hedges' g: the standardised mean difference {@code (mean_current - mean_baseline) / s_pooled} times the
 * small-sample bias correction J, with a confidence interval.
 *
 * <p>The correction is the exact gamma form {@code J(m) = Gamma(m/2) / (sqrt(m/2) Gamma((m-1)/2))}, m = n1 + n2 - 2
 * (Hedges, L. V. (1981), "Distribution theory for Glass's estimator of effect size and related estimators", Journal
 * of Educational Statistics 6, 107-128, eq. 6e), not the approximation {@code 1 - 3/(4m - 1)}.
 *
 * <p>Interval, ordinary case: the pooled t statistic {@code t = d / sqrt(1/n1 + 1/n2)} follows a noncentral t on m
 * degrees of freedom with noncentrality {@code delta sqrt(n1 n2 / (n1 + n2))}. The limits for that noncentrality
 * are found by inverting {@link NoncentralT#cdf} (the values at which the observed t is the upper and lower
 * {@code (1 - confidence)/2} quantile), converted back to the d scale and multiplied by J. This is the
 * confidence-interval inversion of Steiger, J. H. and Fouladi, R. T. (1997), "Noncentrality interval estimation and
 * the evaluation of statistical models", in Harlow, Mulaik and Steiger (eds.), What If There Were No Significance
 * Tests?, the method R's MBESS ({@code ci.smd}) and effectsize packages are built on. The reference values in the
 * tests are base R's {@code pt(q, df, ncp)} inverted with {@code uniroot}, not those packages themselves.
 *
 * <p>Interval, large waves: when {@code n1 + n2 > 100000}, or when the inversion fails to bracket a root, the normal
 * approximation of Hedges, L. V. and Olkin, I. (1985), Statistical Methods for Meta-Analysis, Chapter 5, is used:
 * {@code g +- z SE} with {@code SE = sqrt((n1 + n2)/(n1 n2) + g^2 / (2 (n1 + n2)))}. At that size the two intervals
 * agree to well within the precision anyone reads them at, and the noncentral t series itself switches to a normal
 * approximation beyond df = 4e5.
 */
public final class HedgesG {

    public static final String NAME = "Hedges' g";
    /** Above this total sample size the Hedges-Olkin normal interval replaces the noncentral t inversion. */
    public static final long NORMAL_APPROXIMATION_ABOVE = 100_000;

    private HedgesG() {
    }

    /**
     * @param baseline   the earlier wave
     * @param current    the wave being judged; together with baseline at least 3 observations, each at least 1
     * @param confidence level of the interval, in (0, 1)
     * @throws IllegalArgumentException if a wave is empty, there are fewer than 3 observations in all, or the pooled
     *                                  standard deviation is zero
     */
    public static EffectSize estimate(NumericDistribution baseline, NumericDistribution current, double confidence) {
        Checks.observations(baseline, 1, "baseline");
        Checks.observations(current, 1, "current");
        Checks.confidence(confidence);
        long n1 = baseline.n();
        long n2 = current.n();
        double df = (double) n1 + n2 - 2;
        if (df < 1) {
            throw new IllegalArgumentException("baseline and current together need at least 3 observations, have "
                    + (n1 + n2));
        }
        double sp = Math.sqrt((PooledTTest.sumOfSquares(baseline) + PooledTTest.sumOfSquares(current)) / df);
        if (!(sp > 0)) {
            throw new IllegalArgumentException("pooled standard deviation of baseline and current is 0: "
                    + "a standardised difference is undefined");
        }
        double d = (current.mean() - baseline.mean()) / sp;
        double j = correction(df);
        double g = j * d;
        if (n1 + n2 <= NORMAL_APPROXIMATION_ABOVE) {
            double[] ci = noncentralInterval(d, n1, n2, df, confidence);
            if (ci != null) {
                return new EffectSize(NAME, g, j * ci[0], j * ci[1], confidence);
            }
        }
        double[] ci = normalInterval(g, n1, n2, confidence);
        return new EffectSize(NAME, g, ci[0], ci[1], confidence);
    }

    /**
     * The exact bias correction {@code J(df) = Gamma(df/2) / (sqrt(df/2) Gamma((df-1)/2))} of Hedges (1981).
     *
     * <p>The difference of two large log-gamma values would lose digits (about 1e-10 at df = 1e6), so from df = 1000
     * on the ratio {@code Gamma(x + 1/2) / Gamma(x)}, x = (df - 1)/2, is taken from its asymptotic series
     * {@code sqrt(x) (1 - 1/(8x) + 1/(128x^2) + 5/(1024x^3) - 21/(32768x^4))} (Graham, Knuth and Patashnik (1994),
     * Concrete Mathematics, 2nd ed., exercise 9.60), whose truncation error there is below 1e-16; smaller df are
     * carried up to that range by the exact recursion of the gamma function.
     */
    public static double correction(double df) {
        if (!(df > 1)) {
            throw new IllegalArgumentException("df must exceed 1 for the gamma form of J, was " + df);
        }
        // Below the series range, climb by Gamma(x + 1) = x Gamma(x): J(m) = J(m + 2) sqrt((m + 2) / m) (m - 1) / m.
        // Each step costs one rounding, far less than a log-gamma difference would.
        double factor = 1;
        double m = df;
        while (m < SERIES_FROM_DF) {
            factor *= Math.sqrt((m + 2) / m) * (m - 1) / m;
            m += 2;
        }
        return factor * series(m);
    }

    private static double series(double df) {
        double x = (df - 1) / 2;
        double r = 1 / x;
        double series = 1 + r * (-1.0 / 8 + r * (1.0 / 128 + r * (5.0 / 1024 - r * 21.0 / 32768)));
        return Math.sqrt((df - 1) / df) * series;
    }

    private static final double SERIES_FROM_DF = 1000;

    /**
     * The Hedges-Olkin normal interval for g; exposed so callers and tests can see both paths.
     *
     * @return {low, high}
     */
    public static double[] normalInterval(double g, long n1, long n2, double confidence) {
        double n = (double) n1 + n2;
        double se = Math.sqrt(n / ((double) n1 * n2) + g * g / (2 * n));
        double z = StandardNormal.twoSidedQuantile(confidence);
        return new double[] {g - z * se, g + z * se};
    }

    /** Interval for delta (uncorrected d scale) by noncentral t inversion, or null when the inversion fails. */
    static double[] noncentralInterval(double d, long n1, long n2, double df, double confidence) {
        double scale = Math.sqrt(1.0 / n1 + 1.0 / n2);
        double t = d / scale;
        double tail = (1 - confidence) / 2;
        // cdf(t; ncp) falls as ncp rises: the lower limit leaves 1 - tail below t, the upper limit tail.
        double low = solveNcp(t, df, 1 - tail);
        double high = solveNcp(t, df, tail);
        if (Double.isNaN(low) || Double.isNaN(high) || low > high) {
            return null;
        }
        return new double[] {low * scale, high * scale};
    }

    /** The ncp at which P(T <= t; df, ncp) = target, by bracketing and bisection; NaN when no bracket is found. */
    static double solveNcp(double t, double df, double target) {
        double spread = Math.sqrt(1 + t * t / (2 * df));
        double step = 2 * spread + 1;
        double lo = t - step;
        double hi = t + step;
        int grow = 0;
        while (NoncentralT.cdf(t, df, lo) < target) {
            lo -= step;
            step *= 2;
            if (++grow > 60) {
                return Double.NaN;
            }
        }
        step = 2 * spread + 1;
        grow = 0;
        while (NoncentralT.cdf(t, df, hi) > target) {
            hi += step;
            step *= 2;
            if (++grow > 60) {
                return Double.NaN;
            }
        }
        // Bisection: the cdf is monotone in ncp but only piecewise smooth (the series and the normal approximation
        // meet at |ncp| = 37.62), so a method that never leaves the bracket is the safe choice.
        for (int i = 0; i < 200 && hi - lo > 1e-12 * Math.max(1, Math.abs(lo)); i++) {
            double mid = 0.5 * (lo + hi);
            if (NoncentralT.cdf(t, df, mid) > target) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }
}
