package org.wavewarden.read;

import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.RelativeBins;
import org.wavewarden.profile.ValueIndex;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.LongFunction;

/**
 * Accumulates, during the one pass of {@link BinaryWaveScanner}, the PSU sums a sampling design needs
 * ({@link DesignSummary}): each row's PSU from its stratum and cluster labels, and per column and PSU the weight of
 * each value, and for numeric columns the sums of w, w y and w y^2. Cells are kept per column in a
 * {@link ValueIndex} keyed by (PSU, value key); beyond {@link #MAX_CELLS} a column keeps only its code-like values per PSU.
 */
final class DesignScan {

    /** Values times PSUs kept per column; beyond it only code-like values are kept per PSU (and the totals). */
    static final int MAX_CELLS = 50_000;

    private final Map<String, Integer> psuIds = new HashMap<>();
    private final List<String> psuStratum = new ArrayList<>();
    private final List<String> psuLabel = new ArrayList<>();
    private long rowsWithoutPsu;
    private final Column[] columns;

    DesignScan(boolean[] numeric) {
        columns = new Column[numeric.length];
        for (int i = 0; i < numeric.length; i++) {
            columns[i] = new Column(numeric[i]);
        }
    }

    /** The PSU of a row from its stratum text (absent: one stratum) and cluster text, or -1 when one is NULL. */
    int psu(String stratum, String cluster) {
        if (stratum == null || cluster == null) {
            rowsWithoutPsu++;
            return -1;
        }
        String key = stratum.length() + ":" + stratum + cluster;
        Integer id = psuIds.get(key);
        if (id == null) {
            id = psuLabel.size();
            psuIds.put(key, id);
            psuStratum.add(stratum);
            psuLabel.add(cluster);
        }
        return id;
    }

    /** One cell of column i: its value key (bits, or entry number), its number (NaN if none) and weight. */
    void add(int i, int psu, long valueKey, double x, double w) {
        columns[i].add(psu, valueKey, x, w, true);
    }

    /** A cell of a column summarised in bins: only totals and code-like values are kept. */
    void addBinned(int i, int psu, double x, double w) {
        Column c = columns[i];
        c.exact = false;
        c.add(psu, Double.doubleToLongBits(x == 0 ? 0.0 : x), x, w, RelativeBins.isCodeLike(x));
    }

    /**
     * Column i moves to bins: its cells so far are re-keyed by the bits of their value ({@code valueOf} maps the old
     * key), and only code-like values keep cells from now on.
     */
    void toBins(int i, java.util.function.LongToDoubleFunction valueOf) {
        columns[i].toBins(valueOf);
    }

    /** Marks column i as keeping only its code-like values (it was truncated or moved to bins). */
    void incomplete(int i) {
        columns[i].exact = false;
    }

    /**
     * The summary, with each column's value keys turned into text by {@code texts[i]}; for a column moved to bins
     * the keys are the bits of the value.
     */
    DesignSummary result(List<String> names, List<LongFunction<String>> texts, boolean[] binned) {
        int psus = psuLabel.size();
        Map<String, DesignSummary.ColumnDesign> out = new LinkedHashMap<>();
        for (int i = 0; i < columns.length; i++) {
            LongFunction<String> text = binned[i] ? bits -> binnedText(Double.longBitsToDouble(bits)) : texts.get(i);
            out.put(names.get(i), columns[i].result(psus, text));
        }
        return new DesignSummary(psuStratum, psuLabel, rowsWithoutPsu, out);
    }

    static String binnedText(double x) {
        return x == Math.rint(x) ? Long.toString((long) x) : Double.toString(x);
    }

    private static final class Column {
        private final boolean numeric;
        private boolean exact = true;
        private double[] weight = new double[16];
        private double[] weightedSum = new double[16];
        private double[] weightedSquares = new double[16];
        private int psus;
        private ValueIndex cells = ValueIndex.ofPairs(); // (psu, value key) numbered; its weight in cellWeight
        private double[] cellWeight = new double[256];

        Column(boolean numeric) {
            this.numeric = numeric;
        }

        void add(int psu, long valueKey, double x, double w, boolean keepCell) {
            double weightOrZero = Double.isNaN(w) ? 0 : w;
            if (psu >= weight.length) {
                int n = Math.max(weight.length * 2, psu + 1);
                weight = Arrays.copyOf(weight, n);
                weightedSum = Arrays.copyOf(weightedSum, n);
                weightedSquares = Arrays.copyOf(weightedSquares, n);
            }
            psus = Math.max(psus, psu + 1);
            if (numeric && Double.isFinite(x)) {
                weight[psu] += weightOrZero;
                weightedSum[psu] += weightOrZero * x;
                weightedSquares[psu] += weightOrZero * x * x;
            }
            if (keepCell) {
                addCell(psu, valueKey, weightOrZero);
            }
        }

        void toBins(java.util.function.LongToDoubleFunction valueOf) {
            exact = false;
            ValueIndex before = cells;
            double[] weights = cellWeight;
            cells = ValueIndex.ofPairs();
            cellWeight = new double[256];
            for (int e = 0; e < before.size(); e++) {
                double x = valueOf.applyAsDouble(before.second(e));
                if (RelativeBins.isCodeLike(x)) {
                    addCell((int) before.first(e), Double.doubleToLongBits(x == 0 ? 0.0 : x), weights[e]);
                }
            }
        }

        private void addCell(int psu, long valueKey, double w) {
            int e = cells.add(psu, valueKey);
            if (e == cellWeight.length) {
                cellWeight = Arrays.copyOf(cellWeight, ValueIndex.capacityFor(e, cellWeight.length));
            }
            cellWeight[e] += w;
        }

        DesignSummary.ColumnDesign result(int totalPsus, LongFunction<String> text) {
            Map<Long, double[]> byValue = new HashMap<>();
            for (int e = 0; e < cells.size(); e++) {
                byValue.computeIfAbsent(cells.second(e), k -> new double[totalPsus])[(int) cells.first(e)]
                        += cellWeight[e];
            }
            boolean complete = exact && (long) byValue.size() * totalPsus <= MAX_CELLS;
            Map<String, double[]> cells = new LinkedHashMap<>();
            byValue.forEach((key, sums) -> {
                String t = text.apply(key);
                if (complete || isCodeLikeText(t)) {
                    double[] before = cells.get(t);
                    if (before == null) {
                        cells.put(t, sums);
                    } else {
                        for (int p = 0; p < sums.length; p++) {
                            before[p] += sums[p];
                        }
                    }
                }
            });
            return new DesignSummary.ColumnDesign(cells, complete,
                    numeric ? Arrays.copyOf(weight, totalPsus) : null,
                    numeric ? Arrays.copyOf(weightedSum, totalPsus) : null,
                    numeric ? Arrays.copyOf(weightedSquares, totalPsus) : null);
        }
    }

    /** Whether a value's text is a code-like number, the values a column without complete cells still keeps. */
    static boolean isCodeLikeText(String t) {
        try {
            return RelativeBins.isCodeLike(RelativeBins.keyValue(t));
        } catch (NumberFormatException e) {
            return false;
        }
    }
}
