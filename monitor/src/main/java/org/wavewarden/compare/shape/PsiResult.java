package org.wavewarden.compare.shape;

import java.util.List;

/**
 * A population stability index with the bins it was summed over.
 *
 * @param psi  sum of the bin contributions; 0 for identical shares
 * @param bins the bins in ascending order of value
 */
public record PsiResult(double psi, List<PsiBin> bins) {

    public PsiResult {
        bins = List.copyOf(bins);
    }
}
