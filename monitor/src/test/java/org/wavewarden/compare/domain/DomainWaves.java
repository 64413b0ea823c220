package org.wavewarden.compare.domain;

import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.WaveProfile;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * A small, obviously correct accumulator: wave summaries with domain tallies built row by row, as the one pass over
 * a wave builds them, so that a breakdown can be checked against R on the same rows.
 *
 * <p>{@code domain/api_two_waves.csv} holds R survey's {@code api} data (California Academic Performance Index
 * schools, shipped with R's survey package 4.1.1, Lumley; published data, not ours): wave 1 is {@code apistrat}
 * (stratified by school type, each school its own PSU), wave 2 is {@code apiclus2} (two-stage cluster sample; the
 * first-stage district {@code dnum} is the PSU), columns {@code wave,stratum,psu,w,stype,api00,sch.wide,avg.ed,
 * acs.46}, written by {@code write.csv(..., na = "")} in R 4.2.2; an empty field is SQL NULL.
 */
final class DomainWaves {

    /** One row: the design fields, the domain and the monitored values (null for NULL). */
    record Row(String stratum, String psu, double w, String domain, Map<String, String> values) {
    }

    private DomainWaves() {
    }

    /** The rows of each wave of a CSV test resource whose first column is the wave. */
    static Map<String, List<Row>> read(String resource) {
        try (BufferedReader in = new BufferedReader(new InputStreamReader(
                DomainWaves.class.getClassLoader().getResourceAsStream(resource), StandardCharsets.UTF_8))) {
            return parse(in);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The rows of each wave of CSV text, header first, as {@link #read}. */
    static Map<String, List<Row>> parse(String csv) {
        try {
            return parse(new BufferedReader(new java.io.StringReader(csv)));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static Map<String, List<Row>> parse(BufferedReader in) throws IOException {
        Map<String, List<Row>> waves = new LinkedHashMap<>();
        String[] header = in.readLine().strip().split(",", -1);
        for (String line = in.readLine(); line != null; line = in.readLine()) {
            if (line.isBlank()) {
                continue;
            }
            String[] f = line.strip().split(",", -1);
            Map<String, String> values = new LinkedHashMap<>();
            for (int c = 5; c < header.length; c++) {
                values.put(header[c], f[c].isEmpty() ? null : f[c]);
            }
            waves.computeIfAbsent(f[0], k -> new ArrayList<>())
                    .add(new Row(f[1], f[2], Double.parseDouble(f[3]), f[4].isEmpty() ? null : f[4], values));
        }
        return waves;
    }

    /**
     * The wave's summary: whole-wave tallies and weight sums of every column, the PSUs in order of first
     * appearance, and the domain tallies of the breakdown column {@code column} keeping at most {@code maxDomains}
     * domains.
     *
     * @param design whether the summary holds the design (PSU sums); weights are always held
     */
    static WaveProfile profile(String wave, List<Row> rows, String column, int maxDomains, boolean design) {
        return profile(wave, rows, column, maxDomains, design, null);
    }

    /**
     * The same, the design's PSU sums kept by value only for the values {@code cellsKept} accepts and marked
     * incomplete (as the reader keeps a numeric column with too many distinct values); every value when null.
     */
    static WaveProfile profile(String wave, List<Row> rows, String column, int maxDomains, boolean design,
                               java.util.function.Predicate<String> cellsKept) {
        List<String> columns = new ArrayList<>(rows.get(0).values().keySet());
        List<String> psuKeys = new ArrayList<>();
        List<String> psuStratum = new ArrayList<>();
        List<String> psuLabel = new ArrayList<>();
        for (Row r : rows) {
            String key = r.stratum() + "/" + r.psu();
            if (!psuKeys.contains(key)) {
                psuKeys.add(key);
                psuStratum.add(r.stratum());
                psuLabel.add(r.psu());
            }
        }
        List<String> domains = new ArrayList<>();
        long nullRows = 0;
        List<String> overflow = new ArrayList<>();
        for (Row r : rows) {
            if (r.domain() == null) {
                nullRows++;
            } else if (!domains.contains(r.domain()) && !overflow.contains(r.domain())) {
                (domains.size() < maxDomains ? domains : overflow).add(r.domain());
            }
        }
        long overflowRows = rows.stream().filter(r -> r.domain() != null && overflow.contains(r.domain())).count();

        Map<String, ColumnTally> whole = new LinkedHashMap<>();
        Map<String, Map<String, double[]>> wholeWeights = new LinkedHashMap<>();
        Map<String, DesignSummary.ColumnDesign> wholeDesign = new LinkedHashMap<>();
        Map<String, List<ColumnTally>> tallies = new LinkedHashMap<>();
        Map<String, List<Map<String, double[]>>> weights = new LinkedHashMap<>();
        Map<String, List<DesignSummary.ColumnDesign>> designs = new LinkedHashMap<>();
        long[] domainRows = new long[domains.size()];
        for (Row r : rows) {
            int d = r.domain() == null ? -1 : domains.indexOf(r.domain());
            if (d >= 0) {
                domainRows[d]++;
            }
        }
        for (String c : columns) {
            boolean numeric = rows.stream().map(r -> r.values().get(c)).filter(x -> x != null)
                    .allMatch(x -> x.matches("-?[0-9.]+"));
            ColumnType type = numeric ? ColumnType.DECIMAL : ColumnType.TEXT;
            whole.put(c, tally(c, type, rows, null));
            wholeWeights.put(c, weightSums(c, rows, r -> true));
            wholeDesign.put(c, design(c, numeric, rows, psuKeys, r -> true, cellsKept));
            List<ColumnTally> t = new ArrayList<>();
            List<Map<String, double[]>> w = new ArrayList<>();
            List<DesignSummary.ColumnDesign> g = new ArrayList<>();
            for (String domain : domains) {
                java.util.function.Predicate<Row> in = r -> domain.equals(r.domain());
                t.add(tally(c, type, rows, in));
                w.add(weightSums(c, rows, in));
                g.add(design(c, numeric, rows, psuKeys, in, cellsKept));
            }
            tallies.put(c, t);
            weights.put(c, w);
            designs.put(c, g);
        }
        DomainTally dt = new DomainTally(column, domains, domainRows, nullRows, overflow.size(), overflowRows,
                tallies, weights, design ? designs : Map.of());
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        whole.forEach((k, v) -> schema.put(k, v.type()));
        DesignSummary summary = design ? new DesignSummary(psuStratum, psuLabel, 0, wholeDesign) : null;
        return new WaveProfile(wave, rows.size(), schema, whole, wholeWeights, summary, List.of(), List.of(dt));
    }

    /** The tally of column c over the rows {@code in} selects (every row when null). */
    private static ColumnTally tally(String c, ColumnType type, List<Row> rows, java.util.function.Predicate<Row> in) {
        Map<String, Long> counts = new LinkedHashMap<>();
        long n = 0;
        long nulls = 0;
        for (Row r : rows) {
            if (in != null && !in.test(r)) {
                continue;
            }
            n++;
            String v = r.values().get(c);
            if (v == null) {
                nulls++;
            } else {
                counts.merge(v, 1L, Long::sum);
            }
        }
        return new ColumnTally(c, type, n, nulls, counts, false);
    }

    private static Map<String, double[]> weightSums(String c, List<Row> rows, java.util.function.Predicate<Row> in) {
        Map<String, double[]> sums = new LinkedHashMap<>();
        for (Row r : rows) {
            String v = r.values().get(c);
            if (v != null && in.test(r)) {
                double[] s = sums.computeIfAbsent(v, k -> new double[2]);
                s[0] += r.w();
                s[1] += r.w() * r.w();
            }
        }
        return sums;
    }

    private static DesignSummary.ColumnDesign design(String c, boolean numeric, List<Row> rows, List<String> psuKeys,
                                                     java.util.function.Predicate<Row> in,
                                                     java.util.function.Predicate<String> cellsKept) {
        int psus = psuKeys.size();
        Map<String, double[]> cells = new LinkedHashMap<>();
        double[] w = new double[psus];
        double[] wy = new double[psus];
        double[] wyy = new double[psus];
        for (Row r : rows) {
            String v = r.values().get(c);
            if (v == null || !in.test(r)) {
                continue;
            }
            int p = psuKeys.indexOf(r.stratum() + "/" + r.psu());
            cells.computeIfAbsent(v, k -> new double[psus])[p] += r.w();
            if (numeric) {
                double y = Double.parseDouble(v);
                w[p] += r.w();
                wy[p] += r.w() * y;
                wyy[p] += r.w() * y * y;
            }
        }
        if (cellsKept != null) {
            cells.keySet().removeIf(cellsKept.negate());
        }
        return new DesignSummary.ColumnDesign(cells, cellsKept == null, numeric ? w : null, numeric ? wy : null,
                numeric ? wyy : null);
    }
}
