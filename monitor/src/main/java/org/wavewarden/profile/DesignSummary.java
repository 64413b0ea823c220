package org.wavewarden.profile;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * What a wave's sampling design needs kept beyond the tallies, for design-based variances by Taylor linearisation:
 * the primary sampling units (PSUs) with their strata, and per monitored column the weight sums of each PSU. Only
 * PSU totals enter a linearised variance with PSUs drawn with replacement within strata (Wolter 2007, Chapter 6),
 * so no respondent is kept.
 *
 * @param psuStratum      stratum label of each PSU, PSU {@code p} at position {@code p}
 * @param psuLabel        cluster label of each PSU (unique within its stratum)
 * @param rowsWithoutPsu  rows whose stratum or cluster is NULL; they are in the tallies but in no PSU
 * @param columns         per monitored column its PSU sums
 */
public record DesignSummary(List<String> psuStratum, List<String> psuLabel, long rowsWithoutPsu,
                            Map<String, ColumnDesign> columns) {

    public DesignSummary {
        psuStratum = List.copyOf(psuStratum);
        psuLabel = List.copyOf(psuLabel);
        columns = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(columns));
        if (psuStratum.size() != psuLabel.size()) {
            throw new IllegalArgumentException(psuStratum.size() + " strata for " + psuLabel.size() + " PSUs");
        }
    }

    public int psuCount() {
        return psuLabel.size();
    }

    /** The stratum index of each PSU, strata numbered in order of first appearance. */
    public int[] stratumIndex() {
        Map<String, Integer> index = new LinkedHashMap<>();
        int[] out = new int[psuStratum.size()];
        for (int p = 0; p < out.length; p++) {
            out[p] = index.computeIfAbsent(psuStratum.get(p), k -> index.size());
        }
        return out;
    }

    /**
     * One column's PSU sums over its non-null answers; a weight that is NULL or not a finite non-negative number
     * counts as zero.
     *
     * @param cells          per value (text form, as in the tally) the weight sum of each PSU; every value of the
     *                       tally when {@code complete}, otherwise only the code-like values
     *                       ({@link RelativeBins#isCodeLike}) so that missing codes can still be taken out
     * @param complete       whether {@code cells} holds every value; false when the column had more distinct values
     *                       than are kept per PSU, or was summarised in bins, or truncated
     * @param weight         numeric columns: per PSU the sum of weights over all non-null answers; null otherwise
     * @param weightedSum    numeric columns: per PSU the sum of w y
     * @param weightedSquares numeric columns: per PSU the sum of w y^2
     */
    public record ColumnDesign(Map<String, double[]> cells, boolean complete, double[] weight, double[] weightedSum,
                               double[] weightedSquares) {

        public ColumnDesign {
            cells = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(cells));
        }

        @Override
        public boolean equals(Object o) {
            if (!(o instanceof ColumnDesign d) || complete != d.complete || !cells.keySet().equals(d.cells.keySet())
                    || !java.util.Arrays.equals(weight, d.weight) || !java.util.Arrays.equals(weightedSum, d.weightedSum)
                    || !java.util.Arrays.equals(weightedSquares, d.weightedSquares)) {
                return false;
            }
            return cells.entrySet().stream().allMatch(e -> java.util.Arrays.equals(e.getValue(), d.cells.get(e.getKey())));
        }

        @Override
        public int hashCode() {
            return java.util.Objects.hash(cells.keySet(), complete, java.util.Arrays.hashCode(weight));
        }
    }
}
