package org.wavewarden.profile;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * The per-wave summary: every monitored column's tally and the table's column layout. It is computed once per
 * wave content and stored, so that a later wave is judged against it without rereading the source.
 *
 * @param wave    wave label
 * @param rows    rows in the wave
 * @param schema  column name to storage class, for every column of the source table (not only monitored ones)
 * @param columns tallies of the monitored columns
 * @param weights with a weight column: per column and value, {sum of weights, sum of squared weights}
 * @param design  with design columns: the PSUs and per column their weight sums; null otherwise (and for
 *                summaries stored before designs were read)
 * @param pairs   joint tallies of the configured pairs of numeric columns (relationship drift); empty in summaries
 *                stored before pairs were tallied
 * @param domains the tallies of each configured breakdown column's domains, in configured order; empty without
 *                breakdowns and in summaries stored before breakdowns were tallied
 */
public record WaveProfile(String wave, long rows, Map<String, ColumnType> schema, Map<String, ColumnTally> columns,
                          Map<String, Map<String, double[]>> weights, DesignSummary design, List<JointTally> pairs,
                          List<DomainTally> domains) {

    public WaveProfile {
        schema = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(schema));
        columns = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(columns));
        weights = weights == null ? Map.of() : java.util.Collections.unmodifiableMap(new LinkedHashMap<>(weights));
        pairs = pairs == null ? List.of() : List.copyOf(pairs);
        domains = domains == null ? List.of() : List.copyOf(domains);
    }

    /** A summary without domain tallies. */
    public WaveProfile(String wave, long rows, Map<String, ColumnType> schema, Map<String, ColumnTally> columns,
                       Map<String, Map<String, double[]>> weights, DesignSummary design, List<JointTally> pairs) {
        this(wave, rows, schema, columns, weights, design, pairs, List.of());
    }

    /** The domain tallies of a breakdown column, if this summary holds them. */
    public java.util.Optional<DomainTally> domains(String breakdownColumn) {
        return domains.stream().filter(t -> t.column().equals(breakdownColumn)).findFirst();
    }

    /**
     * One domain of a breakdown column as a summary of its own: the domain's rows, its tallies, weight sums and
     * (with a design) its PSU sums over every PSU of the wave, so that every comparison and screening made on a
     * whole wave can be made on a domain unchanged. Empty when the column or the domain is not held.
     *
     * <p>The domain's summary has the wave's label and column layout, no pairs and no domains of its own; its design
     * has the wave's PSUs (rows without a PSU are not counted per domain, so {@code rowsWithoutPsu} is 0).
     */
    public java.util.Optional<WaveProfile> inDomain(String breakdownColumn, String domain) {
        java.util.Optional<DomainTally> held = domains(breakdownColumn);
        if (held.isEmpty() || held.get().indexOf(domain) < 0) {
            return java.util.Optional.empty();
        }
        DomainTally t = held.get();
        int d = t.indexOf(domain);
        Map<String, ColumnTally> domainColumns = new LinkedHashMap<>();
        t.tallies().forEach((column, perDomain) -> domainColumns.put(column, perDomain.get(d)));
        Map<String, Map<String, double[]>> domainWeights = new LinkedHashMap<>();
        t.weights().forEach((column, perDomain) -> domainWeights.put(column, perDomain.get(d)));
        DesignSummary domainDesign = null;
        if (design != null && !t.designs().isEmpty()) {
            Map<String, DesignSummary.ColumnDesign> cds = new LinkedHashMap<>();
            t.designs().forEach((column, perDomain) -> cds.put(column, perDomain.get(d)));
            domainDesign = new DesignSummary(design.psuStratum(), design.psuLabel(), 0, cds);
        }
        return java.util.Optional.of(new WaveProfile(wave, t.rows()[d], schema, domainColumns, domainWeights,
                domainDesign, List.of(), List.of()));
    }

    public WaveProfile(String wave, long rows, Map<String, ColumnType> schema, Map<String, ColumnTally> columns) {
        this(wave, rows, schema, columns, Map.of(), null, List.of());
    }

    public WaveProfile(String wave, long rows, Map<String, ColumnType> schema, Map<String, ColumnTally> columns,
                       Map<String, Map<String, double[]>> weights) {
        this(wave, rows, schema, columns, weights, null, List.of());
    }

    public WaveProfile(String wave, long rows, Map<String, ColumnType> schema, Map<String, ColumnTally> columns,
                       Map<String, Map<String, double[]>> weights, DesignSummary design) {
        this(wave, rows, schema, columns, weights, design, List.of());
    }

    /** The joint tally of columns x and y, in that order, if this summary holds one. */
    public java.util.Optional<JointTally> pair(String x, String y) {
        return pairs.stream().filter(t -> t.of(x, y)).findFirst();
    }

    /**
     * SHA-256 over a canonical rendering (columns and values sorted), so the same data always gives the same
     * checksum whatever order the database streamed it in. The rendering is the checksum's definition: stored
     * summaries are found by it, so it never changes (a test holds it to a value an earlier build computed).
     */
    public String checksum() {
        Canonical md = new Canonical();
        md.line("rows=" + rows);
        new TreeMap<>(schema).forEach((k, v) -> md.line("col " + k + " " + v));
        for (ColumnTally t : new TreeMap<>(columns).values()) {
            md.line("tally " + t.column() + " " + t.rowCount() + " " + t.nullCount() + " " + t.truncated()
                    + (t.binning().isExact() ? "" : " bins " + t.binning().level()));
            md.counts(t.valueCounts());
        }
        for (var w : new TreeMap<>(weights).entrySet()) {
            md.weights("w " + w.getKey() + " ", w.getValue());
        }
        if (design != null) {
            md.line("design " + design.rowsWithoutPsu() + " " + design.psuStratum() + " " + design.psuLabel());
            for (var c : new TreeMap<>(design.columns()).entrySet()) {
                var cd = c.getValue();
                md.line("psu " + c.getKey() + " " + cd.complete() + " " + java.util.Arrays.toString(cd.weight())
                        + java.util.Arrays.toString(cd.weightedSum()) + java.util.Arrays.toString(cd.weightedSquares()));
                md.cells(cd.cells());
            }
        }
        // Only summaries with pairs feed them, so the checksum of every summary without pairs is what it was.
        List<JointTally> sortedPairs = new java.util.ArrayList<>(pairs);
        sortedPairs.sort(java.util.Comparator.comparing(JointTally::x).thenComparing(JointTally::y));
        for (JointTally p : sortedPairs) {
            md.line("pair " + p.x().length() + ":" + p.x() + " " + p.y().length() + ":" + p.y()
                    + (p.binning().isExact() ? "" : " bins " + p.binning().level()));
            double[] xs = p.xs();
            double[] ys = p.ys();
            long[] n = p.counts();
            for (int i = 0; i < n.length; i++) {
                md.line(Double.doubleToLongBits(xs[i]) + "," + Double.doubleToLongBits(ys[i]) + "=" + n[i]);
            }
        }
        // Only summaries with domains feed them, so the checksum of every summary without them is what it was.
        for (DomainTally t : domains) {
            feedDomains(md, t);
        }
        return md.hex();
    }

    /** One breakdown column's domains, each domain's tallies and sums in a canonical order. */
    private static void feedDomains(Canonical md, DomainTally t) {
        md.line("domains " + t.column().length() + ":" + t.column() + " " + t.nullRows() + " " + t.overflowDomains()
                + " " + t.overflowRows());
        List<String> tallied = sorted(t.tallies());
        List<String> weighed = sorted(t.weights());
        List<String> designed = sorted(t.designs());
        for (int d = 0; d < t.domains().size(); d++) {
            String label = t.domains().get(d);
            md.line("domain " + label.length() + ":" + label + " " + t.rows()[d]);
            for (String column : tallied) {
                ColumnTally ct = t.tallies().get(column).get(d);
                md.line("dtally " + column.length() + ":" + column + " " + ct.rowCount() + " "
                        + ct.nullCount() + " " + ct.truncated() + " " + ct.binning().level());
                md.counts(ct.valueCounts());
            }
            for (String column : weighed) {
                md.weights("dw " + column.length() + ":" + column + " ", t.weights().get(column).get(d));
            }
            for (String column : designed) {
                DesignSummary.ColumnDesign cd = t.designs().get(column).get(d);
                md.line("dpsu " + column.length() + ":" + column + " " + cd.complete() + " "
                        + java.util.Arrays.toString(cd.weight()) + java.util.Arrays.toString(cd.weightedSum())
                        + java.util.Arrays.toString(cd.weightedSquares()));
                md.cells(cd.cells());
            }
        }
    }

    /** A map's keys in the order of {@link String#compareTo}, as a {@link TreeMap} holds them. */
    private static List<String> sorted(Map<String, ?> m) {
        String[] keys = m.keySet().toArray(new String[0]);
        java.util.Arrays.sort(keys);
        return java.util.Arrays.asList(keys);
    }

    /**
     * The canonical rendering, line by line, hashed in pieces of about 16 kB: the same bytes as hashing each line on
     * its own (a line is never split, so neither is a character), without a byte array and a digest update per
     * value, which for a summary with hundreds of domains cost about 0.4 s a check.
     */
    private static final class Canonical {
        private final MessageDigest md;
        private final StringBuilder pending = new StringBuilder(1 << 15);

        Canonical() {
            try {
                md = MessageDigest.getInstance("SHA-256");
            } catch (NoSuchAlgorithmException e) {
                throw new IllegalStateException(e);
            }
        }

        void line(String s) {
            pending.append(s).append('\n');
            flushIfFull();
        }

        /** Each value {@code length:text=count}, in sorted order. */
        void counts(Map<String, Long> counts) {
            for (String v : sorted(counts)) {
                pending.append(v.length()).append(':').append(v).append('=').append(counts.get(v).longValue())
                        .append('\n');
                flushIfFull();
            }
        }

        /** Each value's weight sums {@code prefix length:text=bits,bits}, in sorted order. */
        void weights(String prefix, Map<String, double[]> sums) {
            for (String v : sorted(sums)) {
                double[] s = sums.get(v);
                pending.append(prefix).append(v.length()).append(':').append(v).append('=')
                        .append(Double.doubleToLongBits(s[0])).append(',').append(Double.doubleToLongBits(s[1]))
                        .append('\n');
                flushIfFull();
            }
        }

        /** Each cell {@code length:text=[sums]}, in sorted order. */
        void cells(Map<String, double[]> cells) {
            for (String v : sorted(cells)) {
                pending.append(v.length()).append(':').append(v).append('=')
                        .append(java.util.Arrays.toString(cells.get(v))).append('\n');
                flushIfFull();
            }
        }

        private void flushIfFull() {
            if (pending.length() >= 1 << 14) {
                flush();
            }
        }

        private void flush() {
            md.update(pending.toString().getBytes(StandardCharsets.UTF_8));
            pending.setLength(0);
        }

        String hex() {
            flush();
            return HexFormat.of().formatHex(md.digest());
        }
    }

    public List<String> columnNames() {
        return List.copyOf(columns.keySet());
    }

    /**
     * Pools several waves' profiles (for comparison against the pooled last k waves). A column's weight sums are
     * pooled with its counts, value by value (in the coarser binning for summarised columns); a column keeps weights
     * in the pool only when every wave that has the column has its weights, so a pool never mixes weighted and
     * unweighted waves.
     */
    public static WaveProfile pooled(String label, List<WaveProfile> waves) {
        long rows = 0;
        Map<String, ColumnType> schema = new LinkedHashMap<>();
        Map<String, ColumnTally> columns = new LinkedHashMap<>();
        Map<String, Map<String, double[]>> weights = new LinkedHashMap<>();
        java.util.Set<String> unweighted = new java.util.HashSet<>();
        Map<List<String>, List<JointTally>> pairs = new LinkedHashMap<>();
        for (WaveProfile w : waves) {
            for (JointTally p : w.pairs) {
                pairs.computeIfAbsent(List.of(p.x(), p.y()), k -> new java.util.ArrayList<>()).add(p);
            }
            rows += w.rows;
            schema.putAll(w.schema);
            for (ColumnTally t : w.columns.values()) {
                ColumnTally prev = columns.get(t.column());
                Map<String, double[]> tw = w.weights.get(t.column());
                if (tw == null) {
                    unweighted.add(t.column());
                }
                if (prev == null) {
                    columns.put(t.column(), t);
                    if (tw != null) {
                        weights.put(t.column(), tw);
                    }
                } else {
                    Pooled p = pooled(prev, weights.get(t.column()), t, tw);
                    columns.put(t.column(), p.tally());
                    if (p.weights() != null) {
                        weights.put(t.column(), p.weights());
                    }
                }
            }
        }
        unweighted.forEach(weights::remove);
        List<JointTally> pooledPairs = pairs.values().stream().map(WaveProfile::pooled).toList();
        return new WaveProfile(label, rows, schema, columns, weights, null, pooledPairs, pooledDomains(waves));
    }

    /**
     * The pool's domains: a breakdown column is pooled only when every wave holds its domains (else it is dropped,
     * as a pool never mixes waves with and without a column's weights); its domains are matched by label, in order
     * of first appearance, and each domain's tallies pooled like a whole wave's (a domain or a column absent from a
     * wave adds nothing for it). Weights are kept for a column only when every wave has them; PSU sums are dropped,
     * as a pool has no design. Overflow rows add up; overflow domains add up too, an upper bound of the distinct
     * labels, since one label may overflow in several waves.
     */
    static List<DomainTally> pooledDomains(List<WaveProfile> waves) {
        if (waves.isEmpty() || waves.get(0).domains.isEmpty()) {
            return List.of();
        }
        List<DomainTally> out = new java.util.ArrayList<>();
        for (DomainTally firstWave : waves.get(0).domains) {
            String column = firstWave.column();
            List<DomainTally> parts = waves.stream().map(w -> w.domains(column).orElse(null)).toList();
            if (parts.contains(null)) {
                continue;
            }
            out.add(pooledDomain(column, parts));
        }
        return out;
    }

    private static DomainTally pooledDomain(String column, List<DomainTally> parts) {
        List<String> labels = new java.util.ArrayList<>();
        java.util.Set<String> columnNames = new java.util.LinkedHashSet<>();
        java.util.Set<String> weighted = null;
        long nullRows = 0;
        long overflowRows = 0;
        int overflowDomains = 0;
        for (DomainTally t : parts) {
            t.domains().stream().filter(l -> !labels.contains(l)).forEach(labels::add);
            columnNames.addAll(t.tallies().keySet());
            nullRows += t.nullRows();
            overflowRows += t.overflowRows();
            overflowDomains += t.overflowDomains();
        }
        for (String c : columnNames) {
            boolean allWeighted = parts.stream().allMatch(t -> !t.tallies().containsKey(c) || t.weights().containsKey(c));
            if (allWeighted) {
                if (weighted == null) {
                    weighted = new java.util.HashSet<>();
                }
                weighted.add(c);
            }
        }
        long[] rows = new long[labels.size()];
        Map<String, List<ColumnTally>> tallies = new LinkedHashMap<>();
        Map<String, List<Map<String, double[]>>> weights = new LinkedHashMap<>();
        for (String c : columnNames) {
            boolean keepWeights = weighted != null && weighted.contains(c);
            List<ColumnTally> perDomain = new java.util.ArrayList<>();
            List<Map<String, double[]>> perDomainWeights = new java.util.ArrayList<>();
            for (String label : labels) {
                ColumnTally pooled = null;
                Map<String, double[]> pooledWeights = null;
                for (DomainTally t : parts) {
                    int d = t.indexOf(label);
                    List<ColumnTally> ct = t.tallies().get(c);
                    if (d < 0 || ct == null) {
                        continue;
                    }
                    Map<String, double[]> tw = keepWeights ? t.weights().get(c).get(d) : null;
                    if (pooled == null) {
                        pooled = ct.get(d);
                        pooledWeights = tw;
                    } else {
                        Pooled p = pooled(pooled, pooledWeights, ct.get(d), tw);
                        pooled = p.tally();
                        pooledWeights = p.weights();
                    }
                }
                // A domain no wave had this column in: an empty tally over the domain's rows, all of them unanswered.
                perDomain.add(pooled);
                perDomainWeights.add(pooledWeights == null ? Map.of() : pooledWeights);
            }
            tallies.put(c, perDomain);
            if (keepWeights) {
                weights.put(c, perDomainWeights);
            }
        }
        for (int d = 0; d < labels.size(); d++) {
            for (DomainTally t : parts) {
                int i = t.indexOf(labels.get(d));
                if (i >= 0) {
                    rows[d] += t.rows()[i];
                }
            }
        }
        for (var e : tallies.entrySet()) {
            List<ColumnTally> perDomain = e.getValue();
            for (int d = 0; d < perDomain.size(); d++) {
                if (perDomain.get(d) == null) {
                    ColumnType type = parts.stream().map(t -> t.tallies().get(e.getKey())).filter(java.util.Objects::nonNull)
                            .findFirst().map(l -> l.get(0).type()).orElse(ColumnType.OTHER);
                    perDomain.set(d, new ColumnTally(e.getKey(), type, rows[d], rows[d], Map.of(), false));
                }
            }
        }
        return new DomainTally(column, labels, rows, nullRows, overflowDomains, overflowRows, tallies, weights,
                Map.of());
    }

    /**
     * Several waves' tallies of one pair as one: counts of equal pairs add up, within the same budget of distinct
     * pairs, summarised at least at the coarsest binning among them.
     */
    static JointTally pooled(List<JointTally> parts) {
        PairCounter counter = new PairCounter();
        Binning coarsest = Binning.EXACT;
        for (JointTally p : parts) {
            coarsest = coarsest.coarser(p.binning());
        }
        counter.summariseAtLeast(coarsest);
        for (JointTally p : parts) {
            double[] xs = p.xs();
            double[] ys = p.ys();
            long[] n = p.counts();
            for (int i = 0; i < n.length; i++) {
                counter.add(xs[i], ys[i], n[i]);
            }
        }
        return counter.tally(parts.get(0).x(), parts.get(0).y());
    }

    /** Two waves' tallies of one column as one; summarised tallies pool in the coarser binning of the two. */
    static ColumnTally pooled(ColumnTally a, ColumnTally b) {
        return pooled(a, null, b, null).tally();
    }

    /** A pooled tally and its weight sums (null unless both parts had them). */
    record Pooled(ColumnTally tally, Map<String, double[]> weights) {
    }

    static Pooled pooled(ColumnTally a, Map<String, double[]> aw, ColumnTally b, Map<String, double[]> bw) {
        boolean weighted = aw != null && bw != null;
        Map<String, Long> merged;
        Map<String, double[]> mergedWeights = null;
        Binning binning = a.binning().coarser(b.binning());
        if (binning.isExact()) {
            merged = new java.util.HashMap<>(a.valueCounts());
            b.valueCounts().forEach((v, c) -> merged.merge(v, c, Long::sum));
            if (weighted) {
                mergedWeights = new java.util.HashMap<>();
                for (Map<String, double[]> part : List.of(aw, bw)) {
                    for (Map.Entry<String, double[]> e : part.entrySet()) {
                        double[] cell = mergedWeights.computeIfAbsent(e.getKey(), k -> new double[2]);
                        cell[0] += e.getValue()[0];
                        cell[1] += e.getValue()[1];
                    }
                }
            }
        } else {
            RelativeBins bins = RelativeBins.of(binning.level(), false, a.valueCounts(), weighted ? aw : null);
            b.valueCounts().forEach((v, c) -> {
                double[] w = weighted ? bw.get(v) : null;
                bins.add(RelativeBins.keyValue(v), c, w == null ? 0 : w[0], w == null ? 0 : w[1]);
            });
            merged = bins.counts();
            binning = bins.binning();
            mergedWeights = weighted ? bins.weights() : null;
        }
        return new Pooled(new ColumnTally(a.column(), b.type(), a.rowCount() + b.rowCount(),
                a.nullCount() + b.nullCount(), merged, a.truncated() || b.truncated(), binning), mergedWeights);
    }
}
