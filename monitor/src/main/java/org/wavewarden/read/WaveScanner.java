package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.postgresql.PGConnection;
import org.postgresql.copy.CopyOut;
import org.wavewarden.config.Identifiers;
import org.wavewarden.profile.ColumnTally;

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

    /** Default cap on distinct values kept per column; beyond it the tally is marked truncated. */
    public static final int DEFAULT_MAX_DISTINCT = 100_000;

    /** Longer values are kept as a prefix plus length and hash, so a free-text essay cannot bloat a summary. */
    public static final int MAX_VALUE_CHARS = 256;

    private final int maxDistinct;
    private final String weightColumn;

    public WaveScanner(int maxDistinct) {
        this(maxDistinct, null);
    }

    /**
     * @param weightColumn a survey weight column read in the same pass; each value's weight sum and sum of squared
     *                     weights are kept beside its count (for weighted shares and Kish's effective sample size)
     */
    public WaveScanner(int maxDistinct, String weightColumn) {
        if (maxDistinct < 1) {
            throw new IllegalArgumentException("maxDistinct must be positive, was " + maxDistinct);
        }
        this.maxDistinct = maxDistinct;
        this.weightColumn = weightColumn;
    }

    /**
     * The result of one scan: the wave's row count, one tally per requested column and, with a weight column, per
     * column and value the sum of weights and of squared weights ({@code double[] {sum w, sum w^2}}); rows whose
     * weight is NULL or not a finite non-negative number count in {@code badWeights} and add no weight.
     */
    public record WaveScan(long rows, Map<String, ColumnTally> columns, Map<String, Map<String, double[]>> weights,
                           long badWeights) {

        public WaveScan(long rows, Map<String, ColumnTally> columns) {
            this(rows, columns, Map.of(), 0);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof WaveScan w && rows == w.rows && columns.equals(w.columns) && badWeights == w.badWeights
                    && WaveScanner.sameWeights(weights, w.weights);
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

    public WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, LongConsumer progress) {
        boolean weighted = weightColumn != null;
        List<SourceColumn> read = columns;
        if (weighted) {
            read = new ArrayList<>(columns);
            read.add(new SourceColumn(weightColumn, org.wavewarden.profile.ColumnType.DECIMAL, "weight"));
        }
        String sql = copySql(h, source, wave, read);
        int k = columns.size();
        int fieldsPerRow = read.size();
        List<Map<String, double[]>> weightSums = new ArrayList<>(weighted ? k : 0);
        long badWeights = 0;
        List<Map<String, long[]>> tallies = new ArrayList<>(k);
        long[] nulls = new long[k];
        boolean[] truncated = new boolean[k];
        for (int i = 0; i < k; i++) {
            tallies.add(new HashMap<>());
            if (weighted) {
                weightSums.add(new HashMap<>());
            }
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
                    if (v.length() > MAX_VALUE_CHARS) {
                        v = shortened(v);
                    }
                    Map<String, long[]> t = tallies.get(i);
                    long[] cell = t.get(v);
                    if (cell != null) {
                        cell[0]++;
                    } else if (t.size() < maxDistinct) {
                        t.put(v, new long[] {1});
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
                rows++;
                if ((rows & 0xFFFF) == 0 && progress != null) {
                    progress.accept(rows);
                }
            }
        } catch (SQLException e) {
            throw new SourceReadException("reading wave " + wave + " failed: " + e.getMessage(), e);
        }
        Map<String, ColumnTally> out = new LinkedHashMap<>();
        for (int i = 0; i < k; i++) {
            Map<String, Long> counts = new HashMap<>(tallies.get(i).size() * 2);
            tallies.get(i).forEach((v, cell) -> counts.put(v, cell[0]));
            SourceColumn col = columns.get(i);
            out.put(col.name(), new ColumnTally(col.name(), col.type(), rows, nulls[i], counts, truncated[i]));
        }
        Map<String, Map<String, double[]>> weights = new LinkedHashMap<>();
        for (int i = 0; weighted && i < k; i++) {
            weights.put(columns.get(i).name(), weightSums.get(i));
        }
        return new WaveScan(rows, out, weights, badWeights);
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
