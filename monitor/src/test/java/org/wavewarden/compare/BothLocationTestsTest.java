package org.wavewarden.compare;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.compare.location.LocationTestChoice;
import org.wavewarden.profile.NumericDistribution;

import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

/**
 * A continuous variable's detail holds both location tests and all four effects, whichever test is primary, and
 * the normality numbers the choice was made on, so a reader can reproduce each. Reference values: R 4.2.2 (Debian
 * r-base-core), base R only, {@code b} the baseline and {@code c} the current wave:
 * <pre>
 * w &lt;- t.test(c, b); m &lt;- wilcox.test(c, b)
 * h &lt;- wilcox.test(c, b, conf.int = TRUE, exact = FALSE, correct = TRUE)
 * c(w$statistic, w$parameter, w$p.value, w$estimate[1] - w$estimate[2], w$conf.int, m$statistic, m$p.value,
 *   h$estimate, h$conf.int, hg(b, c), cliff(c, b), shapiro.test(b)[1:2], shapiro.test(c)[1:2])
 * </pre>
 * with {@code hg} the Hedges' g function quoted in {@code HedgesGTest} and {@code cliff} the Cliff's delta
 * function quoted in {@code CliffsDeltaTest}. R's Hodges-Lehmann estimate and limits come from {@code uniroot}
 * with its default tolerance 1e-4 on a step function, so R lands within about 1e-4 of the exact jump computed here
 * (as in {@code HodgesLehmannTest}): that is the tolerance used for them.
 */
class BothLocationTestsTest {

    static Stream<Arguments> waves() {
        return Stream.of(
                Arguments.of("near-normal waves: Welch's t is primary",
                        new double[] {10.1, 11.3, 9.8, 10.7, 12.0, 10.4, 11.1, 9.5, 10.9, 11.6},
                        new double[] {11.2, 12.4, 10.9, 11.8, 12.9, 11.5, 12.2, 10.6, 13.1, 11.9}, "Welch t",
                        new double[] {3.0591683946415174, 17.983307531089537, 0.0067612880516137444,
                                1.1099999999999994, 0.34764293652221845, 1.8723570634777804,
                                82.5, 0.015525521661179783,
                                1.0999999999999996, 0.20003664976621444, 1.9999569127761045,
                                1.3101577019442883, 0.35490745829361697, 2.2365188552576027,
                                0.65000000000000002, 0.20058892456248195, 0.87340295380476674,
                                0.98417312408482061, 0.98356110615387193, 0.97472749237732859,
                                0.93088667614136855}),
                Arguments.of("skewed waves: Mann-Whitney is primary",
                        new double[] {1.2, 1.5, 1.1, 1.9, 2.3, 1.4, 1.7, 9.8, 1.3, 2.1, 1.6, 14.2},
                        new double[] {2.2, 2.8, 1.8, 3.1, 2.5, 19.5, 2.9, 2.4, 3.6, 2.0, 25.1, 2.6}, "Mann-Whitney U",
                        new double[] {0.99439033227980855, 16.831457143977826, 0.33411448073853467,
                                2.5333333333333332, -2.8457878275022921, 7.9124544941689594,
                                118, 0.0068117371926767539,
                                1.0000010241820116, 0.39998129384146053, 1.6999985912324962,
                                0.3919325664551509, -0.3934403432064702, 1.1686388127216198,
                                0.63888888888888884, 0.15986885554268179, 0.87436825178585786,
                                0.56820006402435252, 5.8982360787510238e-05, 0.5455625856884484,
                                3.9095361749334898e-05}));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("waves")
    void theDetailHoldsBothTestsBothEffectsAndTheNormalityNumbersAsRGivesThem(String name, double[] b, double[] c,
                                                                             String primary, double[] r) {
        Comparison cmp = new VariableComparator(0.95).numeric("x", false, NumericDistribution.ofSample(b),
                NumericDistribution.ofSample(c), null, null);
        var d = (VariableComparator.LocationDetail) cmp.detail();
        VariableComparator.BothTests both = d.bothTests();
        assertEquals(primary, both.primary());
        assertEquals(primary.equals("Welch t") ? "Welch t" : "Mann-Whitney U", cmp.test().test());

        close(r[0], both.welch().statistic(), 1e-10, "Welch t");
        close(r[1], both.welch().df(), 1e-10, "Welch df");
        assertEquals(TestResult.DF_WELCH, both.welch().dfConvention());
        close(r[2], both.welch().pValue(), 1e-9, "Welch p");
        close(r[3], both.meanDifference().estimate(), 1e-12, "mean difference");
        close(r[4], both.meanDifference().ciLow(), 1e-9, "mean difference low");
        close(r[5], both.meanDifference().ciHigh(), 1e-9, "mean difference high");
        close(r[6], both.mannWhitney().statistic(), 0, "W");
        close(r[7], both.mannWhitney().pValue(), 1e-9, "Mann-Whitney p");
        close(r[8], both.hodgesLehmann().estimate(), 1e-4, "Hodges-Lehmann shift");
        close(r[9], both.hodgesLehmann().ciLow(), 1e-4, "Hodges-Lehmann low");
        close(r[10], both.hodgesLehmann().ciHigh(), 1e-4, "Hodges-Lehmann high");
        close(r[11], both.hedgesG().estimate(), 1e-9, "Hedges' g");
        close(r[12], both.hedgesG().ciLow(), 1e-6, "Hedges' g low");
        close(r[13], both.hedgesG().ciHigh(), 1e-6, "Hedges' g high");
        close(r[14], both.cliffsDelta().estimate(), 1e-12, "Cliff's delta");
        close(r[15], both.cliffsDelta().ciLow(), 1e-10, "Cliff's delta low");
        close(r[16], both.cliffsDelta().ciHigh(), 1e-10, "Cliff's delta high");

        LocationTestChoice.Normality n = d.normality();
        assertEquals("Shapiro-Wilk", n.method());
        close(r[17], n.wBaseline(), 1e-9, "Shapiro-Wilk W baseline");
        close(r[18], n.pBaseline(), 1e-7, "Shapiro-Wilk p baseline");
        close(r[19], n.wCurrent(), 1e-9, "Shapiro-Wilk W current");
        close(r[20], n.pCurrent(), 1e-7, "Shapiro-Wilk p current");
        assertEquals(LocationTestChoice.SHAPIRO_WILK_LEVEL, n.level());
        assertNull(n.skewnessBaseline(), "the moments rule was not used");

        // The finding's own test is one of the pair, with its df where it has one.
        TestResult own = primary.equals("Welch t") ? both.welch() : both.mannWhitney();
        assertEquals(own, cmp.test());
    }

    private static void close(double expected, double actual, double relative, String what) {
        assertEquals(expected, actual, relative * Math.max(1, Math.abs(expected)), what);
    }
}
