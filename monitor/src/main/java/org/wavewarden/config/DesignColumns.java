package org.wavewarden.config;

/**
 * The sampling design columns of a dataset: the stratum and the primary sampling unit (PSU, the cluster) each
 * respondent was drawn in. Without strata the design has one stratum. PSU labels are nested in strata (the same
 * label in two strata names two PSUs).
 *
 * @param strata   the stratum column, or null
 * @param clusters the PSU column
 */
public record DesignColumns(String strata, String clusters) {

    public DesignColumns {
        if (clusters == null) {
            throw new IllegalArgumentException("a design names its cluster (PSU) column");
        }
    }

    boolean names(String column) {
        return column.equals(strata) || column.equals(clusters);
    }
}
