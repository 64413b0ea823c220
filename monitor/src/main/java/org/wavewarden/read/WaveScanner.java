package org.wavewarden.read;

import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.RelativeBins;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * What reading one wave gives ({@link WaveScan}), what it is asked for ({@link Design}), its limits and its one
 * failure ({@link SourceReadException}): the contract {@link BinaryWaveScanner} fulfils in one {@code COPY} pass, so
 * the JVM holds frequency tables, never rows.
 */
public final class WaveScanner {

    private WaveScanner() {
    }

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

    /**
     * The result of one scan: the wave's row count, one tally per requested column and, with a weight column, per
     * column and value the sum of weights and of squared weights ({@code double[] {sum w, sum w^2}}); rows whose
     * weight is NULL or not a finite non-negative number count in {@code badWeights} and add no weight. With a
     * design, the PSU sums of {@link DesignSummary}; with pairs requested, one joint tally per pair, in the order
     * requested.
     */
    public record WaveScan(long rows, Map<String, ColumnTally> columns, Map<String, Map<String, double[]>> weights,
                           long badWeights, DesignSummary design, List<JointTally> pairs) {

        public WaveScan {
            pairs = pairs == null ? List.of() : List.copyOf(pairs);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof WaveScan w && rows == w.rows && columns.equals(w.columns) && badWeights == w.badWeights
                    && sameWeights(weights, w.weights) && Objects.equals(design, w.design) && pairs.equals(w.pairs);
        }

        @Override
        public int hashCode() {
            return Objects.hash(rows, columns, badWeights);
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
                if (!Arrays.equals(v.getValue(), y.get(v.getKey()))) {
                    return false;
                }
            }
        }
        return true;
    }

    /** The stratum column (null for one stratum) and the cluster column of a wave's sampling design. */
    public record Design(SourceColumn strata, SourceColumn clusters) {
    }

    /** A weight as the text form gives it, or NaN when it is NULL, not a number, negative or infinite. */
    static double weight(String text) {
        if (text == null || !org.wavewarden.missing.NumberText.isPlainDecimal(text)) {
            return Double.NaN;
        }
        double w = Double.parseDouble(text);
        return w >= 0 && Double.isFinite(w) ? w : Double.NaN;
    }

    /** The source could not be read (an outage, a permission problem); the run is retried, not judged. */
    public static final class SourceReadException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public SourceReadException(String message, Throwable cause) {
            super(message, cause);
        }
    }
}
