package org.wavewarden.compare.shape;

/**
 * One bin of a population stability index: the values in (lower, upper].
 *
 * @param lower          exclusive lower limit, negative infinity for the first bin
 * @param upper          inclusive upper limit, positive infinity for the last bin
 * @param baselineCount  baseline observations in the bin
 * @param currentCount   current observations in the bin
 * @param baselineShare  baseline share, floored at {@link PopulationStabilityIndex#EMPTY_SHARE}
 * @param currentShare   current share, floored likewise
 * @param contribution   (currentShare - baselineShare) ln(currentShare / baselineShare)
 */
public record PsiBin(double lower, double upper, long baselineCount, long currentCount, double baselineShare,
                     double currentShare, double contribution) {
}
