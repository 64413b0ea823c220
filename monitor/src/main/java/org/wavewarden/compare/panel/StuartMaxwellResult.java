package org.wavewarden.compare.panel;

import java.util.Arrays;
import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.TestResult;

/**
 * The outcome of {@link StuartMaxwellTest}: the test of marginal homogeneity and the marginal shares behind it.
 *
 * <p>The share arrays cover every category of the table that was passed in, in its order, including categories that
 * did not enter the statistic; {@code testedCategories} lists those that did and {@code droppedNote} says why the
 * others did not (empty when every category entered).
 *
 * @param test                 X2, its degrees of freedom and the upper-tail chi-square p-value
 * @param sharesBefore         each category's share of the pairs at the earlier wave (row margins over n)
 * @param sharesAfter          each category's share at the later wave (column margins over n)
 * @param shareDifferences     {@code sharesAfter - sharesBefore}, as proportions
 * @param largestShift         the share difference largest in absolute value, in percentage points, with its paired
 *                             Wald interval
 * @param largestShiftCategory index, in the table, of the category of {@code largestShift}
 * @param testedCategories     indices, in the table, of the categories whose margins entered the statistic
 * @param droppedNote          which categories were left out of the statistic and why, or an empty string
 */
public record StuartMaxwellResult(TestResult test, double[] sharesBefore, double[] sharesAfter,
                                  double[] shareDifferences, EffectSize largestShift, int largestShiftCategory,
                                  int[] testedCategories, String droppedNote) {

    public StuartMaxwellResult {
        if (test == null || largestShift == null || droppedNote == null) {
            throw new IllegalArgumentException("test, largestShift and droppedNote must not be null");
        }
        if (sharesBefore.length != sharesAfter.length || sharesBefore.length != shareDifferences.length) {
            throw new IllegalArgumentException("sharesBefore, sharesAfter and shareDifferences must have one entry"
                    + " per category, have " + sharesBefore.length + ", " + sharesAfter.length + " and "
                    + shareDifferences.length);
        }
        sharesBefore = sharesBefore.clone();
        sharesAfter = sharesAfter.clone();
        shareDifferences = shareDifferences.clone();
        testedCategories = testedCategories.clone();
    }

    @Override
    public double[] sharesBefore() {
        return sharesBefore.clone();
    }

    @Override
    public double[] sharesAfter() {
        return sharesAfter.clone();
    }

    @Override
    public double[] shareDifferences() {
        return shareDifferences.clone();
    }

    @Override
    public int[] testedCategories() {
        return testedCategories.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof StuartMaxwellResult r && test.equals(r.test)
                && Arrays.equals(sharesBefore, r.sharesBefore) && Arrays.equals(sharesAfter, r.sharesAfter)
                && Arrays.equals(shareDifferences, r.shareDifferences) && largestShift.equals(r.largestShift)
                && largestShiftCategory == r.largestShiftCategory
                && Arrays.equals(testedCategories, r.testedCategories) && droppedNote.equals(r.droppedNote);
    }

    @Override
    public int hashCode() {
        return 31 * (31 * test.hashCode() + Arrays.hashCode(shareDifferences)) + largestShiftCategory;
    }

    @Override
    public String toString() {
        return "StuartMaxwellResult[test=" + test + ", sharesBefore=" + Arrays.toString(sharesBefore)
                + ", sharesAfter=" + Arrays.toString(sharesAfter) + ", shareDifferences="
                + Arrays.toString(shareDifferences) + ", largestShift=" + largestShift + ", largestShiftCategory="
                + largestShiftCategory + ", testedCategories=" + Arrays.toString(testedCategories)
                + ", droppedNote=" + droppedNote + "]";
    }
}
