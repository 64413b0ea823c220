/** False-discovery-rate control over a run's family of p-values: Benjamini-Hochberg and Benjamini-Yekutieli step-up. */
package org.wavewarden.judge.multiplicity;
