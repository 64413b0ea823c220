package org.wavewarden.compare;

import org.wavewarden.compare.design.DesignEstimate;
import org.wavewarden.compare.design.PsuTally;
import org.wavewarden.compare.design.PsuTotals;
import org.wavewarden.compare.design.TallyEstimates;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.compare.proportion.WilsonInterval;
import org.wavewarden.compare.rank.MedianInterval;
import org.wavewarden.profile.NumericDistribution;

import java.util.List;
import java.util.Objects;

/**
 * One wave's value of the statistic a finding is about, with its confidence interval. The comparators take a
 * finding's "before" and "after" from here, and the digest takes every wave's point of the trend from here, so the
 * sentence, the plot and the trend show the same numbers by construction.
 *
 * <ul>
 *   <li>Share of answers or of rows: Wilson's score interval (Wilson, E. B. (1927), JASA 22, 209-212), R's
 *   {@code prop.test(x, n, correct = FALSE)$conf.int}.</li>
 *   <li>Weighted share: the logit interval on the design-based standard error, {@code expit(logit p +- t SE / (p (1 -
 *   p)))} with t on the design's degrees of freedom, as R survey's {@code svyciprop(~y, design, method = "logit")};
 *   it stays inside (0, 1). At a share of 0 or 1, where the standard error is 0, Wilson's interval at Kish's
 *   effective sample size instead (Korn, E. L. and Graubard, B. I. (1998), "Confidence intervals for proportions
 *   with small expected number of positive counts estimated from survey data", Survey Methodology 24, 193-201).</li>
 *   <li>Mean: Student's t interval on n - 1 df, R's {@code t.test(x)$conf.int}.</li>
 *   <li>Weighted mean: the design-based standard error times t on the design's degrees of freedom, R survey's
 *   {@code confint(svymean(~y, design), df = degf(design))}.</li>
 *   <li>Median: the distribution-free order-statistic interval of {@link MedianInterval}.</li>
 * </ul>
 */
public final class WaveEstimates {

    private WaveEstimates() {
    }

    /** Which estimator a finding's numbers come from, so that a trend computes every wave with the same one. */
    public enum Estimator {
        /** Share of valid answers (or of rows, for a missing rate), Wilson interval. */
        SHARE,
        /** Weighted share under the weights-only design, logit interval on n - 1 df. */
        WEIGHTED_SHARE,
        /** Weighted share under the stratified cluster design, logit interval on #PSU - #strata df. */
        DESIGN_SHARE,
        /** Mean, t interval. */
        MEAN,
        /** Weighted mean under the weights-only design. */
        WEIGHTED_MEAN,
        /** Weighted mean under the stratified cluster design. */
        DESIGN_MEAN,
        /** Median, order-statistic interval. */
        MEDIAN;

        public boolean percent() {
            return this == SHARE || this == WEIGHTED_SHARE || this == DESIGN_SHARE;
        }
    }

    /**
     * One wave's estimate.
     *
     * @param category the category or missing reason the value is the share of; null for a mean or median
     * @param value    the estimate (a share as a proportion from 0 to 1)
     * @param low      lower confidence limit, or NaN when there is none (fewer than 2 answers)
     * @param high     upper confidence limit, or NaN
     * @param label    the category's value label, or null when it has none (or is not a category)
     */
    public record Estimate(String category, String label, double value, double low, double high) {

        /** An estimate without a label. */
        public Estimate(String category, double value, double low, double high) {
            this(category, null, value, low, high);
        }

        /** The same estimate without sampling error (a complete enumeration): low = high = value. */
        public Estimate exact() {
            return new Estimate(category, label, value, value, value);
        }

        /** The same estimate with its category's label from the variable's labels. */
        public Estimate labelled(org.wavewarden.codebook.CodeLabels labels) {
            return category == null ? this : new Estimate(category, labels.label(category), value, low, high);
        }
    }

    /**
     * What a finding's plot draws, in the finding's detail: the statistic its sentence states, per wave.
     *
     * @param statistic what the values are, as the sentence names it, e.g. "weighted share answering 'SELF'"
     * @param estimator how each wave's value and interval are computed
     * @param unit      the values' unit when they are not shares; null otherwise
     * @param baseline  the baseline's estimates, the category the sentence names first; empty for a reference
     * @param current   the current wave's estimates, in the same order
     * @param reference the reference values of a REFERENCE finding, aligned with {@code current}; empty otherwise
     */
    public record Plotted(String statistic, Estimator estimator, String unit, List<Estimate> baseline,
                          List<Estimate> current, List<Estimate> reference) {

        public Plotted {
            Objects.requireNonNull(statistic, "statistic");
            Objects.requireNonNull(estimator, "estimator");
            baseline = baseline == null ? List.of() : List.copyOf(baseline);
            current = List.copyOf(current);
            reference = reference == null ? List.of() : List.copyOf(reference);
        }

        /** The category the sentence names (the first one drawn), or null for a mean or median. */
        public String category() {
            return current.isEmpty() ? null : current.get(0).category();
        }
    }

    /** A share of {@code n} with Wilson's interval. */
    public static Estimate share(String category, long count, long n, double confidence) {
        if (n == 0) {
            return new Estimate(category, Double.NaN, Double.NaN, Double.NaN);
        }
        WilsonInterval w = WilsonInterval.of(count, n, confidence);
        return new Estimate(category, (double) count / n, w.lower(), w.upper());
    }

    /**
     * A weighted share from its design-based estimate: the logit interval on {@code df} degrees of freedom, or at a
     * share of 0 or 1 Wilson's interval at the effective sample size {@code effectiveN}.
     */
    public static Estimate designShare(String category, DesignEstimate e, double df, double effectiveN,
                                       double confidence) {
        double p = e.estimate();
        double se = e.standardError();
        if (p > 0 && p < 1 && se > 0 && df > 0) {
            double half = StudentT.twoSidedQuantile(df, confidence) * se / (p * (1 - p));
            double logit = Math.log(p / (1 - p));
            return new Estimate(category, p, expit(logit - half), expit(logit + half));
        }
        // A ratio of sums may round a hair past 0 or 1; the interval is of the share as it stands.
        WilsonInterval w = WilsonInterval.ofShare(Math.min(1, Math.max(0, p)), Math.max(1, effectiveN),
                confidence);
        return new Estimate(category, p, w.lower(), w.upper());
    }

    /** The weighted share of the answers coded {@code code} under the weights-only design ({@code design} null) or the PSUs. */
    public static Estimate weightedShare(String category, WeightedTally tally, PsuTally design, double code,
                                         double confidence) {
        WeightedTally indicator = tally.indicator(code);
        if (design == null) {
            return designShare(category, TallyEstimates.mean(indicator), tally.n() - 1.0,
                    tally.effectiveSampleSize(), confidence);
        }
        PsuTally d = design.indicator(code);
        return designShare(category, d.totals().mean(), d.degreesOfFreedom(), tally.effectiveSampleSize(),
                confidence);
    }

    /** A mean with Student's t interval. */
    public static Estimate mean(NumericDistribution d, double confidence) {
        return d.n() == 0 ? mean(0, Double.NaN, Double.NaN, confidence)
                : mean(d.n(), d.mean(), d.n() < 2 ? Double.NaN : d.standardDeviation(), confidence);
    }

    /** A mean of {@code n} answers with sample standard deviation {@code sd}: Student's t interval on n - 1 df. */
    public static Estimate mean(long n, double mean, double sd, double confidence) {
        if (n == 0) {
            return new Estimate(null, Double.NaN, Double.NaN, Double.NaN);
        }
        if (n < 2 || Double.isNaN(sd)) {
            return new Estimate(null, mean, Double.NaN, Double.NaN);
        }
        double half = StudentT.twoSidedQuantile(n - 1, confidence) * sd / Math.sqrt(n);
        return new Estimate(null, mean, mean - half, mean + half);
    }

    /** A weighted mean from its design-based estimate, t on {@code df} degrees of freedom. */
    public static Estimate designMean(DesignEstimate e, double df, double confidence) {
        if (!(df > 0)) {
            return new Estimate(null, e.estimate(), Double.NaN, Double.NaN);
        }
        double half = StudentT.twoSidedQuantile(df, confidence) * e.standardError();
        return new Estimate(null, e.estimate(), e.estimate() - half, e.estimate() + half);
    }

    /** The weighted mean under the weights-only design ({@code design} null) or the PSUs. */
    public static Estimate weightedMean(WeightedTally tally, PsuTotals design, double confidence) {
        return design == null ? designMean(TallyEstimates.mean(tally), tally.n() - 1.0, confidence)
                : designMean(design.mean(), design.degreesOfFreedom(), confidence);
    }

    /** The median with its order-statistic interval. */
    public static Estimate median(NumericDistribution d, double confidence) {
        if (d.n() == 0) {
            return new Estimate(null, Double.NaN, Double.NaN, Double.NaN);
        }
        EffectSize m = MedianInterval.of(d, confidence);
        return new Estimate(null, m.estimate(), m.ciLow(), m.ciHigh());
    }


    private static double expit(double x) {
        return 1 / (1 + Math.exp(-x));
    }
}
