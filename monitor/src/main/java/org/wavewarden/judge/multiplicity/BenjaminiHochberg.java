package org.wavewarden.judge.multiplicity;

/**
 * Benjamini-Hochberg adjusted p-values (q-values): q_(i) = min over j >= i of min(1, m p_(j) / j) (Benjamini and
 * Hochberg 1995, JRSS B 57, 289-300; R's {@code p.adjust(method = "BH")}). Rejecting every hypothesis with
 * q <= alpha controls the false discovery rate at alpha for independent or positively dependent tests.
 *
 * <p>NaN p-values (tests that could not be computed) give NaN q-values and are left out of m, as R's
 * {@code p.adjust} does with NA.
 */
public final class BenjaminiHochberg {

    private BenjaminiHochberg() {
    }

    /** Adjusted values in the order of {@code p}. */
    public static double[] adjust(double[] p) {
        return StepUp.adjust(p, false);
    }
}
