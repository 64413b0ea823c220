package org.wavewarden.compare;

import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.missing.ScreenedVariable;

import java.util.List;
import java.util.Optional;

/**
 * Routes a variable of a weighted dataset to {@link WeightedComparator}: a comparison is weighted when both waves'
 * screens carry a weighted view, that is when the dataset has a {@code weightColumn} and both waves' summaries hold
 * the column's weight sums (a summary stored before weights were read has none, and the variable is then compared
 * unweighted). Missing rates and data-quality findings stay counts of answers.
 *
 * <p>Design: without strata or cluster columns each wave is taken as a weights-only design, each respondent its own
 * PSU, drawn with replacement; see {@link WeightedComparator}.
 */
public final class WeightedComparisons {

    private WeightedComparisons() {
    }

    public static boolean applies(ScreenedVariable baseline, ScreenedVariable current) {
        return baseline != null && current != null && baseline.weighted() != null && current.weighted() != null;
    }

    /** Why a weighted comparison cannot be made although the unweighted one could, or null. */
    public static String skipReason(ScreenedVariable baseline, ScreenedVariable current) {
        if (!applies(baseline, current)) {
            return null;
        }
        if (!(baseline.weighted().totalWeight() > 0) || !(current.weighted().totalWeight() > 0)) {
            return "no valid answer carries a positive weight in a wave";
        }
        return null;
    }

    public static Optional<Comparison> compare(WeightedComparator comparator, VariableConfig v, ScreenedVariable b,
                                        ScreenedVariable c, WeightedComparator.Design design) {
        return switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> Optional.of(comparator.numeric(v.name(), b.weighted(), c.weighted(), design,
                    v.threshold(), v.unit()));
            case CATEGORICAL -> {
                List<String> order = b.categories().unionOrder(c.categories());
                yield Optional.of(comparator.categorical(v.name(), order, VariableScreen.aligned(b, order),
                        VariableScreen.aligned(c, order), design, v.threshold()));
            }
            case BINARY -> {
                String success = VariableScreen.successValue(v, b.categories(), c.categories());
                int at = b.categories().unionOrder(c.categories()).indexOf(success);
                WeightedComparator.Design shares = design == null ? null : new WeightedComparator.Design(
                        design.baselineTally().indicator(at), design.currentTally().indicator(at), null, null);
                yield Optional.of(comparator.proportion(v.name(), "answering '" + success + "'",
                        indicator(b, success), indicator(c, success), shares, v.threshold()));
            }
            case TEXT, DATE -> Optional.empty();
        };
    }

    /**
     * Both waves' design views of a variable, or null when a wave has none (the comparison then takes its variance
     * from the weights alone, and says so by its test name).
     */
    public static WeightedComparator.Design design(VariableConfig v, ColumnTally bt, ColumnTally ct, ScreenedVariable b,
                                            ScreenedVariable c, DesignSummary bd, DesignSummary cd) {
        DesignViews.View vb;
        DesignViews.View vc;
        switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> {
                vb = DesignViews.numeric(bd, bt, b, v);
                vc = DesignViews.numeric(cd, ct, c, v);
            }
            case CATEGORICAL, BINARY -> {
                List<String> order = b.categories().unionOrder(c.categories());
                vb = DesignViews.categories(bd, bt.column(), b, order);
                vc = DesignViews.categories(cd, ct.column(), c, order);
            }
            default -> {
                return null;
            }
        }
        if (vb.unavailable() != null || vc.unavailable() != null) {
            LOG.info("{} compared with its weights alone: {}", v.name(),
                    vb.unavailable() != null ? vb.unavailable() : vc.unavailable());
            return null;
        }
        return new WeightedComparator.Design(vb.tally(), vc.tally(), vb.totals(), vc.totals());
    }

    private static final org.slf4j.Logger LOG = org.slf4j.LoggerFactory.getLogger(WeightedComparisons.class);

    public static Comparison shape(WeightedComparator comparator, VariableConfig v, ScreenedVariable b, ScreenedVariable c,
                            WeightedComparator.Design design) {
        return comparator.shape(v.name(), b.weighted(), c.weighted(), design);
    }

    /**
     * The weighted reference comparison, when the variable has a reference mean or reference shares; empty
     * otherwise. With the wave's design (null: none), the shares' variance comes from its strata and clusters.
     */
    public static Optional<Comparison> reference(WeightedComparator unlabelled, VariableConfig v, ScreenedVariable c,
                                          ColumnTally ct, DesignSummary cd) {
        if (v.reference() == null || c.validN() < 2 || !(c.weighted().totalWeight() > 0)) {
            return Optional.empty();
        }
        WeightedComparator comparator = unlabelled.labelled(org.wavewarden.codebook.CodeLabels.of(v));
        if (v.reference().mean() != null && c.numeric() != null && c.numeric().size() > 1) {
            return Optional.of(comparator.referenceMean(v.name(), c.weighted(), v.reference().mean(), v.threshold(),
                    v.unit()));
        }
        if (v.reference().shares().isEmpty() || c.categories() == null) {
            return Optional.empty();
        }
        List<String> cats = new java.util.ArrayList<>(v.reference().shares().keySet());
        double listed = v.reference().shares().values().stream().mapToDouble(Double::doubleValue).sum();
        boolean other = listed < 1 - 1e-9;
        int k = cats.size() + (other ? 1 : 0);
        double[] expected = new double[k];
        for (int j = 0; j < cats.size(); j++) {
            expected[j] = v.reference().shares().get(cats.get(j));
        }
        List<String> labels = new java.util.ArrayList<>(cats);
        if (other) {
            expected[k - 1] = 1 - listed;
            labels.add("any other answer");
        }
        // Each of the wave's categories goes to its listed position, or to "other".
        List<String> own = c.categories().categories();
        int[] to = new int[own.size()];
        for (int i = 0; i < own.size(); i++) {
            int j = cats.indexOf(own.get(i));
            to[i] = j >= 0 ? j : other ? k - 1 : -1;
        }
        double[] values = new double[k];
        long[] n = new long[k];
        double[] w = new double[k];
        double[] q = new double[k];
        for (int j = 0; j < k; j++) {
            values[j] = j;
        }
        long[] cn = c.weighted().counts();
        double[] cw = c.weighted().weights();
        double[] cq = c.weighted().squaredWeights();
        for (int i = 0; i < own.size(); i++) {
            if (to[i] >= 0) {
                n[to[i]] += cn[i];
                w[to[i]] += cw[i];
                q[to[i]] += cq[i];
            }
        }
        WeightedTally tally = new WeightedTally(values, n, w, q);
        org.wavewarden.compare.design.PsuTally design = null;
        if (cd != null) {
            DesignViews.View view = DesignViews.categories(cd, ct.column(), c, own);
            if (view.unavailable() == null) {
                double[][] psuSums = view.tally().weight();
                double[][] byPsu = new double[k][view.tally().psuCount()];
                for (int i = 0; i < own.size(); i++) {
                    if (to[i] < 0) {
                        continue;
                    }
                    for (int h = 0; h < byPsu[to[i]].length; h++) {
                        byPsu[to[i]][h] += psuSums[i][h];
                    }
                }
                design = new org.wavewarden.compare.design.PsuTally(values, n, view.tally().psuStratum(), byPsu);
            } else {
                LOG.info("{} reference shares with its weights alone: {}", v.name(), view.unavailable());
            }
        }
        return Optional.of(comparator.referenceShares(v.name(), labels, tally, expected, design, v.threshold()));
    }

    /** The 0/1 view of a binary variable: 1 for the success answer. */
    private static WeightedTally indicator(ScreenedVariable s, String success) {
        int position = s.categories().indexOf(success);
        return s.weighted().indicator(position);
    }
}
