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
        int decade = drawingDecade(p.baseline().merge(p.current()));
        NumericDistribution b = inDecades(p.baseline(), decade);
        NumericDistribution c = inDecades(p.current(), decade);
        NumericDistribution pooled = b.merge(c);
        String given = p.unit() == null || p.unit().isBlank() ? null : p.unit();
        String unit = decade == 0 ? given : "\u00d7 1e" + decade + (given == null ? "" : " " + given);
        String title = "Distribution of " + variable + (unit == null ? "" : " (" + unit + ")") + ": "
                + baselineWave + " (n = " + b.n() + ") against " + currentWave + " (n = " + c.n() + ")";
        Frame f = new Frame(WIDTH, 270, 58, 18, 40, 50);
        StringBuilder s = open(f, "numeric", title);
        legend(s, f, baselineWave + " (baseline, n = " + b.n() + ")", currentWave + " (current, n = " + c.n() + ")");
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
                bar(s, "b", x - bw, f.sy(sb[i], 0, ytop), bw, f.y0() - f.sy(sb[i], 0, ytop),
                        baselineWave + ": " + number(values[i]) + " " + percent(sb[i]));
                bar(s, "c", x, f.sy(sc[i], 0, ytop), bw, f.y0() - f.sy(sc[i], 0, ytop),
                        currentWave + ": " + number(values[i]) + " " + percent(sc[i]));
            }
        } else {
            step(s, "b", f, bins, sb, lo, hi, ytop);
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
        if (labels.size() != shareB.length || labels.size() != shareC.length) {
            throw new IllegalArgumentException("labels, shareB and shareC must have one entry each, had "
                    + labels.size() + ", " + shareB.length + " and " + shareC.length);
        }
        int shown = Math.min(labels.size(), MAX_BARS);
        int row = 30;
        int labelWidth = 150;
        Frame f = new Frame(WIDTH, 40 + shown * row + 46, labelWidth + 8, 66, 40, 46);
        StringBuilder s = open(f, kindClass, title);
        legend(s, f, baselineWave + " (baseline)", currentWave + " (current)");
        double ymax = Math.max(max(shareB), max(shareC));
        double[] xt = niceTicks(0, ymax > 0 ? ymax * 100 : 1, 6);
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
                (f.x0() + f.x1()) / 2, f.height() - 8, esc(axis)));
        for (int i = 0; i < shown; i++) {
            double y = f.y1() + i * row + 4;
            String label = labels.get(i);
            String cut = label.length() > 24 ? label.substring(0, 23) + "\u2026" : label;
            s.append(String.format(Locale.ROOT, "<text class=\"cat\" x=\"%d\" y=\"%.1f\" text-anchor=\"end\"><title>%s</title>%s</text>",
                    labelWidth, y + 15, esc(label), esc(cut.isEmpty() ? "(empty)" : cut)));
            double wb = f.sx(100 * shareB[i], 0, xtop) - f.x0();
            double wc = f.sx(100 * shareC[i], 0, xtop) - f.x0();
            bar(s, "b", f.x0(), y, wb, 10, baselineWave + ", " + label + ": " + percent(shareB[i]));
            bar(s, "c", f.x0(), y + 11, wc, 10, currentWave + ", " + label + ": " + percent(shareC[i]));
            s.append(String.format(Locale.ROOT, "<text class=\"val b\" x=\"%.1f\" y=\"%.1f\">%s</text>",
                    f.x0() + wb + 4, y + 9, esc(percent(shareB[i]))));
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
        long nb = sum(b);
        long nc = sum(c);
        return shares("shares", "Shares of " + variable + " by category: " + baselineWave + " (n = " + nb
                        + ") against " + currentWave + " (n = " + nc + ")", p.categories(), divide(b, nb),
                divide(c, nc), baselineWave + " n = " + nb, currentWave + " n = " + nc, "% of valid answers");
    }

    /** Each wave's correlations with their intervals, points and whiskers on the scale from -1 to 1. */
    public static String correlation(String relationship, VariablePlot.CorrelationPlot p, String baselineWave,
                                     String currentWave) {
        int row = 34;
        int labelWidth = 110;
        int shown = p.labels().size();
        Frame f = new Frame(WIDTH, 40 + shown * row + 46, labelWidth + 8, 30, 40, 46);
        StringBuilder s = open(f, "correlation", "Correlations of " + relationship + ": " + baselineWave
                + " against " + currentWave + ", with " + "confidence intervals");
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
            whisker(s, f, "b", y + 6, p.baseline()[i], baselineWave + ", " + p.labels().get(i));
            whisker(s, f, "c", y + 19, p.current()[i], currentWave + ", " + p.labels().get(i));
        }
        return s.append("</svg>").toString();
    }

    private static void whisker(StringBuilder s, Frame f, String cls, double y, double[] e, String what) {
        double lo = f.sx(Math.max(-1, e[1]), -1, 1);
        double hi = f.sx(Math.min(1, e[2]), -1, 1);
        double x = f.sx(e[0], -1, 1);
        String tip = what + ": " + number(e[0]) + " (" + number(e[1]) + " to " + number(e[2]) + ")";
        s.append(String.format(Locale.ROOT, "<g class=\"whisker %s\"><title>%s</title><line class=\"ci %s\" x1=\"%.1f\""
                + " y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/><circle class=\"pt %s\" cx=\"%.1f\" cy=\"%.1f\" r=\"4\"/>"
                + "<text class=\"val %s\" x=\"%.1f\" y=\"%.1f\">%s</text></g>", cls, esc(tip), cls, lo, y, hi, y, cls,
                x, y, cls, hi + 5, y + 4, esc(number(e[0]))));
    }

    /** Missing rate by reason, both waves, as a share of the wave's rows. */
    public static String missing(String variable, VariablePlot.MissingPlot p, String baselineWave,
                                 String currentWave) {
        return shares("missing", "Missing answers of " + variable + " by reason: " + baselineWave + " ("
                        + p.rowsBaseline() + " rows) against " + currentWave + " (" + p.rowsCurrent() + " rows)",
                p.reasons(), divide(p.baseline(), p.rowsBaseline()), divide(p.current(), p.rowsCurrent()),
                baselineWave + " " + p.rowsBaseline() + " rows", currentWave + " " + p.rowsCurrent() + " rows",
                "% of rows in the wave");
    }

    /**
     * A small line chart of one measure across all waves, wave labels on the x axis. A wave without data (NaN)
     * breaks the line; the point of {@code currentWave} is marked.
     */
    public static String sparkline(String variable, Trend t, String currentWave) {
        String unit = t.unit() == null || t.unit().isBlank() ? null : t.unit();
        int n = t.waves().size();
        String title = "Trend of " + t.measure() + (unit == null ? "" : " (" + unit + ")") + " for " + variable
                + " across " + n + " wave(s)";
        int maxLabel = t.waves().stream().mapToInt(String::length).max().orElse(1);
        boolean rotate = n > 1 && (SPARK_WIDTH - 70.0) / n < maxLabel * 6.5;
        int bottom = rotate ? (int) Math.min(100, 34 + maxLabel * 4.6) : 40;
        Frame f = new Frame(SPARK_WIDTH, 150 + bottom, 58, 20, 28, bottom);
        StringBuilder s = open(f, "trend", title);
        s.append(String.format(Locale.ROOT, "<text class=\"chart-title\" x=\"%d\" y=\"16\">%s</text>", f.left() - 50,
                esc(t.measure() + (unit == null ? "" : " (" + unit + ")"))));
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double v : t.values()) {
            if (!Double.isNaN(v)) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
        }
        if (lo == Double.POSITIVE_INFINITY) {
            s.append(String.format(Locale.ROOT, "<text class=\"note\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">no data in any wave</text>",
                    (f.x0() + f.x1()) / 2, (f.y0() + f.y1()) / 2));
            return s.append("</svg>").toString();
        }
        double[] yt = niceTicks(lo, hi, 4);
        double ylo = yt[0];
        double yhi = yt[yt.length - 1];
        yAxis(s, f, yt, ylo, yhi, false);
        double slot = (f.x1() - f.x0()) / Math.max(1, n);
        s.append(String.format(Locale.ROOT, "<line class=\"axis\" x1=\"%.1f\" y1=\"%.1f\" x2=\"%.1f\" y2=\"%.1f\"/>",
                f.x0(), f.y0(), f.x1(), f.y0()));
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
            double y = f.sy(v, ylo, yhi);
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
            double y = f.sy(v, ylo, yhi);
            boolean cur = t.waves().get(i).equals(currentWave);
            s.append(String.format(Locale.ROOT, "<circle class=\"%s\" cx=\"%.1f\" cy=\"%.1f\" r=\"%s\"><title>%s</title></circle>",
                    cur ? "pt cur" : "pt", x, y, cur ? "4.5" : "3", esc(t.waves().get(i) + ": " + number(v)
                            + (unit == null ? "" : " " + unit))));
            if (cur) {
                s.append(String.format(Locale.ROOT, "<text class=\"val c\" x=\"%.1f\" y=\"%.1f\" text-anchor=\"middle\">%s</text>",
                        x, Math.max(f.y1() + 10, y - 8), esc(number(v))));
            }
        }
        s.append(String.format(Locale.ROOT, "<text class=\"axis-title\" x=\"%.1f\" y=\"%d\" text-anchor=\"middle\">wave</text>",
                (f.x0() + f.x1()) / 2, f.height() - 6));
        return s.append("</svg>").toString();
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

    private static void bar(StringBuilder s, String cls, double x, double y, double w, double h, String tip) {
        s.append(String.format(Locale.ROOT, "<rect class=\"bar %s\" x=\"%.1f\" y=\"%.1f\" width=\"%.1f\" height=\"%.1f\"><title>%s</title></rect>",
                cls, x, y, Math.max(0, w), Math.max(0, h), esc(tip)));
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
}
