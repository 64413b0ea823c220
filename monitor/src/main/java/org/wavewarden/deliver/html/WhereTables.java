package org.wavewarden.deliver.html;

import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.deliver.BreakdownView;
import org.wavewarden.judge.Finding;

import java.util.List;

import static org.wavewarden.deliver.html.Html.esc;

/**
 * A finding's "Where it changed" tables in HTML, for the digest and the console's finding page alike: one table per
 * breakdown column, its heterogeneity test, its overall split and what was not compared. Every string is escaped
 * (a domain label is data, never markup), and no element carries an inline style or script, so the console's
 * content security policy holds; the look comes from the {@code where} classes of {@link HtmlDigest#CSS}, which the
 * console's style sheet includes.
 */
public final class WhereTables {

    private WhereTables() {
    }

    /**
     * The section of a finding's breakdowns, or the empty string when it has none.
     *
     * @param confidence the intervals' confidence (1 - the run's alpha), or NaN when the page does not know it
     */
    public static String html(Finding f, String baselineWave, String currentWave, double confidence) {
        return html(f.breakdowns(), baselineWave, currentWave, confidence);
    }

    /** The same for a list of breakdowns. */
    public static String html(List<Breakdown> breakdowns, String baselineWave, String currentWave,
                              double confidence) {
        if (breakdowns.isEmpty()) {
            return "";
        }
        StringBuilder h = new StringBuilder();
        h.append("<section class=\"where\"><h3>Where it changed</h3>\n");
        for (Breakdown b : breakdowns) {
            table(h, BreakdownView.of(b, baselineWave, currentWave, confidence), b, confidence);
        }
        h.append("</section>\n");
        return h.toString();
    }

    private static void table(StringBuilder h, BreakdownView v, Breakdown b, double confidence) {
        // Marked for a reader's eye and for tests when the change differs across domains at the run's alpha.
        boolean significant = b.qValue() != null && !Double.isNaN(confidence) && b.qValue() < 1 - confidence;
        h.append("<div class=\"scroll\"><table class=\"where-table\" data-column=\"").append(esc(b.column()))
                .append("\"").append(significant ? " data-differs=\"yes\"" : "").append("><caption>")
                .append(esc(capitalised(v.title()))).append("</caption>\n<thead><tr>");
        for (String heading : v.headings()) {
            h.append("<th scope=\"col\">").append(esc(heading)).append("</th>");
        }
        h.append("</tr></thead>\n<tbody>");
        for (List<String> row : v.rows()) {
            h.append("<tr><th scope=\"row\">").append(esc(row.get(0))).append("</th>");
            for (String cell : row.subList(1, row.size())) {
                h.append("<td class=\"num\">").append(esc(cell)).append("</td>");
            }
            h.append("</tr>\n");
        }
        h.append("</tbody></table></div>\n");
        h.append("<p class=\"where-test\">").append(esc(v.test())).append("</p>\n");
        h.append("<p class=\"where-overall\">").append(esc(v.overall())).append(' ')
                .append("<span class=\"where-method\">").append(esc(capitalised(v.method()))).append(".</span></p>\n");
        if (!v.notes().isEmpty()) {
            h.append("<ul class=\"where-notes\">");
            v.notes().forEach(n -> h.append("<li>").append(esc(n)).append("</li>"));
            h.append("</ul>\n");
        }
    }

    private static String capitalised(String s) {
        return s == null || s.isEmpty() ? "" : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }
}
