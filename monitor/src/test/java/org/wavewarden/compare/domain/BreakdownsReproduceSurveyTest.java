package org.wavewarden.compare.domain;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.profile.WaveProfile;

import java.util.List;
import java.util.Map;
import java.util.Set;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A breakdown reproduces R's survey package 4.1.1 (R 4.2.2) on R survey's own {@code api} data: wave 1 is
 * {@code apistrat}, wave 2 {@code apiclus2}, the domains are the school types E, H and M (see {@link DomainWaves}).
 *
 * <p>Per wave {@code d} is one of three designs made of the wave's rows:
 * <ul>
 * <li>design: {@code svydesign(ids = ~psu, strata = ~stratum, weights = ~w, nest = TRUE)} (wave 1 stratified by
 * school type, each school its PSU; wave 2 the districts as PSUs, with replacement: no fpc);</li>
 * <li>weights: {@code svydesign(ids = ~1, weights = ~w)};</li>
 * <li>unweighted: {@code svydesign(ids = ~1)}.</li>
 * </ul>
 * Measures: {@code yes} the SHARE of {@code sch.wide == "Yes"}, {@code api00} the MEAN of api00, {@code acs.46}
 * the MEAN of acs.46 (NULL in many rows; no high school of wave 2 has an answer, so H is left out and E and M are
 * compared), {@code na46} the RATE of NULL in acs.46 (always unweighted). The R calls are named above each table;
 * the script read the committed CSV back with {@code read.csv}, so both sides start from the same doubles.
 * Agreement is required to 1e-9 relative.
 */
class BreakdownsReproduceSurveyTest {

    private static final Map<String, List<DomainWaves.Row>> API = DomainWaves.read("domain/api_two_waves.csv");

    static DomainMeasure measure(String name) {
        return switch (name) {
            case "yes" -> new DomainMeasure(DomainMeasure.Kind.SHARE, "sch.wide", Set.of("Yes"), Set.of(),
                    "share answering Yes", "points");
            case "api00" -> new DomainMeasure(DomainMeasure.Kind.MEAN, "api00", Set.of(), Set.of(), "mean", "points");
            case "acs.46" -> new DomainMeasure(DomainMeasure.Kind.MEAN, "acs.46", Set.of(), Set.of(), "mean",
                    "pupils");
            case "na46" -> new DomainMeasure(DomainMeasure.Kind.RATE, "acs.46", Set.of(DomainMeasure.NULL), Set.of(),
                    "share of NULL", "points");
            default -> throw new IllegalArgumentException(name);
        };
    }

    static WaveProfile wave(String wave, String kind) {
        return DomainWaves.profile(wave, API.get(wave), "stype", 10, kind.equals("design"));
    }

    static Breakdown breakdown(String kind, String measure) {
        return Breakdowns.of("stype", measure(measure), wave("1", kind), wave("2", kind), !kind.equals("unweighted"),
                0.95).orElseThrow();
    }

    static void close(double expected, double actual, String what) {
        assertEquals(expected, actual, 1e-9 * Math.max(1e-300, Math.abs(expected)), what);
    }

    /**
     * Each domain's estimate in each wave, the SE of its change, its Wald z p-value and BH q-value over the
     * breakdown's domains, and its share of the measure's base in each wave. R, per wave {@code d}:
     * <pre>
     * by &lt;- svyby(~y, ~stype, subset(d, !is.na(y)), svymean, covmat = TRUE)   # before, after (coef)
     * se &lt;- sqrt(diag(vcov(by1)) + diag(vcov(by2)))                           # independent waves
     * p &lt;- 2 * pnorm(-abs(change / se)); q &lt;- p.adjust(p, "BH")
     * share &lt;- tapply(w[!is.na(y)], stype[!is.na(y)], sum) / sum(w[!is.na(y)])  # weight 1 when unweighted
     * </pre>
     * ({@code subset(d, !is.na(y))} is domain estimation over every PSU, as {@code na.rm = TRUE}; checked equal in
     * SE to {@code svyby(..., na.rm = TRUE)}, which refuses {@code covmat = TRUE} with NAs.)
     */
    @ParameterizedTest(name = "{0} {1} {2}")
    @CsvSource({
            "design,yes,E,0.91000000000000003,0.93066088840736727,0.048903910796092444,0.67267523050895406,0.67267523050895406,0.71375523706774757,0.68118081180811807",
            "design,yes,H,0.52000000000000002,0.14835164835164835,0.11270889546531321,0.00097578128700747389,0.0029273438610224215,0.12189215760224134,0.13431734317343172",
            "design,yes,M,0.70000000000000007,0.52800000000000002,0.20051646015834268,0.39101122644566189,0.58651683966849277,0.16435260533001114,0.18450184501845018",
            "design,api00,E,674.42999999999995,692.81040086673897,32.770418637501059,0.57487667255783981,0.86231500883675971,0.71375523706774757,0.68118081180811807",
            "design,api00,H,625.82000000000005,598.34065934065927,22.951096994352593,0.23118977638084637,0.6935693291425391,0.12189215760224134,0.13431734317343172",
            "design,api00,M,636.60000000000002,642.35199999999998,48.296399847343181,0.90519779116933019,0.90519779116933019,0.16435260533001114,0.18450184501845018",
            "design,acs.46,E,28.744897959183671,28.989864864864867,0.97905316260658959,0.80242652101872292,0.80242652101872292,0.85708463443019201,0.79498657117278415",
            "design,acs.46,M,29.147058823529409,28.213973799126638,1.0895063749260239,0.39176044368049001,0.78352088736098002,0.13694110608707119,0.20501342882721574",
            "weights,yes,E,0.91000000000000003,0.93066088840736727,0.040317888920119588,0.60833634416930105,0.60833634416930105,0.71375523706774757,0.68118081180811807",
            "weights,yes,H,0.52000000000000002,0.14835164835164835,0.10241314501543443,0.00028461758005499235,0.00085385274016497705,0.12189215760224134,0.13431734317343172",
            "weights,yes,M,0.70000000000000007,0.52800000000000002,0.19688237527463495,0.38232628413352487,0.57348942620028731,0.16435260533001114,0.18450184501845018",
            "weights,api00,E,674.42999999999995,692.81040086673897,28.352271319514387,0.51679952423087183,0.77519928634630775,0.71375523706774757,0.68118081180811807",
            "weights,api00,H,625.82000000000005,598.34065934065927,33.667431549805698,0.41438604510333893,0.77519928634630775,0.12189215760224134,0.13431734317343172",
            "weights,api00,M,636.60000000000002,642.35199999999998,47.527984970554854,0.90367247317472066,0.90367247317472066,0.16435260533001114,0.18450184501845018",
            "weights,acs.46,E,28.744897959183671,28.989864864864867,0.68572298514898966,0.72091298763071188,0.72091298763071188,0.85708463443019201,0.79498657117278415",
            "weights,acs.46,M,29.147058823529409,28.213973799126638,1.0937207628862948,0.39358770831010542,0.72091298763071188,0.13694110608707119,0.20501342882721574",
            "unweighted,yes,E,0.91000000000000003,0.90361445783132532,0.043368791920550667,0.88294402247455728,0.88294402247455728,0.5,0.65873015873015872",
            "unweighted,yes,H,0.52000000000000002,0.25,0.12027919781548124,0.02478243963651414,0.074347318909542423,0.25,0.15873015873015872",
            "unweighted,yes,M,0.70000000000000007,0.82608695652173914,0.10255477058336636,0.21889950216234835,0.32834925324352254,0.25,0.18253968253968253",
            "unweighted,api00,E,674.42999999999995,727.67469879518069,19.458640114086656,0.0062134139827542479,0.018640241948262744,0.5,0.65873015873015872",
            "unweighted,api00,H,625.81999999999994,614.20000000000005,27.259906717581703,0.669913265317861,0.669913265317861,0.25,0.15873015873015872",
            "unweighted,api00,M,636.60000000000002,695.60869565217388,29.624192607980216,0.046381044132102006,0.069571566198153009,0.25,0.18253968253968253",
            "unweighted,acs.46,E,28.744897959183675,27.368421052631579,0.5193684342076067,0.0080422734319404235,0.015545360713228137,0.73134328358208955,0.79166666666666663",
            "unweighted,acs.46,M,29.147058823529413,27,0.88742777416354546,0.015545360713228137,0.015545360713228137,0.2537313432835821,0.20833333333333334",
            "unweighted,na46,E,0.02,0.084337349397590369,0.033687455411607573,0.05615496600115602,0.08423244900173403,0.5,0.65873015873015872",
            "unweighted,na46,H,0.95999999999999996,1,0.027782355848315149,0.14993454406292014,0.14993454406292014,0.25,0.15873015873015872",
            "unweighted,na46,M,0.32000000000000001,0.13043478260869565,0.096667947448570046,0.049879780196899176,0.08423244900173403,0.25,0.18253968253968253"
    })
    void eachDomainAsSvyby(String kind, String measure, String domain, double before, double after, double se,
                           double p, double q, double shareBefore, double shareAfter) {
        Breakdown b = breakdown(kind, measure);
        DomainChange d = b.domains().stream().filter(x -> x.domain().equals(domain)).findFirst().orElseThrow();
        close(before, d.before(), "before");
        close(after, d.after(), "after");
        close(after - before, d.change(), "change");
        close(se, d.se(), "se");
        close(p, d.pValue(), "p");
        close(q, d.qValue(), "q");
        close(shareBefore, d.shareBefore(), "share before");
        close(shareAfter, d.shareAfter(), "share after");
        // The interval is change -/+ qnorm(0.975) se; qnorm(0.975) = 1.959963984540054 (R 4.2.2).
        close(after - before - 1.959963984540054 * se, d.ciLow(), "ciLow");
        close(after - before + 1.959963984540054 * se, d.ciHigh(), "ciHigh");
    }

    /**
     * The covariance of two domains' estimates within one wave: {@code vcov(svyby(~y, ~stype, subset(d,
     * !is.na(y)), svymean, covmat = TRUE))[a, b]}. With weights only or none R leaves rounding of about 1e-30
     * where the exact value is 0 (no respondent is in two domains), so the check is to 1e-9 of the two SEs'
     * product.
     */
    @ParameterizedTest(name = "{0} {1} wave {2} {3}-{4}")
    @CsvSource({
            "design,yes,1,E,H,0",
            "design,yes,1,E,M,0",
            "design,yes,1,H,M,0",
            "design,yes,2,E,H,0.00021336805739010194",
            "design,yes,2,E,M,-0.0034848407825968162",
            "design,yes,2,H,M,0.0048718446613966468",
            "design,api00,1,E,H,0",
            "design,api00,1,E,M,0",
            "design,api00,1,H,M,0",
            "design,api00,2,E,H,219.87057209083963",
            "design,api00,2,E,M,1221.8645647716105",
            "design,api00,2,H,M,294.33909067293308",
            "design,acs.46,1,E,M,0",
            "design,acs.46,2,E,M,-0.43381770145006515",
            "weights,yes,1,E,H,-1.4294011305999016e-35",
            "weights,yes,1,E,M,7.4368506620756291e-36",
            "weights,yes,1,H,M,-3.9120451995365728e-35",
            "weights,yes,2,E,H,-3.8379890554347687e-36",
            "weights,yes,2,E,M,4.3610840415506867e-36",
            "weights,yes,2,H,M,8.4601559898952341e-36",
            "weights,api00,1,E,H,1.334284265471477e-29",
            "weights,api00,1,E,M,7.5901451567112333e-30",
            "weights,api00,1,H,M,-6.3601910483444077e-30",
            "weights,api00,2,E,H,4.5408805856784492e-29",
            "weights,api00,2,E,M,2.4491665916783601e-29",
            "weights,api00,2,H,M,-2.694179972882223e-29",
            "weights,acs.46,1,E,M,-2.7783242177934707e-32",
            "weights,acs.46,2,E,M,-8.7382149915833363e-33",
            "unweighted,yes,1,E,H,3.76158192263132e-37",
            "unweighted,yes,1,E,M,-3.0484644351505669e-35",
            "unweighted,yes,1,H,M,-6.770847460736376e-36",
            "unweighted,yes,2,E,H,-6.8178672347692675e-36",
            "unweighted,yes,2,E,M,3.197344634236622e-36",
            "unweighted,yes,2,H,M,4.2774560148779022e-37",
            "unweighted,api00,1,E,H,-1.8068304366263292e-29",
            "unweighted,api00,1,E,M,6.7996023061420117e-30",
            "unweighted,api00,1,H,M,9.7636944460655309e-30",
            "unweighted,api00,2,E,H,1.2769685903265129e-29",
            "unweighted,api00,2,E,M,-1.1832913578315177e-29",
            "unweighted,api00,2,H,M,1.9929835908910846e-29",
            "unweighted,acs.46,1,E,M,-6.5098366216079032e-33",
            "unweighted,acs.46,2,E,M,-4.6142071584277511e-35",
            "unweighted,na46,1,E,H,1.431899056095399e-36",
            "unweighted,na46,1,E,M,-6.8971215448445569e-37",
            "unweighted,na46,1,H,M,1.897247882227172e-35",
            "unweighted,na46,2,E,H,0",
            "unweighted,na46,2,E,M,7.9933615855915551e-36",
            "unweighted,na46,2,H,M,0"
    })
    void covarianceBetweenDomainsAsSvybyCovmat(String kind, String measure, String wave, String a, String b,
                                               double covariance) {
        List<String> domains = List.of(a, b);
        double[][] v = Breakdowns.covariance("stype", measure(measure), wave(wave, kind), domains,
                !kind.equals("unweighted")).orElseThrow();
        double scale = Math.sqrt(v[0][0] * v[1][1]);
        assertEquals(covariance, v[0][1], 1e-9 * scale, "covariance");
        assertEquals(v[0][1], v[1][0], 0.0, "symmetric");
    }

    /**
     * The heterogeneity test and the overall change. R, on the two waves stacked (wave-specific strata and PSUs;
     * for weights and unweighted {@code svydesign(ids = ~1, strata = ~wave, ...)}), {@code st} restricted to the
     * compared domains with {@code subset}:
     * <pre>
     * fit &lt;- svyglm(y ~ stype * wave, design = st)
     * regTermTest(fit, ~stype:wave, method = "Wald", df = Inf)    # chisq, df, p
     * coef(svymean(~y, d2, na.rm = TRUE)) - coef(svymean(~y, d1, na.rm = TRUE))   # overall
     * </pre>
     * svyglm's and svyby's variances agree here without any factor (the Wald statistic from svyby's covariances
     * differs from regTermTest's by less than 1e-13 relative): the model is saturated in domain by wave, so its
     * coefficients are the cell means and its sandwich variance is their linearised variance.
     */
    @ParameterizedTest(name = "{0} {1}")
    @CsvSource({
            "design,yes,10.681585746479028,2,0.0047920696998089317,-0.076656498500694559",
            "design,api00,2.0634009112152278,2,0.35640040194025913,8.5244449587603413",
            "design,acs.46,0.46057487498836386,1,0.49735542710588165,0.026315288781574964",
            "weights,yes,13.192918298419894,2,0.0013651934357543488,-0.076656498500694559",
            "weights,api00,1.10057219119218,2,0.57678477119019034,8.5244449587603413",
            "weights,acs.46,0.83279651090569207,1,0.36146513324265905,0.026315288781574964",
            "unweighted,yes,6.4265592430864809,2,0.040224475652861642,0.02571428571428569",
            "unweighted,api00,4.4287462398179107,2,0.10922196186539659,50.989523809523803",
            "unweighted,acs.46,0.56163097243832771,1,0.45360384445481361,-1.566542288557212",
            "unweighted,na46,6.1572481225101816,2,0.046022537296118292,-0.091904761904761934"
    })
    void heterogeneityAsRegTermTestOfTheInteraction(String kind, String measure, double chisq, int df, double p,
                                                    double overall) {
        Breakdown b = breakdown(kind, measure);
        close(chisq, b.statistic(), "chi-square");
        assertEquals(df, b.df(), "df");
        close(p, b.pValue(), "p");
        close(overall, b.overall(), "overall change");
        double sum = b.composition();
        for (DomainChange d : b.domains()) {
            sum += d.contribution();
            close((d.shareBefore() + d.shareAfter()) / 2 * d.change(), d.contribution(), "Kitagawa contribution");
        }
        close(b.overall(), sum, "contributions and composition add up to the overall change");
        for (int i = 1; i < b.domains().size(); i++) {
            assertTrue(Math.abs(b.domains().get(i - 1).contribution()) >= Math.abs(b.domains().get(i).contribution()),
                    "ranked by |contribution|");
        }
    }

    /**
     * The first-ranked domain (largest |Kitagawa contribution| from R's shares and changes above) and the change
     * over every other domain pooled, its own estimate of the pooled rows, not an average of the domains'. R:
     * {@code coef(svymean(~y, subset(d2, stype != first), na.rm = TRUE)) - coef(svymean(~y, subset(d1, stype !=
     * first), na.rm = TRUE))}; for acs.46 the pooled rows hold wave 1's two high schools with an answer.
     */
    @ParameterizedTest(name = "{0} {1} beside {2}")
    @CsvSource({
            "design,yes,H,-0.025852694335641302",
            "design,api00,E,-8.1993466941345332",
            "design,acs.46,E,-0.94783894650185019",
            "weights,yes,H,-0.025852694335641302",
            "weights,api00,E,-8.1993466941345332",
            "weights,acs.46,E,-0.94783894650185019",
            "unweighted,yes,H,0.046792452830188513",
            "unweighted,api00,E,26.534186046511536",
            "unweighted,acs.46,E,-2.1666666666666679",
            "unweighted,na46,M,-0.071197411003236288"
    })
    void elsewhereIsThePooledRestAsSvymeanOfTheSubset(String kind, String measure, String first, double elsewhere) {
        Breakdown b = breakdown(kind, measure);
        assertEquals(first, b.domains().get(0).domain(), "first-ranked domain");
        close(elsewhere, b.elsewhere(), "elsewhere");
    }

    /** The breakdown says how it was made: apistrat has 200 schools in 3 strata, apiclus2 40 districts. */
    @ParameterizedTest(name = "{0} {1}")
    @CsvSource(delimiter = '|', value = {
            "design|yes|design-based (linearised over all 200 and 40 PSUs of the waves, in 3 and 1 strata, with replacement)",
            "weights|api00|weighted (linearised, each respondent a PSU)",
            "unweighted|api00|unweighted",
            "design|na46|unweighted (a share of rows)",
    })
    void theMethodIsNamed(String kind, String measure, String method) {
        assertEquals(method, breakdown(kind, measure).method());
    }
}
