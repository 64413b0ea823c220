package org.wavewarden.pipeline;

import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.profile.WaveProfile;

import java.util.List;
import java.util.Map;
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
final class WeightedComparisons {

    private WeightedComparisons() {
    }

    static boolean applies(ScreenedVariable baseline, ScreenedVariable current) {
        return baseline != null && current != null && baseline.weighted() != null && current.weighted() != null;
    }

    /** Why a weighted comparison cannot be made although the unweighted one could, or null. */
    static String skipReason(ScreenedVariable baseline, ScreenedVariable current) {
        if (!applies(baseline, current)) {
            return null;
        }
        if (!(baseline.weighted().totalWeight() > 0) || !(current.weighted().totalWeight() > 0)) {
            return "no valid answer carries a positive weight in a wave";
        }
        return null;
    }

    static Optional<Comparison> compare(WeightedComparator comparator, VariableConfig v, ScreenedVariable b,
                                        ScreenedVariable c) {
        return switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> Optional.of(comparator.numeric(v.name(), b.weighted(), c.weighted(),
                    v.threshold(), v.unit()));
            case CATEGORICAL -> {
                List<String> order = b.categories().unionOrder(c.categories());
                yield Optional.of(comparator.categorical(v.name(), order, VariableScreen.aligned(b, order),
                        VariableScreen.aligned(c, order), v.threshold()));
            }
            case BINARY -> {
                String success = VariableScreen.successValue(v, b.categories(), c.categories());
                yield Optional.of(comparator.proportion(v.name(), "answering '" + success + "'",
                        indicator(b, success), indicator(c, success), v.threshold()));
            }
            case TEXT, DATE -> Optional.empty();
        };
    }

    static Comparison shape(WeightedComparator comparator, VariableConfig v, ScreenedVariable b, ScreenedVariable c) {
        return comparator.shape(v.name(), b.weighted(), c.weighted());
    }

    /** The weighted reference comparison, when the variable has a reference mean; empty otherwise. */
    static Optional<Comparison> reference(WeightedComparator comparator, VariableConfig v, ScreenedVariable c) {
        if (v.reference() == null || v.reference().mean() == null || c.numeric() == null || c.numeric().size() < 2
                || c.validN() < 2 || !(c.weighted().totalWeight() > 0)) {
            return Optional.empty();
        }
        return Optional.of(comparator.referenceMean(v.name(), c.weighted(), v.reference().mean(), v.threshold(),
                v.unit()));
    }

    /** The 0/1 view of a binary variable: 1 for the success answer. */
    private static WeightedTally indicator(ScreenedVariable s, String success) {
        int position = s.categories().categories().indexOf(success);
        return s.weighted().indicator(position);
    }
}
