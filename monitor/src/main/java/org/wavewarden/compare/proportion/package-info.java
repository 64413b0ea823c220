/**
 * Comparisons of shares: the two-proportion z test with Cohen's h and its interval, Wilson intervals, and McNemar's
 * test for paired proportions.
 */
package org.wavewarden.compare.proportion;
