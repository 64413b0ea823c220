/**
 * Changes of a distribution's shape: the Kolmogorov-Smirnov test and distance with its interval, the Wasserstein
 * distance, Jensen-Shannon divergence and the population stability index.
 */
package org.wavewarden.compare.shape;
