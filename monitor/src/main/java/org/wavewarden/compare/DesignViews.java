package org.wavewarden.compare;

import org.wavewarden.compare.design.PsuTally;
import org.wavewarden.compare.design.PsuTotals;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.missing.ScreenedVariable;

import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * One variable's valid answers in one wave as its sampling design sees them: the PSU sums of the values that enter
 * the comparison, the screen's missing codes and excluded values taken out, as the weighted view takes them out of
 * the weight sums ({@link VariableScreen}).
 *
 * <p>With every value's PSU sums kept ({@link DesignSummary.ColumnDesign#complete()}), the view is exact. A numeric
 * column with too many values keeps its PSU totals of all answers and the PSU sums of its code-like values; its
 * valid totals are then the totals less the excluded values, which works when every excluded value is code-like (as
 * missing codes are). Otherwise there is no design view, and the comparison falls back to the weights alone.
 */
public final class DesignViews {

    private DesignViews() {
    }

    /**
     * A design view, or the reason there is none.
     *
     * @param tally  the values with their PSU sums, when every value's sums are known; null otherwise
     * @param totals the valid answers' PSU totals (numeric variables)
     */
    public record View(PsuTally tally, PsuTotals totals, String unavailable) {

        static View none(String why) {
            return new View(null, null, why);
        }
    }

    /** A numeric variable's view: values are the numbers (or level ranks) the screen compares. */
    public static View numeric(DesignSummary design, ColumnTally tally, ScreenedVariable s, VariableConfig v) {
        DesignSummary.ColumnDesign cd = design.columns().get(tally.column());
        if (cd == null) {
            return View.none("the design holds no PSU sums for " + tally.column());
        }
        int[] strata = design.stratumIndex();
        Set<String> left = new HashSet<>(s.excludedValues());
        left.addAll(s.invalid().keySet());
        ValidNumber valid = s.validNumber();
        if (cd.complete()) {
            TreeMap<Double, double[]> byValue = new TreeMap<>(); // value -> {count, psu sums...}
            for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
                double x = valid.value(e.getKey());
                if (Double.isNaN(x)) {
                    continue;
                }
                double[] cell = byValue.computeIfAbsent(x == 0.0 ? 0.0 : x, k -> new double[1 + strata.length]);
                cell[0] += e.getValue();
                double[] sums = cd.cells().get(e.getKey());
                for (int p = 0; sums != null && p < strata.length; p++) {
                    cell[1 + p] += sums[p];
                }
            }
            PsuTally t = tally(byValue, strata);
            return new View(t, t.totals(), null);
        }
        if (cd.weight() == null) {
            return View.none("too many distinct answers of " + tally.column() + " to keep their PSU sums");
        }
        double[] w = cd.weight().clone();
        double[] wy = cd.weightedSum().clone();
        double[] wyy = cd.weightedSquares().clone();
        for (String t : left) {
            Double x = ValidNumber.parse(t);
            if (x == null) {
                continue; // not a finite number: never in the numeric totals
            }
            double[] sums = cd.cells().get(t);
            if (sums == null) {
                return View.none("the excluded value " + t + " of " + tally.column() + " is not code-like, so its PSU"
                        + " sums were not kept");
            }
            for (int p = 0; p < strata.length; p++) {
                w[p] -= sums[p];
                wy[p] -= sums[p] * x;
                wyy[p] -= sums[p] * x * x;
            }
        }
        return new View(null, new PsuTotals(strata, w, wy, wyy, s.validN()), null);
    }

    /** A categorical or binary variable's view along {@code order}: value j is the category {@code order.get(j)}. */
    public static View categories(DesignSummary design, String column, ScreenedVariable s, List<String> order) {
        DesignSummary.ColumnDesign cd = design.columns().get(column);
        if (cd == null || !cd.complete()) {
            return View.none("the design holds no PSU sums of every answer of " + column);
        }
        int[] strata = design.stratumIndex();
        TreeMap<Double, double[]> byValue = new TreeMap<>();
        for (int j = 0; j < order.size(); j++) {
            double[] cell = new double[1 + strata.length];
            cell[0] = s.categories().count(order.get(j));
            double[] sums = cell[0] == 0 ? null : cd.cells().get(order.get(j));
            for (int p = 0; sums != null && p < strata.length; p++) {
                cell[1 + p] = sums[p];
            }
            byValue.put((double) j, cell);
        }
        PsuTally t = tally(byValue, strata);
        return new View(t, null, null);
    }

    private static PsuTally tally(TreeMap<Double, double[]> byValue, int[] strata) {
        int k = byValue.size();
        double[] values = new double[k];
        long[] counts = new long[k];
        double[][] weight = new double[k][];
        int j = 0;
        for (Map.Entry<Double, double[]> e : byValue.entrySet()) {
            values[j] = e.getKey();
            counts[j] = (long) e.getValue()[0];
            weight[j] = java.util.Arrays.copyOfRange(e.getValue(), 1, e.getValue().length);
            j++;
        }
        return new PsuTally(values, counts, strata, weight);
    }
}
