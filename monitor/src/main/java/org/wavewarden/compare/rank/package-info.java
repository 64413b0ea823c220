/**
 * Rank comparisons: Mann-Whitney and Wilcoxon signed-rank tests (exact null distributions for small samples), the
 * Hodges-Lehmann shift, Cliff's delta and the rank-biserial correlation, and order-statistic intervals for a median.
 */
package org.wavewarden.compare.rank;
