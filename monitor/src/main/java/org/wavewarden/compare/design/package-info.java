/**
 * Design-based statistics for complex survey samples: Kish's weighting effect, weighted means and shares with
 * standard errors by Taylor linearisation under stratified cluster designs (PSUs with replacement within strata),
 * the design-based comparison of two independently sampled waves, and the Rao-Scott corrected chi-square for a
 * categorical variable. Inputs are per-respondent arrays: values, weights, stratum and PSU ids
 * ({@link org.wavewarden.compare.design.SurveyDesign}), since design-based variances need PSU totals.
 */
package org.wavewarden.compare.design;
