package org.wavewarden.missing;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.wavewarden.profile.NumericDistribution;

/**
 * Answers outside a variable's declared range, counted below and above, with the most frequent offending values as
 * examples (a repeated out-of-range value is usually an undeclared code; a scattered tail is usually keying).
 *
 * @param range          the declared range
 * @param n              answers checked
 * @param below          answers below the range
 * @param above          answers above the range
 * @param examplesBelow  up to five distinct values below, most frequent first
 * @param examplesAbove  up to five distinct values above, most frequent first
 */
public record RangeViolation(ValueRange range, long n, long below, long above, List<Double> examplesBelow,
                             List<Double> examplesAbove) {

    static final int EXAMPLES = 5;

    public RangeViolation {
        examplesBelow = List.copyOf(examplesBelow);
        examplesAbove = List.copyOf(examplesAbove);
    }

    public static RangeViolation check(NumericDistribution values, ValueRange range) {
        if (values == null) {
            throw new IllegalArgumentException("values must not be null");
        }
        if (range == null) {
            throw new IllegalArgumentException("range must not be null");
        }
        long below = 0;
        long above = 0;
        List<Integer> lows = new ArrayList<>();
        List<Integer> highs = new ArrayList<>();
        for (int i = 0; i < values.size(); i++) {
            if (range.isBelow(values.value(i))) {
                below += values.count(i);
                lows.add(i);
            } else if (range.isAbove(values.value(i))) {
                above += values.count(i);
                highs.add(i);
            }
        }
        return new RangeViolation(range, values.n(), below, above, examples(values, lows), examples(values, highs));
    }

    private static List<Double> examples(NumericDistribution d, List<Integer> idx) {
        return idx.stream()
                .sorted(Comparator.comparingLong((Integer i) -> d.count(i)).reversed().thenComparing(i -> i))
                .limit(EXAMPLES).map(d::value).toList();
    }

    public long violations() {
        return below + above;
    }

    /** Share of the answers outside the range (0 when there are none). */
    public double share() {
        return n == 0 ? 0 : (double) violations() / n;
    }
}
