package org.wavewarden.judge.multiplicity;

/**
 * Benjamini-Yekutieli adjusted p-values: the Benjamini-Hochberg values multiplied by the harmonic number
 * c(m) = 1 + 1/2 + ... + 1/m, which controls the false discovery rate under any dependence between the tests
 * (Benjamini and Yekutieli 2001, Annals of Statistics 29, 1165-1188, theorem 1.3; R's
 * {@code p.adjust(method = "BY")}).
 *
 * <p>NaN p-values give NaN and are left out of m, as in {@link BenjaminiHochberg}.
 */
public final class BenjaminiYekutieli {

    private BenjaminiYekutieli() {
    }

    public static double[] adjust(double[] p) {
        return StepUp.adjust(p, true);
    }
}
