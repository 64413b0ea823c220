package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyOut;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.PairCounter;
import org.wavewarden.profile.RelativeBins;

import java.sql.Connection;
import java.sql.SQLException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.LongConsumer;

/**
 * Reads one wave in a single pass: one {@code COPY (SELECT ...) TO STDOUT} streams the monitored columns, and each
 * column's distinct values are tallied as they arrive, so the JVM holds frequency tables, never rows.
 */
public final class WaveScanner {

    /** Default cap on distinct values kept per non-numeric column; beyond it the tally is marked truncated. */
    public static final int DEFAULT_MAX_DISTINCT = 100_000;

    /**
     * Default number of distinct values a numeric column is counted exactly up to; beyond it the column is
     * summarised in {@link RelativeBins}. Ten thousand distinct values hold any coded answer, age, scale or
     * rounded amount exactly; what has more is a measurement or an amount to the cent, where 0.05% is finer than
     * any shift worth reporting.
     */
    public static final int DEFAULT_EXACT_NUMBERS = 10_000;

    /** Longer values are kept as a prefix plus length and hash, so a free-text essay cannot bloat a summary. */
    public static final int MAX_VALUE_CHARS = 256;

    private final int maxDistinct;
    private final int exactNumbers;

    public WaveScanner(int maxDistinct) {
        this(maxDistinct, DEFAULT_EXACT_NUMBERS);
    }

    /**
     * @param maxDistinct  distinct values kept per non-numeric column
     * @param exactNumbers distinct values a numeric column is counted exactly up to
     */
    public WaveScanner(int maxDistinct, int exactNumbers) {
        if (maxDistinct < 1 || exactNumbers < 1) {
            throw new IllegalArgumentException("maxDistinct and exactNumbers must be positive, were " + maxDistinct
                    + " and " + exactNumbers);
        }
        this.maxDistinct = maxDistinct;
        this.exactNumbers = exactNumbers;
    }

    /**
     * The result of one scan: the wave's row count, one tally per requested column and, with a weight column, per
     * column and value the sum of weights and of squared weights ({@code double[] {sum w, sum w^2}}); rows whose
     * weight is NULL or not a finite non-negative number count in {@code badWeights} and add no weight. With pairs
     * requested, one joint tally per pair, in the order requested.
     */
    public record WaveScan(long rows, Map<String, ColumnTally> columns, Map<String, Map<String, double[]>> weights,
                           long badWeights, DesignSummary design, List<JointTally> pairs) {

        public WaveScan {
            pairs = pairs == null ? List.of() : List.copyOf(pairs);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof WaveScan w && rows == w.rows && columns.equals(w.columns) && badWeights == w.badWeights
                    && WaveScanner.sameWeights(weights, w.weights) && java.util.Objects.equals(design, w.design)
                    && pairs.equals(w.pairs);
        }

        @Override
        public int hashCode() {
            return java.util.Objects.hash(rows, columns, badWeights);
        }
    }

    static boolean sameWeights(Map<String, Map<String, double[]>> a, Map<String, Map<String, double[]>> b) {
        if (!a.keySet().equals(b.keySet())) {
            return false;
        }
        for (var e : a.entrySet()) {
            Map<String, double[]> x = e.getValue();
            Map<String, double[]> y = b.get(e.getKey());
            if (!x.keySet().equals(y.keySet())) {
                return false;
            }
            for (var v : x.entrySet()) {
                if (!java.util.Arrays.equals(v.getValue(), y.get(v.getKey()))) {
                    return false;
                }
            }
        }
        return true;
    }

    /** The stratum column (null for one stratum) and the cluster column of a wave's sampling design. */
    public record Design(SourceColumn strata, SourceColumn clusters) {
    }

    /**
     * The scanner interface's form: this reference scanner reads no sampling design (the binary scanner does).
     *
     * @throws IllegalArgumentException when a design is given
     */
    public WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                         Design design, List<PairSpec> pairs, LongConsumer progress) {
        if (design != null) {
            throw new IllegalArgumentException("the text scanner reads no sampling design; use the binary scanner");
        }
        return read(h, source, wave, columns, weight, pairs, progress);
    }

    /** {@link #scan(Handle, WaveSource, String, List, SourceColumn, Design, List, LongConsumer)} without pairs. */
    public WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                         Design design, LongConsumer progress) {
        return scan(h, source, wave, columns, weight, design, List.of(), progress);
    }

    /** {@link #scan(Handle, WaveSource, String, List, SourceColumn, LongConsumer)} without a weight column. */
    public WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, LongConsumer progress) {
        return read(h, source, wave, columns, null, List.of(), progress);
    }

    /** A scan with a weight column, without design or pairs. */
    public WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                         LongConsumer progress) {
        return read(h, source, wave, columns, weight, List.of(), progress);
    }

    /**
     * Reads the columns of one wave in one pass.
     *
     * @param weight a survey weight column read in the same pass, or null; each value's weight sum and sum of
     *               squared weights are kept beside its count (for weighted shares and Kish's effective sample size)
     * @param pairs  pairs of numeric columns among {@code columns} whose joint values are tallied in the same pass,
     *               over the rows where both cells are finite numbers ({@link PairCounter})
     */
    private WaveScan read(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                          List<PairSpec> pairs, LongConsumer progress) {
        boolean weighted = weight != null;
        List<SourceColumn> read = columns;
        if (weighted) {
            read = new ArrayList<>(columns);
            read.add(weight);
        }
        String sql = copySql(h, source, wave, read);
        int k = columns.size();
        int fieldsPerRow = read.size();
        List<Map<String, double[]>> weightSums = new ArrayList<>(weighted ? k : 0);
        long badWeights = 0;
        List<Map<String, long[]>> tallies = new ArrayList<>(k);
        RelativeBins[] bins = new RelativeBins[k];
        long[] nulls = new long[k];
        boolean[] truncated = new boolean[k];
        for (int i = 0; i < k; i++) {
            tallies.add(new HashMap<>());
            weightSums.add(weighted ? new HashMap<>() : null);
        }
        int[][] pairAt = new int[pairs.size()][];
        PairCounter[] joint = new PairCounter[pairs.size()];
        for (int j = 0; j < pairs.size(); j++) {
            pairAt[j] = pairs.get(j).indexIn(columns);
            joint[j] = new PairCounter();
        }
        long rows = 0;
        String[] fields = new String[fieldsPerRow];
        try {
            Connection c = h.getConnection();
            try (var st = c.createStatement()) {
                st.execute("SET DateStyle = 'ISO, YMD'"); // dates in one text form whatever the server default
            }
            CopyOut copy = c.unwrap(PGConnection.class).getCopyAPI().copyOut(sql);
            byte[] row;
            while ((row = copy.readFromCopy()) != null) {
                int n = CopyTextRow.split(row, fields);
                if (n != Math.max(fieldsPerRow, 1)) {
                    throw new IllegalStateException("COPY row had " + n + " fields, expected " + fieldsPerRow);
                }
                double w = Double.NaN;
                if (weighted) {
                    w = weight(fields[k]);
                    if (Double.isNaN(w)) {
                        badWeights++;
                    }
                }
                for (int i = 0; i < k; i++) {
                    String v = fields[i];
                    if (v == null) {
                        nulls[i]++;
                        continue;
                    }
                    if (bins[i] != null) {
                        bins[i].add(number(columns.get(i), v), w);
                        continue;
                    }
                    boolean numeric = columns.get(i).type().isNumeric();
                    // A number keeps its full text however long (-1e-300 takes 303 characters): a stand-in is no number.
                    if (v.length() > MAX_VALUE_CHARS && !numeric) {
                        v = shortened(v);
                    }
                    Map<String, long[]> t = tallies.get(i);
                    long[] cell = t.get(v);
                    if (cell != null) {
                        cell[0]++;
                    } else if (t.size() < (numeric ? exactNumbers : maxDistinct)) {
                        t.put(v, new long[] {1});
                    } else if (numeric) {
                        bins[i] = summarise(columns.get(i), t, weightSums.get(i));
                        tallies.set(i, null);
                        weightSums.set(i, null);
                        bins[i].add(number(columns.get(i), v), w);
                        continue;
                    } else {
                        truncated[i] = true;
                        continue;
                    }
                    if (weighted && !Double.isNaN(w)) {
                        double[] ws = weightSums.get(i).computeIfAbsent(v, x -> new double[2]);
                        ws[0] += w;
                        ws[1] += w * w;
                    }
                }
                for (int j = 0; j < joint.length; j++) {
                    String x = fields[pairAt[j][0]];
                    String y = fields[pairAt[j][1]];
                    if (x != null && y != null) {
                        double a = number(columns.get(pairAt[j][0]), x);
                        double b = number(columns.get(pairAt[j][1]), y);
                        if (Double.isFinite(a) && Double.isFinite(b)) {
                            joint[j].add(a, b);
                        }
                    }
                }
                rows++;
                if ((rows & 0xFFFF) == 0 && progress != null) {
                    progress.accept(rows);
                }
            }
        } catch (SQLException e) {
            throw new SourceReadException("reading wave " + wave + " failed: " + e.getMessage(), e);
        }
        Map<String, ColumnTally> out = new LinkedHashMap<>();
        Map<String, Map<String, double[]>> weights = new LinkedHashMap<>();
        for (int i = 0; i < k; i++) {
            SourceColumn col = columns.get(i);
            if (bins[i] != null) {
                out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], bins[i].counts(), false,
                        bins[i].binning()));
                if (weighted) {
                    weights.put(col.name(), bins[i].weights());
                }
                continue;
            }
            Map<String, Long> counts = new HashMap<>(tallies.get(i).size() * 2);
            tallies.get(i).forEach((v, cell) -> counts.put(v, cell[0]));
            out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], counts, truncated[i]));
            if (weighted) {
                Map<String, double[]> ws = weightSums.get(i);
                counts.keySet().forEach(v -> ws.computeIfAbsent(v, x -> new double[2]));
                weights.put(col.name(), ws);
            }
        }
        List<JointTally> jointTallies = new ArrayList<>(pairs.size());
        for (int j = 0; j < joint.length; j++) {
            jointTallies.add(joint[j].tally(pairs.get(j).x(), pairs.get(j).y()));
        }
        return new WaveScan(rows, out, weights, badWeights, null, jointTallies);
    }

    /** Moves a numeric column's exact counts into relative bins, when it has more distinct values than kept. */
    private static RelativeBins summarise(SourceColumn col, Map<String, long[]> tally, Map<String, double[]> weights) {
        RelativeBins bins = new RelativeBins(RelativeBins.DEFAULT_MAX_BINS, 0, isReal(col));
        tally.forEach((v, cell) -> {
            double[] w = weights == null ? null : weights.get(v);
            bins.add(number(col, v), cell[0], w == null ? 0 : w[0], w == null ? 0 : w[1]);
        });
        return bins;
    }

    private static boolean isReal(SourceColumn col) {
        String t = col.postgresType().toLowerCase(java.util.Locale.ROOT);
        return t.equals("real") || t.equals("float4");
    }

    /** A numeric column's text as a double; a {@code real} reads as the float it is, widened exactly. */
    private static double number(SourceColumn col, String text) {
        return isReal(col) ? Float.parseFloat(text) : Double.parseDouble(text);
    }

    /** A weight as the text form gives it, or NaN when it is NULL, not a number, negative or infinite. */
    static double weight(String text) {
        if (text == null || !org.wavewarden.missing.NumberText.isPlainDecimal(text)) {
            return Double.NaN;
        }
        double w = Double.parseDouble(text);
        return w >= 0 && Double.isFinite(w) ? w : Double.NaN;
    }

    /** A long value's stand-in: its first 200 characters, its length and a hash, distinct for distinct values. */
    static String shortened(String v) {
        return v.substring(0, 200) + "\u2026[" + v.length() + " chars, #" + Integer.toHexString(v.hashCode()) + "]";
    }

    static String copySql(Handle h, WaveSource source, String wave, List<SourceColumn> columns) {
        StringBuilder select = new StringBuilder("SELECT ");
        if (columns.isEmpty()) {
            select.append("1");
        }
        for (int i = 0; i < columns.size(); i++) {
            if (i > 0) {
                select.append(", ");
            }
            select.append(Identifiers.quote(columns.get(i).name()));
        }
        select.append(source.fromClause(wave));
        return "COPY (" + select + ") TO STDOUT";
    }

    /** The source could not be read (an outage, a permission problem); the run is retried, not judged. */
    public static final class SourceReadException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public SourceReadException(String message, Throwable cause) {
            super(message, cause);
        }
    }
}
