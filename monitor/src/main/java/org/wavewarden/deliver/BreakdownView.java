package org.wavewarden.deliver;

import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.compare.domain.DomainMeasure;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * One breakdown as every output shows it: the "Where it changed" table's title, headings and cells, the heterogeneity
 * test's line and what was not compared, as plain text. The HTML digest, the Markdown digest and the console render
 * these same strings, each with its own escaping, so the three never disagree on a number.
 *
 * @param title    "share answering 'yes' by district"
 * @param headings the table's column headings
 * @param rows     one row of cells per domain, ranked as the breakdown ranks them (largest contribution first)
 * @param domains  the domain label of each row (data: the renderer escapes it like every cell)
 * @param overall  the overall change and its split into within-domain change and composition
 * @param test     the heterogeneity test: statistic, df, p and the run-wide q
 * @param method   how the estimates and variances were made
 * @param notes    what was not compared: overflow domains, domains without answers in one wave, rows with no domain
 */
public record BreakdownView(String title, List<String> headings, List<List<String>> rows, List<String> domains,
                            String overall, String test, String method, List<String> notes) {

    public BreakdownView {
        headings = List.copyOf(headings);
        rows = rows.stream().map(List::copyOf).toList();
        domains = List.copyOf(domains);
        notes = List.copyOf(notes);
    }

    /**
     * The view of one breakdown.
     *
     * @param confidence the confidence of the change's interval (1 - the run's alpha), or NaN when not known, in
     *                   which case the heading says "interval" without a level
     */
    public static BreakdownView of(Breakdown b, String baselineWave, String currentWave, double confidence) {
        boolean mean = b.kind() == DomainMeasure.Kind.MEAN;
        String unit = mean ? (b.unit() == null || b.unit().isBlank() ? "" : " (" + b.unit() + ")") : " (%)";
        String changeUnit = mean ? unit : " (points)";
        String level = Double.isNaN(confidence) ? "interval"
                : String.format(Locale.ROOT, "%.0f%% interval", confidence * 100);
        String column = b.column().replace('_', ' ');
        List<String> headings = List.of(capitalised(column), "n " + baselineWave, "n " + currentWave,
                baselineWave + unit, currentWave + unit, "change" + changeUnit + ", " + level, "q (within "
                        + column + ")", "contribution" + changeUnit);
        List<List<String>> rows = new ArrayList<>();
        List<String> domains = new ArrayList<>();
        for (DomainChange d : b.domains()) {
            domains.add(d.domain());
            rows.add(List.of(d.domain(), count(d.nBaseline()), count(d.nCurrent()), level(b, d.before()),
                    level(b, d.after()), signed(b, d.change()) + " (" + signed(b, d.ciLow()) + " to "
                            + signed(b, d.ciHigh()) + ")", q(d.qValue()), signed(b, d.contribution())));
        }
        String overall = String.format(Locale.ROOT, "Overall change %s%s: %s within the %s, %s from their"
                        + " shares of the population moving (composition, Kitagawa 1955).", signed(b, b.overall()),
                mean ? unitWords(b) : " points", signed(b, b.overall() - b.composition()),
                org.wavewarden.judge.WhereItChanged.plural(column),
                signed(b, b.composition()));
        String test = String.format(Locale.ROOT, "Does the change differ across %s? Wald chi-square %s on %d df,"
                        + " p %s, q %s (false-discovery control over every breakdown test of the run).",
                org.wavewarden.judge.WhereItChanged.plural(column),
                Double.isFinite(b.statistic()) ? String.format(Locale.ROOT, "%.4g", b.statistic()) : "n/a", b.df(),
                pq(b.pValue()), b.qValue() == null ? "not adjusted" : pq(b.qValue()));
        List<String> notes = new ArrayList<>();
        if (b.overflowDomains() > 0) {
            notes.add(String.format(Locale.ROOT, "%,d further %s value(s) beyond the cap on domains (%,d rows) were"
                    + " counted, not compared.", b.overflowDomains(), column, b.overflowRows()));
        }
        if (!b.leftOut().isEmpty()) {
            notes.add("Not compared, no answers in one of the waves: " + String.join(", ", b.leftOut()) + ".");
        }
        if (b.nullRows() > 0) {
            notes.add(String.format(Locale.ROOT, "%,d row(s) of %s have no %s and are in no domain.", b.nullRows(),
                    currentWave, column));
        }
        return new BreakdownView(b.measure() + " by " + column, headings, rows, domains, overall, test,
                b.method(), notes);
    }

    private static String unitWords(Breakdown b) {
        return b.unit() == null || b.unit().isBlank() ? "" : " " + b.unit();
    }

    /** A share or rate in percent with one decimal, a mean with the digits its size needs. */
    static String level(Breakdown b, double v) {
        if (!Double.isFinite(v)) {
            return "n/a";
        }
        return b.kind() == DomainMeasure.Kind.MEAN ? String.format(Locale.ROOT, "%." + digits(v) + "f", v)
                : String.format(Locale.ROOT, "%.1f", v * 100);
    }

    /** A change: percentage points for shares and rates, the variable's unit for means; always signed. */
    static String signed(Breakdown b, double v) {
        if (!Double.isFinite(v)) {
            return "n/a";
        }
        String s = b.kind() == DomainMeasure.Kind.MEAN ? String.format(Locale.ROOT, "%+." + digits(v) + "f", v)
                : String.format(Locale.ROOT, "%+.1f", v * 100);
        return s.startsWith("-") ? "\u2212" + s.substring(1) : s;
    }

    private static int digits(double v) {
        double a = Math.abs(v);
        return a >= 100 ? 0 : a >= 10 ? 1 : a >= 1 ? 2 : 3;
    }

    private static String count(long n) {
        return String.format(Locale.ROOT, "%,d", n);
    }

    private static String q(double q) {
        return Double.isNaN(q) ? "n/a" : q < 0.001 ? "< 0.001" : String.format(Locale.ROOT, "%.3f", q);
    }

    /** "< 0.001" or "= 0.012". */
    private static String pq(double p) {
        return Double.isNaN(p) ? "n/a" : p < 0.001 ? "< 0.001" : String.format(Locale.ROOT, "= %.3f", p);
    }

    private static String capitalised(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }
}
