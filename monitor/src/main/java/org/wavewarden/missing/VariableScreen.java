package org.wavewarden.missing;

import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.NumericDistribution;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;

/**
 * Separates one variable's answers into missing (by reason) and valid, typed for its kind. Codebook codes and
 * missing ranges are removed first; then the detector looks for disguised missing values among the rest, and candidates it is
 * confident about are removed too, so that a sentinel such as 999 never poisons a mean or a share.
 *
 * <p>Only {@link ScreenedWave} screens: the rest of a run takes each wave's screened answers from there, so the
 * screen runs once per variable and wave.
 */
public final class VariableScreen {

    /** Candidates at or above this confidence are excluded from the comparison (the others are only reported). */
    public static final double EXCLUDE_CONFIDENCE = 0.8;


    /** Variables screened in this JVM: a wave is screened once per run, and this lets a test see it. */
    private static final java.util.concurrent.atomic.LongAdder SCREENS = new java.util.concurrent.atomic.LongAdder();

    private VariableScreen() {
    }

    /** How many variables have been screened in this JVM so far. */
    public static long screensSoFar() {
        return SCREENS.sum();
    }

    /** The variable's declared missing values, discrete codes and ranges alike, as the one matcher of them. */
    public static Codebook codebook(VariableConfig v) {
        return new Codebook(v.missingCodes().stream().map(c -> new MissingCode(c.value(), c.reason())).toList(),
                v.missingRanges().stream().map(r -> new MissingRange(r.low(), r.high(), r.reason())).toList());
    }

    public static Optional<ValueRange> range(VariableConfig v) {
        return v.range() == null ? Optional.empty() : Optional.of(new ValueRange(v.range().min(), v.range().max()));
    }

    static ScreenedVariable screen(ColumnTally tally, VariableConfig v) {
        return screen(tally, v, null);
    }

    /**
     * The same, and with the column's per-value weight sums ({@code {sum w, sum w^2}}, as
     * {@link org.wavewarden.profile.WaveProfile#weights()} keeps them) the weighted view of the valid answers: the
     * values that enter the comparison with their counts and weight sums, missing codes and excluded values removed
     * from the weights as from the counts. Without weights (null) the result is that of the unweighted screen.
     */
    static ScreenedVariable screen(ColumnTally tally, VariableConfig v, Map<String, double[]> weights) {
        SCREENS.increment();
        CodebookSplit split = codebook(v).split(tally);
        Map<String, Long> missing = new LinkedHashMap<>(split.countsByReason());
        List<String> excluded = new ArrayList<>();
        ColumnTally valid = split.validOnly();
        tally.valueCounts().keySet().stream().filter(x -> !valid.valueCounts().containsKey(x)).forEach(excluded::add);
        List<MissingCandidate> candidates = DisguisedMissingDetector.detect(valid, range(v));
        Map<String, Long> rest = new HashMap<>(valid.valueCounts());
        for (MissingCandidate c : candidates) {
            if (c.confidence() >= EXCLUDE_CONFIDENCE && rest.remove(c.value()) != null) {
                excluded.add(c.value());
                missing.merge(reasonOf(c), c.count(), Long::sum);
            }
        }
        Map<String, Long> invalid = new TreeMap<>();
        ValidNumber rule = ValidNumber.of(v);
        NumericDistribution numeric = null;
        CategoryCounts categories = null;
        switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> numeric = numeric(rest, rule, invalid, excluded, missing);
            case CATEGORICAL, BINARY -> categories = CategoryCounts.ofTally(new TreeMap<>(rest));
            case TEXT, DATE -> {
                // Screened for disguised missing values only; no distribution comparison.
            }
        }
        WeightedTally weighted = weights == null ? null : switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> weightedNumbers(rest, rule, weights);
            case CATEGORICAL, BINARY -> weightedCategories(categories, weights);
            case TEXT, DATE -> null;
        };
        List<String> leftOut = new ArrayList<>(excluded);
        leftOut.addAll(invalid.keySet());
        return new ScreenedVariable(tally.rowCount(), tally.nullCount(), missing, candidates, excluded, invalid,
                numeric, categories, weighted, numeric == null ? null : ValidNumber.ofScreen(v, leftOut));
    }

    /** The valid numbers with their weights: the same values as {@link #numeric}'s distribution, in the same order. */
    private static WeightedTally weightedNumbers(Map<String, Long> values, ValidNumber rule,
                                                 Map<String, double[]> weights) {
        Map<Double, double[]> cells = new HashMap<>();
        for (Map.Entry<String, Long> e : values.entrySet()) {
            Double x = rule.number(e.getKey());
            if (x == null || rule.outside(x)) {
                continue;
            }
            double[] cell = cells.computeIfAbsent(x == 0.0 ? 0.0 : x, k -> new double[3]);
            double[] w = weights.getOrDefault(e.getKey(), NO_WEIGHT);
            cell[0] += e.getValue();
            cell[1] += w[0];
            cell[2] += w[1];
        }
        return WeightedTally.ofCells(cells);
    }

    private static final double[] NO_WEIGHT = {0, 0};

    /** The valid categories with their weights; the tally's values are the positions in {@code categories}. */
    private static WeightedTally weightedCategories(CategoryCounts categories, Map<String, double[]> weights) {
        return aligned(categories, weights, categories.categories());
    }

    /**
     * A weighted categorical view laid out along {@code order} (the union of both waves' categories), as the weighted
     * comparison needs: value j is {@code order.get(j)}, with count and weights 0 where this wave lacks it.
     */
    public static WeightedTally aligned(ScreenedVariable s, List<String> order) {
        List<String> own = s.categories().categories();
        double[] w = s.weighted().weights();
        double[] q = s.weighted().squaredWeights();
        Map<String, double[]> weights = new HashMap<>();
        for (int j = 0; j < own.size(); j++) {
            weights.put(own.get(j), new double[] {w[j], q[j]});
        }
        return aligned(s.categories(), weights, order);
    }

    private static WeightedTally aligned(CategoryCounts counts, Map<String, double[]> weights, List<String> order) {
        int k = order.size();
        double[] values = new double[k];
        long[] n = new long[k];
        double[] w = new double[k];
        double[] q = new double[k];
        for (int j = 0; j < k; j++) {
            values[j] = j;
            n[j] = counts.count(order.get(j));
            double[] ws = n[j] == 0 ? NO_WEIGHT : weights.getOrDefault(order.get(j), NO_WEIGHT);
            w[j] = ws[0];
            q[j] = ws[1];
        }
        return new WeightedTally(values, n, w, q);
    }

    public static String reasonOf(MissingCandidate c) {
        return "disguised: " + c.kind().name().toLowerCase(java.util.Locale.ROOT).replace('_', ' ');
    }

    /**
     * The valid numbers of the answers left after codes and confident candidates: the codebook's codes were matched
     * as the column's type matches them, so only the parsing and the range of {@link ValidNumber} apply here.
     */
    private static NumericDistribution numeric(Map<String, Long> values, ValidNumber rule, Map<String, Long> invalid,
                                               List<String> excluded, Map<String, Long> missing) {
        Map<Double, Long> tally = new HashMap<>();
        for (Map.Entry<String, Long> e : values.entrySet()) {
            Double x = rule.number(e.getKey());
            if (x == null) {
                invalid.merge(e.getKey(), e.getValue(), Long::sum);
                continue;
            }
            if (rule.outside(x)) {
                excluded.add(e.getKey());
                missing.merge("outside the declared range", e.getValue(), Long::sum);
                continue;
            }
            tally.merge(x == 0.0 ? 0.0 : x, e.getValue(), Long::sum);
        }
        return NumericDistribution.ofTally(tally);
    }

    /** The answer whose share a binary variable tracks: configured, else 1 / true / yes, else the last in order. */
    public static String successValue(VariableConfig v, CategoryCounts b, CategoryCounts c) {
        if (v.successValue() != null) {
            return v.successValue();
        }
        List<String> all = b.unionOrder(c).stream().sorted().toList();
        for (String preferred : List.of("1", "t", "true", "yes", "y", "Y", "Yes", "TRUE", "True")) {
            if (all.contains(preferred)) {
                return preferred;
            }
        }
        return all.isEmpty() ? "1" : all.get(all.size() - 1);
    }

    public static boolean isNumericKind(VariableKind k) {
        return k == VariableKind.CONTINUOUS || k == VariableKind.ORDINAL;
    }
}
