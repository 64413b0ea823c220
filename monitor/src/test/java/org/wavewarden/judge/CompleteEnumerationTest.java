package org.wavewarden.judge;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.Population;
import org.wavewarden.config.WardenConfig.FdrMethod;

import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A census or a full register observes every unit: a change is the population's own, so it is judged by its size
 * against the threshold alone, with no test, no q-value, no interval and no false-discovery-rate family.
 */
class CompleteEnumerationTest {

    static final double ALPHA = 0.05;

    static Comparison share(String variable, FindingKind kind, String what, long sB, long nB, long sC, long nC) {
        return new VariableComparator(1 - ALPHA).proportion(variable, kind, what, sB, nB, sC, nC, null);
    }

    /**
     * Cohen's h of two complete counts against the default 0.2 (Cohen 1988). Reference: R 4.2.2,
     * 2 * asin(sqrt(p2)) - 2 * asin(sqrt(p1)). MATERIAL from T on, MINOR above 0, STABLE at 0 (common practice, no
     * source).
     */
    @ParameterizedTest(name = "{0}/1000 -> {1}/1000 in a {3}: h {2}, {4}")
    @CsvSource({
            "300, 360, 0.12772274, CENSUS,   MINOR",     // R 4.2.2: 2*asin(sqrt(0.36)) - 2*asin(sqrt(0.3))
            "300, 400, 0.21015893, REGISTER, MATERIAL",  // R 4.2.2: 2*asin(sqrt(0.4)) - 2*asin(sqrt(0.3))
            "300, 300, 0.00000000, CENSUS,   STABLE",    // no change at all
    })
    void aChangeIsJudgedByItsSizeAlone(long before, long after, double h, Population population, Verdict verdict) {
        Finding f = Judge.judge(List.of(share("owns_boat", FindingKind.SHIFT, "answering 'yes'", before, 1000,
                after, 1000)), ALPHA, FdrMethod.BENJAMINI_HOCHBERG, population).get(0);
        assertEquals(verdict, f.verdict());
        assertEquals(h, f.effect().estimate(), 1e-8);
        assertNull(f.pValue(), "no test answers a question about a population observed whole");
        assertNull(f.qValue());
        assertNull(f.test());
        assertNull(f.statistic());
        assertNull(f.df());
        assertNull(f.fdrFamilySize());
        assertNull(f.fdrMethod());
        assertEquals(f.effect().estimate(), f.effect().ciLow());
        assertEquals(f.effect().estimate(), f.effect().ciHigh());
        assertEquals(0, f.effect().minimumDetectable());
        assertTrue(f.effect().resolvable());
        String unit = population == Population.CENSUS ? "census" : "full register";
        assertTrue(f.sentence().startsWith("Every unit was observed (" + unit + "): the change is as large as it"
                + " is, so no test is made; "), f.sentence());
        assertTrue(f.sentence().endsWith(": " + verdict + "."), f.sentence());
        assertTrue(!f.sentence().contains("p =") && !f.sentence().contains("q =") && !f.sentence().contains("CI"),
                f.sentence());
    }

    /**
     * The same counts as a sample: the two-proportion z-test without continuity correction, reference R 4.2.2
     * {@code prop.test(c(300, 400), c(1000, 1000), correct = FALSE)}: X-squared 21.978022 (z 4.6880723), p-value
     * 2.7579058e-06; alone in its family, so Benjamini-Hochberg leaves q = p. Cohen's h with its interval on the
     * arcsine scale from the two Wilson intervals (the MOVER construction CohensH documents), reference R 4.2.2:
     *   g <- function(p) 2 * asin(sqrt(p)); b <- prop.test(300, 1000, correct = FALSE)$conf.int
     *   a <- prop.test(400, 1000, correct = FALSE)$conf.int; h <- g(0.4) - g(0.3)
     *   c(h - sqrt((g(0.4) - g(a[1]))^2 + (g(b[2]) - g(0.3))^2),
     *     h + sqrt((g(a[2]) - g(0.4))^2 + (g(0.3) - g(b[1]))^2))
     * = 0.12229986 to 0.29738900.
     */
    @Test
    void theSameCountsAsASampleAreTested() {
        Comparison c = share("owns_boat", FindingKind.SHIFT, "answering 'yes'", 300, 1000, 400, 1000);
        Finding f = Judge.judge(List.of(c), ALPHA, FdrMethod.BENJAMINI_HOCHBERG, Population.SAMPLE).get(0);
        assertEquals(2.7579057770547e-06, f.pValue(), 1e-12);    // R 4.2.2 prop.test, see above
        assertEquals(f.pValue(), f.qValue(), 1e-15, "a family of one: q is p");
        assertEquals(1, f.fdrFamilySize());
        assertEquals(0.21015893, f.effect().estimate(), 1e-8);     // R 4.2.2, see above
        assertEquals(0.12229986, f.effect().ciLow(), 1e-8);        // R 4.2.2, see above
        assertEquals(0.29738900, f.effect().ciHigh(), 1e-8);       // R 4.2.2, see above
        assertEquals(Verdict.MATERIAL, f.verdict(), f.sentence());
        // The same comparison, judged without naming a population, is a sample's.
        assertEquals(f, Judge.judge(List.of(c), ALPHA, FdrMethod.BENJAMINI_HOCHBERG).get(0));
    }

    /**
     * Nonresponse in a complete enumeration is missingness: the missing share is of every unit, those that did not
     * answer included, and judged by size too. Reference: R 4.2.2, 2 * asin(sqrt(0.13)) - 2 * asin(sqrt(0.10)) =
     * 0.09422486, below 0.2.
     */
    @Test
    void partialNonresponseIsReportedAsMissingnessOfAllUnits() {
        Finding f = WaveVerdicts.judge(List.of(share("income", FindingKind.MISSING_RATE_CHANGE, "missing (NULL)",
                100, 1000, 130, 1000)), Map.of(), ALPHA, FdrMethod.BENJAMINI_HOCHBERG, Population.CENSUS).get(0);
        assertEquals(Verdict.MINOR, f.verdict());
        assertEquals(0.09422486, f.effect().estimate(), 1e-8);   // R 4.2.2, see above
        assertNull(f.qValue());
        assertEquals("Every unit was observed (census): the change is as large as it is, so no test is made, and the"
                + " shares are of all units, those that did not answer included; share missing (NULL) rose from 10.0%"
                + " to 13.0% of units (+3.0 points); Cohen's h 0.094, below the 0.200 threshold: MINOR.", f.sentence());
    }

    /**
     * A relationship between two variables of a census is judged by size too. The difference of Spearman
     * correlations of two weighted pair tables, reference R 4.2.2: cor(rep(x, n), rep(y, n), method = "spearman")
     * is 0.20519567 before and -0.34759085 after, difference -0.55278652, beyond the 0.1 threshold.
     */
    @Test
    void aRelationshipIsJudgedBySizeToo() {
        double[] x = {1, 2, 3, 4, 5};
        double[] y = {1, 2, 3, 4, 1};
        var before = new org.wavewarden.profile.JointTally("x", "y", x, y, new long[] {10, 10, 10, 10, 10},
                org.wavewarden.profile.Binning.EXACT);
        var after = new org.wavewarden.profile.JointTally("x", "y", x, y, new long[] {10, 10, 10, 10, 30},
                org.wavewarden.profile.Binning.EXACT);
        Comparison c = org.wavewarden.compare.relation.RelationshipChange.compare("x ~ y", before, after, 0.1, "",
                1 - ALPHA, 0, 0).comparison();
        Finding f = Judge.judge(List.of(c), ALPHA, FdrMethod.BENJAMINI_HOCHBERG, Population.CENSUS).get(0);
        assertEquals(-0.55278652, f.effect().estimate(), 1e-8);   // R 4.2.2, see above
        assertEquals(Verdict.MATERIAL, f.verdict());
        assertNull(f.pValue());
        assertTrue(f.sentence().startsWith("Every unit was observed (census): the change is as large as it is, so no"
                + " test is made; the Spearman correlation of x and y fell from 0.205 to -0.348"), f.sentence());
    }
}
