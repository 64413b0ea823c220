package org.wavewarden.profile;

import java.util.List;
import java.util.Map;

/**
 * One breakdown column's domains in one wave, tallied in the wave's one pass: per domain (a district, a mode, an
 * interviewer) the tally of every monitored column over the domain's rows, with the weight sums beside the counts
 * and, with a sampling design, the domain's PSU sums over every PSU of the wave (zero where the domain has no
 * rows), so that a domain's variance is the design's, not a subset's (domain estimation, Lohr 2022, section 4.3).
 *
 * <p>Memory is bounded: at most the configured number of domains is kept, in order of first appearance; the rows of
 * every further domain are counted in {@code overflowRows} and their number in {@code overflowDomains}, and take part
 * in no domain. Within a domain a column is tallied like the whole wave's column, with a smaller budget of distinct
 * values ({@link ColumnTally#binning()} says when numbers were summarised in relative bins).
 *
 * @param column          the breakdown column
 * @param domains         domain labels (the column's output text), in order of first appearance
 * @param rows            rows of each domain, at the same index as {@code domains}
 * @param nullRows        rows whose breakdown value is SQL NULL: in no domain
 * @param overflowDomains distinct domain values beyond the cap
 * @param overflowRows    rows of those domains
 * @param tallies         per monitored column, the tally of each domain (same index as {@code domains}); each
 *                        tally's rowCount is the domain's rows
 * @param weights         with a weight column: per monitored column, each domain's {sum w, sum w^2} per value (same
 *                        index as {@code domains}); empty without weights
 * @param designs         with a design: per monitored column, each domain's PSU sums over all PSUs of the wave's
 *                        {@link DesignSummary} (same PSU order); empty without a design
 */
public record DomainTally(String column, List<String> domains, long[] rows, long nullRows, int overflowDomains,
                          long overflowRows, Map<String, List<ColumnTally>> tallies,
                          Map<String, List<Map<String, double[]>>> weights,
                          Map<String, List<DesignSummary.ColumnDesign>> designs) {

    public DomainTally {
        domains = List.copyOf(domains);
        rows = rows.clone();
        tallies = java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(tallies));
        weights = weights == null ? Map.of() : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(weights));
        designs = designs == null ? Map.of() : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(designs));
        if (rows.length != domains.size()) {
            throw new IllegalArgumentException(rows.length + " row counts for " + domains.size() + " domains");
        }
    }

    /** The index of a domain, or -1 when it is not kept. */
    public int indexOf(String domain) {
        return domains.indexOf(domain);
    }

    @Override
    public boolean equals(Object o) {
        // Arrays and the double[] cells compare by content: a merged or re-read tally equals the original.
        return o instanceof DomainTally t && column.equals(t.column) && domains.equals(t.domains)
                && java.util.Arrays.equals(rows, t.rows) && nullRows == t.nullRows
                && overflowDomains == t.overflowDomains && overflowRows == t.overflowRows && tallies.equals(t.tallies)
                && sameCells(weights, t.weights) && designs.equals(t.designs);
    }

    @Override
    public int hashCode() {
        return java.util.Objects.hash(column, domains, java.util.Arrays.hashCode(rows), nullRows, tallies.keySet());
    }

    private static boolean sameCells(Map<String, List<Map<String, double[]>>> a,
                                     Map<String, List<Map<String, double[]>>> b) {
        if (!a.keySet().equals(b.keySet())) {
            return false;
        }
        for (var e : a.entrySet()) {
            List<Map<String, double[]>> x = e.getValue();
            List<Map<String, double[]>> y = b.get(e.getKey());
            if (x.size() != y.size()) {
                return false;
            }
            for (int i = 0; i < x.size(); i++) {
                if (!x.get(i).keySet().equals(y.get(i).keySet())) {
                    return false;
                }
                for (var v : x.get(i).entrySet()) {
                    if (!java.util.Arrays.equals(v.getValue(), y.get(i).get(v.getKey()))) {
                        return false;
                    }
                }
            }
        }
        return true;
    }
}
