package org.wavewarden.compare;

import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.compare.location.LocationTestChoice;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.missing.DataQualityFindings;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.profile.ColumnTally;

import java.util.Optional;

/**
 * Chooses the comparison of one variable between two screened waves: by its kind, weighted when both waves carry
 * weights ({@link WeightedComparisons}), against its configured reference, or none, with the reason a reader is
 * told.
 */
public final class VariableComparisons {

    private VariableComparisons() {
    }

    public static Optional<Comparison> compare(VariableComparator comparator, VariableConfig v,
                                                ScreenedVariable b, ScreenedVariable c, ColumnTally ct,
                                                ColumnTally bt, WeightedComparator weighted,
                                                WeightedComparator.Design design,
                                                LocationTestChoice.Choice choice) {
        if (skipReason(v, b, c, ct, bt) != null) {
            return Optional.empty();
        }
        CodeLabels labels = CodeLabels.of(v);
        if (weighted != null) {
            return WeightedComparisons.compare(weighted.labelled(labels), v, b, c, design);
        }
        return compareUnweighted(comparator.labelled(labels), v, b, c, ct, bt, choice);
    }

    private static Optional<Comparison> compareUnweighted(VariableComparator comparator, VariableConfig v,
                                                          ScreenedVariable b, ScreenedVariable c, ColumnTally ct,
                                                          ColumnTally bt, LocationTestChoice.Choice choice) {
        return switch (v.kind()) {
            case CONTINUOUS, ORDINAL -> Optional.of(comparator.numeric(v.name(), v.kind() == VariableKind.ORDINAL,
                    b.numeric(), c.numeric(), v.threshold(), v.unit(), choice));
            case CATEGORICAL -> Optional.of(comparator.categorical(v.name(), b.categories(), c.categories(),
                    v.threshold()));
            case BINARY -> {
                String success = VariableScreen.successValue(v, b.categories(), c.categories());
                yield Optional.of(comparator.proportion(v.name(), FindingKind.SHIFT, "answering '" + success + "'",
                        b.categories().count(success), b.categories().n(), c.categories().count(success),
                        c.categories().n(), v.threshold()));
            }
            case TEXT -> Optional.empty();
            case DATE -> DateComparison.compare(comparator, v.name(), bt.valueCounts(), b.excludedValues(),
                    ct.valueCounts(), c.excludedValues());
        };
    }

    /** The wave against the variable's configured reference, when it has one and enough valid answers. */
    public static Optional<Comparison> reference(VariableComparator unlabelled, VariableConfig v, ScreenedVariable c) {
        if (v.reference() == null || c.validN() < 2) {
            return Optional.empty();
        }
        VariableComparator comparator = unlabelled.labelled(CodeLabels.of(v));
        if (v.reference().mean() != null && c.numeric() != null && c.numeric().size() > 1) {
            return Optional.of(comparator.referenceMean(v.name(), c.numeric(), v.reference().mean(), v.threshold(),
                    v.unit()));
        }
        if (!v.reference().shares().isEmpty() && c.categories() != null) {
            return Optional.of(comparator.referenceShares(v.name(), c.categories(), v.reference().shares(),
                    v.threshold()));
        }
        return Optional.empty();
    }

    /** Why a variable cannot be compared this time, or null when it can (or is never compared). */
    public static String skipReason(VariableConfig v, ScreenedVariable b, ScreenedVariable c, ColumnTally ct, ColumnTally bt) {
        if (v.kind() == VariableKind.TEXT) {
            return null;
        }
        if (ct.truncated() || bt.truncated()) {
            return "too many distinct values to compare exactly";
        }
        if (b.validN() < 2 || c.validN() < 2) {
            return "fewer than 2 valid answers in a wave (" + b.validN() + " and " + c.validN() + ")";
        }
        if (DataQualityFindings.distinctValid(b) <= 1 && DataQualityFindings.distinctValid(c) <= 1) {
            return "a single value in both waves";
        }
        if (v.kind() == VariableKind.CATEGORICAL && b.categories().unionOrder(c.categories()).size() < 2) {
            return "a single category";
        }
        if (v.kind() == VariableKind.DATE) {
            return DateComparison.skipReason(bt.valueCounts(), b.excludedValues(), ct.valueCounts(),
                    c.excludedValues());
        }
        String codeFrame = DataQualityFindings.binaryFrameSkipReason(v, b, c);
        return codeFrame != null ? codeFrame : WeightedComparisons.skipReason(b, c);
    }
}
