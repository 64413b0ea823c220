package org.wavewarden.compare.domain;

import java.util.List;

/**
 * One variable's change broken down by one domain column: the domains ranked by their contribution, the test that
 * the change differs across domains, and what could not be broken down.
 *
 * @param column          the breakdown column
 * @param variable        the variable
 * @param measure         what was compared, e.g. "share answering yes", "mean", "share of 999"
 * @param kind            the measure's kind
 * @param unit            "points" or the variable's unit
 * @param method          how estimates and variances were made: "unweighted", "weighted (linearised, each
 *                        respondent a PSU)" or "design-based (linearised over all PSUs, strata ...)"
 * @param domains         every kept domain with answers in both waves, ranked by |contribution|, largest first
 * @param overall         the measure's change over the whole wave (after - before)
 * @param composition     the part of {@code overall} due to domains' shares moving (Kitagawa 1955); overall =
 *                        sum of contributions + composition
 * @param statistic       the heterogeneity test's statistic: the Wald chi-square of the domain-by-wave interaction
 *                        (all domains' changes equal), with the domains' full covariance within each wave
 * @param df              its degrees of freedom (domains compared - 1)
 * @param pValue          its p-value
 * @param qValue          the p-value adjusted for the false discovery rate across every breakdown test of the run;
 *                        null until the judge sets it
 * @param elsewhere       the change over every other domain pooled, beside the first-ranked domain; null with
 *                        fewer than two domains
 * @param leftOut         domains kept but not compared (no answers in one wave), by label
 * @param nullRows        rows of the current wave with no domain (NULL in the breakdown column)
 * @param overflowDomains domains of the current wave beyond the cap, not compared
 * @param overflowRows    their rows
 */
public record Breakdown(String column, String variable, String measure, DomainMeasure.Kind kind, String unit,
                        String method, List<DomainChange> domains, double overall, double composition,
                        double statistic, int df, double pValue, Double qValue, Double elsewhere,
                        List<String> leftOut, long nullRows, int overflowDomains, long overflowRows) {

    public Breakdown {
        domains = List.copyOf(domains);
        leftOut = leftOut == null ? List.of() : List.copyOf(leftOut);
    }

    /** The same breakdown with its run-wide q-value. */
    public Breakdown withQValue(double q) {
        return new Breakdown(column, variable, measure, kind, unit, method, domains, overall, composition, statistic,
                df, pValue, q, elsewhere, leftOut, nullRows, overflowDomains, overflowRows);
    }
}
