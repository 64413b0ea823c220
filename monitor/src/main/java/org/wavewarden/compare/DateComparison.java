package org.wavewarden.compare;

import org.wavewarden.judge.FindingKind;
import org.wavewarden.missing.DisguisedMissingDetector;
import org.wavewarden.compare.rank.MedianInterval;
import org.wavewarden.profile.NumericDistribution;

import java.time.LocalDate;
import java.util.Collection;
import java.util.HashMap;
import java.util.HashSet;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * Compares the dates of a date or timestamp variable between two waves: the two-sample Kolmogorov-Smirnov test on
 * the dates as day numbers (days since 1970-01-01, a time of day as a fraction), with the KS distance and its
 * distribution-free interval as the effect ({@link VariableComparator#shape}, Smirnov 1939; the interval of
 * Dvoretzky, Kiefer and Wolfowitz with Massart's constant), judged against the KS threshold. A date has no useful
 * mean, and a shift of a few days matters for one date and not for another, so the distribution as a whole is
 * compared; the sentence gives the median date of each wave and the share of this wave's dates outside the span
 * of the baseline's dates.
 *
 * <p>Dates that follow each wave's own period (interview or fieldwork dates) differ entirely between waves by
 * design. When at some date at least {@value #APART} of one wave lies before it and of the other after it (a KS
 * distance of {@value #APART} or more), the waves are not compared and the reason is given instead. Common
 * practice, no source.
 *
 * <p>The comparison is unweighted: a wave's weights are not kept per date.
 */
public final class DateComparison {

    /** KS distance from which two waves' dates are taken to cover different periods rather than to have moved. */
    static final double APART = 0.9;

    private DateComparison() {
    }

    /**
     * What a date comparison reports beside the test.
     *
     * @param medianBaseline          the baseline's median date (ISO)
     * @param medianCurrent           the current wave's median date
     * @param earliestBaseline        the baseline's earliest valid date
     * @param latestBaseline          the baseline's latest valid date
     * @param earliestCurrent         the current wave's earliest valid date
     * @param latestCurrent           the current wave's latest valid date
     * @param shareOutsideBaselineSpan share of the current wave's dates before the baseline's earliest or after its
     *                                latest date
     * @param medianShiftDays         current median minus baseline median, in days
     * @param medianBaselineInterval  the baseline's median day number (days since 1970-01-01) with its
     *                                distribution-free order-statistic interval ({@link MedianInterval})
     * @param medianCurrentInterval   the same for the current wave
     */
    public record DateDetail(String medianBaseline, String medianCurrent, String earliestBaseline,
                             String latestBaseline, String earliestCurrent, String latestCurrent,
                             double shareOutsideBaselineSpan, double medianShiftDays,
                             EffectSize medianBaselineInterval, EffectSize medianCurrentInterval) {

        /** A day number as the ISO date it falls on; null for none. */
        public static String date(double day) {
            return Double.isNaN(day) ? null : DateComparison.date(day);
        }
    }

    /**
     * The comparison of two waves' dates, or empty when {@link #skipReason} gives a reason not to compare.
     *
     * @param baseline         the baseline's values in PostgreSQL's text form, with counts
     * @param baselineExcluded values the screen left out of the baseline (missing codes, placeholder dates)
     * @param current          the current wave's values
     * @param currentExcluded  values the screen left out of the current wave
     */
    public static Optional<Comparison> compare(VariableComparator comparator, String variable,
                                               Map<String, Long> baseline, Collection<String> baselineExcluded,
                                               Map<String, Long> current, Collection<String> currentExcluded) {
        NumericDistribution b = days(baseline, baselineExcluded);
        NumericDistribution c = days(current, currentExcluded);
        if (reason(b, c) != null) {
            return Optional.empty();
        }
        Comparison ks = comparator.shape(variable, b, c, "days");
        double medB = org.wavewarden.profile.Quantiles.median(b);
        double medC = org.wavewarden.profile.Quantiles.median(c);
        double first = b.value(0);
        double last = b.value(b.size() - 1);
        long outside = 0;
        for (int i = 0; i < c.size(); i++) {
            outside += c.value(i) < first || c.value(i) > last ? c.count(i) : 0;
        }
        double outsideShare = (double) outside / c.n();
        double confidence = ks.effect().confidence();
        DateDetail detail = new DateDetail(date(medB), date(medC), date(first), date(last), date(c.value(0)),
                date(c.value(c.size() - 1)), outsideShare, medC - medB, MedianInterval.of(b, confidence),
                MedianInterval.of(c, confidence));
        String note = String.format(Locale.ROOT, "median date %s in the baseline and %s in this wave; %.1f%% of this"
                        + " wave's dates lie outside the baseline's span %s to %s; the verdict is on the KS distance"
                        + " between the two waves' distributions of dates", detail.medianBaseline(),
                detail.medianCurrent(), 100 * outsideShare, detail.earliestBaseline(), detail.latestBaseline());
        Change change = new Change("median " + variable + ", in days from the baseline's median date "
                + detail.medianBaseline(), 0, medC - medB, false, "days", medC - medB, Double.NaN, Double.NaN, note);
        return Optional.of(new Comparison(variable, FindingKind.SHIFT, ks.test(), ks.effect(), ks.threshold(),
                ks.thresholdSource(), b.n(), c.n(), change, detail));
    }

    /** Why two waves' dates are not compared, or null when they are; arguments as for {@link #compare}. */
    public static String skipReason(Map<String, Long> baseline, Collection<String> baselineExcluded,
                                    Map<String, Long> current, Collection<String> currentExcluded) {
        return reason(days(baseline, baselineExcluded), days(current, currentExcluded));
    }

    private static String reason(NumericDistribution b, NumericDistribution c) {
        if (b.n() < 2 || c.n() < 2) {
            return "fewer than 2 readable dates in a wave (" + b.n() + " and " + c.n() + ")";
        }
        if (b.size() == 1 && c.size() == 1 && b.value(0) == c.value(0)) {
            return "a single date in both waves";
        }
        double d = org.wavewarden.compare.shape.KolmogorovSmirnovTest.test(b, c).d();
        if (d >= APART) {
            return String.format(Locale.ROOT, "the two waves' dates cover different periods (%s to %s in the baseline,"
                            + " %s to %s in this wave; KS distance %.3f): dates that follow each wave's own period,"
                            + " such as interview dates, are not compared as a distribution", date(b.value(0)),
                    date(b.value(b.size() - 1)), date(c.value(0)), date(c.value(c.size() - 1)), d);
        }
        return null;
    }

    /** The readable dates among the values not excluded, as day numbers with counts. */
    static NumericDistribution days(Map<String, Long> values, Collection<String> excluded) {
        Set<String> left = new HashSet<>(excluded);
        Map<Double, Long> tally = new HashMap<>();
        values.forEach((text, count) -> {
            Double day = left.contains(text) ? null : DisguisedMissingDetector.dayNumber(text);
            if (day != null && count > 0) {
                tally.merge(day, count, Long::sum);
            }
        });
        return NumericDistribution.ofTally(tally);
    }

    static String date(double day) {
        return LocalDate.ofEpochDay((long) Math.floor(day)).toString();
    }
}
