package org.wavewarden.deliver.html;

import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.demo.DemoRun;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.NumericDistribution;

import java.io.BufferedReader;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Renders the HTML digest of the demo survey, for the screenshot in the docs: runs the demo, then builds each
 * alert's chart and trend from the demo's wave files (the findings carry per-category counts and per-reason rates,
 * but not the numeric distributions, so the charts are rebuilt from the same data the demo judged).
 *
 * <p>Usage: {@code DemoDigestPreview <out.html>}.
 */
final class DemoDigestPreview {

    /** An unquoted empty cell is SQL NULL when the importer loads the file; a quoted one is the empty string. */
    private static final String NULL_CELL = "\u0000NULL";

    private DemoDigestPreview() {
    }

    public static void main(String[] args) throws Exception {
        Path outHtml = Path.of(args[0]);
        Path work = Files.createTempDirectory("wavewarden-preview");
        DemoRun.Outcome o = DemoRun.run(work, new PrintWriter(new StringWriter()));
        Map<String, String> units = new HashMap<>();
        try (InputStream in = DemoRun.class.getResourceAsStream("/config/demo.yaml")) {
            for (VariableConfig v : ConfigLoader.parse(new String(in.readAllBytes(), StandardCharsets.UTF_8))
                    .datasets().get(0).variables()) {
                units.put(v.name(), v.unit());
            }
        }
        List<String> waves = o.reports().stream().map(FindingsReport::wave).toList();
        Map<String, Map<String, List<String>>> data = new LinkedHashMap<>();
        for (String w : waves) {
            data.put(w, readCsv("/demo-data/waves/" + w + ".csv"));
        }
        List<WaveSection> sections = new ArrayList<>();
        for (FindingsReport r : o.reports()) {
            List<AlertView> alerts = new ArrayList<>();
            for (Finding f : Alerts.select(r.findings())) {
                alerts.add(view(f, r, data, waves, units.get(f.variable())));
            }
            sections.add(new WaveSection(r, alerts));
        }
        Instant at = o.reports().get(o.reports().size() - 1).generatedAt();
        Files.writeString(outHtml, HtmlDigest.render(o.reports().get(0).dataset(), sections, at),
                StandardCharsets.UTF_8);
    }

    private static AlertView view(Finding f, FindingsReport r, Map<String, Map<String, List<String>>> data,
                                  List<String> waves, String unit) {
        if (r.againstWave() == null || !data.get(r.wave()).containsKey(f.variable())) {
            return new AlertView(f, null, null);
        }
        List<String> b = data.get(r.againstWave()).get(f.variable());
        List<String> c = data.get(r.wave()).get(f.variable());
        Object detail = f.detail() == null ? null : Json.mapper().convertValue(f.detail(), Object.class);
        if (f.kind() == FindingKind.MISSING_RATE_CHANGE || (detail instanceof Map<?, ?> m
                && m.get("candidates") instanceof List<?>)) {
            List<String> reasons = new ArrayList<>();
            List<String> codes = new ArrayList<>();
            if (detail instanceof List<?> rows) {
                for (Object row : rows) {
                    String reason = String.valueOf(((Map<?, ?>) row).get("reason"));
                    reasons.add(reason);
                    codes.add(reason.equals("NULL") ? NULL_CELL : null);
                }
            } else {
                for (Object cand : (List<?>) ((Map<?, ?>) detail).get("candidates")) {
                    String v = String.valueOf(((Map<?, ?>) cand).get("value"));
                    reasons.add(v.isEmpty() ? "empty text" : v.isBlank() ? v.length() + " space(s)" : "'" + v + "'");
                    codes.add(v);
                }
            }
            long[] kb = missingCounts(f, b, codes, reasons, true);
            long[] kc = missingCounts(f, c, codes, reasons, false);
            VariablePlot plot = new VariablePlot.MissingPlot(reasons, kb, b.size(), kc, c.size());
            List<Double> trend = new ArrayList<>();
            for (String w : waves) {
                List<String> col = data.get(w).get(f.variable());
                trend.add(col == null ? Double.NaN
                        : 100.0 * sum(missingCounts(f, col, codes, reasons, false)) / col.size());
            }
            // a reason known only by its rate (not by a value in the file) has no per-wave count to trend
            return new AlertView(f, plot, codes.contains(null) ? null : new Trend("share missing", "%", waves, trend));
        }
        if (numeric(c)) {
            VariablePlot plot = new VariablePlot.NumericPlot(unit, distribution(b), distribution(c));
            List<Double> trend = new ArrayList<>();
            for (String w : waves) {
                List<String> col = data.get(w).get(f.variable());
                trend.add(col == null ? Double.NaN : distribution(col).mean());
            }
            return new AlertView(f, plot, new Trend("mean " + f.variable(), unit, waves, trend));
        }
        Map<String, long[]> counts = new LinkedHashMap<>();
        b.stream().filter(v -> v != null && !v.isBlank()).sorted().forEach(v -> counts.computeIfAbsent(v, k -> new long[2])[0]++);
        c.stream().filter(v -> v != null && !v.isBlank()).sorted().forEach(v -> counts.computeIfAbsent(v, k -> new long[2])[1]++);
        List<String> cats = new ArrayList<>(counts.keySet());
        long[] cb = cats.stream().mapToLong(k -> counts.get(k)[0]).toArray();
        long[] cc = cats.stream().mapToLong(k -> counts.get(k)[1]).toArray();
        String moved = cats.get(0);
        double best = -1;
        for (int i = 0; i < cats.size(); i++) {
            double d = Math.abs((double) cc[i] / sum(cc) - (double) cb[i] / sum(cb));
            if (d > best) {
                best = d;
                moved = cats.get(i);
            }
        }
        List<Double> trend = new ArrayList<>();
        for (String w : waves) {
            List<String> col = data.get(w).get(f.variable());
            String m = moved;
            trend.add(col == null ? Double.NaN : 100.0 * col.stream().filter(m::equals).count()
                    / col.stream().filter(v -> v != null && !v.isBlank()).count());
        }
        return new AlertView(f, new VariablePlot.SharesPlot(cats, cb, cc),
                new Trend("share '" + moved + "'", "%", waves, trend));
    }

    /** Rows per reason: NULL is an empty cell, a candidate value counts its exact text, other reasons use the rate. */
    private static long[] missingCounts(Finding f, List<String> col, List<String> codes, List<String> reasons,
                                        boolean baseline) {
        long[] out = new long[reasons.size()];
        for (int i = 0; i < out.length; i++) {
            String code = codes.get(i);
            if (code != null) {
                out[i] = col.stream().filter(v -> code.equals(v == null ? NULL_CELL : v)).count();
            } else if (f.detail() != null) {
                Map<?, ?> row = (Map<?, ?>) ((List<?>) Json.mapper().convertValue(f.detail(), Object.class)).get(i);
                double share = ((Number) row.get(baseline ? "shareBaseline" : "shareCurrent")).doubleValue();
                out[i] = Math.round(share * col.size());
            }
        }
        return out;
    }

    private static boolean numeric(List<String> col) {
        long ok = col.stream().filter(v -> v != null && v.matches("-?[0-9]+(\\.[0-9]+)?")).count();
        return ok > 0.9 * col.stream().filter(v -> v != null && !v.isBlank()).count();
    }

    /** Valid numeric answers; -9 is the demo codebook's "refused" code and is left out as the monitor does. */
    private static NumericDistribution distribution(List<String> col) {
        return NumericDistribution.ofSample(col.stream().filter(v -> v != null && v.matches("-?[0-9]+(\\.[0-9]+)?"))
                .mapToDouble(Double::parseDouble).filter(x -> x != -9).toArray());
    }

    private static long sum(long[] a) {
        long s = 0;
        for (long v : a) {
            s += v;
        }
        return s;
    }

    /** The demo's CSV files: a header line, comma separated, double quotes around fields holding commas. */
    static Map<String, List<String>> readCsv(String resource) throws Exception {
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                DemoRun.class.getResourceAsStream(resource), StandardCharsets.UTF_8))) {
            List<String> header = split(in.readLine());
            Map<String, List<String>> cols = new LinkedHashMap<>();
            header.forEach(h -> cols.put(h, new ArrayList<>()));
            for (String line = in.readLine(); line != null; line = in.readLine()) {
                List<String> f = split(line);
                for (int i = 0; i < header.size(); i++) {
                    cols.get(header.get(i)).add(i < f.size() ? f.get(i) : null);
                }
            }
            return cols;
        }
    }

    private static List<String> split(String line) {
        List<String> out = new ArrayList<>();
        StringBuilder cur = new StringBuilder();
        boolean quoted = false;
        boolean wasQuoted = false;
        for (int i = 0; i < line.length(); i++) {
            char ch = line.charAt(i);
            if (quoted) {
                if (ch == '"' && i + 1 < line.length() && line.charAt(i + 1) == '"') {
                    cur.append('"');
                    i++;
                } else if (ch == '"') {
                    quoted = false;
                } else {
                    cur.append(ch);
                }
            } else if (ch == '"') {
                quoted = true;
                wasQuoted = true;
            } else if (ch == ',') {
                out.add(cur.length() == 0 && !wasQuoted ? null : cur.toString());
                cur.setLength(0);
                wasQuoted = false;
            } else {
                cur.append(ch);
            }
        }
        out.add(cur.length() == 0 && !wasQuoted ? null : cur.toString());
        return out;
    }
}
