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

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A stratified cluster sample on a real PostgreSQL server: 4 strata of 6 PSUs, 30 households a PSU, and an answer
 * that depends strongly on the PSU (a neighbourhood effect). Wave 2 raises the answer by 2 points everywhere. The
 * weights alone (each household its own PSU) would call that shift a sure thing (SE of a wave mean 0.263); the
 * design, with only 24 PSUs a wave, knows the neighbourhoods could explain it (SE 1.139), and the verdict is
 * UNCERTAIN instead of MATERIAL.
 *
 * <p>Reference values: R 4.2.2 (Debian r-base-core) with survey 4.1.1 (Debian r-cran-survey), the same rows built
 * from the same integer formulas:
 * <pre>
 * library(survey); options(survey.lonely.psu = "adjust")
 * mk &lt;- function(wave, shift) {
 *   g &lt;- 1:720
 *   data.frame(wave = wave, stratum = g %% 4, psu = (g %/% 4) %% 6, wt = 1 + ((g * 7) %% 5),
 *              y = ((g %/% 4) %% 6) * 3 + (g %% 4) * 2 + ((g * 13) %% 11) + shift,
 *              cat = c("a", "b", "c")[1 + ((((g %/% 4) %% 6) + (g * 5) %% 7 + (if (shift &gt; 0) (g %% 3 == 0) else 0)) %% 3)],
 *              flag = as.integer(((g %/% 4) %% 6) &gt;= 3 - (if (shift &gt; 0) (g %% 5 == 0) else 0)))
 * }
 * a &lt;- mk("w1", 0); b &lt;- mk("w2", 2)
 * for (d in list(a, b)) {
 *   des &lt;- svydesign(ids = ~psu, strata = ~stratum, weights = ~wt, data = d, nest = TRUE)
 *   print(c(coef(svymean(~y, des)), SE(svymean(~y, des)), coef(svymean(~flag, des)), SE(svymean(~flag, des)), degf(des)))
 *   print(SE(svymean(~y, svydesign(ids = ~1, weights = ~wt, data = d))))
 * }
 * st &lt;- rbind(a, b); st$sw &lt;- paste(st$wave, st$stratum)
 * des &lt;- svydesign(ids = ~psu, strata = ~sw, weights = ~wt, data = st, nest = TRUE)
 * svychisq(~cat + wave, des, statistic = "F"); svychisq(~cat + wave, des, statistic = "Chisq"); svyttest(y ~ wave, des)
 * se &lt;- sqrt(2) * 1.13860010265175; t &lt;- 2 / se; 2 * pt(-t, 40)
 * p &lt;- c(0.25, 0.30, 0.45)    # the reference shares of cat in wave 2, "c" taking the rest
 * svygofchisq(~cat, p, svydesign(ids = ~psu, strata = ~stratum, weights = ~wt, data = b, nest = TRUE))
 * svygofchisq(~cat, p, svydesign(ids = ~1, weights = ~wt, data = b))
 * </pre>
 * gives: y 15.5023148148148 (w1) and 17.5023148148148 (w2), SE 1.13860010265175 in both (weights only:
 * 0.263477531699468); flag 0.5 (SE 0.11180339887499) and 0.511111111111111 (SE 0.10943175335329); degf 20 a wave;
 * Rao-Scott F = 0.10804 on 1.9908 and 79.6325 df, p = 0.8969; first order X2 = 0.15618, p = 0.8976; svyttest
 * difference 2, t = 1.2421 (on its 39 df; on the design's 20 + 20 = 40 df, t = 1.24206344183481 and
 * p = 0.221446454566596). svygofchisq: X2 = 123.103703703704 on the weighted totals; with the design scale
 * 1.92006888631977, df 1.99463436871122, p = 1.18311034298895e-14; with the weights alone scale 3.99525198376937,
 * df 1.95226053502731, p = 1.87921871694695e-07; weighted shares 0.32361, 0.34167, 0.33472.
 */
class DesignJudgeIntegrationTest {

    static Session session;
    static WardenConfig config;

    @BeforeAll
    static void setUp() throws Exception {
        String url = TestDatabase.freshDatabase("design_judge");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA survey;
                    CREATE TABLE survey.sample AS
                    SELECT w.wave, g AS household_id, (g % 4)::text AS stratum, (g / 4) % 6 AS psu,
                           1 + ((g * 7) % 5) AS wt,
                           ((g / 4) % 6) * 3 + (g % 4) * 2 + ((g * 13) % 11) + w.shift AS y,
                           (ARRAY['a', 'b', 'c'])[1 + ((((g / 4) % 6) + (g * 5) % 7
                               + CASE WHEN w.shift > 0 AND g % 3 = 0 THEN 1 ELSE 0 END) % 3)] AS cat,
                           CASE WHEN ((g / 4) % 6) >= 3 - CASE WHEN w.shift > 0 AND g % 5 = 0 THEN 1 ELSE 0 END
                                THEN 1 ELSE 0 END AS flag
                    FROM (VALUES ('w1', 0), ('w2', 2)) w(wave, shift), generate_series(1, 720) g;
                    """);
        }
        String variables = """
                    variables:
                      - {name: y, kind: continuous, unit: points, threshold: {raw: 1.0}}
                      - {name: cat, kind: categorical, reference: {shares: {a: 0.25, b: 0.30}}}
                      - {name: flag, kind: binary, successValue: "1"}
                """;
        config = ConfigLoader.parse("source:\n  jdbcUrl: \"" + url + "\"\n  user: postgres\n"
                + "results:\n  schema: design_results\ndatasets:\n"
                + "  - name: design\n    table: survey.sample\n    waveColumn: wave\n    exclude: [household_id]\n"
                + "    weightColumn: wt\n    design: {strata: stratum, clusters: psu}\n" + variables
                + "  - name: weights-only\n    table: survey.sample\n    waveColumn: wave\n"
                + "    exclude: [household_id, stratum, psu]\n    weightColumn: wt\n" + variables);
        session = Session.open(config, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void tearDown() {
        session.close();
    }

    private static Finding shift(int dataset, String variable) {
        List<Finding> f = new WaveJudge(session, Clock.systemUTC()).judge(config.datasets().get(dataset), "w2", null,
                null, null).report().findings();
        return f.stream().filter(x -> x.variable().equals(variable) && x.kind() == FindingKind.SHIFT).findFirst()
                .orElseThrow(() -> new AssertionError("no SHIFT for " + variable + ": " + f));
    }

    private static void rel(double expected, double actual, double tolerance, String what) {
        assertEquals(expected, actual, tolerance * Math.abs(expected), what);
    }

    @Test
    void theClusterDesignTurnsASureShiftIntoAnUncertainOne() {
        Finding weightsOnly = shift(1, "y");
        assertEquals(Verdict.MATERIAL, weightsOnly.verdict(), weightsOnly.sentence());
        assertTrue(!weightsOnly.test().contains("cluster"), weightsOnly.test());

        Finding design = shift(0, "y");
        assertEquals(WeightedComparator.MEANS_TEST + WeightedComparator.WITH_DESIGN, design.test());
        rel(1.24206344183481, design.statistic(), 1e-9, "design-based t");
        rel(0.221446454566596, design.pValue(), 1e-9, "p on 40 design df");
        assertEquals(Verdict.UNCERTAIN, design.verdict(), design.sentence());
        var d = (WeightedComparator.LocationDetail) design.detail();
        rel(15.5023148148148, d.meanBaseline(), 1e-12, "weighted mean w1");
        rel(17.5023148148148, d.meanCurrent(), 1e-12, "weighted mean w2");
        rel(1.13860010265175, d.standardErrorBaseline(), 1e-9, "svymean SE w1");
        rel(1.13860010265175, d.standardErrorCurrent(), 1e-9, "svymean SE w2");
        rel(2.0, design.effect().estimate(), 1e-12, "difference of weighted means");
    }

    @Test
    void theDesignBasedTFindingStatesItsDfAndWhatSvyttestWouldSay() {
        Finding design = shift(0, "y");
        assertEquals(40.0, design.df(), "degf 20 a wave, as R survey's degf of the stacked design");
        assertEquals(org.wavewarden.compare.design.DesignMeanDifference.DF_DESIGN, design.dfConvention());
        var r = ((WeightedComparator.LocationDetail) design.detail()).reproduce();
        assertEquals(39.0, r.svyttest().df(), "svyttest's df, degf - 1");
        // R 4.2.2: 2 * pt(-1.24206344183481, 39), the svyttest p of the same t
        rel(0.221630633072193, r.svyttest().pValue(), 1e-9, "svyttest p");
        assertNotNull(shift(1, "y").df(), "the weights-only finding states its df too");
    }

    @Test
    void categoriesGetTheRaoScottCorrectionOfTheStackedDesign() {
        Finding f = shift(0, "cat");
        assertEquals(WeightedComparator.CATEGORIES_TEST + WeightedComparator.WITH_DESIGN, f.test());
        rel(0.10804, f.statistic(), 1e-4, "Rao-Scott F");
        rel(0.8969, f.pValue(), 1e-4, "its p");
        var d = (WeightedComparator.CategoryDetail) f.detail();
        // R prints the Pearson X2 of the weighted table with statistic = "Chisq", and takes its p-value from that X2
        // over the mean generalised design effect, the first-order statistic: F x its numerator df (1.9908 is the
        // Satterthwaite df of the second order; the first order's df are (r - 1)(c - 1) = 2).
        rel(0.15618, d.pearsonChiSquare(), 1e-4, "Pearson X2 of the weighted table");
        rel(0.10804 * 2, d.firstOrder().statistic(), 1e-4, "first-order X2 = X2 / mean design effect");
        rel(0.8976, d.firstOrder().pValue(), 1e-4, "its p");
        rel(79.6325, d.denominatorDf(), 1e-6, "denominator df");
    }

    @Test
    void benchmarkSharesAreTestedAsRsSvygofchisqTestsThem() {
        for (int dataset : new int[] {0, 1}) {
            List<Finding> f = new WaveJudge(session, Clock.systemUTC()).judge(config.datasets().get(dataset), "w2",
                    null, null, null).report().findings();
            Finding r = f.stream().filter(x -> x.variable().equals("cat") && x.kind() == FindingKind.REFERENCE)
                    .findFirst().orElseThrow(() -> new AssertionError("no REFERENCE finding: " + f));
            boolean design = dataset == 0;
            assertEquals(org.wavewarden.compare.design.DesignGoodnessOfFit.NAME
                    + (design ? WeightedComparator.WITH_DESIGN : ""), r.test());
            rel(123.103703703704, r.statistic(), 1e-9, "X2 on the weighted totals");
            // the p-value rests on the Satterthwaite scale and df, so it checks them too
            rel(design ? 1.18311034298895e-14 : 1.87921871694695e-07, r.pValue(), 1e-6, "p");
            double w = Math.sqrt(Math.pow(0.323611111 - 0.25, 2) / 0.25 + Math.pow(0.341666667 - 0.30, 2) / 0.30
                    + Math.pow(0.334722222 - 0.45, 2) / 0.45);
            rel(w, r.effect().estimate(), 1e-6, "Cohen's w of the weighted shares");
            assertEquals(Verdict.MATERIAL, r.verdict(), r.sentence());
        }
    }

    @Test
    void aBinaryShareGetsItsDesignStandardErrors() {
        Finding f = shift(0, "flag");
        assertEquals(WeightedComparator.SHARES_TEST + WeightedComparator.WITH_DESIGN, f.test());
        var d = (WeightedComparator.ProportionDetail) f.detail();
        rel(0.5, d.shareBaseline(), 1e-12, "share w1");
        rel(0.511111111111111, d.shareCurrent(), 1e-12, "share w2");
        rel(0.11180339887499, d.standardErrorBaseline(), 1e-9, "svymean SE w1");
        rel(0.10943175335329, d.standardErrorCurrent(), 1e-9, "svymean SE w2");
    }
}
