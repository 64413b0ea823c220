package org.wavewarden.compare.domain;

/**
 * One domain's change between the two waves.
 *
 * @param domain       the domain's label
 * @param nBaseline    the domain's answers counted in the baseline (the measure's denominator, unweighted)
 * @param nCurrent     the same in the current wave
 * @param before       the measure in the baseline (a share or rate as a proportion 0..1, a mean in its unit)
 * @param after        the measure in the current wave
 * @param change       after - before
 * @param se           the standard error of the change (the two waves are independent samples)
 * @param ciLow        lower end of the change's interval at the run's confidence
 * @param ciHigh       upper end
 * @param pValue       two-sided p-value of the change (Wald z)
 * @param qValue       the p-value adjusted for the false discovery rate over the breakdown's domains
 * @param shareBefore  the domain's share of the measure's base over the whole baseline wave: the weight of its valid
 *                     answers (SHARE, MEAN), its rows (RATE); without NULLs or left-out values this is its weighted
 *                     population share, and it is the share for which overall = sum of share x measure
 * @param shareAfter   the same in the current wave
 * @param contribution the domain's part of the overall change within domains: its mean share times its change
 *                     (Kitagawa 1955); the parts and the composition term add up to the overall change
 */
public record DomainChange(String domain, long nBaseline, long nCurrent, double before, double after, double change,
                           double se, double ciLow, double ciHigh, double pValue, double qValue, double shareBefore,
                           double shareAfter, double contribution) {
}
