package org.wavewarden.compare.panel;

import org.wavewarden.profile.Binning;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.read.KeyedPairReader;

import java.util.List;

/**
 * A panel's respondents paired across two waves, summarised per variable: what {@link PanelComparisons} compares.
 * The pipeline's pairing reads the rows and fills these; nothing here reads anything.
 */
public final class PairedPanel {

    private PairedPanel() {
    }

    /**
     * What the pairing found: how many respondents were in both waves or in one only, and per variable its paired
     * summary. A panel that could not be paired at all has no variables and says why in {@code notes}.
     *
     * @param baselineWave  the earlier wave
     * @param currentWave   the judged wave
     * @param matched       respondents with a row in both waves
     * @param onlyBaseline  respondents with a row in the baseline wave only
     * @param onlyCurrent   respondents with a row in the judged wave only
     * @param baselineKeys  the baseline wave's keys (rows with NULL or repeated keys are matched to no one); null
     *                      when nothing was read
     * @param currentKeys   the same for the judged wave
     * @param variables     one summary per variable compared paired, in variable order
     * @param notes         variables (or the whole panel) not compared paired, with the reason
     */
    public record Panel(String baselineWave, String currentWave, long matched, long onlyBaseline, long onlyCurrent,
                        KeyedPairReader.SideKeys baselineKeys, KeyedPairReader.SideKeys currentKeys,
                        List<VariablePairs> variables, List<String> notes) {

        public Panel {
            variables = List.copyOf(variables);
            notes = List.copyOf(notes);
        }

        /** A panel that was not paired, and why. */
        public static Panel skipped(String baselineWave, String currentWave, String why) {
            return new Panel(baselineWave, currentWave, 0, 0, 0, null, null, List.of(), List.of(why));
        }

        /** Rows of a wave that are matched to no one because their key is NULL or repeated. */
        public long unmatchedRows(boolean baseline) {
            KeyedPairReader.SideKeys k = baseline ? baselineKeys : currentKeys;
            return k == null ? 0 : k.nullKeyRows() + k.duplicateKeyRows();
        }
    }

    /** One variable's paired summary. {@code leftOut} counts matched respondents whose pair had an invalid answer. */
    public sealed interface VariablePairs {
        String variable();

        long pairs();

        long leftOut();
    }

    /**
     * The paired differences of a continuous or ordinal variable.
     *
     * @param meanDifference mean of {@code current - baseline}, exact
     * @param sdDifference   sample standard deviation of the differences (divisor n - 1), exact; NaN for one pair
     * @param differences    the differences as a frequency table, exact or summarised as {@code binning} says
     * @param sdBaseline     sample standard deviation of the paired respondents' baseline answers, for the interval
     *                       of the plotted baseline mean; NaN when unknown
     * @param sdCurrent      the same for the judged wave's answers
     */
    public record NumericPairs(String variable, long pairs, long leftOut, double meanBaseline, double meanCurrent,
                               double meanDifference, double sdDifference, NumericDistribution differences,
                               Binning binning, double sdBaseline, double sdCurrent) implements VariablePairs {

        /** Pairs whose waves' own spreads are not known: the plotted means have no interval. */
        public NumericPairs(String variable, long pairs, long leftOut, double meanBaseline, double meanCurrent,
                            double meanDifference, double sdDifference, NumericDistribution differences,
                            Binning binning) {
            this(variable, pairs, leftOut, meanBaseline, meanCurrent, meanDifference, sdDifference, differences,
                    binning, Double.NaN, Double.NaN);
        }
    }

    /**
     * The paired 2 x 2 table of a binary variable's tracked answer {@code successValue}: yes at both waves, yes then
     * no, no then yes, no at both.
     */
    public record BinaryPairs(String variable, String successValue, long bothYes, long yesNo, long noYes,
                              long bothNo, long leftOut) implements VariablePairs {
        @Override
        public long pairs() {
            return bothYes + yesNo + noYes + bothNo;
        }
    }

    /**
     * The paired k x k table of a categorical variable: {@code counts[i][j]} respondents answered {@code labels[i]}
     * in the baseline wave and {@code labels[j]} in the judged wave.
     */
    public record CategoricalPairs(String variable, List<String> labels, long[][] counts, long leftOut)
            implements VariablePairs {

        public CategoricalPairs {
            labels = List.copyOf(labels);
            counts = deepCopy(counts);
        }

        @Override
        public long[][] counts() {
            return deepCopy(counts);
        }

        @Override
        public long pairs() {
            long n = 0;
            for (long[] row : counts) {
                for (long c : row) {
                    n += c;
                }
            }
            return n;
        }

        private static long[][] deepCopy(long[][] t) {
            long[][] out = new long[t.length][];
            for (int i = 0; i < t.length; i++) {
                out[i] = t[i].clone();
            }
            return out;
        }
    }
}
