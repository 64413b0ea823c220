/**
 * Where a change happened: one variable's measure (a share, a mean, a rate) estimated within each domain of a
 * breakdown column in both waves, weighted and design-based where the wave is (domain estimation over every PSU),
 * each domain's change with its interval and test, the test that the change differs across domains (a Wald test of
 * the domain-by-wave interaction), the false-discovery-rate control over the domains' tests, and each domain's
 * contribution to the overall change (Kitagawa's decomposition into within-domain change and composition).
 */
package org.wavewarden.compare.domain;
