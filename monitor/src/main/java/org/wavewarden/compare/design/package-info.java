/**
 * Design-based statistics for complex survey samples: Kish's weighting effect, weighted means and shares with
 * standard errors by Taylor linearisation under stratified cluster designs (PSUs with replacement within strata),
 * the design-based comparison of two independently sampled waves, and the Rao-Scott corrected chi-square for a
 * categorical variable. Inputs are per-respondent arrays: values, weights, stratum and PSU ids
 * ({@link org.wavewarden.compare.design.SurveyDesign}), since design-based variances need PSU totals.
 *
 * <p>Under a weights-only design (no strata or cluster columns: each respondent its own PSU, drawn with
 * replacement, the design Kish's effective sample size assumes as well) the PSU totals are the respondents' own
 * scores, and respondents with the same value have the same score up to their weight. The per-value sums of
 * weights and squared weights ({@link org.wavewarden.compare.design.WeightedTally}) then give every estimate and
 * variance exactly: {@link org.wavewarden.compare.design.TallyEstimates},
 * {@link org.wavewarden.compare.design.WeightedDistribution}, and the tally forms of
 * {@link org.wavewarden.compare.design.DesignMeanDifference} and {@link org.wavewarden.compare.design.RaoScott}.
 * This is what the monitor uses, since a wave's summary keeps those sums and not the rows. Designs with strata or
 * clusters need the rows (or PSU totals) and are not read by the monitor yet.
 */
package org.wavewarden.compare.design;
