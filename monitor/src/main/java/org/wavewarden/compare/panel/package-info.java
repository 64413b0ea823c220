/**
 * Paired comparisons for panel waves, where the same respondents answered a categorical question at both waves: the
 * Stuart-Maxwell test of marginal homogeneity with the share change that moved most, and the churn table of who moved
 * from which answer to which. Inputs are k x k tables of counts, rows the earlier wave and columns the later one.
 */
package org.wavewarden.compare.panel;
