/**
 * Comparisons of categorical variables: chi-square tests of homogeneity and goodness of fit, Fisher's exact and Monte
 * Carlo exact tests, and the effects Cramer's V and Cohen's w with noncentrality-based intervals.
 */
package org.wavewarden.compare.categorical;
