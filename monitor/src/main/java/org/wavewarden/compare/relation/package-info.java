/**
 * Relationship drift: whether two variables go together as strongly in the current wave as in the baseline. Pearson
 * and Spearman correlations from a joint tally of value pairs with Fisher-z intervals, and the comparison of two
 * independent waves' correlations (Fisher's z test and Zou's interval for the difference).
 */
package org.wavewarden.compare.relation;
