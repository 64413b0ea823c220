package org.wavewarden.deliver.html;

import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.profile.Quantiles;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.TreeSet;

import static org.wavewarden.deliver.html.Html.esc;

/**
 * Small inline-SVG charts for the HTML digest: axis ticks at "nice" numbers, overlaid histograms of two waves,
 * grouped share bars and a trend sparkline. Pure functions from data to SVG text; no scripts, fonts or images.
 *
 * <p>Tick positions follow Heckbert's nice-numbers rule (P. S. Heckbert, "Nice numbers for graph labels", in
 * Graphics Gems, Academic Press, 1990): the step is 1, 2 or 5 times a power of ten. Histogram bins follow
 * Freedman and Diaconis (D. Freedman and P. Diaconis, "On the histogram as a density estimator: L2 theory",
 * Zeitschrift fuer Wahrscheinlichkeitstheorie 57, 1981): width {@code 2 IQR / n^(1/3)} on the pooled data of both
 * waves, so both waves share one set of bins; see {@link #histogramBins}.
 */
public final class SvgChart {

    /** At most this many pooled distinct values are drawn one bar per value instead of binned. */
    public static final int MAX_DISTINCT_FOR_VALUE_BARS = 25;
    /** Upper bound on the number of histogram bins. */
    public static final int MAX_BINS = 40;
    /** At most this many categories or reasons are drawn; the rest are named in a note. */
    public static final int MAX_BARS = 30;

    static final int WIDTH = 560;
    static final int SPARK_WIDTH = 340;

    private SvgChart() {
    }

    // ---------------------------------------------------------------------------------------------- nice numbers

    /**
     * Axis ticks covering {@code [min, max]}: evenly spaced at a nice step (1, 2 or 5 times a power of ten),
     * the first at or below {@code min} and the last at or above {@code max}, about {@code wanted} of them.
     */
    public static double[] niceTicks(double min, double max, int wanted) {
        if (!Double.isFinite(min) || !Double.isFinite(max)) {
            throw new IllegalArgumentException("min and max must be finite, were " + min + " and " + max);
        }
        if (max < min) {
            throw new IllegalArgumentException("max " + max + " is below min " + min);
        }
        if (wanted < 2) {
            throw new IllegalArgumentException("wanted must be at least 2, was " + wanted);
        }
        if (max == min) {
            double pad = min == 0 ? 1 : Math.abs(min) * 0.1;
            min -= pad;
            max += pad;
        }
        double step = niceStep(min, max, wanted);
        double lo = Math.floor(min / step + 1e-9) * step;
        double hi = Math.ceil(max / step - 1e-9) * step;
        int n = (int) Math.round((hi - lo) / step) + 1;
        double[] ticks = new double[n];
        for (int i = 0; i < n; i++) {
            double t = lo + i * step;
            ticks[i] = Math.abs(t) < step * 1e-9 ? 0.0 : t;
        }
        return ticks;
    }

    /** The tick step {@link #niceTicks} uses. */
    static double niceStep(double min, double max, int wanted) {
        double range = niceNumber(max - min, false);
        return niceNumber(range / (wanted - 1), true);
    }

    /** Heckbert's nice number near {@code x}: rounded to the nearest, or else the next larger, of 1, 2, 5 x 10^k. */
    public static double niceNumber(double x, boolean round) {
        if (!(x > 0) || !Double.isFinite(x)) {
            throw new IllegalArgumentException("x must be positive and finite, was " + x);
        }
        double exp = Math.floor(Math.log10(x));
        double f = x / Math.pow(10, exp);
        double nf;
        if (round) {
            nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
        } else {
            nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
        }
        return nf * Math.pow(10, exp);
    }

    /** A tick label with just enough decimals for the step between ticks. */
    public static String tickLabel(double value, double step) {
        int decimals = (int) Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
        return String.format(Locale.ROOT, "%." + Math.min(decimals, 6) + "f", value);
    }

    /** A value for a label: three significant digits below 100, whole numbers above. */
    public static String number(double v) {
        if (Double.isNaN(v)) {
            return "no data";
        }
        double a = Math.abs(v);
        String s;
        if (a >= 100 || a == 0) {
            s = String.format(Locale.ROOT, "%.0f", v);
        } else if (a >= 10) {
            s = String.format(Locale.ROOT, "%.1f", v);
        } else if (a >= 1) {
            s = String.format(Locale.ROOT, "%.2f", v);
        } else {
            s = String.format(Locale.ROOT, "%.3g", v);
        }
        return s.equals("-0") ? "0" : s;
    }

    static String percent(double share) {
        double p = 100 * share;
        if (p == 0) {
            return "0%";
        }
        return String.format(Locale.ROOT, p < 1 ? "%.2f%%" : "%.1f%%", p);
    }

    // ---------------------------------------------------------------------------------------------- binning

    /**
     * Equal-width bins shared by both waves.
     *
     * @param start left edge of the first bin
     * @param width bin width; each bin is {@code [left, left + width)}, the last one also holds its right edge
     * @param count number of bins
     */
    public record Bins(double start, double width, int count) {
        public Bins {
            if (!(width > 0) || count < 1) {
                throw new IllegalArgumentException("width must be positive and count at least 1, were " + width
                        + " and " + count);
            }
        }

        public double edge(int i) {
            return start + i * width;
        }

        /** The bin holding {@code x}, clamped to the first and last bin. */
        public int index(double x) {
            int i = (int) Math.floor((x - start) / width + 1e-9);
            return Math.max(0, Math.min(count - 1, i));
        }
    }

    /**
     * The bins for two waves' histograms, from the pooled data: the Freedman-Diaconis width {@code 2 IQR n^(-1/3)}
     * (Sturges' {@code ceil(log2 n) + 1} bins when the IQR is zero), rounded to the nearest nice number (1, 2 or 5
     * times a power of ten) so the edges are readable, at least 1 when every value is a whole number (integer answers must
     * not fall into empty bins between them), and widened until there are at most {@link #MAX_BINS} bins. The
     * first edge is the largest multiple of the width at or below the smallest value.
     */
    public static Bins histogramBins(NumericDistribution baseline, NumericDistribution current) {
        NumericDistribution pooled = baseline.merge(current);
        long n = pooled.n();
        if (n == 0) {
            throw new IllegalArgumentException("baseline and current are both empty");
        }
        double min = pooled.value(0);
        double max = pooled.value(pooled.size() - 1);
        if (max == min) {
            return new Bins(min - 0.5, 1, 1);
        }
        double range = max - min;
        double raw = Math.max(freedmanDiaconisWidth(pooled), range / MAX_BINS);
        double width = niceNumber(raw, true);
        boolean whole = allWhole(pooled);
        if (whole) {
            width = Math.max(width, 1);
        }
        // Bins are [left, left + width). For whole numbers the largest value occupies [max, max + 1), so every bin
        // holds exactly `width` possible answers; otherwise the last bin is closed and holds max.
        double top = whole ? max + 1 : max;
        while (true) {
            double start = Math.floor(min / width + 1e-9) * width;
            int count = Math.max(1, (int) Math.ceil((top - start) / width - 1e-9));
            if (count <= MAX_BINS) {
                return new Bins(start, width, count);
            }
            width = niceUp(width * 1.000001);
        }
    }

    /**
     * Freedman and Diaconis' bin width {@code 2 IQR n^(-1/3)} with the type-7 quartiles; when the IQR is zero, the
     * width that gives Sturges' {@code ceil(log2 n) + 1} bins over the range.
     */
    static double freedmanDiaconisWidth(NumericDistribution pooled) {
        long n = pooled.n();
        double range = pooled.value(pooled.size() - 1) - pooled.value(0);
        double iqr = Quantiles.quantile(pooled, 0.75) - Quantiles.quantile(pooled, 0.25);
        return iqr > 0 ? 2 * iqr / Math.cbrt(n) : range / (Math.ceil(Math.log(n) / Math.log(2)) + 1);
    }

    /** The smallest of 1, 2, 5 x 10^k that is at least {@code x}. */
    static double niceUp(double x) {
        double exp = Math.floor(Math.log10(x));
        double f = x / Math.pow(10, exp);
        double nf = f <= 1 + 1e-12 ? 1 : f <= 2 + 1e-12 ? 2 : f <= 5 + 1e-12 ? 5 : 10;
        return nf * Math.pow(10, exp);
    }

    /** Each bin's share of the wave's observations (all zero for an empty wave). */
    public static double[] binShares(NumericDistribution d, Bins bins) {
        double[] out = new double[bins.count()];
        long n = d.n();
        if (n == 0) {
            return out;
        }
        for (int i = 0; i < d.size(); i++) {
            out[bins.index(d.value(i))] += d.count(i);
        }
        for (int i = 0; i < out.length; i++) {
            out[i] /= n;
        }
        return out;
    }

    private static boolean allWhole(NumericDistribution d) {
        for (int i = 0; i < d.size(); i++) {
            if (d.value(i) != Math.rint(d.value(i))) {
                return false;
            }
        }
        return true;
    }

    // ---------------------------------------------------------------------------------------------- charts

    /** Plot frame in pixels: the plotting area is inside the margins. */
    private record Frame(int width, int height, int left, int right, int top, int bottom) {
        double x0() {
            return left;
        }

        double x1() {
            return width - right;
        }

        double y0() {
            return height - bottom;
        }

        double y1() {
            return top;
        }

        double sx(double v, double lo, double hi) {
            return x0() + (v - lo) / (hi - lo) * (x1() - x0());
        }

        double sy(double v, double lo, double hi) {
            return y0() - (v - lo) / (hi - lo) * (y0() - y1());
        }
    }

    /**
     * Both waves' distributions of a numeric variable as overlaid histograms on shared bins (or one pair of bars
     * per value when there are few distinct values); the y axis is the share of each wave's valid answers.
     */
    public static String numeric(String variable, VariablePlot.NumericPlot p, String baselineWave,
                                 String currentWave) {
        boolean hasBaseline = p.baseline() != null;
        NumericDistribution given0 = hasBaseline ? p.baseline() : NumericDistribution.empty();
        int decade = drawingDecade(given0.merge(p.current()));
        NumericDistribution b = inDecades(given0, decade);
        NumericDistribution c = inDecades(p.current(), decade);
        NumericDistribution pooled = b.merge(c);
        String given = p.unit() == null || p.unit().isBlank() ? null : p.unit();
        String unit = decade == 0 ? given : "\u00d7 1e" + decade + (given == null ? "" : " " + given);
        String title = "Distribution of " + variable + (unit == null ? "" : " (" + unit + ")") + ": "
                + (hasBaseline ? baselineWave + " (n = " + b.n() + ") against " : "") + currentWave + " (n = " + c.n()
                + ")";
        Frame f = new Frame(WIDTH, 270, 58, 18, 40, 50);
        StringBuilder s = open(f, "numeric", title);
        legend(s, f, hasBaseline ? baselineWave + " (baseline, n = " + b.n() + ")" : null,
                currentWave + " (current, n = " + c.n() + ")");
        boolean perValue = pooled.size() <= MAX_DISTINCT_FOR_VALUE_BARS;
        double lo;
        double hi;
        double[] sb;
        double[] sc;
        Bins bins = null;
        double[] values = null;
        if (perValue) {
            values = new double[pooled.size()];
            for (int i = 0; i < values.length; i++) {
                values[i] = pooled.value(i);
            }
            double gap = minGap(values);
            lo = values[0] - gap / 2;
            hi = values[values.length - 1] + gap / 2;
            sb = valueShares(b, values);
            sc = valueShares(c, values);
        } else {
            bins = histogramBins(b, c);
            lo = bins.edge(0);
            hi = bins.edge(bins.count());
            sb = binShares(b, bins);
            sc = binShares(c, bins);
        }
        double ymax = Math.max(max(sb), max(sc));
        double[] yt = niceTicks(0, ymax > 0 ? ymax * 100 : 1, 5);
        double ytop = yt[yt.length - 1] / 100;
        yAxis(s, f, yt, 0, ytop, true);
        double[] xt;
        if (perValue && allWhole(pooled) && values.length <= 15) {
            xt = values;
        } else {
            xt = ticksInside(lo, hi, 7);
        }
        xAxis(s, f, xt, lo, hi, perValue ? 0 : bins.width());
        axisTitles(s, f, variable + (unit == null ? "" : " (" + unit + ")"),
                perValue ? "% of valid answers" : "% of valid answers per bin");
        if (perValue) {
            double gapPx = f.sx(lo + minGap(values), lo, hi) - f.sx(lo, lo, hi);
            double bw = Math.max(1, Math.min(18, gapPx * 0.4));
            for (int i = 0; i < values.length; i++) {
                double x = f.sx(values[i], lo, hi);
                if (hasBaseline) {
                    bar(s, "b", x - bw, f.sy(sb[i], 0, ytop), bw, f.y0() - f.sy(sb[i], 0, ytop),
                            baselineWave + ": " + number(values[i]) + " " + percent(sb[i]),
                            data(sb[i], Double.NaN, Double.NaN, baselineWave, number(values[i]), p.findingId()));
                }
                bar(s, "c", x, f.sy(sc[i], 0, ytop), bw, f.y0() - f.sy(sc[i], 0, ytop),
                        currentWave + ": " + number(values[i]) + " " + percent(sc[i]),
                        data(sc[i], Double.NaN, Double.NaN, currentWave, number(values[i]), p.findingId()));
            }
        } else {
            if (hasBaseline) {
                step(s, "b", f, bins, sb, lo, hi, ytop);
            }
            step(s, "c", f, bins, sc, lo, hi, ytop);
            s.append(String.format(Locale.ROOT, "<text class=\"note\" x=\"%d\" y=\"%d\" text-anchor=\"end\">bin width %s%s</text>",
                    f.width() - f.right(), f.top() - 6, esc(number(bins.width())), unit == null ? "" : " " + esc(unit)));
        }
        return s.append("</svg>").toString();
    }

    /** Largest and smallest magnitudes drawn as they are; beyond them spans, ticks and bin widths would overflow. */
    static final double LARGEST_DRAWN = 1e300;
    static final double SMALLEST_DRAWN = 1e-300;

    /**
     * The power of ten the values are drawn in units of: 0 for ordinary values; for magnitudes near the ends of
     * double precision (1e308, 5e-324) the decade of the largest one, so that every span, tick and bin width of the
     * drawing is an ordinary finite number.
     */
    static int drawingDecade(NumericDistribution pooled) {
        if (pooled.size() == 0) {
            return 0;
        }
        double largest = Math.max(Math.abs(pooled.value(0)), Math.abs(pooled.value(pooled.size() - 1)));
        if (largest <= LARGEST_DRAWN && (largest >= SMALLEST_DRAWN || largest == 0)) {
            return 0;
        }
        return (int) Math.floor(Math.log10(largest));
    }

    /** The values divided by 10^decade, in two steps so that neither power of ten leaves the doubles. */
    static NumericDistribution inDecades(NumericDistribution d, int decade) {
        if (decade == 0) {
            return d;
        }
        double first = Math.pow(10, decade / 2);
        double second = Math.pow(10, decade - decade / 2);
        java.util.Map<Double, Long> tally = new java.util.HashMap<>();
        for (int i = 0; i < d.size(); i++) {
            double x = d.value(i) / first / second;
            // Values far below the largest underflow to zero and are drawn there.
            tally.merge(x == 0 ? 0.0 : x, d.count(i), Long::sum);
        }
        return NumericDistribution.ofTally(tally);
    }

    /**
     * Grouped horizontal bars: for every label the baseline and the current share side by side, each with its
     * percentage. Used for category shares (of valid answers) and missing rates (of rows).
     *
     * @param axis the x axis title, e.g. "% of valid answers"
     */
    public static String shares(String kindClass, String title, List<String> labels, double[] shareB,
                                double[] shareC, String baselineWave, String currentWave, String axis) {
        return shares(kindClass, title, labels, shareB, shareC, baselineWave, baselineWave, currentWave, currentWave,
                axis, null);
    }

    /**
     * The same, with the waves' labels for the data attributes and the finding drawn; {@code shareB} and the
     * baseline's labels are null when there is no baseline wave.
     */
    static String shares(String kindClass, String title, List<String> labels, double[] shareB, double[] shareC,
                         String baselineLegend, String baselineWave, String currentLegend, String currentWave,
                         String axis, String findingId) {
        boolean hasBaseline = shareB != null;
        if (!hasBaseline) {
            shareB = new double[shareC.length];
        }
        if (labels.size() != shareB.length || labels.size() != shareC.length) {
            throw new IllegalArgumentException("labels, shareB and shareC must have one entry each, had "
                    + labels.size() + ", " + shareB.length + " and " + shareC.length);
        }
        int shown = Math.min(labels.size(), MAX_BARS);
        int row = 30;
        int labelWidth = 150;
        Frame f = new Frame(WIDTH, 40 + shown * row + 46, labelWidth + 8, 66, 40, 46);
        StringBuilder s = open(f, kindClass, title);
        legend(s, f, hasBaseline ? baselineLegend + " (baseline)" : null, currentLegend + " (current)");
        double ymax = Math.max(max(shareB), max(shareC));
        double[] xt = niceTicks(0, ymax > 0 ? ymax * 100 : 1, 6);
        double xtop = xt[xt.length - 1];
        percentAxis(s, f, xt, axis);
        for (int i = 0; i < shown; i++) {
            double y = f.y1() + i * row + 4;
            String label = labels.get(i);
            String cut = label.length() > 24 ? label.substring(0, 23) + "\u2026" : label;
            s.append(String.format(Locale.ROOT, "<text class=\"cat\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\"><title>%s</title>%s</text>",
                    labelWidth, y + 15, esc(label), esc(cut.isEmpty() ? "(empty)" : cut)));
            double wb = f.sx(100 * shareB[i], 0, xtop) - f.x0();
            double wc = f.sx(100 * shareC[i], 0, xtop) - f.x0();
            if (hasBaseline) {
                bar(s, "b", f.x0(), y, wb, 10, baselineLegend + ", " + label + ": " + percent(shareB[i]),
                        data(shareB[i], Double.NaN, Double.NaN, baselineWave, label, findingId));
                s.append(String.format(Locale.ROOT, "<text class=\"val b\" x=\"%.1f\" y=\"%.1f\">%s</text>",
                        f.x0() + wb + 4, y + 9, esc(percent(shareB[i]))));
            }
            bar(s, "c", f.x0(), y + 11, wc, 10, currentLegend + ", " + label + ": " + percent(shareC[i]),
                    data(shareC[i], Double.NaN, Double.NaN, currentWave, label, findingId));
            s.append(String.format(Locale.ROOT, "<text class=\"val c\" x=\"%.1f\" y=\"%.1f\">%s</text>",
                    f.x0() + wc + 4, y + 20, esc(percent(shareC[i]))));
        }
        if (labels.size() > shown) {
            s.append(String.format(Locale.ROOT, "<text class=\"note\" x=\"%.1f\" y=\"%d\" text-anchor=\"end\">%d more not drawn</text>",
                    f.x1(), f.top() - 6, labels.size() - shown));
        }
        return s.append("</svg>").toString();
    }

    /** Category shares of valid answers, both waves. */
    public static String shares(String variable, VariablePlot.SharesPlot p, String baselineWave, String currentWave) {
        long[] b = p.baseline();
        long[] c = p.current();
        long nc = sum(c);
        if (b == null) {
            return shares("shares", "Shares of " + variable + " by category: " + currentWave + " (n = " + nc + ")",
                    p.categories(), null, divide(c, nc), null, null, currentWave + " n = " + nc, currentWave,
                    "% of valid answers", p.findingId());
        }
        long nb = sum(b);
        return shares("shares", "Shares of " + variable + " by category: " + baselineWave + " (n = " + nb
                        + ") against " + currentWave + " (n = " + nc + ")", p.categories(), divide(b, nb),
                divide(c, nc), baselineWave + " n = " + nb, baselineWave, currentWave + " n = " + nc, currentWave,
                "% of valid answers", p.findingId());
    }

    /** Each wave's correlations with their intervals, points and whiskers on the scale from -1 to 1. */
    public static String correlation(String relationship, VariablePlot.CorrelationPlot p, String baselineWave,
                                     String currentWave) {
        int row = 34;
        int labelWidth = 110;
        int shown = p.labels().size();
        Frame f = new Frame(WIDTH, 40 + shown * row + 46, labelWidth + 8, 30, 40, 46);
        boolean intervals = false;
        for (int i = 0; i < shown; i++) {
            intervals |= hasWidth(p.baseline()[i][1], p.baseline()[i][2]) || hasWidth(p.current()[i][1],
                    p.current()[i][2]);
        }
        StringBuilder s = open(f, "correlation", "Correlations of " + relationship + ": " + baselineWave
                + " against " + currentWave + (intervals ? ", with confidence intervals" : ""));
        legend(s, f, baselineWave + " (baseline)", currentWave + " (current)");
        for (double t = -1; t <= 1.0001; t += 0.5) {
            double x = f.sx(t, -1, 1);
            s.append(String.format(Locale.ROOT, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                    x, f.y1(), x, f.y0()));
            s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                    x, f.y0() + 14, esc(tickLabel(t, 0.5))));
        }
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">%s</text>",
                (f.x0() + f.x1()) / 2, f.height() - 8, esc("correlation (-1 to 1)")));
        for (int i = 0; i < shown; i++) {
            double y = f.y1() + i * row + 6;
            s.append(String.format(Locale.ROOT, "<text class=\"cat\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\">%s</text>",
                    labelWidth, y + 14, esc(p.labels().get(i))));
            whisker(s, f, "b", y + 6, p.baseline()[i], baselineWave + ", " + p.labels().get(i),
                    data(p.baseline()[i][0], p.baseline()[i][1], p.baseline()[i][2], baselineWave, p.labels().get(i),
                            p.findingId()));
            whisker(s, f, "c", y + 19, p.current()[i], currentWave + ", " + p.labels().get(i),
                    data(p.current()[i][0], p.current()[i][1], p.current()[i][2], currentWave, p.labels().get(i),
                            p.findingId()));
        }
        return s.append("</svg>").toString();
    }

    private static void whisker(StringBuilder s, Frame f, String cls, double y, double[] e, String what,
                                String data) {
        boolean interval = hasWidth(e[1], e[2]);
        double x = f.sx(e[0], -1, 1);
        double lo = interval ? f.sx(Math.max(-1, e[1]), -1, 1) : x;
        double hi = interval ? f.sx(Math.min(1, e[2]), -1, 1) : x;
        String tip = what + ": " + number(e[0]) + (interval ? " (" + number(e[1]) + " to " + number(e[2]) + ")" : "");
        s.append(String.format(Locale.ROOT, "<g class=\"whisker %s\"%s><title>%s</title>%s<circle class=\"pt %s\""
                + " cx=\"%.1f\" cy=\"%.1f\" r=\"4\"/><text class=\"val %s\" x=\"%.1f\" y=\"%.1f\">%s</text></g>", cls, data,
                esc(tip), ciLine(interval, cls, lo, y, hi), cls, x, y, cls, hi + 5, y + 4, esc(number(e[0]))));
    }

    /** A whisker's line from {@code lo} to {@code hi} at height {@code y}, or nothing when there is no interval. */
    private static String ciLine(boolean interval, String cls, double lo, double y, double hi) {
        return interval ? String.format(Locale.ROOT, "<line class=\"ci %s\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\""
                + " y2=\"%.1f\"/>", cls, lo, y, hi, y) : "";
    }

    /** Missing rate by reason, both waves, as a share of the wave's rows. */
    public static String missing(String variable, VariablePlot.MissingPlot p, String baselineWave,
                                 String currentWave) {
        if (p.baseline() == null) {
            // A first wave has no baseline: nothing is drawn or named for it.
            return shares("missing", "Missing answers of " + variable + " by reason: " + currentWave + " ("
                            + p.rowsCurrent() + " rows)", p.reasons(), null, divide(p.current(), p.rowsCurrent()),
                    null, null, currentWave + " " + p.rowsCurrent() + " rows", currentWave, "% of rows in the wave",
                    p.findingId());
        }
        return shares("missing", "Missing answers of " + variable + " by reason: " + baselineWave + " ("
                        + p.rowsBaseline() + " rows) against " + currentWave + " (" + p.rowsCurrent() + " rows)",
                p.reasons(), divide(p.baseline(), p.rowsBaseline()), divide(p.current(), p.rowsCurrent()),
                baselineWave + " " + p.rowsBaseline() + " rows", baselineWave, currentWave + " " + p.rowsCurrent()
                        + " rows", currentWave, "% of rows in the wave", p.findingId());
    }

    /**
     * A small line chart of one statistic across all waves, wave labels on the x axis, with its confidence band
     * (where the waves have intervals) and, for a reference finding, the reference as a dashed line. Shares are
     * drawn in percent, as the sentence states them. A wave without data (NaN) breaks the line; the point of
     * {@code currentWave} is marked.
     */
    public static String sparkline(String variable, Trend t, String currentWave) {
        List<Double> all = new ArrayList<>(t.values());
        all.addAll(t.lows());
        all.addAll(t.highs());
        all.add(t.reference());
        int decade = t.percent() ? 0 : decadeOf(all);
        String given = t.unit() == null || t.unit().isBlank() ? null : t.unit();
        String unit = t.percent() ? "%" : decade == 0 ? given : "\u00d7 1e" + decade + (given == null ? "" : " " + given);
        java.util.function.DoubleUnaryOperator scale = t.percent() ? v -> 100 * v : v -> inDecade(v, decade);
        int n = t.waves().size();
        String measure = t.measure() + (unit == null ? "" : " (" + unit + ")");
        String title = "Trend of " + measure + " for " + variable + " across " + n + " wave(s)"
                + (hasInterval(t) ? ", with confidence intervals" : "");
        int maxLabel = t.waves().stream().mapToInt(String::length).max().orElse(1);
        boolean rotate = n > 1 && (SPARK_WIDTH - 70.0) / n < maxLabel * 6.5;
        int bottom = rotate ? (int) Math.min(100, 34 + maxLabel * 4.6) : 40;
        Frame f = new Frame(SPARK_WIDTH, 150 + bottom, 58, 20, 28, bottom);
        StringBuilder s = open(f, "trend", title);
        s.append(String.format(Locale.ROOT, "<text class=\"chart-title\" x=\"%d\" y=\"16\">%s</text>", f.left() - 50,
                esc(measure)));
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            for (double v : new double[] {t.values().get(i), t.lows().get(i), t.highs().get(i)}) {
                if (!Double.isNaN(v) && !Double.isNaN(t.values().get(i))) {
                    lo = Math.min(lo, scale.applyAsDouble(v));
                    hi = Math.max(hi, scale.applyAsDouble(v));
                }
            }
        }
        if (!Double.isNaN(t.reference())) {
            lo = Math.min(lo, scale.applyAsDouble(t.reference()));
            hi = Math.max(hi, scale.applyAsDouble(t.reference()));
        }
        if (lo == Double.POSITIVE_INFINITY) {
            s.append(String.format(Locale.ROOT, "<text class=\"note\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">no data in any wave</text>",
                    (f.x0() + f.x1()) / 2, (f.y0() + f.y1()) / 2));
            return s.append("</svg>").toString();
        }
        if (t.percent()) {
            lo = Math.max(0, lo);
            hi = Math.min(100, hi);
        }
        double[] yt = niceTicks(lo, hi, 4);
        double ylo = yt[0];
        double yhi = yt[yt.length - 1];
        yAxis(s, f, yt, ylo, yhi, false);
        double slot = (f.x1() - f.x0()) / Math.max(1, n);
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
        // The band: one polygon per run of waves that all have an interval.
        StringBuilder upper = new StringBuilder();
        StringBuilder lower = new StringBuilder();
        for (int i = 0; i <= n; i++) {
            boolean in = i < n && !Double.isNaN(t.values().get(i)) && hasWidth(t.lows().get(i), t.highs().get(i));
            if (in) {
                double x = f.x0() + slot * (i + 0.5);
                upper.append(String.format(Locale.ROOT, "%.1f,%.1f ", x, f.sy(scale.applyAsDouble(t.highs().get(i)), ylo, yhi)));
                lower.insert(0, String.format(Locale.ROOT, "%.1f,%.1f ", x, f.sy(scale.applyAsDouble(t.lows().get(i)), ylo, yhi)));
            } else if (upper.length() > 0) {
                s.append("<polygon class=\"band\" points=\"").append((upper.toString() + lower).trim())
                        .append("\"/>");
                upper.setLength(0);
                lower.setLength(0);
            }
        }
        if (!Double.isNaN(t.reference())) {
            double y = f.sy(scale.applyAsDouble(t.reference()), ylo, yhi);
            s.append(String.format(Locale.ROOT, "<line class=\"ref\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\""
                            + " data-reference=\"%s\"%s%s><title>%s</title></line>", f.x0(), y, f.x1(), y,
                    full(t.reference()), t.category() == null ? "" : " data-category=\"" + esc(t.category()) + "\"",
                    t.findingId() == null ? "" : " data-finding=\"" + esc(t.findingId()) + "\"",
                    esc("reference: " + number(scale.applyAsDouble(t.reference())) + (unit == null ? "" : " " + unit))));
        }
        List<StringBuilder> segments = new ArrayList<>();
        StringBuilder seg = null;
        for (int i = 0; i < n; i++) {
            double x = f.x0() + slot * (i + 0.5);
            String w = t.waves().get(i);
            if (rotate) {
                s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"end\" transform=\"rotate(-40 %.1f %.1f)\">%s</text>",
                        x, f.y0() + 14, x, f.y0() + 14, esc(w)));
            } else {
                s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                        x, f.y0() + 14, esc(w)));
            }
            double v = t.values().get(i);
            if (Double.isNaN(v)) {
                seg = null;
                continue;
            }
            double y = f.sy(scale.applyAsDouble(v), ylo, yhi);
            if (seg == null) {
                seg = new StringBuilder();
                segments.add(seg);
            }
            seg.append(String.format(Locale.ROOT, "%.1f,%.1f ", x, y));
        }
        for (StringBuilder sg : segments) {
            s.append("<polyline class=\"line\" points=\"").append(sg.toString().trim()).append("\"/>");
        }
        for (int i = 0; i < n; i++) {
            double v = t.values().get(i);
            if (Double.isNaN(v)) {
                continue;
            }
            double x = f.x0() + slot * (i + 0.5);
            double y = f.sy(scale.applyAsDouble(v), ylo, yhi);
            boolean cur = t.waves().get(i).equals(currentWave);
            double l = t.lows().get(i);
            double h = t.highs().get(i);
            String tip = t.waves().get(i) + ": " + number(scale.applyAsDouble(v)) + (unit == null ? "" : " " + unit)
                    + (Double.isNaN(l) ? "" : " (" + number(scale.applyAsDouble(l)) + " to " + number(scale.applyAsDouble(h)) + ")");
            s.append(String.format(Locale.ROOT, "<circle class=\"%s\" cx=\"%.1f\" cy=\"%.1f\" r=\"%s\"%s><title>%s</title></circle>",
                    cur ? "pt cur" : "pt", x, y, cur ? "4.5" : "3",
                    data(v, l, h, t.waves().get(i), t.category(), t.findingId()), esc(tip)));
            if (cur) {
                s.append(String.format(Locale.ROOT, "<text class=\"val c\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                        x, Math.max(f.y1() + 10, y - 8), esc(number(scale.applyAsDouble(v)))));
            }
        }
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">wave</text>",
                (f.x0() + f.x1()) / 2, f.height() - 6));
        return s.append("</svg>").toString();
    }

    /**
     * The power of ten finite values are drawn in units of: 0 for ordinary magnitudes, otherwise that of the
     * largest (as {@link #drawingDecade} for a histogram).
     */
    static int decadeOf(List<Double> values) {
        double largest = 0;
        for (double v : values) {
            if (Double.isFinite(v)) {
                largest = Math.max(largest, Math.abs(v));
            }
        }
        return largest == 0 || largest <= LARGEST_DRAWN && largest >= SMALLEST_DRAWN ? 0
                : (int) Math.floor(Math.log10(largest));
    }

    /** {@code v / 10^decade}, in two steps so that neither power of ten leaves the doubles. */
    static double inDecade(double v, int decade) {
        if (decade == 0 || Double.isNaN(v)) {
            return v;
        }
        return v / Math.pow(10, decade / 2) / Math.pow(10, decade - decade / 2);
    }

    private static boolean hasInterval(Trend t) {
        for (int i = 0; i < t.lows().size(); i++) {
            if (hasWidth(t.lows().get(i), t.highs().get(i))) {
                return true;
            }
        }
        return false;
    }

    /**
     * Whether an interval is drawn: only one of positive width. NaN limits mean none was computed (too few answers);
     * limits equal to the estimate are those of a complete enumeration, which has no sampling error, and a whisker
     * of no length would still read as one.
     */
    static boolean hasWidth(double low, double high) {
        return high > low;
    }

    /**
     * The estimates a finding was judged on, each with its confidence interval: for shares, grouped bars per
     * category (the category the sentence names first) with error bars, in percent; for a mean or median, one
     * point with whiskers per wave on the variable's scale. A reference finding's reference is a dashed mark.
     * Every bar or point carries its numbers as data attributes ({@link #data}).
     */
    public static String estimates(String variable, VariablePlot.EstimatePlot p, String baselineWave,
                                   String currentWave) {
        var plotted = p.plotted();
        return plotted.estimator().percent() ? shareEstimates(variable, p, baselineWave, currentWave)
                : locationEstimates(variable, p, baselineWave, currentWave);
    }

    private static String shareEstimates(String variable, VariablePlot.EstimatePlot p, String baselineWave,
                                         String currentWave) {
        var plotted = p.plotted();
        boolean hasBaseline = !plotted.baseline().isEmpty();
        boolean hasReference = !plotted.reference().isEmpty();
        int shown = Math.min(plotted.current().size(), MAX_BARS);
        int row = 30;
        int labelWidth = 150;
        Frame f = new Frame(WIDTH, 40 + shown * row + 46, labelWidth + 8, 66, 40, 46);
        boolean intervals = java.util.stream.Stream.of(plotted.baseline(), plotted.current()).flatMap(List::stream)
                .anyMatch(e -> hasWidth(e.low(), e.high()));
        String title = capitalised(plotted.statistic()) + " of " + variable + (intervals
                ? ", each category with its confidence interval: " : ", each category: ") + (hasBaseline ? baselineWave + " against " : "") + currentWave
                + (hasReference ? ", with the reference shares" : "");
        StringBuilder s = open(f, "shares estimates", title);
        legend(s, f, hasBaseline ? baselineWave + " (baseline)" : null, currentWave + " (current)"
                + (hasReference ? "; dashed: reference" : ""));
        double top = 0;
        for (int i = 0; i < shown; i++) {
            top = Math.max(top, upperOf(plotted.current().get(i)));
            if (hasBaseline) {
                top = Math.max(top, upperOf(plotted.baseline().get(i)));
            }
            if (hasReference) {
                top = Math.max(top, plotted.reference().get(i).value());
            }
        }
        double[] xt = niceTicks(0, top > 0 ? Math.min(100, top * 100) : 1, 6);
        double xtop = xt[xt.length - 1];
        percentAxis(s, f, xt, shareAxis(plotted));
        for (int i = 0; i < shown; i++) {
            double y = f.y1() + i * row + 4;
            var c = plotted.current().get(i);
            String label = categoryName(c);
            String cut = label.length() > 24 ? label.substring(0, 23) + "\u2026" : label;
            s.append(String.format(Locale.ROOT, "<text class=\"cat\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\"><title>%s</title>%s</text>",
                    labelWidth, y + 15, esc(label), esc(cut.isEmpty() ? "(empty)" : cut)));
            if (hasBaseline) {
                shareBar(s, f, "b", y, xtop, plotted.baseline().get(i), baselineWave, p.findingId());
            }
            shareBar(s, f, "c", y + 11, xtop, c, currentWave, p.findingId());
            if (hasReference) {
                double r = plotted.reference().get(i).value();
                double x = f.sx(100 * r, 0, xtop);
                s.append(String.format(Locale.ROOT, "<line class=\"ref\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\""
                                + " data-reference=\"%s\" data-category=\"%s\"%s><title>%s</title></line>", x, y - 2, x,
                        y + 23, full(r), esc(label), p.findingId() == null ? ""
                                : " data-finding=\"" + esc(p.findingId()) + "\"",
                        esc("reference for " + label + ": " + percent(r))));
            }
        }
        if (plotted.current().size() > shown) {
            s.append(String.format(Locale.ROOT, "<text class=\"note\" x=\"%.1f\" y=\"%d\" text-anchor=\"end\">%d more not drawn</text>",
                    f.x1(), f.top() - 6, plotted.current().size() - shown));
        }
        return s.append("</svg>").toString();
    }

    /** "Council tenant (COUN)": a category by its value label with its code, or the code alone. */
    static String categoryName(org.wavewarden.compare.WaveEstimates.Estimate e) {
        String code = e.category() == null ? "" : e.category();
        return e.label() == null ? code : e.label() + " (" + code + ")";
    }

    private static void shareBar(StringBuilder s, Frame f, String cls, double y, double xtop,
                                 org.wavewarden.compare.WaveEstimates.Estimate e, String wave, String findingId) {
        double w = Double.isNaN(e.value()) ? 0 : f.sx(100 * e.value(), 0, xtop) - f.x0();
        boolean interval = hasWidth(e.low(), e.high());
        String tip = wave + ", " + categoryName(e) + ": " + percent(e.value()) + (!interval ? ""
                : " (" + percent(e.low()) + " to " + percent(e.high()) + ")");
        s.append("<g class=\"est ").append(cls).append('"')
                .append(data(e.value(), e.low(), e.high(), wave, e.category(), findingId)).append('>');
        bar(s, cls, f.x0(), y, w, 10, tip, "");
        if (interval) {
            double lo = f.sx(100 * e.low(), 0, xtop);
            double hi = f.sx(100 * e.high(), 0, xtop);
            s.append(String.format(Locale.ROOT, "<line class=\"ci %s\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>"
                    + "<line class=\"ci %s\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>"
                    + "<line class=\"ci %s\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>", cls, lo, y + 5, hi,
                    y + 5, cls, lo, y + 2, lo, y + 8, cls, hi, y + 2, hi, y + 8));
        }
        double end = !interval ? f.x0() + w : Math.max(f.x0() + w, f.sx(100 * e.high(), 0, xtop));
        s.append(String.format(Locale.ROOT, "<text class=\"val %s\" x=\"%.1f\" y=\"%.1f\">%s</text></g>", cls, end + 4,
                y + 9, esc(percent(e.value()))));
    }

    private static String locationEstimates(String variable, VariablePlot.EstimatePlot p, String baselineWave,
                                            String currentWave) {
        var plotted = p.plotted();
        boolean hasBaseline = !plotted.baseline().isEmpty();
        boolean hasReference = !plotted.reference().isEmpty();
        String unit0 = plotted.unit() == null || plotted.unit().isBlank() ? null : plotted.unit();
        String unit = unit0;
        List<org.wavewarden.compare.WaveEstimates.Estimate> rows = new ArrayList<>();
        List<String> waves = new ArrayList<>();
        if (hasBaseline) {
            rows.add(plotted.baseline().get(0));
            waves.add(baselineWave);
        }
        rows.add(plotted.current().get(0));
        waves.add(currentWave);
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (var e : rows) {
            for (double v : new double[] {e.value(), e.low(), e.high()}) {
                if (!Double.isNaN(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        Double reference = hasReference ? plotted.reference().get(0).value() : null;
        if (reference != null) {
            lo = Math.min(lo, reference);
            hi = Math.max(hi, reference);
        }
        List<Double> all = new ArrayList<>(List.of(lo, hi));
        int decade = decadeOf(all);
        if (decade != 0) {
            unit = "\u00d7 1e" + decade + (unit == null ? "" : " " + unit);
            lo = inDecade(lo, decade);
            hi = inDecade(hi, decade);
        }
        int row = 34;
        int labelWidth = 110;
        Frame f = new Frame(WIDTH, 40 + rows.size() * row + 46, labelWidth + 8, 30, 40, 46);
        String axis = capitalised(plotted.statistic()) + (unit == null ? "" : " (" + unit + ")");
        boolean intervals = rows.stream().anyMatch(e -> hasWidth(e.low(), e.high()));
        StringBuilder s = open(f, "location estimates", axis + (intervals ? " with its confidence interval: " : ": ")
                + (hasBaseline ? baselineWave + " against " : "") + currentWave
                + (reference == null ? "" : ", with the reference"));
        legend(s, f, hasBaseline ? baselineWave + " (baseline)" : null, currentWave + " (current)"
                + (reference == null ? "" : "; dashed: reference"));
        double[] xt = niceTicks(lo, hi, 6);
        double xlo = xt[0];
        double xhi = xt[xt.length - 1];
        for (double t : xt) {
            double x = f.sx(t, xlo, xhi);
            s.append(String.format(Locale.ROOT, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                    x, f.y1(), x, f.y0()));
            s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                    x, f.y0() + 14, esc(tickLabel(t, xt.length > 1 ? xt[1] - xt[0] : 1))));
        }
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">%s</text>",
                (f.x0() + f.x1()) / 2, f.height() - 8, esc(axis)));
        if (reference != null) {
            double x = f.sx(inDecade(reference, decade), xlo, xhi);
            s.append(String.format(Locale.ROOT, "<line class=\"ref\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\""
                            + " data-reference=\"%s\"%s><title>%s</title></line>", x, f.y1(), x, f.y0(),
                    full(reference), p.findingId() == null ? "" : " data-finding=\"" + esc(p.findingId()) + "\"",
                    esc("reference: " + number(inDecade(reference, decade)) + (unit == null ? "" : " " + unit))));
        }
        for (int i = 0; i < rows.size(); i++) {
            var e = rows.get(i);
            String cls = i == rows.size() - 1 ? "c" : "b";
            double y = f.y1() + i * row + 12;
            s.append(String.format(Locale.ROOT, "<text class=\"cat\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\">%s</text>",
                    labelWidth, y + 4, esc(waves.get(i))));
            double x = f.sx(inDecade(e.value(), decade), xlo, xhi);
            boolean interval = hasWidth(e.low(), e.high());
            double l = interval ? f.sx(inDecade(e.low(), decade), xlo, xhi) : x;
            double h = interval ? f.sx(inDecade(e.high(), decade), xlo, xhi) : x;
            String tip = waves.get(i) + ": " + number(inDecade(e.value(), decade)) + (unit == null ? "" : " " + unit)
                    + (interval ? " (" + number(inDecade(e.low(), decade)) + " to " + number(inDecade(e.high(),
                    decade)) + ")" : "");
            s.append(String.format(Locale.ROOT, "<g class=\"whisker est %s\"%s><title>%s</title>%s<circle class=\"pt %s\""
                            + " cx=\"%.1f\" cy=\"%.1f\" r=\"4\"/><text class=\"val %s\" x=\"%.1f\" y=\"%.1f\">%s</text></g>",
                    cls, data(e.value(), e.low(), e.high(), waves.get(i), null, p.findingId()), esc(tip),
                    ciLine(interval, cls, l, y, h), cls, x, y, cls, h + 5, y + 4,
                    esc(number(inDecade(e.value(), decade)))));
        }
        return s.append("</svg>").toString();
    }

    /**
     * A change of shape: both waves' cumulative distributions as step curves (the share of each wave, weighted
     * where the finding is, at or below each value) and the largest gap between them as a vertical bar, whose length
     * is the finding's KS distance. Every step carries its value and cumulative share, and the gap its distance,
     * interval and the two shares it joins, as data attributes.
     */
    public static String cumulative(String variable, VariablePlot.CumulativePlot p, String baselineWave,
                                    String currentWave) {
        var d = p.shape();
        String id = p.findingId();
        List<Double> xs = new ArrayList<>();
        for (var st : d.current()) {
            xs.add(st.value());
        }
        int decade = decadeOf(xs);
        String given = d.unit() == null || d.unit().isBlank() ? null : d.unit();
        String unit = decade == 0 ? given : "\u00d7 1e" + decade + (given == null ? "" : " " + given);
        double lo = inDecade(xs.get(0), decade);
        double hi = inDecade(xs.get(xs.size() - 1), decade);
        if (hi <= lo) {
            hi = lo + 1;
        }
        Frame f = new Frame(WIDTH, 300, 58, 20, 40, 46);
        String share = d.weighted() ? "weighted share at or below (%)" : "share of answers at or below (%)";
        String title = "Cumulative distributions of " + variable + (d.weighted() ? " (weighted)" : "") + ": "
                + baselineWave + " against " + currentWave + "; the bar marks the largest gap, KS distance "
                + number(d.distance());
        StringBuilder s = open(f, "cumulative", title);
        legend(s, f, baselineWave + " (baseline)", currentWave + " (current)");
        double[] xt = niceTicks(lo, hi, 6);
        double xlo = Math.min(lo, xt[0]);
        double xhi = Math.max(hi, xt[xt.length - 1]);
        xAxis(s, f, ticksInside(xlo, xhi, 6), xlo, xhi, 0);
        yAxis(s, f, new double[] {0, 25, 50, 75, 100}, 0, 1, true);
        axisTitles(s, f, variable + (unit == null ? "" : " (" + unit + ")"), share);
        String[] cls = {"b", "c"};
        String[] waves = {baselineWave, currentWave};
        List<List<org.wavewarden.compare.shape.CumulativeGap.Step>> curves = List.of(d.baseline(), d.current());
        for (int k = 0; k < 2; k++) {
            StringBuilder pts = new StringBuilder();
            StringBuilder marks = new StringBuilder();
            double prev = 0;
            for (var st : curves.get(k)) {
                double x = f.sx(inDecade(st.value(), decade), xlo, xhi);
                pts.append(String.format(Locale.ROOT, "%.1f,%.1f %.1f,%.1f ", x, f.sy(prev, 0, 1), x,
                        f.sy(st.cumulative(), 0, 1)));
                prev = st.cumulative();
                marks.append(String.format(Locale.ROOT, "<circle class=\"step %s\" cx=\"%.1f\" cy=\"%.1f\" r=\"1.5\""
                                + " data-at=\"%s\"%s/>", cls[k], x, f.sy(st.cumulative(), 0, 1), full(st.value()),
                        data(st.cumulative(), Double.NaN, Double.NaN, waves[k], null, id)));
            }
            pts.append(String.format(Locale.ROOT, "%.1f,%.1f", f.x1(), f.sy(prev, 0, 1)));
            s.append("<polyline class=\"cdf ").append(cls[k]).append("\" fill=\"none\" points=\"")
                    .append(pts.toString().trim()).append("\"/>").append(marks);
        }
        double gx = f.sx(inDecade(d.at(), decade), xlo, xhi);
        var ci = d.interval();
        String tip = "largest gap at " + number(d.at()) + (given == null ? "" : " " + given) + ": "
                + percent(d.cdfBaseline()) + " of " + baselineWave + " and " + percent(d.cdfCurrent()) + " of "
                + currentWave + " at or below it; KS distance " + number(d.distance())
                + (hasWidth(ci.ciLow(), ci.ciHigh()) ? " (" + Math.round(100 * ci.confidence()) + "% CI "
                + number(ci.ciLow()) + " to " + number(ci.ciHigh()) + ")" : "");
        s.append(String.format(Locale.ROOT, "<line class=\"gap\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\""
                        + " data-at=\"%s\" data-baseline=\"%s\" data-current=\"%s\"%s><title>%s</title></line>", gx,
                f.sy(d.cdfBaseline(), 0, 1), gx, f.sy(d.cdfCurrent(), 0, 1), full(d.at()), full(d.cdfBaseline()),
                full(d.cdfCurrent()), data(d.distance(), ci.ciLow(), ci.ciHigh(), null, "KS distance", id), esc(tip)));
        s.append(String.format(Locale.ROOT, "<text class=\"val\" x=\"%.1f\" y=\"%.1f\">%s</text>", gx + 5,
                f.sy((d.cdfBaseline() + d.cdfCurrent()) / 2, 0, 1) + 4, esc("D = " + number(d.distance()))));
        return s.append("</svg>").toString();
    }

    /**
     * Dates compared: per wave the span from its earliest to its latest date as a line and its median date as a
     * point with whiskers for the median's interval, on an axis of dates. Every median carries its day number
     * (days since 1970-01-01), interval and ISO date, and every span its two ends, as data attributes.
     */
    public static String dates(String variable, VariablePlot.DatePlot p, String baselineWave, String currentWave) {
        var d = p.dates();
        String id = p.findingId();
        double[][] spans = {{day(d.earliestBaseline()), day(d.latestBaseline())},
                {day(d.earliestCurrent()), day(d.latestCurrent())}};
        org.wavewarden.compare.EffectSize[] medians = {d.medianBaselineInterval(), d.medianCurrentInterval()};
        String[] iso = {d.medianBaseline(), d.medianCurrent()};
        String[][] ends = {{d.earliestBaseline(), d.latestBaseline()}, {d.earliestCurrent(), d.latestCurrent()}};
        double lo = Math.min(spans[0][0], spans[1][0]);
        double hi = Math.max(spans[0][1], spans[1][1]);
        if (hi <= lo) {
            hi = lo + 1;
        }
        int row = 40;
        int labelWidth = 110;
        Frame f = new Frame(WIDTH, 40 + 2 * row + 46, labelWidth + 8, 40, 40, 46);
        boolean intervals = hasWidth(medians[0].ciLow(), medians[0].ciHigh())
                || hasWidth(medians[1].ciLow(), medians[1].ciHigh());
        StringBuilder s = open(f, "dates estimates", "Median date of " + variable
                + (intervals ? " with its confidence interval," : ",") + " and the span of the dates: " + baselineWave + " against " + currentWave);
        legend(s, f, baselineWave + " (baseline)", currentWave + " (current)");
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
        for (int k = 0; k <= 4; k++) {
            double t = lo + k * (hi - lo) / 4;
            double x = f.sx(t, lo, hi);
            s.append(String.format(Locale.ROOT, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>"
                            + "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>", x, f.y1(), x,
                    f.y0(), x, f.y0() + 14, esc(org.wavewarden.compare.DateComparison.DateDetail.date(t))));
        }
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">%s</text>",
                (f.x0() + f.x1()) / 2, f.height() - 8, esc("date")));
        String[] cls = {"b", "c"};
        String[] waves = {baselineWave, currentWave};
        for (int i = 0; i < 2; i++) {
            double y = f.y1() + i * row + 14;
            s.append(String.format(Locale.ROOT, "<text class=\"cat\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\">%s</text>",
                    labelWidth, y + 4, esc(waves[i])));
            s.append(String.format(Locale.ROOT, "<line class=\"span %s\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\""
                            + " data-from=\"%s\" data-to=\"%s\"%s><title>%s</title></line>", cls[i],
                    f.sx(spans[i][0], lo, hi), y + 10, f.sx(spans[i][1], lo, hi), y + 10, esc(ends[i][0]),
                    esc(ends[i][1]), data(Double.NaN, spans[i][0], spans[i][1], waves[i], "span", id),
                    esc(waves[i] + ": dates from " + ends[i][0] + " to " + ends[i][1])));
            var m = medians[i];
            double x = f.sx(m.estimate(), lo, hi);
            boolean interval = hasWidth(m.ciLow(), m.ciHigh());
            double l = interval ? f.sx(m.ciLow(), lo, hi) : x;
            double h = interval ? f.sx(m.ciHigh(), lo, hi) : x;
            String tip = waves[i] + ": median date " + iso[i] + (interval ? " (" + Math.round(100 * m.confidence())
                    + "% CI " + org.wavewarden.compare.DateComparison.DateDetail.date(m.ciLow()) + " to "
                    + org.wavewarden.compare.DateComparison.DateDetail.date(m.ciHigh()) + ")" : "");
            s.append(String.format(Locale.ROOT, "<g class=\"whisker est %s\" data-date=\"%s\"%s><title>%s</title>"
                            + "%s<circle class=\"pt %s\" cx=\"%.1f\" cy=\"%.1f\" r=\"4\"/><text class=\"val %s\" x=\"%.1f\""
                            + " y=\"%.1f\">%s</text></g>",
                    cls[i], esc(iso[i]), data(m.estimate(), m.ciLow(), m.ciHigh(), waves[i], "median date", id),
                    esc(tip), ciLine(interval, cls[i], l, y, h), cls[i], x, y, cls[i], h + 5, y + 4, esc(iso[i])));
        }
        return s.append("</svg>").toString();
    }

    private static double day(String iso) {
        return java.time.LocalDate.parse(iso).toEpochDay();
    }

    private static double upperOf(org.wavewarden.compare.WaveEstimates.Estimate e) {
        return Double.isNaN(e.high()) ? (Double.isNaN(e.value()) ? 0 : e.value()) : e.high();
    }

    private static String shareAxis(org.wavewarden.compare.WaveEstimates.Plotted p) {
        return switch (p.estimator()) {
            case WEIGHTED_SHARE, DESIGN_SHARE -> "weighted share (%)";
            default -> p.statistic().startsWith("share of rows") ? "% of rows in the wave" : "% of valid answers";
        };
    }

    private static String capitalised(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }


    // ---------------------------------------------------------------------------------------------- pieces

    private static StringBuilder open(Frame f, String kindClass, String title) {
        StringBuilder s = new StringBuilder(4096);
        s.append(String.format(Locale.ROOT, "<svg class=\"plot %s\" xmlns=\"http://www.w3.org/2000/svg\" role=\"img\" width=\"%d\" height=\"%d\" viewBox=\"0 0 %d %d\" aria-label=\"%s\"><title>%s</title>",
                kindClass, f.width(), f.height(), f.width(), f.height(), esc(title), esc(title)));
        return s;
    }

    private static void legend(StringBuilder s, Frame f, String baseline, String current) {
        int x = f.left();
        if (baseline == null) {
            s.append(String.format(Locale.ROOT, "<g class=\"legend\"><rect class=\"c\" x=\"%d\" y=\"8\" width=\"12\""
                    + " height=\"12\"/><text x=\"%d\" y=\"18\">%s</text></g>", x, x + 17, esc(current)));
            return;
        }
        s.append(String.format(Locale.ROOT, "<g class=\"legend\"><rect class=\"b\" x=\"%d\" y=\"8\" width=\"12\" height=\"12\"/>"
                + "<text x=\"%d\" y=\"18\">%s</text>", x, x + 17, esc(baseline)));
        int x2 = x + 30 + (int) (baseline.length() * 6.4);
        s.append(String.format(Locale.ROOT, "<rect class=\"c\" x=\"%d\" y=\"8\" width=\"12\" height=\"12\"/>"
                + "<text x=\"%d\" y=\"18\">%s</text></g>", x2, x2 + 17, esc(current)));
    }

    private static void yAxis(StringBuilder s, Frame f, double[] ticks, double lo, double hi, boolean percentAxis) {
        double step = ticks.length > 1 ? ticks[1] - ticks[0] : 1;
        for (double t : ticks) {
            double y = f.sy(percentAxis ? t / 100 : t, lo, hi);
            s.append(String.format(Locale.ROOT, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                    f.x0(), y, f.x1(), y));
            s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"end\">%s</text>",
                    f.x0() - 5, y + 4, esc(tickLabel(t, step))));
        }
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y1(), f.x0(), f.y0()));
    }

    private static void xAxis(StringBuilder s, Frame f, double[] ticks, double lo, double hi, double binWidth) {
        double step = ticks.length > 1 ? ticks[1] - ticks[0] : Math.max(binWidth, 1);
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
        for (double t : ticks) {
            double x = f.sx(t, lo, hi);
            s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                    x, f.y0(), x, f.y0() + 4));
            s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                    x, f.y0() + 16, esc(tickLabel(t, step))));
        }
    }

    private static void axisTitles(StringBuilder s, Frame f, String x, String y) {
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">%s</text>",
                (f.x0() + f.x1()) / 2, f.height() - 8, esc(x)));
        double cy = (f.y0() + f.y1()) / 2;
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"14\" y=\"%.1f\" text-anchor=\"middle\" transform=\"rotate(-90 14 %.1f)\">%s</text>",
                cy, cy, esc(y)));
    }

    private static void bar(StringBuilder s, String cls, double x, double y, double w, double h, String tip,
                            String data) {
        s.append(String.format(Locale.ROOT, "<rect class=\"bar %s\" x=\"%.1f\" y=\"%.1f\" width=\"%.1f\" height=\"%.1f\"%s><title>%s</title></rect>",
                cls, x, y, Math.max(0, w), Math.max(0, h), data, esc(tip)));
    }

    /**
     * The data attributes of one plotted number: its value and interval at full precision (the shortest decimal
     * that reads back as the same double; NaN where there is none), its wave, category and finding, so that every
     * number in a picture can be held to the finding it belongs to.
     */
    static String data(double value, double low, double high, String wave, String category, String findingId) {
        StringBuilder b = new StringBuilder(" data-value=\"").append(full(value)).append('"');
        if (!Double.isNaN(low) || !Double.isNaN(high)) {
            b.append(" data-low=\"").append(full(low)).append("\" data-high=\"").append(full(high)).append('"');
        }
        if (wave != null) {
            b.append(" data-wave=\"").append(esc(wave)).append('"');
        }
        if (category != null) {
            b.append(" data-category=\"").append(esc(category)).append('"');
        }
        if (findingId != null) {
            b.append(" data-finding=\"").append(esc(findingId)).append('"');
        }
        return b.toString();
    }

    static String full(double v) {
        return Double.isNaN(v) ? "NaN" : Double.toString(v);
    }

    /** A histogram as a closed step outline (filled lightly), so two waves stay readable when overlaid. */
    private static void step(StringBuilder s, String cls, Frame f, Bins bins, double[] shares, double lo, double hi,
                             double ytop) {
        StringBuilder pts = new StringBuilder();
        pts.append(String.format(Locale.ROOT, "%.1f,%.1f ", f.sx(bins.edge(0), lo, hi), f.y0()));
        for (int i = 0; i < bins.count(); i++) {
            double y = f.sy(shares[i], 0, ytop);
            pts.append(String.format(Locale.ROOT, "%.1f,%.1f %.1f,%.1f ", f.sx(bins.edge(i), lo, hi), y,
                    f.sx(bins.edge(i + 1), lo, hi), y));
        }
        pts.append(String.format(Locale.ROOT, "%.1f,%.1f", f.sx(bins.edge(bins.count()), lo, hi), f.y0()));
        s.append("<polygon class=\"hist ").append(cls).append("\" points=\"").append(pts).append("\"/>");
    }

    private static double[] ticksInside(double lo, double hi, int wanted) {
        double[] t = niceTicks(lo, hi, wanted);
        return java.util.Arrays.stream(t).filter(v -> v >= lo - 1e-9 * Math.abs(hi - lo)
                && v <= hi + 1e-9 * Math.abs(hi - lo)).toArray();
    }

    private static double[] valueShares(NumericDistribution d, double[] values) {
        double[] out = new double[values.length];
        long n = d.n();
        for (int i = 0; i < d.size(); i++) {
            int k = java.util.Arrays.binarySearch(values, d.value(i));
            out[k] = n == 0 ? 0 : (double) d.count(i) / n;
        }
        return out;
    }

    private static double minGap(double[] sorted) {
        if (sorted.length < 2) {
            return 1;
        }
        TreeSet<Double> gaps = new TreeSet<>();
        for (int i = 1; i < sorted.length; i++) {
            gaps.add(sorted[i] - sorted[i - 1]);
        }
        return gaps.first();
    }

    private static double max(double[] a) {
        double m = 0;
        for (double v : a) {
            m = Math.max(m, v);
        }
        return m;
    }

    private static long sum(long[] a) {
        long s = 0;
        for (long v : a) {
            s += v;
        }
        return s;
    }

    private static double[] divide(long[] a, long by) {
        double[] out = new double[a.length];
        for (int i = 0; i < a.length; i++) {
            out[i] = by == 0 ? 0 : (double) a[i] / by;
        }
        return out;
    }

    /** The horizontal percent axis of a bar chart: grid and tick at each of {@code xt}, both axis lines, the title. */
    private static void percentAxis(StringBuilder s, Frame f, double[] xt, String title) {
        double xtop = xt[xt.length - 1];
        for (double t : xt) {
            double x = f.sx(t, 0, xtop);
            s.append(String.format(Locale.ROOT, "<line class=\"grid\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                    x, f.y1(), x, f.y0()));
            s.append(String.format(Locale.ROOT, "<text class=\"tick\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                    x, f.y0() + 14, esc(tickLabel(t, xt.length > 1 ? xt[1] - xt[0] : 1))));
        }
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y1(), f.x0(), f.y0()));
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">%s</text>",
                (f.x0() + f.x1()) / 2, f.height() - 8, esc(title)));
    }
}
