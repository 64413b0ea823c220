package org.wavewarden.compare.location;

import java.util.Locale;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.normality.Moments;
import org.wavewarden.compare.normality.ShapiroWilkTest;
import org.wavewarden.profile.NumericDistribution;

/**
 * The rule that picks the primary location test for a continuous variable: Welch's t on means, or Mann-Whitney on
 * ranks.
 *
 * <p>The rule, applied in this order:
 * <ol>
 *   <li>If a value is so large that the sums of squares behind a variance, a t statistic or a normality test would
 *       pass the largest double (|x| above sqrt(1.8e308 / n)): {@link LocationTest#MANN_WHITNEY}, which needs only
 *       the order of the values. A value of that size dominates every moment anyway.</li>
 *   <li>If either wave has fewer than {@value #MIN_N} observations or fewer than {@value #MIN_DISTINCT} distinct
 *       values: {@link LocationTest#MANN_WHITNEY}. So coarse a variable is an ordinal scale, not a normal one, and
 *       Mann-Whitney handles its ties exactly.</li>
 *   <li>If both waves have at most {@value #SHAPIRO_WILK_MAX_N} observations: Shapiro-Wilk (Royston 1995, see
 *       {@link ShapiroWilkTest}) on each wave at level {@value #SHAPIRO_WILK_LEVEL}. Neither rejected:
 *       {@link LocationTest#WELCH_T}; otherwise {@link LocationTest#MANN_WHITNEY}. The low level keeps Welch's t
 *       for data that are only mildly non-normal, where it remains accurate.</li>
 *   <li>If either wave has more than {@value #SHAPIRO_WILK_MAX_N} observations, any normality test rejects for
 *       departures too small to matter, so the shape is judged instead: {@link LocationTest#WELCH_T} when both waves
 *       have |sample skewness g1| at most {@value #MAX_ABS_SKEWNESS} and |excess kurtosis g2| at most
 *       {@value #MAX_ABS_EXCESS_KURTOSIS} ({@link Moments}), otherwise {@link LocationTest#MANN_WHITNEY}. These
 *       bounds are common practice, no source. The reasoning: at such sizes the sample means are close to normal by
 *       the central limit theorem, so Welch's t is valid whatever the shape, and for a distribution this close to
 *       symmetric and normal-tailed the mean is a fair summary of where the values lie; for strongly skewed or
 *       heavy-tailed variables a shift in the mean can be driven by a few extreme answers, and the rank-based
 *       comparison says more about the bulk of respondents.</li>
 * </ol>
 */
public final class LocationTestChoice {

    public static final int MIN_N = 3;
    public static final int MIN_DISTINCT = 5;
    public static final int SHAPIRO_WILK_MAX_N = ShapiroWilkTest.MAX_N;
    public static final double SHAPIRO_WILK_LEVEL = 0.01;
    public static final double MAX_ABS_SKEWNESS = 1.0;
    public static final double MAX_ABS_EXCESS_KURTOSIS = 2.0;

    /** The two candidate primary tests for a continuous variable. */
    public enum LocationTest { WELCH_T, MANN_WHITNEY }

    /**
     * The chosen test and why, in a sentence a reader of the findings can follow.
     *
     * @param test      the primary test
     * @param reason    plain-language reason for the choice
     * @param normality the numbers the choice was made on, or null when no normality check was made
     */
    public record Choice(LocationTest test, String reason, Normality normality) {
        public Choice {
            if (test == null) {
                throw new IllegalArgumentException("test must not be null");
            }
            if (reason == null || reason.isBlank()) {
                throw new IllegalArgumentException("reason must not be blank");
            }
        }

        /** A choice made without a normality check. */
        public Choice(LocationTest test, String reason) {
            this(test, reason, null);
        }
    }

    /**
     * The normality evidence behind a choice as numbers, so that a reader can check it with another tool: the
     * Shapiro-Wilk W and p of each wave with the level they were held to, or, for waves too large for it, each
     * wave's sample skewness g1 and excess kurtosis g2 with their limits. The fields of the check not made are null.
     */
    public record Normality(String method, Double wBaseline, Double pBaseline, Double wCurrent, Double pCurrent,
                            Double level, Double skewnessBaseline, Double excessKurtosisBaseline,
                            Double skewnessCurrent, Double excessKurtosisCurrent, Double maxAbsSkewness,
                            Double maxAbsExcessKurtosis) {

        static Normality shapiroWilk(TestResult baseline, TestResult current, double level) {
            return new Normality(ShapiroWilkTest.NAME, baseline.statistic(), baseline.pValue(), current.statistic(),
                    current.pValue(), level, null, null, null, null, null, null);
        }

        static Normality moments(Moments baseline, Moments current) {
            return new Normality("sample skewness and excess kurtosis", null, null, null, null, null,
                    baseline.skewness(), baseline.excessKurtosis(), current.skewness(), current.excessKurtosis(),
                    MAX_ABS_SKEWNESS, MAX_ABS_EXCESS_KURTOSIS);
        }
    }

    private LocationTestChoice() {
    }

    /** Applies the rule above to the two waves' frequency tables. */
    public static Choice choose(NumericDistribution baseline, NumericDistribution current) {
        if (baseline == null || current == null) {
            throw new IllegalArgumentException((baseline == null ? "baseline" : "current") + " must not be null");
        }
        long nb = baseline.n();
        long nc = current.n();
        if (momentsOverflow(baseline) || momentsOverflow(current)) {
            return new Choice(LocationTest.MANN_WHITNEY, String.format(Locale.ROOT, "values as large as %.3g are"
                    + " beyond what sums of squares can hold in double precision, so only their order is compared",
                    Math.max(largest(baseline), largest(current))));
        }
        if (nb < MIN_N || nc < MIN_N || baseline.size() < MIN_DISTINCT || current.size() < MIN_DISTINCT) {
            return new Choice(LocationTest.MANN_WHITNEY, String.format(Locale.ROOT,
                    "too few distinct values for a normal model (baseline %d observations, %d distinct; "
                            + "current %d observations, %d distinct)", nb, baseline.size(), nc, current.size()));
        }
        if (nb <= SHAPIRO_WILK_MAX_N && nc <= SHAPIRO_WILK_MAX_N) {
            TestResult swb = ShapiroWilkTest.test(baseline);
            TestResult swc = ShapiroWilkTest.test(current);
            boolean normalB = swb.pValue() >= SHAPIRO_WILK_LEVEL;
            boolean normalC = swc.pValue() >= SHAPIRO_WILK_LEVEL;
            String detail = String.format(Locale.ROOT, "Shapiro-Wilk p = %.3g (baseline), %.3g (current), level %s",
                    swb.pValue(), swc.pValue(), SHAPIRO_WILK_LEVEL);
            Normality numbers = Normality.shapiroWilk(swb, swc, SHAPIRO_WILK_LEVEL);
            if (normalB && normalC) {
                return new Choice(LocationTest.WELCH_T, "both waves are consistent with a normal distribution ("
                        + detail + ")", numbers);
            }
            String which = !normalB && !normalC ? "both waves" : !normalB ? "the baseline wave" : "the current wave";
            return new Choice(LocationTest.MANN_WHITNEY, which + " departs from a normal distribution (" + detail
                    + ")", numbers);
        }
        Moments mb = Moments.of(baseline);
        Moments mc = Moments.of(current);
        boolean okB = nearNormalShape(mb);
        boolean okC = nearNormalShape(mc);
        String detail = String.format(Locale.ROOT,
                "skewness %.2f and excess kurtosis %.2f (baseline), %.2f and %.2f (current); limits %s and %s",
                mb.skewness(), mb.excessKurtosis(), mc.skewness(), mc.excessKurtosis(), MAX_ABS_SKEWNESS,
                MAX_ABS_EXCESS_KURTOSIS);
        Normality numbers = Normality.moments(mb, mc);
        if (okB && okC) {
            return new Choice(LocationTest.WELCH_T, "large waves with a near-symmetric, normal-tailed shape, so "
                    + "the mean is a fair summary and Welch's t is valid (" + detail + ")", numbers);
        }
        String which = !okB && !okC ? "both waves are" : !okB ? "the baseline wave is" : "the current wave is";
        return new Choice(LocationTest.MANN_WHITNEY, which + " too skewed or heavy-tailed for the mean to summarise "
                + "them (" + detail + ")", numbers);
    }

    /** True when n x^2 of the largest |x| passes the largest double, so a variance cannot be formed. */
    static boolean momentsOverflow(NumericDistribution d) {
        return largest(d) > Math.sqrt(Double.MAX_VALUE / Math.max(1, d.n()));
    }

    private static double largest(NumericDistribution d) {
        return d.size() == 0 ? 0 : Math.max(Math.abs(d.value(0)), Math.abs(d.value(d.size() - 1)));
    }

    private static boolean nearNormalShape(Moments m) {
        return Math.abs(m.skewness()) <= MAX_ABS_SKEWNESS && Math.abs(m.excessKurtosis()) <= MAX_ABS_EXCESS_KURTOSIS;
    }
}
