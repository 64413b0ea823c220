package org.wavewarden.pipeline;

import org.jdbi.v3.core.Handle;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.Binning;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.profile.RelativeBins;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.compare.panel.PairedPanel.BinaryPairs;
import org.wavewarden.compare.panel.PairedPanel.CategoricalPairs;
import org.wavewarden.compare.panel.PairedPanel.NumericPairs;
import org.wavewarden.compare.panel.PairedPanel.Panel;
import org.wavewarden.compare.panel.PairedPanel.VariablePairs;
import org.wavewarden.read.KeyedPairReader;
import org.wavewarden.read.WaveScanner;
import org.wavewarden.read.WaveSource;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.missing.ScreenedVariable;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.LongConsumer;

/**
 * The respondents of a panel matched across the baseline wave and the judged wave, summarised per variable while
 * their rows stream past: what the paired comparisons ({@link org.wavewarden.compare.panel.PanelComparisons}) need, and nothing else.
 *
 * <p>This is the one place a check reads an earlier wave's rows (every other comparison works from the earlier
 * wave's stored summary): pairing needs to know who answered what at both waves. Both waves come in one
 * {@code COPY} of a {@code FULL JOIN} on the respondent key ({@link KeyedPairReader}), one statement whatever the
 * number of variables. The JVM holds one joined row at a time and per variable a bounded summary:
 * <ul>
 *   <li>continuous and ordinal: the paired differences {@code current - baseline} as a frequency table, exact up to
 *       {@value #MAX_EXACT_DIFFERENCES} distinct differences and then in {@link RelativeBins}, beside the exact
 *       mean and variance of the differences (Welford's running update) and the means of both answers;</li>
 *   <li>binary: the 2 x 2 table of the tracked answer at the two waves;</li>
 *   <li>categorical: the k x k table of the answers at the two waves, k at most {@value #MAX_CATEGORIES}.</li>
 * </ul>
 * A pair enters a variable's summary only when both answers are valid by that wave's own screen of the variable
 * (the run's {@link org.wavewarden.missing.ScreenedWave}, the same screens the two-sample comparison uses): a NULL, a codebook
 * missing code, a confidently detected disguised missing value, a value outside the declared range or text in a
 * number leaves the pair out of that variable, and it is counted as left out. Ordinal answers with {@code levels}
 * are their ranks, as in the screen.
 *
 * <p>Panel comparisons are made when the dataset names a {@code respondentKey} and the wave is judged against one
 * earlier wave; a pooled baseline ({@code compareWith: {pooledLast: n}}) has no single earlier answer to pair with,
 * and is noted as skipped. Pairs are unweighted: each respondent counts once.
 */
public final class PanelPairs implements KeyedPairReader.Visitor {

    /** Distinct paired differences counted exactly before the rest are summarised in relative bins. */
    public static final int MAX_EXACT_DIFFERENCES = WaveScanner.DEFAULT_EXACT_NUMBERS;
    /** Categories a paired table may have; a variable with more is not compared paired. */
    public static final int MAX_CATEGORIES = 50;

    /** Reads two selections side by side, as {@link KeyedPairReader#read} does (tests wrap it to count reads). */
    @FunctionalInterface
    public interface Reader {
        KeyedPairReader.PairScan read(Handle h, String keyColumn, List<String> columns,
                                      KeyedPairReader.Selection before, KeyedPairReader.Selection after,
                                      KeyedPairReader.Visitor visitor, LongConsumer progress);
    }

    private final DatasetConfig dataset;
    private final String baselineWave;
    private final String currentWave;
    private final List<String> columns = new ArrayList<>();
    private final List<Accumulator> accumulators = new ArrayList<>();
    private final List<String> notes = new ArrayList<>();
    private final String skipped;
    private long matched;
    private long onlyBaseline;
    private long onlyCurrent;

    private PanelPairs(DatasetConfig dataset, String baselineWave, String currentWave, String skipped) {
        this.dataset = dataset;
        this.baselineWave = baselineWave;
        this.currentWave = currentWave;
        this.skipped = skipped;
    }

    /**
     * The pairing a check of {@code current} against {@code against} makes, before anything is read: null when the
     * dataset has no respondent key or the wave has no baseline; otherwise the variables to pair, with their
     * screens taken from the two waves' summaries.
     */
    public static PanelPairs plan(DatasetConfig d, List<String> against, WaveProfile baseline, WaveProfile current) {
        return plan(d, against, baseline, current, baseline == null ? null : WaveJudge.screen(d, current, baseline));
    }

    /** The same with the run's screened waves, whose screens decide which answers of a pair are valid. */
    public static PanelPairs plan(DatasetConfig d, List<String> against, WaveProfile baseline, WaveProfile current,
                                  WaveJudge.Screened screened) {
        if (d.respondentKey() == null || baseline == null || against.isEmpty()) {
            return null;
        }
        String wave = current.wave();
        if (against.size() > 1) {
            return new PanelPairs(d, baseline.wave(), wave, "panel comparisons skipped: the baseline pools "
                    + against.size() + " waves (" + String.join(", ", against) + "); pairing respondents needs one"
                    + " earlier wave");
        }
        String b = against.get(0);
        for (WaveProfile p : List.of(baseline, current)) {
            if (!p.schema().containsKey(d.respondentKey())) {
                return new PanelPairs(d, b, wave, "panel comparisons skipped: wave " + p.wave() + " has no column "
                        + d.respondentKey() + " (the respondent key)");
            }
        }
        PanelPairs plan = new PanelPairs(d, b, wave, null);
        for (VariableConfig v : screened.current().variables()) {
            ColumnTally ct = current.columns().get(v.name());
            ColumnTally bt = baseline.columns().get(v.name());
            if (ct == null || bt == null || !pairable(v.kind())) {
                continue;
            }
            if (ct.truncated() || bt.truncated()) {
                plan.notes.add(v.name() + ": not compared paired: too many distinct values to compare exactly");
                continue;
            }
            try {
                plan.add(v, screened.baseline().get(v.name()).orElseThrow(),
                        screened.current().get(v.name()).orElseThrow());
            } catch (RuntimeException e) {
                // The two-sample comparison reports the failed screen; the other variables are still paired.
                plan.notes.add(v.name() + ": not compared paired: the answers could not be screened");
            }
        }
        return plan;
    }

    private static boolean pairable(VariableKind k) {
        return k == VariableKind.CONTINUOUS || k == VariableKind.ORDINAL || k == VariableKind.BINARY
                || k == VariableKind.CATEGORICAL;
    }

    private void add(VariableConfig v, ScreenedVariable b, ScreenedVariable c) {
        Accumulator a = switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> new Numbers(v, b, c);
            case BINARY -> new Binary(v, b, c);
            case CATEGORICAL -> {
                List<String> labels = b.categories().unionOrder(c.categories());
                if (labels.size() > MAX_CATEGORIES) {
                    notes.add(v.name() + ": not compared paired: " + labels.size() + " categories, more than the "
                            + MAX_CATEGORIES + " a paired table is kept for");
                    yield null;
                }
                yield new Categories(v, labels, b, c);
            }
            case TEXT, DATE -> null;
        };
        if (a != null) {
            columns.add(v.name());
            accumulators.add(a);
        }
    }

    /** The columns read for the pairs, in the order of the reader's arrays. */
    public List<String> columns() {
        return List.copyOf(columns);
    }

    /** Whether any rows need reading: there is a variable to pair and nothing ruled the panel out. */
    public boolean needsRead() {
        return skipped == null && !accumulators.isEmpty();
    }

    /**
     * Reads both waves in one statement and returns the paired summaries.
     *
     * @param source where the dataset's waves are; each wave is selected as its own check selects it (the latest
     *               release, with a release column)
     */
    public Panel read(Handle h, WaveSource source, Reader reader) {
        if (!needsRead()) {
            return finish(null);
        }
        KeyedPairReader.PairScan scan = reader.read(h, dataset.respondentKey(), columns,
                new KeyedPairReader.Selection("wave " + baselineWave, source.fromClause(baselineWave)),
                new KeyedPairReader.Selection("wave " + currentWave, source.fromClause(currentWave)), this, null);
        return finish(scan);
    }

    /** The summaries of the rows seen so far, with the keys of the scan (null when nothing was read). */
    Panel finish(KeyedPairReader.PairScan scan) {
        if (skipped != null) {
            return Panel.skipped(baselineWave, currentWave, skipped);
        }
        List<VariablePairs> out = new ArrayList<>(accumulators.size());
        accumulators.forEach(a -> out.add(a.result()));
        return new Panel(baselineWave, currentWave, matched, onlyBaseline, onlyCurrent,
                scan == null ? null : scan.before(), scan == null ? null : scan.after(), out, notes);
    }

    @Override
    public void row(String key, String[] before, String[] after) {
        if (before == null) {
            onlyCurrent++;
            return;
        }
        if (after == null) {
            onlyBaseline++;
            return;
        }
        matched++;
        for (int i = 0; i < accumulators.size(); i++) {
            accumulators.get(i).add(before[i], after[i]);
        }
    }

    @Override
    public void unmatched(String key, String[] before, String[] after) {
        // Counted by the reader in each side's keys; such rows belong to no pair.
    }

    /** One variable's running summary of the pairs. */
    private abstract static class Accumulator {
        final String variable;
        long leftOut;

        Accumulator(String variable) {
            this.variable = variable;
        }

        abstract void add(String baseline, String current);

        abstract VariablePairs result();
    }

    private static final class Numbers extends Accumulator {
        private final ValidNumber validB;
        private final ValidNumber validC;
        private final DoubleCounts exact = new DoubleCounts();
        private RelativeBins bins;
        private long n;
        private double mean;
        private double m2;
        private double sumB;
        private double sumC;
        private double meanB;
        private double m2B;
        private double meanC;
        private double m2C;

        Numbers(VariableConfig v, ScreenedVariable b, ScreenedVariable c) {
            super(v.name());
            validB = b.validNumber();
            validC = c.validNumber();
        }

        @Override
        void add(String baseline, String current) {
            double xb = baseline == null ? Double.NaN : validB.value(KeyedPairReader.tallied(baseline));
            double xc = current == null ? Double.NaN : validC.value(KeyedPairReader.tallied(current));
            if (Double.isNaN(xb) || Double.isNaN(xc)) {
                leftOut++;
                return;
            }
            double d = xc - xb;
            d = d == 0 ? 0.0 : d; // -0.0 and 0.0 are one difference
            n++;
            double delta = d - mean;
            mean += delta / n;
            m2 += delta * (d - mean);
            sumB += xb;
            sumC += xc;
            double deltaB = xb - meanB;
            meanB += deltaB / n;
            m2B += deltaB * (xb - meanB);
            double deltaC = xc - meanC;
            meanC += deltaC / n;
            m2C += deltaC * (xc - meanC);
            if (bins != null) {
                bins.add(d, Double.NaN);
            } else if (!exact.add(d, MAX_EXACT_DIFFERENCES)) {
                bins = new RelativeBins();
                exact.forEach((x, count) -> bins.add(x, count, 0, 0));
                bins.add(d, Double.NaN);
            }
        }

        @Override
        VariablePairs result() {
            NumericDistribution table;
            Binning binning;
            if (bins == null) {
                table = exact.distribution();
                binning = Binning.EXACT;
            } else {
                Map<Double, Long> tally = new HashMap<>();
                bins.counts().forEach((text, c) -> tally.merge(RelativeBins.keyValue(text), c, Long::sum));
                table = NumericDistribution.ofTally(tally);
                binning = bins.binning();
            }
            double sd = n > 1 ? Math.sqrt(m2 / (n - 1)) : Double.NaN;
            return new NumericPairs(variable, n, leftOut, n == 0 ? Double.NaN : sumB / n,
                    n == 0 ? Double.NaN : sumC / n, n == 0 ? Double.NaN : mean, sd, table, binning,
                    n > 1 ? Math.sqrt(m2B / (n - 1)) : Double.NaN, n > 1 ? Math.sqrt(m2C / (n - 1)) : Double.NaN);
        }
    }

    private static final class Binary extends Accumulator {
        private final String success;
        private final Set<String> validB;
        private final Set<String> validC;
        private long bothYes;
        private long yesNo;
        private long noYes;
        private long bothNo;

        Binary(VariableConfig v, ScreenedVariable b, ScreenedVariable c) {
            super(v.name());
            success = VariableScreen.successValue(v, b.categories(), c.categories());
            validB = new HashSet<>(b.categories().categories());
            validC = new HashSet<>(c.categories().categories());
        }

        @Override
        void add(String baseline, String current) {
            String b = baseline == null ? null : KeyedPairReader.tallied(baseline);
            String c = current == null ? null : KeyedPairReader.tallied(current);
            if (b == null || c == null || !validB.contains(b) || !validC.contains(c)) {
                leftOut++;
                return;
            }
            boolean yb = b.equals(success);
            boolean yc = c.equals(success);
            if (yb) {
                if (yc) {
                    bothYes++;
                } else {
                    yesNo++;
                }
            } else if (yc) {
                noYes++;
            } else {
                bothNo++;
            }
        }

        @Override
        VariablePairs result() {
            return new BinaryPairs(variable, success, bothYes, yesNo, noYes, bothNo, leftOut);
        }
    }

    private static final class Categories extends Accumulator {
        private final List<String> labels;
        private final Map<String, Integer> indexB = new HashMap<>();
        private final Map<String, Integer> indexC = new HashMap<>();
        private final long[][] counts;

        Categories(VariableConfig v, List<String> labels, ScreenedVariable b, ScreenedVariable c) {
            super(v.name());
            this.labels = labels;
            Map<String, Integer> index = new HashMap<>();
            for (int i = 0; i < labels.size(); i++) {
                index.put(labels.get(i), i);
            }
            b.categories().categories().forEach(x -> indexB.put(x, index.get(x)));
            c.categories().categories().forEach(x -> indexC.put(x, index.get(x)));
            counts = new long[labels.size()][labels.size()];
        }

        @Override
        void add(String baseline, String current) {
            Integer i = baseline == null ? null : indexB.get(KeyedPairReader.tallied(baseline));
            Integer j = current == null ? null : indexC.get(KeyedPairReader.tallied(current));
            if (i == null || j == null) {
                leftOut++;
                return;
            }
            counts[i][j]++;
        }

        @Override
        VariablePairs result() {
            return new CategoricalPairs(variable, labels, counts, leftOut);
        }
    }

    /** Counts of distinct doubles (by their bits), so the per-pair path neither boxes nor allocates. */
    static final class DoubleCounts {
        private final org.wavewarden.profile.ValueIndex values = org.wavewarden.profile.ValueIndex.ofLongs();
        private long[] counts = new long[64];

        /** Counts x once; false (and nothing counted) when x is new and {@code limit} values are counted already. */
        boolean add(double x, int limit) {
            int e = values.add(Double.doubleToLongBits(x), 0, limit);
            if (e < 0) {
                return false;
            }
            if (e == counts.length) {
                counts = java.util.Arrays.copyOf(counts,
                        org.wavewarden.profile.ValueIndex.capacityFor(e, counts.length));
            }
            counts[e]++;
            return true;
        }

        interface Entry {
            void accept(double value, long count);
        }

        void forEach(Entry e) {
            for (int j = 0; j < values.size(); j++) {
                e.accept(Double.longBitsToDouble(values.first(j)), counts[j]);
            }
        }

        NumericDistribution distribution() {
            int size = values.size();
            double[] v = new double[size];
            for (int j = 0; j < size; j++) {
                v[j] = Double.longBitsToDouble(values.first(j));
            }
            java.util.Arrays.sort(v);
            long[] c = new long[size];
            for (int j = 0; j < size; j++) {
                c[java.util.Arrays.binarySearch(v, Double.longBitsToDouble(values.first(j)))] = counts[j];
            }
            return new NumericDistribution(v, c);
        }
    }
}
