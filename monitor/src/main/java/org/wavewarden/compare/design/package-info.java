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
 * This is what the monitor uses, since a wave's summary keeps those sums and not the rows.
 *
 * <p>Under a stratified cluster design the linearised scores of respondents in one PSU no longer collapse onto
 * their values, but they enter the variance only through their PSU totals. The per-PSU sums of {@code w},
 * {@code w y} and {@code w y^2} of a numeric variable ({@link org.wavewarden.compare.design.PsuTotals}), or of the
 * weights of each value of a variable with few values ({@link org.wavewarden.compare.design.PsuTally}), with the
 * stratum of each PSU, give the same estimates, design effects, two-wave t tests and Rao-Scott tests as the rows.
 * Missing answers follow the domain rule described at {@code PsuTotals}: every PSU of the design stays in the
 * variance, as R's {@code subset} of a survey design keeps it.
 * The read stage collects these sums in the wave's one scan ({@code read.DesignScan}).
 */
package org.wavewarden.compare.design;
