package org.wavewarden.read;

import org.jdbi.v3.core.Handle;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.JointTally;
import org.wavewarden.profile.RelativeBins;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.function.LongConsumer;

/**
 * Reads one wave's columns into frequency tables in one pass, so the JVM holds tallies, never rows: what a scan is
 * asked for ({@link Design}, {@link PairSpec}), what it gives ({@link WaveScan}), its limits and its one failure
 * ({@link SourceReadException}). {@link BinaryWaveScanner} is the scanner.
 */
public interface WaveScanner {

    /**
     * Reads the columns of one wave in one pass.
     *
     * @param weight   a survey weight column read in the same pass, or null; each value's weight sum and sum of
     *                 squared weights are kept beside its count (for weighted shares and Kish's effective sample
     *                 size)
     * @param design   the stratum and cluster columns, or null
     * @param pairs    pairs of numeric columns among {@code columns} whose joint values are tallied in the same
     *                 pass, over the rows where both cells are finite numbers, possibly none
     * @param domains  the breakdown columns whose domains are tallied in the same pass ({@link Domains#NONE}:
     *                 none)
     * @param progress told the rows read so far now and then, or null
     * @throws SourceReadException when the source cannot be read
     */
    WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                  Design design, List<PairSpec> pairs, Domains domains, LongConsumer progress);

    /** The scan without breakdowns. */
    default WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                          Design design, List<PairSpec> pairs, LongConsumer progress) {
        return scan(h, source, wave, columns, weight, design, pairs, Domains.NONE, progress);
    }

    /** The scan without weight, design or pairs. */
    default WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns,
                          LongConsumer progress) {
        return scan(h, source, wave, columns, null, null, List.of(), progress);
    }

    /** The scan with a weight column, without design or pairs. */
    default WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                          LongConsumer progress) {
        return scan(h, source, wave, columns, weight, null, List.of(), progress);
    }

    /** The scan with a weight column and a design, without pairs. */
    default WaveScan scan(Handle h, WaveSource source, String wave, List<SourceColumn> columns, SourceColumn weight,
                          Design design, LongConsumer progress) {
        return scan(h, source, wave, columns, weight, design, List.of(), progress);
    }

    /** Default cap on distinct values kept per non-numeric column; beyond it the tally is marked truncated. */
    int DEFAULT_MAX_DISTINCT = 100_000;

    /**
     * Default number of distinct values a numeric column is counted exactly up to; beyond it the column is
     * summarised in {@link RelativeBins}. Ten thousand distinct values hold any coded answer, age, scale or
     * rounded amount exactly; what has more is a measurement or an amount to the cent, where 0.05% is finer than
     * any shift worth reporting.
     */
    int DEFAULT_EXACT_NUMBERS = 10_000;

    /** Longer values are kept as a prefix plus length and hash, so a free-text essay cannot bloat a summary. */
    int MAX_VALUE_CHARS = 256;

    /**
     * The result of one scan: the wave's row count, one tally per requested column and, with a weight column, per
     * column and value the sum of weights and of squared weights ({@code double[] {sum w, sum w^2}}); rows whose
     * weight is NULL or not a finite non-negative number count in {@code badWeights} and add no weight. With a
     * design, the PSU sums of {@link DesignSummary}; with pairs requested, one joint tally per pair, in the order
     * requested; with breakdown columns requested, one {@link DomainTally} per breakdown column, in the order
     * requested.
     */
    record WaveScan(long rows, Map<String, ColumnTally> columns, Map<String, Map<String, double[]>> weights,
                           long badWeights, DesignSummary design, List<JointTally> pairs, List<DomainTally> domains) {

        public WaveScan {
            pairs = pairs == null ? List.of() : List.copyOf(pairs);
            domains = domains == null ? List.of() : List.copyOf(domains);
        }

        /** A scan without breakdowns. */
        public WaveScan(long rows, Map<String, ColumnTally> columns, Map<String, Map<String, double[]>> weights,
                        long badWeights, DesignSummary design, List<JointTally> pairs) {
            this(rows, columns, weights, badWeights, design, pairs, List.of());
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof WaveScan w && rows == w.rows && columns.equals(w.columns) && badWeights == w.badWeights
                    && sameWeights(weights, w.weights) && Objects.equals(design, w.design) && pairs.equals(w.pairs)
                    && domains.equals(w.domains);
        }

        @Override
        public int hashCode() {
            return Objects.hash(rows, columns, badWeights);
        }
    }

    private static boolean sameWeights(Map<String, Map<String, double[]>> a, Map<String, Map<String, double[]>> b) {
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

    /**
     * The breakdown columns of a scan: each row's domain is the column's output text (as a design label travels),
     * looked up once per row and column; at most {@code maxDomains} domains per column are kept, in order of first
     * appearance, the rows of further domains counted as overflow ({@link DomainTally}).
     */
    record Domains(List<SourceColumn> columns, int maxDomains) {

        /** No breakdowns. */
        public static final Domains NONE = new Domains(List.of(), 1);

        public Domains {
            columns = columns == null ? List.of() : List.copyOf(columns);
            if (maxDomains < 1) {
                throw new IllegalArgumentException("maxDomains must be positive, was " + maxDomains);
            }
        }

        public boolean isEmpty() {
            return columns.isEmpty();
        }
    }

    /** The stratum column (null for one stratum) and the cluster column of a wave's sampling design. */
    record Design(SourceColumn strata, SourceColumn clusters) {
    }

    /** The source could not be read (an outage, a permission problem); the run is retried, not judged. */
    final class SourceReadException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        public SourceReadException(String message, Throwable cause) {
            super(message, cause);
        }
    }
}
