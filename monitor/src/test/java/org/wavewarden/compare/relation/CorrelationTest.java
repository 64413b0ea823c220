package org.wavewarden.compare.relation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.stat.correlation.PearsonsCorrelation;
import org.apache.commons.math3.stat.correlation.SpearmansCorrelation;
import org.junit.jupiter.api.Test;

/**
 * References: R 4.2.2 (Debian r-base-core), {@code cor(x, y, method = "pearson" / "spearman")} and
 * {@code cor.test(x, y, conf.level = ...)$conf.int} (the Pearson Fisher-z interval). R has no interval for
 * Spearman's rho; its reference is the formula recomputed in R:
 * {@code tanh(atanh(rho) + c(-1, 1) * qnorm((1 + conf) / 2) * sqrt(1.06 / (n - 3)))}.
 * On random data: commons-math3 3.6.1 {@code PearsonsCorrelation} and {@code SpearmansCorrelation} (mid-ranks).
 */
class CorrelationTest {

    // Student (1908), Biometrika 6: the sleep data of CHECK-SOURCES, paired by subject
    static final double[] SLEEP_1 = {0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0};
    static final double[] SLEEP_2 = {1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4};

    // Invented, heavily tied: satisfaction (1 to 5) against contacts with the helpline (0 to 3), 24 respondents
    static final double[] SATISFACTION = {1, 1, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4, 4, 5, 5, 5, 2, 3, 4, 1, 5, 3, 3};
    static final double[] CONTACTS = {0, 0, 0, 1, 0, 1, 1, 2, 1, 2, 2, 1, 3, 2, 3, 3, 2, 1, 0, 2, 1, 3, 1, 2};

    // The same 24 respondents as a joint tally (R: table(x, y)), zero cells left out
    static final double[] TALLY_X = {1, 1, 2, 2, 3, 3, 3, 4, 4, 4, 5, 5};
    static final double[] TALLY_Y = {0, 1, 0, 1, 0, 1, 2, 1, 2, 3, 2, 3};
    static final long[] TALLY_N = {2, 1, 2, 2, 1, 4, 2, 1, 4, 1, 1, 3};

    @Test
    void pearsonAndSpearmanMatchROnStudentSleepData() {
        // R 4.2.2: cor(g1, g2) 0.79517020583357778; cor.test(g1, g2)$conf.int 0.33152547416433725 0.94944653361136355
        CorrelationResult p = Correlation.pearson(SLEEP_1, SLEEP_2, 0.95);
        assertEquals(CorrelationMethod.PEARSON, p.method());
        assertEquals(0.79517020583357778, p.estimate(), 1e-14);
        assertEquals(10, p.n());
        assertEquals(0.33152547416433725, p.ciLow(), 1e-12);
        assertEquals(0.94944653361136355, p.ciHigh(), 1e-12);
        // R 4.2.2: cor.test(g1, g2, conf.level = 0.9)$conf.int 0.43304759732396758 0.93628264180666909
        CorrelationResult p90 = Correlation.pearson(SLEEP_1, SLEEP_2, 0.9);
        assertEquals(0.43304759732396758, p90.ciLow(), 1e-12);
        assertEquals(0.93628264180666909, p90.ciHigh(), 1e-12);
        // R 4.2.2: cor(g1, g2, method = "spearman") 0.78181818181818175; formula in R: 0.27967870124863697
        // 0.94810827392171981
        CorrelationResult s = Correlation.spearman(SLEEP_1, SLEEP_2, 0.95);
        assertEquals(0.78181818181818175, s.estimate(), 1e-14);
        assertEquals(0.27967870124863697, s.ciLow(), 1e-12);
        assertEquals(0.94810827392171981, s.ciHigh(), 1e-12);
    }

    @Test
    void pearsonAndSpearmanMatchRWithHeavyTies() {
        // R 4.2.2: cor(x, y) 0.81575703518850529; cor.test(x, y)$conf.int 0.61461344988419297 0.91729581385707171
        CorrelationResult p = Correlation.pearson(SATISFACTION, CONTACTS, 0.95);
        assertEquals(0.81575703518850529, p.estimate(), 1e-14);
        assertEquals(0.61461344988419297, p.ciLow(), 1e-12);
        assertEquals(0.91729581385707171, p.ciHigh(), 1e-12);
        // R 4.2.2: cor(x, y, method = "spearman") 0.82949959888802072 (mid-ranks); formula in R:
        // 0.63286852420673856 0.92561502255280592
        CorrelationResult s = Correlation.spearman(SATISFACTION, CONTACTS, 0.95);
        assertEquals(0.82949959888802072, s.estimate(), 1e-14);
        assertEquals(0.63286852420673856, s.ciLow(), 1e-12);
        assertEquals(0.92561502255280592, s.ciHigh(), 1e-12);
    }

    @Test
    void jointTallyGivesWhatTheRawPairsGive() {
        for (CorrelationMethod m : CorrelationMethod.values()) {
            CorrelationResult raw = Correlation.of(m, SATISFACTION, CONTACTS, ones(SATISFACTION.length), 0.95);
            CorrelationResult tally = Correlation.of(m, TALLY_X, TALLY_Y, TALLY_N, 0.95);
            assertEquals(raw.n(), tally.n());
            assertEquals(raw.estimate(), tally.estimate(), 1e-14, m.label());
            assertEquals(raw.ciLow(), tally.ciLow(), 1e-13);
            assertEquals(raw.ciHigh(), tally.ciHigh(), 1e-13);
        }
        // repeated pairs and zero counts are allowed in a tally
        double[] xs = {1, 1, 2, 2, 3, 3, 3, 4, 4, 4, 5, 5, 5, 1};
        double[] ys = {0, 1, 0, 1, 0, 1, 2, 1, 2, 3, 2, 3, 3, 0};
        long[] ns = {1, 1, 2, 2, 1, 4, 2, 1, 4, 1, 1, 2, 1, 1};
        long[] withZero = {2, 1, 2, 2, 1, 4, 2, 1, 4, 1, 1, 3, 0, 0};
        assertEquals(0.82949959888802072, Correlation.spearman(xs, ys, ns, 0.95).estimate(), 1e-14);
        assertEquals(0.82949959888802072, Correlation.spearman(xs, ys, withZero, 0.95).estimate(), 1e-14);
    }

    @Test
    void agreesWithCommonsMathOnRandomTallies() {
        Random random = new Random(41L);
        PearsonsCorrelation pearson = new PearsonsCorrelation();
        SpearmansCorrelation spearman = new SpearmansCorrelation();
        for (int rep = 0; rep < 200; rep++) {
            int distinct = 2 + random.nextInt(30);
            double[] xs = new double[distinct];
            double[] ys = new double[distinct];
            long[] ns = new long[distinct];
            int n = 0;
            for (int i = 0; i < distinct; i++) {
                xs[i] = random.nextInt(6);
                ys[i] = Math.round((xs[i] * 0.5 + random.nextGaussian()) * 10) / 10.0 + 1e6;
                ns[i] = random.nextInt(5);
                n += ns[i];
            }
            double[] x = new double[n];
            double[] y = new double[n];
            int at = 0;
            for (int i = 0; i < distinct; i++) {
                for (long c = 0; c < ns[i]; c++) {
                    x[at] = xs[i];
                    y[at++] = ys[i];
                }
            }
            double expectedR;
            try {
                expectedR = pearson.correlation(x, y);
            } catch (RuntimeException tooFew) {
                continue;
            }
            if (!Double.isFinite(expectedR)) {
                continue;
            }
            assertEquals(expectedR, Correlation.pearson(xs, ys, ns, 0.95).estimate(), 1e-9);
            assertEquals(spearman.correlation(x, y), Correlation.spearman(xs, ys, ns, 0.95).estimate(), 1e-12);
            CorrelationResult raw = Correlation.spearman(x, y, 0.95);
            CorrelationResult tally = Correlation.spearman(xs, ys, ns, 0.95);
            assertEquals(n, tally.n());
            assertEquals(raw.n(), tally.n());
            assertEquals(raw.ciLow(), tally.ciLow(), 1e-12);
            assertEquals(raw.ciHigh(), tally.ciHigh(), 1e-12);
            // symmetric in x and y
            assertEquals(Correlation.spearman(xs, ys, ns, 0.9).estimate(),
                    Correlation.spearman(ys, xs, ns, 0.9).estimate(), 1e-12);
        }
    }

    @Test
    void threePairsOrFewerGiveTheWholeRange() {
        CorrelationResult r = Correlation.pearson(new double[] {1, 2, 3}, new double[] {2, 1, 4}, 0.95);
        assertEquals(-1, r.ciLow());
        assertEquals(1, r.ciHigh());
        CorrelationResult perfect = Correlation.pearson(new double[] {1, 2, 3, 4, 5}, new double[] {3, 5, 7, 9, 11},
                0.95);
        assertEquals(1, perfect.estimate(), 1e-15);
        assertEquals(1, perfect.ciHigh(), 1e-15);
    }

    @Test
    void rejectsConstantVariablesAndBadTallies() {
        assertEquals("y takes a single value over all pairs; the correlation is undefined",
                assertThrows(IllegalArgumentException.class,
                        () -> Correlation.pearson(new double[] {1, 2, 3}, new double[] {4, 4, 4}, 0.95)).getMessage());
        assertEquals("x takes a single value over all pairs; the correlation is undefined",
                assertThrows(IllegalArgumentException.class, () -> Correlation.spearman(new double[] {1, 2},
                        new double[] {4, 5}, new long[] {3, 0}, 0.95)).getMessage());
        assertEquals("counts[1] must not be negative, was -1", assertThrows(IllegalArgumentException.class,
                () -> Correlation.pearson(new double[] {1, 2}, new double[] {4, 5}, new long[] {3, -1}, 0.95))
                .getMessage());
        assertEquals("xs[0] is not finite: NaN", assertThrows(IllegalArgumentException.class,
                () -> Correlation.pearson(new double[] {Double.NaN, 2}, new double[] {4, 5}, 0.95)).getMessage());
        assertEquals("a correlation needs at least 2 pairs, have 1", assertThrows(IllegalArgumentException.class,
                () -> Correlation.pearson(new double[] {1}, new double[] {4}, 0.95)).getMessage());
        assertEquals("xs, ys and counts must have equal lengths, have 2, 2 and 1",
                assertThrows(IllegalArgumentException.class, () -> Correlation.pearson(new double[] {1, 2},
                        new double[] {4, 5}, new long[] {1}, 0.95)).getMessage());
    }

    private static long[] ones(int n) {
        long[] c = new long[n];
        Arrays.fill(c, 1);
        return c;
    }
}
