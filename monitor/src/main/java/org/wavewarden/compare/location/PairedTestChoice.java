package org.wavewarden.compare.location;

import java.util.Locale;
import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.normality.Moments;
import org.wavewarden.compare.normality.ShapiroWilkTest;
import org.wavewarden.profile.NumericDistribution;

/**
 * The rule that picks the primary test for the paired differences of a continuous variable: the paired t test on
 * their mean, or the Wilcoxon signed-rank test on their ranks. It is {@link LocationTestChoice}'s rule applied to
 * the one distribution that matters for paired data, the differences {@code current - baseline}, with the same
 * constants:
 * <ol>
 *   <li>fewer than {@value LocationTestChoice#MIN_N} pairs or fewer than {@value LocationTestChoice#MIN_DISTINCT}
 *       distinct differences: {@link PairedTest#SIGNED_RANK};</li>
 *   <li>at most {@value LocationTestChoice#SHAPIRO_WILK_MAX_N} pairs: Shapiro-Wilk (Royston 1995) on the
 *       differences at level {@value LocationTestChoice#SHAPIRO_WILK_LEVEL}; not rejected, {@link PairedTest#PAIRED_T},
 *       else {@link PairedTest#SIGNED_RANK};</li>
 *   <li>more pairs: {@link PairedTest#PAIRED_T} when the differences have |skewness| at most
 *       {@value LocationTestChoice#MAX_ABS_SKEWNESS} and |excess kurtosis| at most
 *       {@value LocationTestChoice#MAX_ABS_EXCESS_KURTOSIS} (common practice, no source), else
 *       {@link PairedTest#SIGNED_RANK}.</li>
 * </ol>
 * The paired t test assumes normal differences, not normal answers, which is why the rule looks at them alone.
 */
public final class PairedTestChoice {

    /** The two candidate primary tests for paired differences. */
    public enum PairedTest { PAIRED_T, SIGNED_RANK }

    /**
     * The chosen test and why.
     *
     * @param test   the primary test
     * @param reason plain-language reason for the choice
     */
    public record Choice(PairedTest test, String reason) {
        public Choice {
            if (test == null) {
                throw new IllegalArgumentException("test must not be null");
            }
            if (reason == null || reason.isBlank()) {
                throw new IllegalArgumentException("reason must not be blank");
            }
        }
    }

    private PairedTestChoice() {
    }

    /** Applies the rule above to the frequency table of the differences. */
    public static Choice choose(NumericDistribution differences) {
        if (differences == null) {
            throw new IllegalArgumentException("differences must not be null");
        }
        long n = differences.n();
        if (n < LocationTestChoice.MIN_N || differences.size() < LocationTestChoice.MIN_DISTINCT) {
            return new Choice(PairedTest.SIGNED_RANK, String.format(Locale.ROOT, "too few distinct differences for a"
                    + " normal model (%d pairs, %d distinct differences)", n, differences.size()));
        }
        if (n <= LocationTestChoice.SHAPIRO_WILK_MAX_N) {
            TestResult sw = ShapiroWilkTest.test(differences);
            String detail = String.format(Locale.ROOT, "Shapiro-Wilk p = %.3g on the differences, level %s",
                    sw.pValue(), LocationTestChoice.SHAPIRO_WILK_LEVEL);
            return sw.pValue() >= LocationTestChoice.SHAPIRO_WILK_LEVEL
                    ? new Choice(PairedTest.PAIRED_T, "the paired differences are consistent with a normal"
                    + " distribution (" + detail + ")")
                    : new Choice(PairedTest.SIGNED_RANK, "the paired differences depart from a normal distribution ("
                    + detail + ")");
        }
        Moments m = Moments.of(differences);
        String detail = String.format(Locale.ROOT, "skewness %.2f and excess kurtosis %.2f of the differences;"
                        + " limits %s and %s", m.skewness(), m.excessKurtosis(), LocationTestChoice.MAX_ABS_SKEWNESS,
                LocationTestChoice.MAX_ABS_EXCESS_KURTOSIS);
        boolean near = Math.abs(m.skewness()) <= LocationTestChoice.MAX_ABS_SKEWNESS
                && Math.abs(m.excessKurtosis()) <= LocationTestChoice.MAX_ABS_EXCESS_KURTOSIS;
        return near
                ? new Choice(PairedTest.PAIRED_T, "many pairs with near-symmetric, normal-tailed differences, so the"
                + " mean difference is a fair summary and the paired t is valid (" + detail + ")")
                : new Choice(PairedTest.SIGNED_RANK, "the paired differences are too skewed or heavy-tailed for their"
                + " mean to summarise them (" + detail + ")");
    }
}
