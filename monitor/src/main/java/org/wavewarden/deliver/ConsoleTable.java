package org.wavewarden.deliver;

import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;

import java.util.Locale;

/**
 * A fixed-width table of a judged wave's findings for the terminal: one line per finding, whatever characters the
 * labels hold (they are shown through {@link DataText#visible(String)}).
 */
public final class ConsoleTable {

    private ConsoleTable() {
    }

    public static String render(FindingsReport r, boolean all) {
        StringBuilder sb = new StringBuilder();
        sb.append(DataText.visible(r.dataset())).append(" wave ").append(DataText.visible(r.wave()))
                .append(r.againstWave() == null ? " (screened alone)" : " against " + DataText.visible(r.againstWave()))
                .append('\n');
        sb.append(String.format(Locale.ROOT, "  %-10s %-22s %-20s %-28s %9s %9s%n", "verdict", "variable", "kind",
                "effect [CI]", "p", "q"));
        java.util.Set<String> labelShown = new java.util.HashSet<>();
        for (Finding f : FindingsFiles.ordered(r.findings())) {
            // A repeat raised no new alert, but the table lists findings: it keeps its line.
            if (!all && !Alerts.worthAPerson(f.withRepeat(null)) && f.verdict() != org.wavewarden.judge.Verdict.MINOR) {
                continue;
            }
            String effect = f.effect() == null ? "" : String.format(Locale.ROOT, "%+.3f [%+.3f, %+.3f]",
                    f.effect().estimate(), f.effect().ciLow(), f.effect().ciHigh());
            sb.append(String.format(Locale.ROOT, "  %-10s %-22s %-20s %-28s %9s %9s%n",
                    f.verdict() == null ? (f.kind() == FindingKind.SKIPPED ? "skipped" : "quality") : f.verdict().name(),
                    cut(DataText.visible(f.variable()), 22), cut(f.kind().name(), 20), effect, p(f.pValue()),
                    p(f.qValue())));
            // The variable's label on a line of its own under its first row: the column is too narrow to hold both.
            if (f.label() != null && labelShown.add(f.variable())) {
                sb.append(String.format(Locale.ROOT, "  %-10s %s%n", "", cut(DataText.visible(f.label()), 80)));
            }
        }
        return sb.toString();
    }

    /**
     * Any other listing as a fixed-width table: every cell made visible and cut to its column's width (a width of 0
     * leaves the cell whole, for a last column), so that no value from the data can break a row or the columns.
     */
    public static String table(java.util.List<String> headers, int[] widths,
                               java.util.List<java.util.List<String>> rows) {
        StringBuilder sb = new StringBuilder();
        line(sb, headers, widths);
        rows.forEach(r -> line(sb, r, widths));
        return sb.toString();
    }

    private static void line(StringBuilder sb, java.util.List<String> cells, int[] widths) {
        StringBuilder row = new StringBuilder(" ");
        for (int i = 0; i < cells.size(); i++) {
            String v = DataText.visible(cells.get(i));
            int w = i < widths.length ? widths[i] : 0;
            row.append(' ').append(w == 0 ? v : String.format(Locale.ROOT, "%-" + w + "s", cut(v, w)));
        }
        sb.append(row.toString().stripTrailing()).append('\n');
    }

    static String cut(String s, int n) {
        return s.length() <= n ? s : s.substring(0, n - 1) + "~";
    }

    static String p(Double p) {
        if (p == null) {
            return "";
        }
        return p < 0.0001 ? "<0.0001" : String.format(Locale.ROOT, "%.4f", p);
    }
}
