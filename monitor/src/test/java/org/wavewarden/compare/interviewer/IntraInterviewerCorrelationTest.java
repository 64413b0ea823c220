package org.wavewarden.compare.interviewer;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.util.Arrays;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The intra-interviewer correlation by the one-way ANOVA estimator, with its F interval and F test, against R on
 * published grouped data (each group standing for one interviewer's workload).
 *
 * <p>Reference values: R 4.2.2, the estimator written out over {@code anova(aov(y ~ g))}:
 * {@code msb <- a[1,3]; msw <- a[2,3]; m0 <- (N - sum(n^2)/N)/(k-1); (msb - msw)/(msb + (m0-1)*msw)}, the interval
 * {@code FL <- F/qf(1-a/2, df1, df2); FU <- F/qf(a/2, df1, df2); (FL-1)/(FL+m0-1), (FU-1)/(FU+m0-1)} and the
 * p-value {@code anova(...)[1,5]}.
 */
class IntraInterviewerCorrelationTest {

    /** datasets::chickwts, weight by feed: six unequal groups (10 to 14). */
    static final String CHICKWTS = "368 390 379 260 404 318 352 359 216 222 283 332 | 179 160 136 227 217 168 108 124 "
            + "143 140 | 309 229 181 141 260 203 148 169 213 257 244 271 | 325 257 303 315 380 153 263 242 206 344 258 "
            + "| 243 230 248 327 329 250 193 271 316 267 199 171 158 248 | 423 340 392 339 341 226 320 295 334 322 297 "
            + "318";
    /** datasets::InsectSprays, count by spray: six groups of 12. */
    static final String INSECT_SPRAYS = "10 7 20 14 14 12 10 23 17 20 14 13 | 11 17 21 11 16 14 17 17 19 21 7 13 | "
            + "0 1 7 2 3 1 2 1 3 0 1 4 | 3 5 12 6 4 3 5 5 5 5 2 4 | 3 5 3 5 3 6 1 1 3 2 6 4 | "
            + "11 9 15 22 15 16 13 10 26 26 24 13";
    /** lme4::Dyestuff (lme4 1.1.31), Yield by Batch: six batches of 5. */
    static final String DYESTUFF = "1545 1440 1440 1520 1580 | 1540 1555 1490 1560 1495 | 1595 1550 1605 1510 1560 | "
            + "1445 1440 1595 1465 1545 | 1595 1630 1515 1635 1625 | 1520 1455 1450 1480 1445";
    /** datasets::mtcars, am (0/1) by cyl: a binary indicator in three unequal groups, as a missing indicator is. */
    static final String MTCARS_AM = "1 0 0 1 1 1 0 1 1 1 1 | 1 1 0 0 0 0 1 | 0 0 0 0 0 0 0 0 0 0 0 0 1 1";

    @ParameterizedTest(name = "{0} at {1}")
    @CsvSource(delimiter = ';', textBlock = """
            # data;          confidence; icc;                lower;               upper;              F;                 df1; df2; p;                     m0
            CHICKWTS;        0.95;       0.548835147024332;  0.278119204254105;   0.887275298149768;  15.3647997747125;  5;   65;  5.93641985347133e-10;  11.8084507042254
            INSECT_SPRAYS;   0.95;       0.737431054636843;  0.490406671465694;   0.946220107614868;  34.7022820554917;  5;   66;  3.18258372614518e-17;  12
            DYESTUFF;        0.95;       0.418487414893366;  0.0838360506605941;  0.847876815473381;  4.59826619071903;  5;   24;  0.00439753126830609;   5
            DYESTUFF;        0.90;       0.418487414893366;  0.131133705594091;   0.79852565162177;   4.59826619071903;  5;   24;  0.00439753126830609;   5
            MTCARS_AM;       0.95;       0.302033329813904;  0.0280960667909004;  0.954166814984647;  5.44903790509259;  2;   29;  0.00979417088576859;   10.28125
            """)
    void theAnovaEstimatorItsIntervalAndItsTestAsR(String data, double confidence, double icc, double lower,
                                                   double upper, double f, double df1, double df2, double p,
                                                   double m0) {
        InterviewerEffect e = estimate(data, confidence);
        assertEquals(icc, e.icc(), 1e-10, "icc");
        assertEquals(lower, e.ciLow(), 1e-8, "lower end");
        assertEquals(upper, e.ciHigh(), 1e-8, "upper end");
        assertEquals(f, e.fStatistic(), 1e-9 * f, "F");
        assertEquals(df1, e.dfBetween(), 0);
        assertEquals(df2, e.dfWithin(), 0);
        assertEquals(p, e.pValue(), 1e-6 * p, "p");
        assertEquals(m0, e.m0(), 1e-10, "m0");
    }

    @Test
    void withEqualWorkloadsTheEstimateIsTheRemlVarianceShareOfAMixedModel() {
        // R 4.2.2, lme4 1.1.31: v <- as.data.frame(VarCorr(lmer(Yield ~ 1 + (1|Batch), Dyestuff, REML = TRUE)))$vcov;
        // v[1] / sum(v) = 0.418487415918282. With equal groups and a positive estimate REML and ANOVA agree, up to
        // the optimiser's tolerance: an estimate by another method, not the same formula twice.
        assertEquals(0.418487415918282, estimate("DYESTUFF", 0.95).icc(), 1e-8);
    }

    @Test
    void interviewersWithoutAnswersTakeNoPartAndTheLeftOutAreCarried() {
        InterviewerEffect full = estimate("DYESTUFF", 0.95);
        Groups g = Groups.parse(DYESTUFF);
        long[] n = Arrays.copyOf(g.n, g.n.length + 1);
        double[] s = Arrays.copyOf(g.sum, g.sum.length + 1);
        double[] q = Arrays.copyOf(g.squares, g.squares.length + 1);
        InterviewerEffect withEmpty = IntraInterviewerCorrelation.estimate("yield", "value", n, s, q, 0.95, 3)
                .orElseThrow();
        assertEquals(full.icc(), withEmpty.icc(), 1e-15);
        assertEquals(6, withEmpty.interviewers());
        assertEquals(30, withEmpty.interviews());
        assertEquals(3, withEmpty.belowMinimum());
    }

    @Test
    void undefinedWithOneInterviewerOrNoVariationWithinInterviewers() {
        assertTrue(IntraInterviewerCorrelation.estimate("x", "value", new long[] {5}, new double[] {10},
                new double[] {30}, 0.95, 0).isEmpty(), "one interviewer");
        // Every interviewer constant within (2, 2 | 3, 3): MSW = 0, the ratio has no value.
        assertTrue(IntraInterviewerCorrelation.estimate("x", "value", new long[] {2, 2}, new double[] {4, 6},
                new double[] {8, 18}, 0.95, 0).isEmpty(), "no variation within");
    }

    private static InterviewerEffect estimate(String data, double confidence) {
        Groups g = Groups.parse(switch (data) {
            case "CHICKWTS" -> CHICKWTS;
            case "INSECT_SPRAYS" -> INSECT_SPRAYS;
            case "DYESTUFF" -> DYESTUFF;
            case "MTCARS_AM" -> MTCARS_AM;
            default -> throw new IllegalArgumentException(data);
        });
        return IntraInterviewerCorrelation.estimate(data, "value", g.n, g.sum, g.squares, confidence, 0)
                .orElseThrow();
    }

    /** Per group the count, sum and sum of squares: what an interviewer's tally gives. */
    record Groups(long[] n, double[] sum, double[] squares) {
        static Groups parse(String text) {
            String[] groups = text.split("\\|");
            long[] n = new long[groups.length];
            double[] s = new double[groups.length];
            double[] q = new double[groups.length];
            for (int i = 0; i < groups.length; i++) {
                for (String v : groups[i].trim().split("\\s+")) {
                    double y = Double.parseDouble(v);
                    n[i]++;
                    s[i] += y;
                    q[i] += y * y;
                }
            }
            return new Groups(n, s, q);
        }
    }
}
