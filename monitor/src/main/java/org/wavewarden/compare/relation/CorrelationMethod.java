package org.wavewarden.compare.relation;

/**
 * The correlation coefficient, with the numerator of the variance of its Fisher z, atanh(r), which is taken as
 * {@code varianceNumerator / (n - 3)}.
 */
public enum CorrelationMethod {

    /** Pearson's product-moment r; var(atanh r) = 1 / (n - 3) (Fisher 1921, Metron 1, 3-32). */
    PEARSON("Pearson r", 1.0),

    /**
     * Spearman's rho, Pearson's r on the mid-ranks; var(atanh rho) = 1.06 / (n - 3) (Fieller, E. C., Hartley, H. O.
     * and Pearson, E. S. (1957), "Tests for rank correlation coefficients. I", Biometrika 44, 470-481, derived for
     * bivariate normal data without ties; with many ties it is an approximation).
     */
    SPEARMAN("Spearman rho", 1.06);

    private final String label;
    private final double varianceNumerator;

    CorrelationMethod(String label, double varianceNumerator) {
        this.label = label;
        this.varianceNumerator = varianceNumerator;
    }

    /** The name shown to readers, e.g. "Spearman rho". */
    public String label() {
        return label;
    }

    /** 1 for Pearson, 1.06 for Spearman. */
    public double varianceNumerator() {
        return varianceNumerator;
    }
}
