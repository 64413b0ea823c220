package org.wavewarden.compare.interviewer;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.config.Breakdowns;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.WaveProfile;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Interviewer monitoring of one invented wave: five interviewers, a height with the declared missing code 999 and
 * SQL NULLs, and a categorical tenure. Interviewer C keys 999 for most heights; E has five interviews, under the
 * minimum workload of 20.
 *
 * <p>Reference values: R 4.2.2 on the same interviews expanded to rows, each judged interviewer (A to D) against
 * every other interviewer (E included): {@code fisher.test(matrix(c(a, c, b, d), 2))$p.value} for the shares,
 * {@code t.test(mine, others, var.equal = FALSE)} for the mean of valid heights,
 * {@code chisq.test(rbind(others, mine), correct = FALSE)} for the tenure shares, and
 * {@code p.adjust(p, method = "BH")} over all 20 p-values; the interviewer effect by
 * {@code anova(aov(y ~ factor(interviewer)))} over A to D with the estimator and interval written out as in
 * {@link IntraInterviewerCorrelationTest}.
 */
class InterviewerMonitorTest {

    static final String COLUMN = "interviewer_id";
    static final List<String> IDS = List.of("A", "B", "C", "D", "E");
    /** Heights per interviewer: value = count; "NULL" for SQL NULL. */
    static final List<String> HEIGHTS = List.of(
            "160=10 170=12 180=8 999=2 NULL=1",
            "150=6 165=14 175=10 999=1",
            "170=5 999=20 NULL=2",
            "160=9 170=9 180=9 190=3",
            "170=3 999=1 NULL=1");
    static final List<String> TENURE = List.of(
            "own=20 rent=13",
            "own=15 rent=10 other=6",
            "own=5 rent=20 other=2",
            "own=18 rent=10 other=2",
            "own=5");
    static final VariableConfig HEIGHT = new VariableConfig("height_cm", VariableKind.CONTINUOUS, "cm", null,
            List.of(new MissingCodeSpec("999", "not measured")), null, null, List.of(), null);
    static final VariableConfig TENURE_V = new VariableConfig("tenure", VariableKind.CATEGORICAL, null, null,
            List.of(), null, null, List.of(), null);
    static final Breakdowns CONFIG = new Breakdowns(List.of(COLUMN), 500, COLUMN, 20, List.of(), 0.02, 5000);

    @ParameterizedTest(name = "interviewer {0}, {1} {2}")
    @CsvSource(delimiter = ';', textBlock = """
            # interviewer; variable;  measure;           p (R 4.2.2);           q (R p.adjust BH);     statistic;          df
            A;             height_cm; missing share;     4.94079257525123e-02;  8.23465429208538e-02;  ;                   ;
            A;             height_cm; share of SQL NULL; 1;                     1;                     ;                   ;
            A;             height_cm; share of 999;      3.68637581768188e-02;  7.37275163536377e-02;  ;                   ;
            A;             height_cm; mean;              7.81472153814329e-01;  8.22602267172978e-01;  0.278538689246392;  65.8148175208598
            A;             tenure;    answer shares;     9.87661566778991e-02;  1.51947933350614e-01;  4.63000055331157;   2
            B;             height_cm; missing share;     2.35580307490201e-03;  7.85267691634002e-03;  ;                   ;
            B;             height_cm; share of SQL NULL; 5.71304684475416e-01;  6.35278641572898e-01;  ;                   ;
            B;             height_cm; share of 999;      8.00115011078922e-03;  2.23636204709234e-02;  ;                   ;
            B;             height_cm; mean;              8.94544818836937e-03;  2.23636204709234e-02;  -2.71517349234647;  52.4920528116084
            B;             tenure;    answer shares;     2.11148483148291e-02;  4.69218851440647e-02;  7.7155575487715;    2
            C;             height_cm; missing share;     1.11136902675211e-14;  2.22273805350421e-13;  ;                   ;
            C;             height_cm; share of SQL NULL; 2.00799370574351e-01;  2.86856243677644e-01;  ;                   ;
            C;             height_cm; share of 999;      8.52404759158075e-14;  8.52404759158075e-13;  ;                   ;
            C;             height_cm; mean;              2.59733835153542e-01;  3.46311780204722e-01;  1.13401668841098;   92
            C;             tenure;    answer shares;     5.01794892230126e-04;  2.50897446115063e-03;  15.194638205959;    2
            D;             height_cm; missing share;     2.47176701293649e-04;  1.64784467529100e-03;  ;                   ;
            D;             height_cm; share of SQL NULL; 5.71750777415608e-01;  6.35278641572898e-01;  ;                   ;
            D;             height_cm; share of 999;      9.68795156712082e-04;  3.87518062684833e-03;  ;                   ;
            D;             height_cm; mean;              4.08049178113648e-02;  7.41907596570269e-02;  2.10376174061971;   46.7648449721029
            D;             tenure;    answer shares;     4.53630768030826e-01;  5.67038460038532e-01;  1.58094339622642;   2
            """)
    void everyInterviewerTestAsR(String interviewer, String variable, String measure, double p, double q,
                                 Double statistic, Double df) {
        InterviewerMonitor.Assessment a = InterviewerMonitor.assess(interviewers(), screened(), CONFIG, 0.05);
        assertEquals(20, a.tests().size(), "four judged interviewers, five tests each");
        assertEquals(20, a.family());
        int i = indexOf(a, interviewer, variable, measure);
        var t = a.tests().get(i);
        assertEquals(p, t.result().pValue(), 1e-9 * Math.max(p, 1e-12) + 1e-15, "p");
        assertEquals(q, a.q()[i], 1e-9 * Math.max(q, 1e-12) + 1e-15, "q");
        if (statistic != null) {
            assertEquals(statistic, t.result().statistic(), 1e-9 * Math.abs(statistic), "statistic");
            assertEquals(df, t.result().df(), 1e-9 * df, "df");
        }
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = ';', textBlock = """
            # measure; icc (R 4.2.2 aov);  lower (qf);           upper (qf);         F;                 p;                     m0
            missing;   0.674132241852026;  0.381820422608758;    0.966979619290832;  63.472211278167;   1.96715061554181e-24;  30.198347107438
            value;     0.0809538799038745; -0.00440091537026087; 0.644906845496584;  2.94713494763525;  0.0370057208090218;    22.1052631578947
            """)
    void theInterviewerEffectOverTheJudgedInterviewersAsR(String measure, double icc, double lower, double upper,
                                                            double f, double p, double m0) {
        InterviewerMonitor.Result r = InterviewerMonitor.judge(interviewers(), screened(), CONFIG, 0.05);
        InterviewerEffect e = r.effects().stream().filter(x -> x.variable().equals("height_cm")
                && x.measure().equals(measure)).findFirst().orElseThrow();
        assertEquals(icc, e.icc(), 1e-10);
        assertEquals(lower, e.ciLow(), 1e-8);
        assertEquals(upper, e.ciHigh(), 1e-8);
        assertEquals(f, e.fStatistic(), 1e-9 * f);
        assertEquals(p, e.pValue(), 1e-6 * p);
        assertEquals(m0, e.m0(), 1e-10);
        assertEquals(4, e.interviewers());
        assertEquals(1, e.belowMinimum());
    }

    @Test
    void aFlagPerTestBelowAlphaAfterFdrEachAFindingWithItsEvidence() {
        InterviewerMonitor.Result r = InterviewerMonitor.judge(interviewers(), screened(), CONFIG, 0.05);
        // q < 0.05 in the table above, in order of q: of one interviewer's missing measures of height_cm (the
        // missing share, the shares of NULL and of 999) only the strongest is reported.
        assertEquals(List.of("C height_cm missing share", "D height_cm missing share", "C tenure answer shares",
                        "B height_cm missing share", "B height_cm mean", "B tenure answer shares"),
                r.flags().stream().map(f -> f.interviewer() + " " + f.variable() + " " + f.measure()).toList());
        InterviewerFlag c = r.flags().get(0);
        assertEquals(new InterviewerFlag(COLUMN, "C", "height_cm", "missing share", "Fisher exact", 27, 22 / 27.0,
                6 / 99.0, c.pValue(), c.qValue(), List.of(DomainMeasure.NULL, "999"), 20), c);
        Finding f = r.findings().get(0);
        assertEquals(FindingKind.INTERVIEWER_OUTLIER, f.kind());
        assertEquals("height_cm", f.variable());
        assertEquals(c, f.detail());
        assertEquals(20, f.fdrFamilySize());
        assertEquals("BENJAMINI_HOCHBERG", f.fdrMethod());
        assertEquals(27L, f.nCurrent());
        assertEquals(99L, f.nBaseline());
        assertEquals("Interviewer C recorded a missing answer (SQL NULL, 999) for 22 of 27 interviews on height_cm "
                + "(81%; other interviewers 6.1%), q < 0.001; 4 interviewers judged, 1 under the minimum workload of "
                + "20. A screening aid: worth a look at these interviews, not proof of a fault.", f.sentence());
    }

    @Test
    void withOneKindOfMissingAnswerTheFlagNamesTheValue() {
        // The same heights without their SQL NULLs: 999 is the only missing answer, so its share is the measure.
        List<String> noNulls = HEIGHTS.stream().map(h -> h.replaceAll("NULL=\\d+", "").trim()).toList();
        Map<String, List<ColumnTally>> tallies = new LinkedHashMap<>();
        tallies.put("height_cm", noNulls.stream().map(h -> tally("height_cm", ColumnType.INTEGER, h)).toList());
        DomainTally t = new DomainTally(COLUMN, IDS, tallies.get("height_cm").stream()
                .mapToLong(ColumnTally::rowCount).toArray(), 0, 0, 0, tallies, null, null);
        ScreenedWave wave = ScreenedWave.screen("2025-Q1", Map.of("height_cm", tally("height_cm",
                ColumnType.INTEGER, String.join(" ", noNulls))), null, List.of(HEIGHT), List.of());
        Finding f = InterviewerMonitor.judge(t, wave, CONFIG, 0.05).findings().get(0);
        InterviewerFlag flag = (InterviewerFlag) f.detail();
        assertEquals("share of 999", flag.measure());
        assertEquals(List.of("999"), flag.offendingValues());
        assertEquals("Interviewer C recorded 999 for 20 of 25 interviews on height_cm (80%; other interviewers "
                + "4.1%), q < 0.001; 4 interviewers judged, 1 under the minimum workload of 20. A screening aid: "
                + "worth a look at these interviews, not proof of a fault.", f.sentence());
    }

    @Test
    void anEffectFindingWhenTheIntervalLiesAboveTheThreshold() {
        InterviewerMonitor.Result r = InterviewerMonitor.judge(interviewers(), screened(), CONFIG, 0.05);
        List<Finding> effects = r.findings().stream().filter(f -> f.kind() == FindingKind.INTERVIEWER_EFFECT)
                .toList();
        // The missing indicator's interval starts at 0.38, above 0.02; the value's starts below 0: not reported.
        assertEquals(1, effects.size());
        Finding e = effects.get(0);
        assertEquals("height_cm", e.variable());
        assertEquals("intra-interviewer correlation", e.effect().name());
        assertEquals(0.674132241852026, e.effect().estimate(), 1e-10);
        assertEquals(0.381820422608758, e.effect().ciLow(), 1e-8);
        assertEquals(0.966979619290832, e.effect().ciHigh(), 1e-8);
        assertEquals(0.02, e.effect().threshold());
        assertTrue(e.sentence().startsWith("Whether height_cm is missing clusters by interviewer: "
                + "intra-interviewer correlation 0.674 (95% interval 0.382 to 0.967), above 0.02"), e.sentence());
        assertTrue(e.sentence().endsWith("4 interviewers judged, 1 under the minimum workload of 20."));
    }

    @Test
    void whatWasNotJudgedIsSaid() {
        DomainTally t = interviewers();
        DomainTally withOverflow = new DomainTally(t.column(), t.domains(), t.rows(), 7, 3, 12, t.tallies(), null,
                null);
        InterviewerMonitor.Result r = InterviewerMonitor.judge(withOverflow, screened(), CONFIG, 0.05);
        assertEquals(List.of(
                "1 interviewer under the minimum workload of 20 interviews (5 interviews in all) was not judged: E.",
                "3 interviewers beyond the cap of 500 per column (12 interviews) were not tallied by interviewer_id "
                        + "and not judged.",
                "7 interviews have no interviewer_id and were not judged."), r.notes());
    }

    @Test
    void withFewerThanTwoJudgedInterviewersNothingIsTested() {
        Breakdowns strict = new Breakdowns(List.of(COLUMN), 500, COLUMN, 32, List.of(), 0.02, 5000);
        InterviewerMonitor.Result r = InterviewerMonitor.judge(interviewers(), screened(), strict, 0.05);
        assertTrue(r.findings().isEmpty());
        assertTrue(r.effects().isEmpty());
        assertTrue(r.notes().get(r.notes().size() - 1).startsWith("1 interviewer reached the minimum workload of 32"),
                r.notes().toString());
    }

    @Test
    void keyVariablesLimitTheDistributionsNotTheMissingShares() {
        Breakdowns onlyTenure = new Breakdowns(List.of(COLUMN), 500, COLUMN, 20, List.of("tenure", "income"), 0.02,
                5000);
        InterviewerMonitor.Assessment a = InterviewerMonitor.assess(interviewers(), screened(), onlyTenure, 0.05);
        // Height's three missing measures and tenure's shares for four interviewers; no height means.
        assertEquals(16, a.tests().size());
        assertTrue(a.tests().stream().noneMatch(t -> t.measure().equals("mean")));
        assertTrue(a.notes().contains("Key variable income has no tallies by interviewer_id in this wave; its "
                + "distributions were not compared."), a.notes().toString());
    }

    @Test
    void withoutKeyVariablesTheBreakdownColumnsAreNotComparedByInterviewer() {
        // Interviewers work in areas: a breakdown column (here tenure, standing in for a district) differs between
        // them by design. Its missing shares are still measured; it has none.
        Breakdowns byTenure = new Breakdowns(List.of("tenure", COLUMN), 500, COLUMN, 20, List.of(), 0.02, 5000);
        InterviewerMonitor.Assessment a = InterviewerMonitor.assess(interviewers(), screened(), byTenure, 0.05);
        assertEquals(16, a.tests().size());
        assertTrue(a.tests().stream().noneMatch(t -> t.variable().name().equals("tenure")));
    }

    @Test
    void aWaveSummaryIsJudgedByItsInterviewerColumnsTallies() {
        WaveProfile wave = new WaveProfile("2025-Q1", 126, Map.of(), screened().columns(), Map.of(), null, List.of(),
                List.of(interviewers()));
        assertEquals(InterviewerMonitor.judge(interviewers(), screened(), CONFIG, 0.05),
                InterviewerMonitor.judge(wave, screened(), CONFIG, 0.05));
    }

    @Test
    void withoutAnInterviewerColumnOrItsTalliesNothingIsJudged() {
        WaveProfile none = new WaveProfile("2025-Q1", 126, Map.of(), Map.of());
        assertEquals(new InterviewerMonitor.Result(List.of(), List.of(), List.of(), List.of()),
                InterviewerMonitor.judge(none, screened(), Breakdowns.NONE, 0.05));
        assertEquals(List.of("The wave's summary holds no tallies by interviewer_id, so no interviewer was judged."),
                InterviewerMonitor.judge(none, screened(), CONFIG, 0.05).notes());
    }

    @Test
    void aSentinelFoundByTheScreenCountsAsMissingLikeADeclaredCode() {
        // No codebook: the wave's screen finds 999 among heights of 150 to 190 and leaves it out, and the
        // interviewers are measured by that same rule, so every test is the one made with 999 declared.
        VariableConfig undeclared = new VariableConfig("height_cm", VariableKind.CONTINUOUS, "cm", null, List.of(),
                null, null, List.of(), null);
        Map<String, ColumnTally> wave = new LinkedHashMap<>();
        wave.put("height_cm", tally("height_cm", ColumnType.INTEGER, String.join(" ", HEIGHTS)));
        wave.put("tenure", tally("tenure", ColumnType.TEXT, String.join(" ", TENURE)));
        ScreenedWave found = ScreenedWave.screen("2025-Q1", wave, null, List.of(undeclared, TENURE_V), List.of());
        assertTrue(found.get("height_cm").orElseThrow().excludedValues().contains("999"),
                found.get("height_cm").orElseThrow().candidates().toString());
        InterviewerMonitor.Assessment declared = InterviewerMonitor.assess(interviewers(), screened(), CONFIG, 0.05);
        InterviewerMonitor.Assessment screen = InterviewerMonitor.assess(interviewers(), found, CONFIG, 0.05);
        assertEquals(declared.tests().stream().map(t -> t.measure() + " " + t.result().pValue()).toList(),
                screen.tests().stream().map(t -> t.measure() + " " + t.result().pValue()).toList());
    }

    static final VariableConfig CONSENT = new VariableConfig("consent", VariableKind.BINARY, null, null, List.of(),
            null, null, List.of(), null);
    static final List<String> CONSENTS = List.of("yes=25 no=8", "yes=20 no=11", "yes=26 no=1", "yes=12 no=18",
            "yes=3 no=2");

    /**
     * A binary key variable: the share of its tracked answer ("yes") by Fisher's exact test, and its interviewer
     * effect on the 0/1 indicator. R 4.2.2: {@code fisher.test(matrix(c(yes_i, yes_others, no_i, no_others), 2))},
     * {@code p.adjust(p, "BH")} over the four tests, the effect as above on the indicator.
     */
    @ParameterizedTest(name = "interviewer {0}")
    @CsvSource(delimiter = ';', textBlock = """
            # interviewer; p (R 4.2.2 fisher.test);  q (p.adjust BH)
            A;             0.384377097594873096;     0.512502796793164128
            B;             0.659165320673235966;     0.659165320673235966
            C;             0.000156248939346713;     0.000530837111601353
            D;             0.000265418555800677;     0.000530837111601353
            """)
    void aBinaryKeyVariableByItsTrackedAnswerAsR(String interviewer, double p, double q) {
        InterviewerMonitor.Assessment a = InterviewerMonitor.assess(consentInterviewers(), consentWave(), CONFIG,
                0.05);
        assertEquals(4, a.family());
        int i = indexOf(a, interviewer, "consent", "share of yes");
        assertEquals(p, a.tests().get(i).result().pValue(), 1e-9 * p);
        assertEquals(q, a.q()[i], 1e-9 * q);
        InterviewerEffect e = a.effects().get(0);
        // R 4.2.2 anova(aov(indicator ~ interviewer)) over A to D, the estimator and qf interval written out.
        assertEquals("share of yes", e.measure());
        assertEquals(0.202778592279666, e.icc(), 1e-10);
        assertEquals(0.0529331172024941, e.ciLow(), 1e-8);
        assertEquals(0.799061956227294, e.ciHigh(), 1e-8);
        assertEquals(3.00935654057382e-05, e.pValue(), 1e-6 * e.pValue());
    }

    @Test
    void aBinaryFlagSaysWhatShareOfValidAnswers() {
        InterviewerMonitor.Result r = InterviewerMonitor.judge(consentInterviewers(), consentWave(), CONFIG, 0.05);
        assertEquals(List.of("C", "D"), r.flags().stream().map(InterviewerFlag::interviewer).toList());
        assertTrue(r.findings().get(0).sentence().startsWith("Interviewer C recorded yes for 26 of 27 valid answers "
                + "to consent (96%; other interviewers 61%), q < 0.001;"), r.findings().get(0).sentence());
    }

    static DomainTally consentInterviewers() {
        List<ColumnTally> tallies = CONSENTS.stream().map(c -> tally("consent", ColumnType.TEXT, c)).toList();
        return new DomainTally(COLUMN, IDS, tallies.stream().mapToLong(ColumnTally::rowCount).toArray(), 0, 0, 0,
                Map.of("consent", tallies), null, null);
    }

    static ScreenedWave consentWave() {
        return ScreenedWave.screen("2025-Q1", Map.of("consent", tally("consent", ColumnType.TEXT,
                String.join(" ", CONSENTS))), null, List.of(CONSENT), List.of());
    }

    private static int indexOf(InterviewerMonitor.Assessment a, String interviewer, String variable, String measure) {
        for (int i = 0; i < a.tests().size(); i++) {
            var t = a.tests().get(i);
            if (IDS.get(t.interviewer()).equals(interviewer) && t.variable().name().equals(variable)
                    && t.measure().equals(measure)) {
                return i;
            }
        }
        throw new AssertionError("no test " + interviewer + " " + variable + " " + measure);
    }

    static DomainTally interviewers() {
        Map<String, List<ColumnTally>> tallies = new LinkedHashMap<>();
        tallies.put("height_cm", IDS.stream().map(id -> tally("height_cm", ColumnType.INTEGER,
                HEIGHTS.get(IDS.indexOf(id)))).toList());
        tallies.put("tenure", IDS.stream().map(id -> tally("tenure", ColumnType.TEXT,
                TENURE.get(IDS.indexOf(id)))).toList());
        long[] rows = tallies.get("height_cm").stream().mapToLong(ColumnTally::rowCount).toArray();
        return new DomainTally(COLUMN, IDS, rows, 0, 0, 0, tallies, null, null);
    }

    static ScreenedWave screened() {
        Map<String, ColumnTally> wave = new LinkedHashMap<>();
        wave.put("height_cm", tally("height_cm", ColumnType.INTEGER, String.join(" ", HEIGHTS)));
        wave.put("tenure", tally("tenure", ColumnType.TEXT, String.join(" ", TENURE)));
        return ScreenedWave.screen("2025-Q1", wave, null, List.of(HEIGHT, TENURE_V), List.of());
    }

    /** A tally from "value=count ..." (repeats added up); "NULL" counts SQL NULLs. */
    static ColumnTally tally(String column, ColumnType type, String cells) {
        Map<String, Long> counts = new LinkedHashMap<>();
        long nulls = 0;
        long rows = 0;
        for (String cell : cells.trim().split("\\s+")) {
            String[] kv = cell.split("=");
            long c = Long.parseLong(kv[1]);
            rows += c;
            if (kv[0].equals("NULL")) {
                nulls += c;
            } else {
                counts.merge(kv[0], c, Long::sum);
            }
        }
        return new ColumnTally(column, type, rows, nulls, counts, false);
    }
}
