package org.wavewarden.console.page;

import org.wavewarden.store.ConsoleReads.TrendPoint;

import java.util.List;
import java.util.Objects;

import static org.wavewarden.deliver.html.Html.esc;

/**
 * A finding's variable and kind across waves as inline SVG: each wave's effect estimate as a dot with its interval
 * as a whisker, the threshold as a band around zero (inside it a change is too small to matter), the page's own wave
 * marked; and when the findings carry it, the level (share, mean, median) per wave in a second chart. Every number
 * drawn is also written in a table below the charts, which is what a screen reader reads.
 *
 * <p>Colours come from classes in the console's style sheet (the content security policy refuses inline styles).
 */
final class TrendChart {

    private static final int WIDTH = 560;
    private static final int HEIGHT = 180;
    private static final int LEFT = 56;
    private static final int RIGHT = 16;
    private static final int TOP = 14;
    private static final int BOTTOM = 34;

    private TrendChart() {
    }

    static void render(StringBuilder h, String variable, List<TrendPoint> points, String currentWave) {
        if (points.isEmpty()) {
            h.append("<p class=\"none\">No wave has a finding of this variable and kind to draw.</p>\n");
            return;
        }
        String effectName = points.stream().map(TrendPoint::effectName).filter(Objects::nonNull).findFirst()
                .orElse(null);
        boolean anyEffect = points.stream().anyMatch(p -> finite(p.estimate()));
        if (anyEffect) {
            chart(h, "trend-effect", "The effect (" + (effectName == null ? "estimate" : effectName) + ") of "
                    + variable + " per wave, with its interval and the threshold band", points, currentWave, true);
        }
        String levelName = points.stream().map(TrendPoint::levelName).filter(Objects::nonNull).findFirst()
                .orElse(null);
        boolean anyLevel = points.stream().anyMatch(p -> finite(p.level()));
        if (anyLevel) {
            chart(h, "trend-level", "The level (" + (levelName == null ? "level" : levelName) + ") of " + variable
                    + " per wave, with its interval", points, currentWave, false);
        }
        if (!anyEffect && !anyLevel) {
            h.append("<p class=\"none\">The findings of this variable and kind carry no estimate to draw.</p>\n");
        }
        table(h, points, currentWave, effectName, levelName, anyLevel);
    }

    private static void chart(StringBuilder h, String id, String title, List<TrendPoint> points, String currentWave,
                              boolean effect) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        double threshold = Double.NaN;
        for (TrendPoint p : points) {
            for (Double v : effect ? new Double[] {p.estimate(), p.low(), p.high()}
                    : new Double[] {p.level(), p.levelLow(), p.levelHigh()}) {
                if (finite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
            if (effect && finite(p.threshold()) && Objects.equals(p.wave(), currentWave)) {
                threshold = Math.abs(p.threshold());
            }
        }
        if (effect && Double.isNaN(threshold)) {
            threshold = points.stream().map(TrendPoint::threshold).filter(TrendChart::finite).mapToDouble(Math::abs)
                    .findFirst().orElse(Double.NaN);
        }
        if (effect) {
            // The band and zero are always in view: an estimate is read against them.
            lo = Math.min(lo, 0);
            hi = Math.max(hi, 0);
            if (!Double.isNaN(threshold)) {
                lo = Math.min(lo, -threshold);
                hi = Math.max(hi, threshold);
            }
        }
        if (hi - lo < 1e-12) {
            double pad = Math.abs(hi) > 0 ? Math.abs(hi) * 0.1 : 1;
            lo -= pad;
            hi += pad;
        }
        double pad = (hi - lo) * 0.06;
        lo -= pad;
        hi += pad;
        final double yLo = lo;
        final double yHi = hi;
        java.util.function.DoubleUnaryOperator y = v -> TOP + (yHi - v) / (yHi - yLo) * (HEIGHT - TOP - BOTTOM);
        int n = points.size();
        double step = (WIDTH - LEFT - RIGHT) / (double) n;
        h.append("<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"trend-chart\" id=\"").append(id)
                .append("\" viewBox=\"0 0 ").append(WIDTH).append(' ').append(HEIGHT).append("\" role=\"img\"")
                .append(" aria-labelledby=\"").append(id).append("-title\"><title id=\"").append(id)
                .append("-title\">").append(esc(title)).append("</title>");
        // The page's wave as a shaded column, drawn first so the band, zero line and whiskers stay on top of it.
        for (int i = 0; i < n; i++) {
            if (Objects.equals(points.get(i).wave(), currentWave)) {
                h.append("<rect class=\"current-wave\" x=\"").append(f(LEFT + step * i)).append("\" y=\"")
                        .append(TOP).append("\" width=\"").append(f(step)).append("\" height=\"")
                        .append(HEIGHT - TOP - BOTTOM).append("\" />");
            }
        }
        if (effect && !Double.isNaN(threshold)) {
            double top = y.applyAsDouble(threshold);
            double bottom = y.applyAsDouble(-threshold);
            h.append("<rect class=\"band\" x=\"").append(LEFT).append("\" y=\"").append(f(top)).append("\" width=\"")
                    .append(WIDTH - LEFT - RIGHT).append("\" height=\"").append(f(bottom - top)).append("\" />");
            h.append("<text class=\"tick\" x=\"").append(LEFT - 4).append("\" y=\"").append(f(top + 4))
                    .append("\" text-anchor=\"end\">+").append(esc(Pages.fmt("%.3g", threshold))).append("</text>");
            h.append("<text class=\"tick\" x=\"").append(LEFT - 4).append("\" y=\"").append(f(bottom + 4))
                    .append("\" text-anchor=\"end\">&#8722;").append(esc(Pages.fmt("%.3g", threshold)))
                    .append("</text>");
        }
        if (effect) {
            double zero = y.applyAsDouble(0);
            h.append("<line class=\"zero\" x1=\"").append(LEFT).append("\" x2=\"").append(WIDTH - RIGHT)
                    .append("\" y1=\"").append(f(zero)).append("\" y2=\"").append(f(zero)).append("\" />")
                    .append("<text class=\"tick\" x=\"").append(LEFT - 4).append("\" y=\"").append(f(zero + 4))
                    .append("\" text-anchor=\"end\">0</text>");
        } else {
            h.append("<text class=\"tick\" x=\"").append(LEFT - 4).append("\" y=\"").append(f(TOP + 8))
                    .append("\" text-anchor=\"end\">").append(esc(Pages.fmt("%.3g", yHi))).append("</text>")
                    .append("<text class=\"tick\" x=\"").append(LEFT - 4).append("\" y=\"")
                    .append(f(HEIGHT - BOTTOM)).append("\" text-anchor=\"end\">").append(esc(Pages.fmt("%.3g", yLo)))
                    .append("</text>");
        }
        // Wave names below the axis: all of them when they fit, else every k-th and always the page's wave.
        int every = Math.max(1, (int) Math.ceil(n / (WIDTH / 60.0)));
        for (int i = 0; i < n; i++) {
            TrendPoint p = points.get(i);
            double x = LEFT + step * (i + 0.5);
            boolean current = Objects.equals(p.wave(), currentWave);
            Double est = effect ? p.estimate() : p.level();
            Double low = effect ? p.low() : p.levelLow();
            Double high = effect ? p.high() : p.levelHigh();
            if (finite(low) && finite(high)) {
                h.append("<line class=\"whisker\" x1=\"").append(f(x)).append("\" x2=\"").append(f(x))
                        .append("\" y1=\"").append(f(y.applyAsDouble(low))).append("\" y2=\"")
                        .append(f(y.applyAsDouble(high))).append("\" />");
            }
            if (finite(est)) {
                h.append("<circle class=\"").append(current ? "point current" : "point").append("\" cx=\"")
                        .append(f(x)).append("\" cy=\"").append(f(y.applyAsDouble(est))).append("\" r=\"")
                        .append(current ? 5 : 3.5).append("\"><title>").append(esc(p.wave())).append(": ")
                        .append(esc(Pages.fmt("%.4g", est))).append("</title></circle>");
            }
            if (current || i % every == 0) {
                h.append("<text class=\"").append(current ? "wave current" : "wave").append("\" x=\"").append(f(x))
                        .append("\" y=\"").append(HEIGHT - BOTTOM + 16).append("\" text-anchor=\"middle\">")
                        .append(esc(p.wave())).append(current ? " (this wave)" : "").append("</text>");
            }
        }
        h.append("</svg>\n");
    }

    /** The same numbers as a table: what a screen reader reads, and what a reader copies. */
    private static void table(StringBuilder h, List<TrendPoint> points, String currentWave, String effectName,
                              String levelName, boolean level) {
        h.append("<table id=\"trend-table\" class=\"trend-table\"><caption>The numbers drawn above, per wave")
                .append("</caption><thead><tr><th scope=\"col\">Wave</th><th scope=\"col\">Verdict</th>")
                .append("<th scope=\"col\">").append(esc(effectName == null ? "Effect" : effectName)).append("</th>")
                .append("<th scope=\"col\">Interval</th><th scope=\"col\">Threshold</th>");
        if (level) {
            h.append("<th scope=\"col\">").append(esc(levelName == null ? "Level" : levelName)).append("</th>")
                    .append("<th scope=\"col\">Level interval</th>");
        }
        h.append("</tr></thead><tbody>");
        for (TrendPoint p : points) {
            boolean current = Objects.equals(p.wave(), currentWave);
            h.append("<tr").append(current ? " class=\"current\"" : "").append("><th scope=\"row\">");
            if (p.findingId() != 0) {
                h.append("<a href=\"/console/finding?id=").append(p.findingId()).append("\">").append(esc(p.wave()))
                        .append("</a>");
            } else {
                h.append(esc(p.wave()));
            }
            h.append(current ? " (this wave)" : "").append("</th><td>").append(esc(p.verdict() == null ? "none"
                    : p.verdict())).append("</td><td>").append(num(p.estimate())).append("</td><td>")
                    .append(interval(p.low(), p.high())).append("</td><td>")
                    .append(finite(p.threshold()) ? "&#177;" + num(Math.abs(p.threshold())) : "").append("</td>");
            if (level) {
                h.append("<td>").append(num(p.level())).append("</td><td>").append(interval(p.levelLow(), p.levelHigh()))
                        .append("</td>");
            }
            h.append("</tr>");
        }
        h.append("</tbody></table>\n");
    }

    private static String interval(Double low, Double high) {
        return finite(low) && finite(high) ? num(low) + " to " + num(high) : "";
    }

    private static String num(Double v) {
        return finite(v) ? esc(Pages.fmt("%.4g", v)) : "";
    }

    private static boolean finite(Double v) {
        return v != null && Double.isFinite(v);
    }

    private static String f(double v) {
        return Pages.fmt("%.1f", v);
    }
}
