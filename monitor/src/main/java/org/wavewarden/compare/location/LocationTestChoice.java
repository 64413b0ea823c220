package org.wavewarden.compare.location;

import java.util.ArrayList;
import java.util.List;
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
 *
 * <p>In a series of waves the rule is not applied to the two waves being compared but to the variable's history
 * ({@link #fromHistory}), or the test is pinned in the configuration ({@link #pinned}), so that one variable keeps
 * one test, one effect scale and one threshold from wave to wave. {@link #choose} remains for comparisons outside a
 * series, such as two releases of one wave.
 */
public final class LocationTestChoice {

    public static final int MIN_N = 3;
    public static final int MIN_DISTINCT = 5;
    public static final int SHAPIRO_WILK_MAX_N = ShapiroWilkTest.MAX_N;
    public static final double SHAPIRO_WILK_LEVEL = 0.01;
    public static final double MAX_ABS_SKEWNESS = 1.0;
    public static final double MAX_ABS_EXCESS_KURTOSIS = 2.0;
    /**
     * The earliest waves with answers that the choice in a series rests on; from the wave after them on, the choice
     * no longer changes. Four is a year of quarterly waves: common practice, no source.
     */
    public static final int HISTORY_WAVES = 4;

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

    /** A test fixed in the configuration under {@code key}, whatever the data look like. */
    public static Choice pinned(LocationTest test, String key) {
        if (test == null || key == null) {
            throw new IllegalArgumentException("test and key must not be null");
        }
        return new Choice(test, (test == LocationTest.WELCH_T ? "Welch's t on means" : "Mann-Whitney on ranks")
                + ", pinned in the configuration (" + key + ")");
    }

    /**
     * The test of a variable in a series of waves, chosen from its history and never from the wave being judged:
     * the earliest {@value #HISTORY_WAVES} waves before it that have answers (the caller passes the waves in wave
     * order, oldest first; the rest are ignored), each checked on its own by the rule above (fewer than
     * {@value #MIN_N} answers or {@value #MIN_DISTINCT} distinct values, Shapiro-Wilk at level
     * {@value #SHAPIRO_WILK_LEVEL} up to {@value #SHAPIRO_WILK_MAX_N} answers, the shape limits beyond).
     * {@link LocationTest#WELCH_T} when none of them departs from a normal distribution, otherwise
     * {@link LocationTest#MANN_WHITNEY}.
     *
     * <p>Why this way. A pre-test on the wave being judged lets that wave pick its own test, and on waves of 9 to 29
     * answers it has so little power that the choice flips from wave to wave with the effect scale and threshold
     * behind it. The first waves are a fixed window: as it fills, a wave can only add a departure, so the choice
     * changes at most once, from means to ranks, and never after the window is full; the cost of a false departure
     * is small (Mann-Whitney keeps 95.5% of the t test's efficiency under normality, Hodges and Lehmann 1956,
     * Annals of Mathematical Statistics 27, 324-335), that of a missed one is a mean driven by a few extreme
     * answers. The waves are checked one by one rather than pooled, because waves pooled with their own shifts
     * are a mixture, and pooled after standardising, one skewed wave among normal ones is diluted until it passes
     * (a lognormal wave of 20 among three normal ones: Shapiro-Wilk p 0.0035, 0.021, 0.044 as the normal waves
     * are added).
     *
     * @param labels the waves' labels, for the reason
     * @param waves  the valid answers of the variable in each earlier wave, oldest first; at least one with answers
     */
    public static Choice fromHistory(List<String> labels, List<NumericDistribution> waves) {
        if (labels == null || waves == null || labels.size() != waves.size()) {
            throw new IllegalArgumentException("labels and waves must be given and of one length");
        }
        List<String> used = new ArrayList<>();
        List<NumericDistribution> kept = new ArrayList<>();
        for (int i = 0; i < waves.size() && used.size() < HISTORY_WAVES; i++) {
            if (waves.get(i) != null && waves.get(i).n() > 0) {
                used.add(labels.get(i));
                kept.add(waves.get(i));
            }
        }
        if (used.isEmpty()) {
            throw new IllegalArgumentException("no earlier wave has answers to choose a test from");
        }
        return fromWaves(used, kept, "chosen from " + (used.size() == 1 ? "wave " + used.get(0) : "waves "
                + String.join(", ", used)) + ", the variable's first " + (used.size() == 1 ? "wave" : used.size()
                + " waves") + " with answers, and kept for every later wave");
    }

    /**
     * The same rule on the baseline wave alone, for a variable that none of the dataset's first waves holds (a
     * column added later): still never the wave being judged.
     */
    public static Choice fromBaseline(String label, NumericDistribution baseline) {
        if (baseline == null || baseline.n() == 0) {
            throw new IllegalArgumentException("the baseline has no answers to choose a test from");
        }
        return fromWaves(List.of(label), List.of(baseline), "chosen from the baseline " + label + ", since none of"
                + " the dataset's first " + HISTORY_WAVES + " waves holds the variable");
    }

    private static Choice fromWaves(List<String> labels, List<NumericDistribution> waves, String window) {
        List<String> departures = new ArrayList<>();
        List<String> checks = new ArrayList<>();
        for (int i = 0; i < waves.size(); i++) {
            WaveCheck c = check(waves.get(i));
            (c.normal() ? checks : departures).add(labels.get(i) + ": " + c.note());
        }
        if (departures.isEmpty()) {
            return new Choice(LocationTest.WELCH_T, "Welch's t on means, " + window + ": none departs from a normal"
                    + " distribution (" + String.join("; ", checks) + ")");
        }
        return new Choice(LocationTest.MANN_WHITNEY, "Mann-Whitney on ranks, " + window + ": "
                + String.join("; ", departures));
    }

    /** One earlier wave checked by the rule: whether it is taken as normal, and the numbers that say so. */
    private record WaveCheck(boolean normal, String note) {
    }

    private static WaveCheck check(NumericDistribution d) {
        if (momentsOverflow(d)) {
            return new WaveCheck(false, String.format(Locale.ROOT, "values as large as %.3g, beyond what sums of"
                    + " squares can hold", largest(d)));
        }
        if (d.n() < MIN_N || d.size() < MIN_DISTINCT) {
            return new WaveCheck(false, String.format(Locale.ROOT, "too few distinct values for a normal model (%d"
                    + " answers, %d distinct)", d.n(), d.size()));
        }
        if (d.n() <= SHAPIRO_WILK_MAX_N) {
            double p = ShapiroWilkTest.test(d).pValue();
            return p >= SHAPIRO_WILK_LEVEL
                    ? new WaveCheck(true, String.format(Locale.ROOT, "Shapiro-Wilk p = %.3g", p))
                    : new WaveCheck(false, String.format(Locale.ROOT, "departs from a normal distribution"
                    + " (Shapiro-Wilk p = %.3g, level %s)", p, SHAPIRO_WILK_LEVEL));
        }
        Moments m = Moments.of(d);
        String shape = String.format(Locale.ROOT, "skewness %.2f, excess kurtosis %.2f", m.skewness(),
                m.excessKurtosis());
        return nearNormalShape(m) ? new WaveCheck(true, shape) : new WaveCheck(false, "too skewed or heavy-tailed ("
                + shape + "; limits " + MAX_ABS_SKEWNESS + " and " + MAX_ABS_EXCESS_KURTOSIS + ")");
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
