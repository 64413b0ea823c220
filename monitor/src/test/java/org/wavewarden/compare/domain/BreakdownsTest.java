package org.wavewarden.compare.domain;

import org.junit.jupiter.api.Test;
import org.wavewarden.profile.WaveProfile;

import java.util.List;
import java.util.Map;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** What a breakdown holds beyond its statistics: which domains are compared, left out, overflowing, and edge cases. */
class BreakdownsTest {

    private static final DomainMeasure YES = new DomainMeasure(DomainMeasure.Kind.SHARE, "answer", Set.of("Yes"),
            Set.of(), "share answering Yes", "points");

    /**
     * Baseline: A 2 of 3 Yes, B 1 of 3, C 1 of 2, D 1 of 2 (beyond a cap of three). Current: A 2 of 3, B 2 of 4, D
     * without an answer, E and F beyond a cap of three domains, two rows without a region.
     */
    private static final Map<String, List<DomainWaves.Row>> REGIONS = DomainWaves.parse("""
            wave,stratum,psu,w,region,answer
            1,s,1,1,A,Yes
            1,s,2,1,A,No
            1,s,3,1,A,Yes
            1,s,4,1,B,No
            1,s,5,1,B,No
            1,s,6,1,B,Yes
            1,s,7,1,C,Yes
            1,s,8,1,C,No
            1,s,9,1,D,Yes
            1,s,10,1,D,No
            2,s,1,1,A,Yes
            2,s,2,1,A,Yes
            2,s,3,1,A,No
            2,s,4,1,B,Yes
            2,s,5,1,B,No
            2,s,6,1,B,No
            2,s,7,1,B,Yes
            2,s,8,1,D,
            2,s,9,1,D,
            2,s,10,1,E,Yes
            2,s,11,1,E,No
            2,s,12,1,F,Yes
            2,s,13,1,,No
            2,s,14,1,,Yes
            """);

    private static Breakdown regions() {
        return Breakdowns.of("region", YES, DomainWaves.profile("1", REGIONS.get("1"), "region", 3, false),
                DomainWaves.profile("2", REGIONS.get("2"), "region", 3, false), false, 0.95).orElseThrow();
    }

    @Test
    void domainsWithoutAnswersInAWaveAreLeftOutCurrentOrderFirst() {
        Breakdown b = regions();
        assertEquals(List.of("A", "B"), b.domains().stream().map(DomainChange::domain).sorted().toList());
        assertEquals(List.of("D", "C"), b.leftOut());
        assertEquals("unweighted", b.method());
    }

    @Test
    void theCurrentWavesOverflowAndNullRowsArePassedThroughAndCountInTheOverall() {
        Breakdown b = regions();
        assertEquals(2, b.nullRows());
        assertEquals(2, b.overflowDomains(), "E and F beyond the cap of three");
        assertEquals(3, b.overflowRows());
        // The whole wave: baseline 5 Yes of 10 answers; current 7 Yes of 12 answers (D's two rows have none).
        assertEquals(7.0 / 12 - 5.0 / 10, b.overall(), 1e-15);
        // A's share of the answers: 3 of 10, then 3 of 12; B's: 3 of 10, then 4 of 12.
        DomainChange a = find(b, "A");
        assertEquals(0.3, a.shareBefore(), 1e-15);
        assertEquals(0.25, a.shareAfter(), 1e-15);
        assertEquals(3, a.nBaseline());
        assertEquals(3, a.nCurrent());
        assertEquals(0.0, a.change(), 1e-15);
        DomainChange bb = find(b, "B");
        assertEquals(0.5 - 1.0 / 3, bb.change(), 1e-15);
        assertEquals((0.3 + 4.0 / 12) / 2 * (0.5 - 1.0 / 3), bb.contribution(), 1e-15);
        assertEquals(b.overall() - a.contribution() - bb.contribution(), b.composition(), 1e-15);
        assertEquals("B", b.domains().get(0).domain(), "A did not change, so B contributes most");
    }

    @Test
    void elsewhereIsThePooledRestOfTheKeptDomains() {
        Breakdown b = regions();
        // Beside B: the other kept domains pooled. Baseline A and C, 3 Yes of 5 answers (with a cap of three the
        // baseline kept A, B and C; D was beyond it); current A's 2 of 3 (C gone, D without answers).
        assertEquals(2.0 / 3 - 3.0 / 5, b.elsewhere(), 1e-15);
    }

    @Test
    void twoDomainsWithoutWeightsTestTheDifferenceOfTheirChangesAsAZSquared() {
        Breakdown b = regions();
        DomainChange a = find(b, "A");
        DomainChange bb = find(b, "B");
        double z = (a.change() - bb.change()) / Math.sqrt(a.se() * a.se() + bb.se() * bb.se());
        assertEquals(1, b.df());
        assertEquals(z * z, b.statistic(), 1e-12);
        // pchisq(z^2, 1, lower.tail = FALSE) = 2 pnorm(-|z|): the same test.
        assertEquals(2 * org.wavewarden.compare.StandardNormal.cdf(-Math.abs(z)), b.pValue(), 1e-12);
        // Unweighted, each respondent its own PSU: V = n/(n-1) p(1-p)/m per wave, n the wave's rows.
        double vBefore = 10.0 / 9 * (2.0 / 3) * (1.0 / 3) / 3;
        double vAfter = 14.0 / 13 * (2.0 / 3) * (1.0 / 3) / 3;
        assertEquals(Math.sqrt(vBefore + vAfter), a.se(), 1e-15);
    }

    /** C answers Yes throughout, G switches from all Yes to all No: neither change has a variance. */
    private static final Map<String, List<DomainWaves.Row>> STEADY = DomainWaves.parse("""
            wave,stratum,psu,w,region,answer
            1,s,1,1,A,Yes
            1,s,2,1,A,No
            1,s,3,1,A,No
            1,s,4,1,B,No
            1,s,5,1,B,Yes
            1,s,6,1,C,Yes
            1,s,7,1,C,Yes
            1,s,8,1,G,Yes
            1,s,9,1,G,Yes
            2,s,1,1,A,Yes
            2,s,2,1,A,Yes
            2,s,3,1,A,No
            2,s,4,1,B,No
            2,s,5,1,B,No
            2,s,6,1,B,Yes
            2,s,7,1,C,Yes
            2,s,8,1,C,Yes
            2,s,9,1,G,No
            2,s,10,1,G,No
            """);

    @Test
    void aDomainWithoutVarianceKeepsItsRowButIsLeftOutOfTheHeterogeneityTest() {
        Breakdown b = Breakdowns.of("region", YES, DomainWaves.profile("1", STEADY.get("1"), "region", 10, false),
                DomainWaves.profile("2", STEADY.get("2"), "region", 10, false), false, 0.95).orElseThrow();
        assertEquals(4, b.domains().size());
        DomainChange c = find(b, "C");
        assertEquals(0.0, c.se());
        assertEquals(1.0, c.pValue(), "no change and no variance: nothing to see");
        DomainChange g = find(b, "G");
        assertEquals(-1.0, g.change());
        assertEquals(0.0, g.se());
        assertEquals(0.0, g.pValue(), "a change without any sampling variance is certain");
        assertEquals(g.change(), g.ciLow());
        assertEquals(g.change(), g.ciHigh());
        // The test is then that of A and B alone.
        DomainChange a = find(b, "A");
        DomainChange bb = find(b, "B");
        double z = (a.change() - bb.change()) / Math.sqrt(a.se() * a.se() + bb.se() * bb.se());
        assertEquals(1, b.df());
        assertEquals(z * z, b.statistic(), 1e-12);
    }

    @Test
    void withFewerThanTwoTestableDomainsTheTestIsEmpty() {
        Wald w = Wald.ofChanges(new double[] {0.1, -0.2, 0.3}, new double[][] {{0.01, 0, 0}, {0, 0, 0}, {0, 0, 0}});
        assertEquals(0.0, w.statistic());
        assertEquals(0, w.df());
        assertEquals(1.0, w.pValue());
    }

    @Test
    void dependentDomainsTestOnTheRankOfTheirCovariance() {
        // Two domains' changes perfectly correlated with a third (one PSU drives all): C V C' has rank 1.
        double[][] v = {{1, 1, 1}, {1, 1, 1}, {1, 1, 2}};
        Wald w = Wald.ofChanges(new double[] {0.5, 0.5, -0.5}, v);
        assertEquals(1, w.df());
        // Contrast A - C = 1 with variance 1 + 2 - 2 = 1; B - C the same and fully dependent on it.
        assertEquals(1.0, w.statistic(), 1e-12);
    }

    @Test
    void noBreakdownWithoutTheColumnsDomainTalliesOrWithOneComparableDomain() {
        WaveProfile b = DomainWaves.profile("1", REGIONS.get("1"), "region", 3, false);
        WaveProfile c = DomainWaves.profile("2", REGIONS.get("2"), "region", 3, false);
        assertTrue(Breakdowns.of("district", YES, b, c, false, 0.95).isEmpty());
        DomainMeasure other = new DomainMeasure(DomainMeasure.Kind.SHARE, "absent", Set.of("Yes"), Set.of(), "", "");
        assertTrue(Breakdowns.of("region", other, b, c, false, 0.95).isEmpty());
        WaveProfile one = DomainWaves.profile("2", REGIONS.get("2"), "region", 1, false);
        assertTrue(Breakdowns.of("region", YES, b, one, false, 0.95).isEmpty(), "only A kept in the current wave");
    }

    /** Weighted scores with a 99 "not known" code and a NULL-heavy domain. */
    private static final Map<String, List<DomainWaves.Row>> SCORES = DomainWaves.parse("""
            wave,stratum,psu,w,region,score
            1,h1,1,2.5,A,10
            1,h1,1,1.5,A,12
            1,h1,2,3.0,B,99
            1,h1,2,2.0,B,7
            1,h1,3,1.0,A,11
            1,h1,3,4.0,B,8
            1,h2,4,2.0,A,99
            1,h2,4,1.5,B,9
            1,h2,5,2.5,A,13
            1,h2,5,3.5,B,
            1,h2,6,1.0,A,14
            1,h2,6,2.0,B,6
            2,h1,1,2.0,A,11
            2,h1,1,3.0,B,9
            2,h1,2,1.5,A,99
            2,h1,2,2.5,B,10
            2,h1,3,2.0,A,15
            2,h1,3,1.0,B,
            2,h2,4,3.0,A,12
            2,h2,4,2.0,B,8
            2,h2,5,1.0,A,13
            2,h2,5,2.0,B,99
            2,h2,6,2.5,A,16
            2,h2,6,1.5,B,7
            """);

    private static final DomainMeasure MEAN = new DomainMeasure(DomainMeasure.Kind.MEAN, "score", Set.of(),
            Set.of("99"), "mean", "points");

    private static Breakdown scores(Map<String, List<DomainWaves.Row>> data, DomainMeasure m, boolean design,
                                    java.util.function.Predicate<String> cellsKept) {
        return Breakdowns.of("region", m,
                DomainWaves.profile("1", data.get("1"), "region", 10, design, cellsKept),
                DomainWaves.profile("2", data.get("2"), "region", 10, design, cellsKept), true, 0.95).orElseThrow();
    }

    @Test
    void anExcludedValueIsLeftOutAsANullIs() {
        Map<String, List<DomainWaves.Row>> asNull = new java.util.LinkedHashMap<>();
        SCORES.forEach((wave, rows) -> asNull.put(wave, rows.stream().map(r -> new DomainWaves.Row(r.stratum(),
                r.psu(), r.w(), r.domain(), "99".equals(r.values().get("score")) ? java.util.Collections
                .singletonMap("score", null) : r.values())).toList()));
        DomainMeasure plain = new DomainMeasure(DomainMeasure.Kind.MEAN, "score", Set.of(), Set.of(), "mean", "points");
        for (boolean design : new boolean[] {false, true}) {
            assertSame(scores(asNull, plain, design, null), scores(SCORES, MEAN, design, null));
        }
    }

    @Test
    void withoutEveryValuesPsuSumsAMeanTakesTheNumericTotalsLessTheExcludedCodes() {
        Breakdown complete = scores(SCORES, MEAN, true, null);
        assertTrue(complete.method().startsWith("design-based"), complete.method());
        Breakdown codesKept = scores(SCORES, MEAN, true, "99"::equals);
        assertSame(complete, codesKept);
        assertEquals(complete.method(), codesKept.method());
    }

    @Test
    void withoutTheExcludedCodesPsuSumsTheBreakdownFallsBackToTheWeightsAndSaysSo() {
        Breakdown none = scores(SCORES, MEAN, true, v -> false);
        Breakdown weightsOnly = scores(SCORES, MEAN, false, null);
        assertTrue(none.method().startsWith("weighted (linearised, each respondent a PSU; the design holds no PSU sums"),
                none.method());
        assertEquals("weighted (linearised, each respondent a PSU)", weightsOnly.method());
        assertSame(weightsOnly, none);
    }

    @Test
    void aRateCountsRowsUnweightedEvenInAWeightedDesign() {
        DomainMeasure nullOr99 = new DomainMeasure(DomainMeasure.Kind.RATE, "score", Set.of("99", DomainMeasure.NULL),
                Set.of(), "share of 99 or NULL", "points");
        Breakdown b = scores(SCORES, nullOr99, true, null);
        assertEquals("unweighted (a share of rows)", b.method());
        DomainChange bb = find(b, "B");
        // B: baseline 99 and NULL in 6 rows, current 99 and NULL in 6 rows.
        assertEquals(2.0 / 6, bb.before(), 1e-15);
        assertEquals(2.0 / 6, bb.after(), 1e-15);
        assertEquals(6, bb.nBaseline());
        assertEquals(0.5, bb.shareBefore(), 1e-15, "a share of the wave's rows");
        DomainChange a = find(b, "A");
        assertEquals(1.0 / 6, a.before(), 1e-15);
        assertEquals(1.0 / 6, a.after(), 1e-15);
    }

    @Test
    void theBreakdownCarriesTheMeasuresNamesAndNoRunWideQValue() {
        Breakdown b = scores(SCORES, MEAN, true, null);
        assertEquals("region", b.column());
        assertEquals("score", b.variable());
        assertEquals("mean", b.measure());
        assertEquals(DomainMeasure.Kind.MEAN, b.kind());
        assertEquals("points", b.unit());
        assertNull(b.qValue());
        assertEquals(0.25, b.withQValue(0.25).qValue());
    }

    @Test
    void aSummaryWhoseWeightsOrPsuSumsDoNotFitIsUsedWithoutThemNotTrustedInPart() {
        WaveProfile b = DomainWaves.profile("1", SCORES.get("1"), "region", 10, true);
        WaveProfile c = DomainWaves.profile("2", SCORES.get("2"), "region", 10, true);
        var t = c.domains("region").orElseThrow();
        // Weights of one domain only: the comparison is unweighted.
        var oneWeight = new org.wavewarden.profile.DomainTally(t.column(), t.domains(), t.rows(), t.nullRows(),
                t.overflowDomains(), t.overflowRows(), t.tallies(),
                Map.of("score", List.of(t.weights().get("score").get(0))), t.designs());
        Breakdown unweighted = Breakdowns.of("region", MEAN, b, withDomains(c, oneWeight), true, 0.95).orElseThrow();
        assertEquals("unweighted", unweighted.method());
        assertSame(Breakdowns.of("region", MEAN, b, c, false, 0.95).orElseThrow(), unweighted);
        // PSU sums over fewer PSUs than the wave's design has: the weights alone.
        var g = t.designs().get("score").stream().map(d -> new org.wavewarden.profile.DesignSummary.ColumnDesign(
                Map.of("12", new double[] {1.0}), true, null, null, null)).toList();
        var shortPsus = new org.wavewarden.profile.DomainTally(t.column(), t.domains(), t.rows(), t.nullRows(),
                t.overflowDomains(), t.overflowRows(), t.tallies(), t.weights(), Map.of("score", g));
        Breakdown weightsOnly = Breakdowns.of("region", MEAN, b, withDomains(c, shortPsus), true, 0.95).orElseThrow();
        assertTrue(weightsOnly.method().startsWith("weighted"), weightsOnly.method());
        assertSame(scores(SCORES, MEAN, false, null), weightsOnly);
    }

    @Test
    void binnedNumbersAreMeanedAtTheirStandInsWhileTheDesignVarianceIsTheExactValues() {
        WaveProfile b = DomainWaves.profile("1", SCORES.get("1"), "region", 10, true);
        WaveProfile c = DomainWaves.profile("2", SCORES.get("2"), "region", 10, true);
        Breakdown exact = Breakdowns.of("region", MEAN, b, c, true, 0.95).orElseThrow();
        Breakdown binned = Breakdowns.of("region", MEAN, binned(b), binned(c), true, 0.95).orElseThrow();
        assertTrue(binned.method().startsWith("design-based"), binned.method());
        assertTrue(binned.method().endsWith("; binned numbers at their bins' stand-ins"), binned.method());
        for (DomainChange e : exact.domains()) {
            DomainChange x = find(binned, e.domain());
            // The PSU sums hold the exact numbers, so the variance is the exact one.
            assertEquals(e.se(), x.se(), 1e-12, e.domain());
            // The stand-in of a number lies within 1 of it (even numbers stand for odd ones), and so do the means.
            assertTrue(Math.abs(e.before() - x.before()) <= 1 && Math.abs(e.after() - x.after()) <= 1, e.domain());
        }
    }

    /**
     * The summary as the reader makes it of a column with too many numbers per domain: each number replaced by a
     * stand-in (here the even number at or above it; 99 is code-like and stays), and the design's PSU sums kept
     * only as the exact numeric totals and the code-like values' cells.
     */
    private static WaveProfile binned(WaveProfile p) {
        var t = p.domains("region").orElseThrow();
        java.util.function.UnaryOperator<String> standIn = v -> v.equals("99") ? v
                : String.valueOf(2 * (int) Math.ceil(Integer.parseInt(v) / 2.0));
        List<org.wavewarden.profile.ColumnTally> tallies = new java.util.ArrayList<>();
        List<Map<String, double[]>> weights = new java.util.ArrayList<>();
        List<org.wavewarden.profile.DesignSummary.ColumnDesign> designs = new java.util.ArrayList<>();
        for (int d = 0; d < t.domains().size(); d++) {
            var tally = t.tallies().get("score").get(d);
            Map<String, Long> counts = new java.util.LinkedHashMap<>();
            tally.valueCounts().forEach((v, n) -> counts.merge(standIn.apply(v), n, Long::sum));
            tallies.add(new org.wavewarden.profile.ColumnTally("score", tally.type(), tally.rowCount(),
                    tally.nullCount(), counts, false, new org.wavewarden.profile.Binning(0)));
            Map<String, double[]> w = new java.util.LinkedHashMap<>();
            t.weights().get("score").get(d).forEach((v, s) -> {
                double[] cell = w.computeIfAbsent(standIn.apply(v), k -> new double[2]);
                cell[0] += s[0];
                cell[1] += s[1];
            });
            weights.add(w);
            var cd = t.designs().get("score").get(d);
            Map<String, double[]> codes = new java.util.LinkedHashMap<>(cd.cells());
            codes.keySet().retainAll(Set.of("99"));
            designs.add(new org.wavewarden.profile.DesignSummary.ColumnDesign(codes, false, cd.weight(),
                    cd.weightedSum(), cd.weightedSquares()));
        }
        return withDomains(p, new org.wavewarden.profile.DomainTally(t.column(), t.domains(), t.rows(), t.nullRows(),
                t.overflowDomains(), t.overflowRows(), Map.of("score", tallies), Map.of("score", weights),
                Map.of("score", designs)));
    }

    private static WaveProfile withDomains(WaveProfile p, org.wavewarden.profile.DomainTally t) {
        return new WaveProfile(p.wave(), p.rows(), p.schema(), p.columns(), p.weights(), p.design(), p.pairs(),
                List.of(t));
    }

    private static void assertSame(Breakdown expected, Breakdown actual) {
        assertEquals(expected.domains().size(), actual.domains().size());
        for (int i = 0; i < expected.domains().size(); i++) {
            DomainChange e = expected.domains().get(i);
            DomainChange a = actual.domains().get(i);
            assertEquals(e.domain(), a.domain());
            assertEquals(e.nBaseline(), a.nBaseline());
            assertEquals(e.nCurrent(), a.nCurrent());
            assertEquals(e.before(), a.before(), 1e-12);
            assertEquals(e.after(), a.after(), 1e-12);
            assertEquals(e.se(), a.se(), 1e-12);
            assertEquals(e.contribution(), a.contribution(), 1e-12);
        }
        assertEquals(expected.overall(), actual.overall(), 1e-12);
        assertEquals(expected.statistic(), actual.statistic(), 1e-9);
        assertEquals(expected.df(), actual.df());
    }

    private static DomainChange find(Breakdown b, String domain) {
        return b.domains().stream().filter(d -> d.domain().equals(domain)).findFirst().orElseThrow();
    }
}
