package org.wavewarden.compare.proportion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.EffectSize;

/**
 * References: R 4.2.2 (Debian r-base-core), the script test/resources/proportion/paired-cohens-h.R, which prints the
 * rows of {@link #bothIntervalsMatchNewcombesMethodTenAndItsMappingOntoHAsInR}: Newcombe's (1998) method 10 from
 * the Wilson limits of {@code prop.test(x, n, conf.level = conf, correct = FALSE)$conf.int}, and the same limits
 * carried onto the h scale at the observed mean share (shifted as little as keeps both shares in [0, 1]).
 */
class PairedProportionsTest {

    /*
     * Rows: 794 / 150 / 86 / 570, Agresti (2007), section 10.1 (presidential approval); 1 / 1 / 7 / 12 and
     * 59 / 6 / 16 / 80, the tables Fagerland, Lydersen and Laake (2013) use (Bentur et al. 2009; Cavo et al.
     * 2012); 0 / 4 / 0 / 27, a share falling to none; 12 / 0 / 0 / 19, no discordant pair; 0 / 0 / 0 / 30, no yes
     * at either wave; 3 / 9 / 1 / 2, a negative cross product; 20 / 20 / 30 / 30, uncorrelated answers;
     * 0 / 1 / 6 / 3; 0 / 0 / 5 / 0, from none to all.
     */
    @ParameterizedTest(name = "{0} / {1} / {2} / {3} at {4}")
    @CsvSource({
            "794, 150, 86, 570, 0.95, -0.080819030084987808, -0.1186493017913528, -0.04288666659554341, -0.039999999999999925, -0.058703872895728836, -0.021230423982877056",
            "1, 1, 7, 12, 0.95, 0.70293633710244652, 0.060028778133951688, 1.5846372220805458, 0.2857142857142857, 0.025559124164859892, 0.5069202266861409",
            "59, 6, 16, 80, 0.95, 0.12538038470637791, 0.0093299701069280427, 0.23989153443071687, 0.062111801242236031, 0.0046251139330500748, 0.11862119563870993",
            "0, 4, 0, 27, 0.95, -0.73484380923960335, -1.1340958808259354, 0.023798266436095061, -0.12903225806451613, -0.28852406256306418, 0.0058450837140267831",
            "12, 0, 0, 19, 0.95, 0, -0.13279108458640665, 0.13279108458640665, 0, -0.064625500989950638, 0.064625500989950638",
            "0, 0, 0, 30, 0.95, 0, -0.6872820921738535, 0.6872820921738535, 0, -0.11351339317396873, 0.11351339317396873",
            "3, 9, 1, 2, 0.95, -1.1290192310888756, -1.6919094618974384, -0.32873781354152243, -0.53333333333333344, -0.74481049687361112, -0.16325572340464578",
            "20, 20, 30, 30, 0.95, 0.20135792079033088, -0.074998157241924268, 0.47106401204298609, 0.099999999999999978, -0.037302103215463484, 0.23212305420266274",
            "0, 1, 6, 3, 0.95, 1.1286531387919432, 0.0075381567865411281, 2.1549185601869212, 0.5, 0.0035954605939017559, 0.77573368253343145",
            "0, 0, 5, 0, 0.95, 3.1415926535897931, 0.79160551182693251, 3.1415926535897931, 1, 0.38554900569034378, 1",
            "794, 150, 86, 570, 0.9, -0.080819030084987808, -0.11258321627429035, -0.048982895729799525, -0.039999999999999925, -0.055706020643769075, -0.02424767421385883",
            "1, 1, 7, 12, 0.9, 0.70293633710244652, 0.16207735432202808, 1.4689928146100233, 0.2857142857142857, 0.068870034765353, 0.47479832210209227",
            "59, 6, 16, 80, 0.9, 0.12538038470637791, 0.027810504444205408, 0.22185947258945493, 0.062111801242236031, 0.013785990793168473, 0.10974484287179012",
            "0, 4, 0, 27, 0.9, -0.73484380923960335, -1.0663695726019218, -0.092686941375061949, -0.12903225806451613, -0.25834716461930274, -0.022685212589147699",
            "12, 0, 0, 19, 0.9, 0, -0.11096534410291614, 0.11096534410291614, 0, -0.054017472928238969, 0.054017472928238969",
            "0, 0, 0, 30, 0.9, 0, -0.58347833331367671, 0.58347833331367671, 0, -0.082724308125099219, 0.082724308125099219",
            "3, 9, 1, 2, 0.9, -1.1290192310888756, -1.6267147822669576, -0.45426520324918429, -0.53333333333333344, -0.7231694211376587, -0.22465694148296206",
            "20, 20, 30, 30, 0.9, 0.20135792079033088, -0.031163627222877466, 0.42915265664688618, 0.099999999999999978, -0.015503062419841271, 0.21181532317477547",
            "0, 1, 6, 3, 0.9, 1.1286531387919432, 0.1758368127334764, 2.088956488348261, 0.5, 0.083728621838292105, 0.74764132534112471",
            "0, 0, 5, 0, 0.9, 3.1415926535897931, 1.0551655850434143, 3.1415926535897931, 1, 0.5034462826450109, 1"
    })
    void bothIntervalsMatchNewcombesMethodTenAndItsMappingOntoHAsInR(long a, long b, long c, long d, double level,
                                                                    double h, double hLow, double hHigh, double rd,
                                                                    double rdLow, double rdHigh) {
        EffectSize eh = PairedProportions.cohensH(a, b, c, d, level);
        assertEquals(h, eh.estimate(), 1e-13);
        assertEquals(hLow, eh.ciLow(), 1e-12);
        assertEquals(hHigh, eh.ciHigh(), 1e-12);
        EffectSize ed = PairedProportions.riskDifference(a, b, c, d, level);
        assertEquals(rd, ed.estimate(), 1e-15);
        assertEquals(rdLow, ed.ciLow(), 1e-12);
        assertEquals(rdHigh, ed.ciHigh(), 1e-12);
    }

    @Test
    void aShareFallingToNoneKeepsNoChangeInsideHsIntervalAsNewcombesDifferenceDoes() {
        // 4/31 -> 0/31 with every change away from the answer: the Wald interval h +- z sqrt(2 (1 - phi) / n),
        // phi taken as 0 for the empty margin, was -0.735 +- 0.498 and excluded 0.
        EffectSize h = PairedProportions.cohensH(0, 4, 0, 27, 0.95);
        EffectSize d = PairedProportions.riskDifference(0, 4, 0, 27, 0.95);
        assertTrue(d.ciLow() < 0 && d.ciHigh() > 0, d.toString());
        assertTrue(h.ciLow() < 0 && h.ciHigh() > 0, h.toString());
    }

    @Test
    void noDiscordantPairGivesAnIntervalAroundNoChange() {
        EffectSize h = PairedProportions.cohensH(12, 0, 0, 19, 0.95);
        assertEquals(0, h.estimate());
        assertEquals(-h.ciHigh(), h.ciLow(), 1e-15);
        assertTrue(h.ciHigh() > 0);
    }

    @Test
    void hsIntervalIncludesNoChangeExactlyWhenTheDifferencesDoes() {
        Random rng = new Random(29L);
        for (int rep = 0; rep < 2000; rep++) {
            long a = rng.nextInt(30);
            long b = rng.nextInt(12);
            long c = rng.nextInt(12);
            long d = rng.nextInt(30);
            if (a + b + c + d == 0) {
                continue;
            }
            EffectSize h = PairedProportions.cohensH(a, b, c, d, 0.95);
            EffectSize rd = PairedProportions.riskDifference(a, b, c, d, 0.95);
            String table = a + " / " + b + " / " + c + " / " + d;
            assertEquals(rd.ciLow() <= 0 && rd.ciHigh() >= 0, h.ciLow() <= 0 && h.ciHigh() >= 0, table);
            assertTrue(h.ciLow() <= h.estimate() && h.estimate() <= h.ciHigh(), table);
        }
    }

    @Test
    void swappingWavesFlipsBothEffectsAndUncorrelatedAnswersGiveTheIndependentDifferenceInterval() {
        Random rng = new Random(17L);
        for (int rep = 0; rep < 300; rep++) {
            long a = rng.nextInt(50);
            long b = rng.nextInt(50);
            long c = rng.nextInt(50);
            long d = rng.nextInt(50) + 1;
            for (boolean risk : new boolean[] {true, false}) {
                EffectSize f = risk ? PairedProportions.riskDifference(a, b, c, d, 0.95)
                        : PairedProportions.cohensH(a, b, c, d, 0.95);
                EffectSize s = risk ? PairedProportions.riskDifference(a, c, b, d, 0.95)
                        : PairedProportions.cohensH(a, c, b, d, 0.95);
                assertEquals(-f.estimate(), s.estimate(), 1e-12);
                assertEquals(-f.ciHigh(), s.ciLow(), 1e-12);
                assertEquals(-f.ciLow(), s.ciHigh(), 1e-12);
            }
        }
        // ad = bc: phi = 0, so the paired difference has the interval of two independent samples of n
        EffectSize paired = PairedProportions.riskDifference(20, 20, 30, 30, 0.95);
        EffectSize independent = TwoProportionZTest.test(40, 100, 50, 100, 0.95).riskDifference();
        assertEquals(independent.ciLow(), paired.ciLow(), 1e-12);
        assertEquals(independent.ciHigh(), paired.ciHigh(), 1e-12);
        assertThrows(IllegalArgumentException.class, () -> PairedProportions.cohensH(0, 0, 0, 0, 0.95));
        assertThrows(IllegalArgumentException.class, () -> PairedProportions.riskDifference(-1, 0, 0, 3, 0.95));
    }
}
