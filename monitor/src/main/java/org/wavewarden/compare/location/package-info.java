/**
 * Comparisons of location by t tests (Welch, pooled, paired, one-sample) with their degrees of freedom, the effects
 * Hedges' g and Cohen's d_z with noncentral-t intervals, and the choice of a variable's location test
 * ({@code LocationTestChoice}, {@code PairedTestChoice}).
 */
package org.wavewarden.compare.location;
