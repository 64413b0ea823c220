package org.wavewarden.pipeline;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.wavewarden.compare.WeightedComparator;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.testing.TestDatabase;

import java.sql.Connection;
import java.time.Clock;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A weighted survey on a real PostgreSQL server, judged with and without its weight column. Wave 2 keeps wave 1's
 * answers exactly, but its weights double every home owner's (a changed nonresponse adjustment, say), so the
 * unweighted answers do not move while the weighted share of owners rises from 50% to 67% and the weighted mean
 * income with it; region is independent of ownership and stays put either way. Twenty rows of wave 2 have a NULL
 * weight and count as respondents of weight zero. Wave 3 is drawn as wave 1 and is judged against waves 1 and 2
 * pooled.
 *
 * <p>Reference values: R 4.2.2 (Debian r-base-core) with survey 4.1.1 (Debian r-cran-survey), on the same rows built
 * from the same formulas:
 * <pre>
 * suppressMessages(library(survey)); options(digits = 15)
 * g &lt;- 1:2000
 * mk &lt;- function(wave) {
 *   owns &lt;- g %% 2
 *   w &lt;- (1 + (g %% 7) * 0.25) * ifelse(wave == 2 &amp; owns == 1, 2, 1)
 *   if (wave == 2) w[g %% 100 == 0] &lt;- 0  # NULL weights in the table: respondents of weight zero
 *   data.frame(wave = wave, w = w, owns_home = owns, region = c("north", "east", "south", "west")[1 + (g %/% 2) %% 4],
 *              income = 1000 + (g %% 50) * 20 + 800 * owns)
 * }
 * d &lt;- rbind(mk(1), mk(2))
 * for (s in 1:2) {
 *   x &lt;- d[d$wave == s, ]; des &lt;- svydesign(ids = ~1, weights = ~w, data = x)
 *   m &lt;- svymean(~owns_home, des); print(c(coef(m), SE(m)))
 *   m &lt;- svymean(~income, des); print(c(coef(m), SE(m), coef(svyvar(~income, des))))
 *   print(coef(svyquantile(~income, des, c(0.25, 0.5, 0.75))))
 *   print(c(sum(x$w)^2 / sum(x$w^2), nrow(x) * sum(x$w^2) / sum(x$w)^2))
 * }
 * st &lt;- svydesign(ids = ~1, strata = ~wave, weights = ~w, data = d)
 * t &lt;- svyttest(owns_home ~ factor(wave), st); print(c(t$estimate, t$statistic, t$parameter, t$p.value))
 * t &lt;- svyttest(income ~ factor(wave), st); print(c(t$estimate, t$statistic, t$parameter, t$p.value))
 * r &lt;- svychisq(~region + wave, st, statistic = "F"); print(c(r$statistic, r$parameter, r$p.value))
 * # wave 3 is drawn as wave 1 and judged against the pooled waves 1 and 2 (one weights-only design on their rows)
 * d3 &lt;- rbind(d, transform(mk(1), wave = 3)); d3$late &lt;- factor(d3$wave == 3)
 * pool &lt;- svydesign(ids = ~1, weights = ~w, data = d3[d3$wave &lt; 3, ]); m &lt;- svymean(~owns_home, pool); print(c(coef(m), SE(m)))
 * sp &lt;- svydesign(ids = ~1, strata = ~late, weights = ~w, data = d3)
 * t &lt;- svyttest(owns_home ~ late, sp); print(c(t$estimate, t$statistic))
 * # income against its reference mean 1950 in wave 2
 * t &lt;- svyttest(I(income - 1950) ~ 0, svydesign(ids = ~1, weights = ~w, data = d[d$wave == 2, ]))
 * print(c(t$estimate, t$statistic))
 * </pre>
 * svyttest's df (3977) leaves out the zero-weight rows and one more for its regression; the design df used here is
 * #PSU - #strata = 3998, so p-values are not compared with svyttest's.
 */
class WeightedJudgeIntegrationTest {

    static String url;
    static Session session;
    static WardenConfig config;

    private static final double REL = 1e-9;

    @BeforeAll
    static void setUp() throws Exception {
        url = TestDatabase.freshDatabase("weighted");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA survey;
                    CREATE TABLE survey.household AS
                    SELECT wave::text AS wave, g AS household_id,
                           CASE WHEN wave = 2 AND g % 100 = 0 THEN NULL
                                ELSE (1 + (g % 7) * 0.25) * CASE WHEN wave = 2 AND g % 2 = 1 THEN 2 ELSE 1 END
                           END AS w,
                           g % 2 AS owns_home,
                           (ARRAY['north', 'east', 'south', 'west'])[1 + (g / 2) % 4] AS region,
                           1000 + (g % 50) * 20 + 800 * (g % 2) AS income
                    FROM generate_series(1, 3) wave, generate_series(1, 2000) g;
                    CREATE TABLE survey.unweighable AS
                    SELECT wave::text AS wave, g % 2 AS owns_home, CASE WHEN wave = 1 THEN 1.5 ELSE 0 END AS w
                    FROM generate_series(1, 2) wave, generate_series(1, 50) g;
                    """);
        }
        String variables = """
                    variables:
                      - {name: owns_home, kind: binary, successValue: "1"}
                      - {name: region, kind: categorical}
                      - {name: income, kind: continuous, unit: EUR, reference: {mean: 1950}}
                """;
        config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\n"
                + "results:\n  schema: weighted_results\ndatasets:\n"
                + "  - name: weighted\n    table: survey.household\n    waveColumn: wave\n"
                + "    exclude: [household_id]\n    weightColumn: w\n" + variables
                + "  - name: unweighted\n    table: survey.household\n    waveColumn: wave\n"
                + "    exclude: [household_id, w]\n" + variables
                + "  - name: pooled\n    table: survey.household\n    waveColumn: wave\n"
                + "    exclude: [household_id]\n    weightColumn: w\n    compareWith: {pooledLast: 2}\n" + variables
                + "  - name: unweighable\n    table: survey.unweighable\n    waveColumn: wave\n    weightColumn: w\n");
        session = Session.open(config, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    static List<Finding> judge(int dataset, String wave) {
        return new WaveJudge(session, Clock.systemUTC()).judge(config.datasets().get(dataset), wave, null, null, null)
                .report().findings();
    }

    static Finding shift(List<Finding> findings, String variable) {
        return findings.stream().filter(f -> f.variable().equals(variable) && f.kind() == FindingKind.SHIFT)
                .findFirst().orElseThrow(() -> new AssertionError("no SHIFT finding for " + variable + ": "
                        + findings));
    }

    private static void rel(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.abs(expected), what);
    }

    @Test
    void withoutWeightsNothingMovesBecauseTheAnswersAreTheSame() {
        List<Finding> f = judge(1, "2");
        for (String v : List.of("owns_home", "region", "income")) {
            Finding s = shift(f, v);
            assertEquals(Verdict.STABLE, s.verdict(), s.sentence());
            assertTrue(!s.test().contains("weighted"), s.test());
        }
    }

    @Test
    void withWeightsTheShareOfOwnersRisesAndMatchesR() {
        Finding owns = shift(judge(0, "2"), "owns_home");
        assertEquals(Verdict.MATERIAL, owns.verdict(), owns.sentence());
        assertEquals(WeightedComparator.SHARES_TEST, owns.test());
        // R: svytest(owns_home ~ factor(wave), st): t = 11.0136736977626 on the difference 0.171260607762806
        rel(11.0136736977626, owns.statistic(), "t");
        var d = (WeightedComparator.ProportionDetail) owns.detail();
        // R: svymean(~owns_home, des) per wave: coef, SE
        rel(0.4997857142857143, d.shareBaseline(), "baseline share");
        rel(0.0116300855099789, d.standardErrorBaseline(), "baseline SE");
        rel(0.6710463220485279, d.shareCurrent(), "current share");
        rel(0.0103217204012146, d.standardErrorCurrent(), "current SE");
        rel(0.171260607762806, d.shareDifference().estimate(), "difference");
        // Cohen's h of the two R shares
        double h = 2 * Math.asin(Math.sqrt(0.6710463220485279)) - 2 * Math.asin(Math.sqrt(0.4997857142857143));
        rel(h, owns.effect().estimate(), "Cohen's h");
        assertEquals("Cohen's h (weighted shares)", owns.effect().name());
        assertEquals(2000L, owns.nBaseline());
        assertEquals(2000L, owns.nCurrent());
        // R: sum(w)^2 / sum(w^2) and nrow(x) * sum(w^2) / sum(w)^2; the 20 NULL weights count as zero weights
        rel(1849.2310595339184, d.weightingBaseline().effectiveSampleSize(), "baseline n_eff");
        rel(1.0815306122449, d.weightingBaseline().designEffect(), "baseline deff_w");
        rel(1648.85694136916504, d.weightingCurrent().effectiveSampleSize(), "current n_eff");
        rel(1.21296150673888, d.weightingCurrent().designEffect(), "current deff_w");
        assertTrue(owns.sentence().startsWith("Weighted share answering '1' rose from 50.0% to 67.1%"),
                owns.sentence());
        assertTrue(owns.sentence().contains("Kish effective sample sizes 1849 (baseline) and 1649 (current), design"
                + " effects due to weighting 1.08 and 1.21"), owns.sentence());
    }

    @Test
    void withWeightsTheMeanIncomeRisesAndMatchesR() {
        Finding income = shift(judge(0, "2"), "income");
        assertEquals(Verdict.MATERIAL, income.verdict(), income.sentence());
        assertEquals(WeightedComparator.MEANS_TEST, income.test());
        rel(8.98635266027638, income.statistic(), "t");
        var d = (WeightedComparator.LocationDetail) income.detail();
        rel(1889.4785714285715, d.meanBaseline(), "baseline mean");
        rel(11.6581268023107, d.standardErrorBaseline(), "baseline SE");
        rel(2033.1984271602571, d.meanCurrent(), "current mean");
        rel(10.9484294118809, d.standardErrorCurrent(), "current SE");
        rel(143.719855731681, d.rawShift().estimate(), "difference");
        assertArrayEquals(new double[] {1480, 1880, 2300}, d.quartilesBaseline(), 0);
        assertArrayEquals(new double[] {1760, 2060, 2420}, d.quartilesCurrent(), 0);
        // svyvar's n counts nonzero weights only (1980 in wave 2); the monitor counts every respondent (2000)
        double varC = 227064.2936340022716 / (1980.0 / 1979) * (2000.0 / 1999);
        double pooled = Math.sqrt((1999 * 251404.5732560157776 + 1999 * varC) / 3998);
        rel(143.719855731681 / pooled, income.effect().estimate(), "Cohen's d");
        assertTrue(income.sentence().startsWith("Weighted mean income rose from 1889 to 2033 EUR"),
                income.sentence());
        assertTrue(income.sentence().contains("weighted: Kish effective sample sizes 1849"), income.sentence());
    }

    @Test
    void theReferenceMeanIsTestedOnTheWeightedMean() {
        Finding ref = judge(0, "2").stream().filter(f -> f.variable().equals("income")
                && f.kind() == FindingKind.REFERENCE).findFirst().orElseThrow();
        assertEquals("design-based one-sample t on the weighted mean", ref.test());
        // R: svyttest(I(income - 1950) ~ 0, des): estimate, t
        rel(83.1984271602570, ref.effect().estimate(), "difference from the reference");
        rel(7.59911983996282, ref.statistic(), "t");
        assertTrue(ref.sentence().contains("Kish effective sample size 1649"), ref.sentence());
    }

    @Test
    void regionIsIndependentOfTheWeightsAndStaysPut() {
        Finding region = shift(judge(0, "2"), "region");
        assertEquals(WeightedComparator.CATEGORIES_TEST, region.test());
        // R: svychisq(~region + wave, st, statistic = "F"): F, ndf, p
        rel(1.34702735718911e-02, region.statistic(), "F");
        rel(9.97865263781403e-01, region.pValue(), "p");
        var d = (WeightedComparator.CategoryDetail) region.detail();
        rel(1.19939387291713e+04, d.denominatorDf(), "ddf");
        assertEquals(Verdict.STABLE, region.verdict(), region.sentence());
        assertTrue(region.effect().name().startsWith("Cramér's V (weighted"), region.effect().name());
    }

    @Test
    void aWaveWithoutPositiveWeightsIsSkippedWithItsReason() {
        Finding skipped = judge(3, "2").stream().filter(f -> f.variable().equals("owns_home")
                && f.kind() == FindingKind.SKIPPED).findFirst().orElseThrow();
        assertEquals("Not compared: no valid answer carries a positive weight in a wave.", skipped.sentence());
    }

    @Test
    void thePooledBaselineMergesTheWeightsOfItsWaves() {
        Finding owns = shift(judge(2, "3"), "owns_home");
        var d = (WeightedComparator.ProportionDetail) owns.detail();
        // R: svymean(~owns_home, pool) on the rows of waves 1 and 2; svyttest(owns_home ~ late, sp)
        rel(0.60225512136340165, d.shareBaseline(), "pooled share");
        rel(0.00811417996618379, d.standardErrorBaseline(), "pooled SE");
        rel(-0.102469407077686, d.shareDifference().estimate(), "difference");
        rel(-7.225858916041397, owns.statistic(), "t");
        assertEquals(4000L, owns.nBaseline());
        assertEquals(Verdict.MATERIAL, owns.verdict(), owns.sentence());
    }
}
