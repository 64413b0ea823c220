package org.wavewarden.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.Session;
import org.wavewarden.pipeline.WaveJudge;
import org.wavewarden.store.CaseLists;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo household survey judged end to end on an embedded PostgreSQL server, held to the plants of "where it
 * changed" in {@code demo-data/manifest.yaml}: the rise in low water pressure is found in Kestle Point, the 999
 * heights are traced to interviewer H17 with the exact households to send back, the rise in neighbourhood safety is
 * shown as a change of interview mode rather than of neighbourhoods, and the hours of heating are a change against the
 * previous quarter but not against the same quarter a year back.
 *
 * <p>Reference values are those of {@code demo-data/measure-household-breakdowns.R}: R 4.2.2 with survey 4.1.1
 * (svyby(~y, ~domain, svydesign(ids = ~1), svymean) in each wave, V(change) = V(after) + V(before), and
 * regTermTest(svyglm(y ~ domain * wave), ~domain:wave, method = "Wald", df = Inf) on the two waves stacked with the
 * wave as stratum).
 */
class DemoBreakdownPlantsTest {

    private static final String DATASET = "harrowmere-household";

    @TempDir
    static Path out;
    static final Map<String, FindingsReport> byWave = new LinkedHashMap<>();
    /** Every case list of each household wave's current run. */
    static final Map<String, List<CaseLists.CaseList>> caseLists = new LinkedHashMap<>();
    static JsonNode manifest;

    @BeforeAll
    static void runTheDemo() throws Exception {
        DemoRun.Outcome outcome = DemoRun.run(out, new PrintWriter(new StringWriter(), true),
                DemoBreakdownPlantsTest::readCaseLists);
        outcome.reports().forEach(r -> byWave.put(r.wave(), r));
        manifest = new ObjectMapper(new YAMLFactory()).readTree(Files.readString(Path.of("..", "demo-data",
                "manifest.yaml")));
    }

    static void readCaseLists(Session s) {
        CaseLists lists = new CaseLists(s.store().jdbi(), s.config().results().schema());
        var household = s.config().dataset(DATASET);
        for (var w : new WaveJudge(s, Clock.systemUTC()).waves(household)) {
            long run = s.store().currentRun(DATASET, w.wave()).orElseThrow().runId();
            caseLists.put(w.wave(), lists.forRun(run));
        }
    }

    // ---- the digests link the case lists --------------------------------------------------------------------

    @Test
    void everyCaseListLinkOfTheDatasetsDigestsLeadsToItsFile() throws Exception {
        java.util.regex.Pattern csv = java.util.regex.Pattern.compile("(?:href=\"|\\]\\()([^\"()]+\\.csv)");
        for (String digest : List.of("digest.html", "digest.md")) {
            java.util.regex.Matcher m = csv.matcher(Files.readString(out.resolve(digest)));
            int links = 0;
            while (m.find()) {
                links++;
                assertTrue(Files.isRegularFile(out.resolve(m.group(1)).normalize()), digest + " links " + m.group(1));
            }
            assertTrue(links >= 2, digest + " links at least the interviewer plant's two case lists: " + links);
        }
    }

    // ---- the district plant ---------------------------------------------------------------------------------

    @Test
    void lowWaterPressureRisesInKestlePointAndBarelyElsewhere() {
        Finding f = mainBaseline("2025-Q2", "water_pressure_low", FindingKind.SHIFT);
        assertEquals(Verdict.MATERIAL, f.verdict(), f.sentence());
        Breakdown b = breakdown(f, "district");
        DomainChange first = b.domains().get(0);
        assertEquals("KES", first.domain(), "ranked first by contribution");
        // R 4.2.2, survey 4.1.1: svyby(~I(water_pressure_low == "yes"), ~district, svydesign(ids = ~1), svymean)
        assertEquals(0.068966, first.before(), 1e-6);
        assertEquals(0.249448, first.after(), 1e-6);
        assertEquals(0.180483, first.change(), 1e-6);
        assertEquals(0.023686, first.se(), 1e-5);
        assertEquals(0.019547, first.contribution(), 1e-5); // Kitagawa: mean share x change
        assertTrue(first.qValue() < 0.05, "Kestle Point's own rise is significant");
        for (DomainChange d : b.domains().subList(1, b.domains().size())) {
            assertTrue(d.qValue() > 0.05, d.domain() + "'s own change is not: " + d);
            assertTrue(Math.abs(d.change() - 0.01) < 0.002, d.domain() + " rises about one point: " + d.change());
        }
        assertNotNull(b.elsewhere());
        assertEquals(0.010218, b.elsewhere(), 1e-6); // R: the same over the five other districts pooled
        assertEquals(0.028583, b.overall(), 1e-6);
        assertEquals(-0.000071, b.composition(), 5e-6);
        // R: regTermTest(svyglm(y ~ district * wave), ~district:wave, method = "Wald", df = Inf)
        assertEquals(48.4135, b.statistic(), 1e-3);
        assertEquals(5, b.df());
        assertEquals(2.924e-09, b.pValue(), 1e-11);
        assertTrue(f.sentence().contains("KES"), f.sentence());
    }

    // ---- the interviewer plant ------------------------------------------------------------------------------

    @ParameterizedTest(name = "{0}: H17 keyed {2} of {1} interviews as 999")
    @CsvSource({
        // wave,   H17's interviews, with 999, H17's share   (R 4.2.2: table(interviewer_id, height_cm == "999"))
        "2024-Q3, 231, 105, 0.4545",
        "2025-Q2, 237,  83, 0.3502"})
    void interviewerH17IsFlaggedForTheHeightsNotMeasuredWithTheExactCaseList(String wave, long interviews,
                                                                             long sentinels, double share) {
        List<Finding> flagged = byWave.get(wave).findings().stream()
                .filter(f -> f.kind() == FindingKind.INTERVIEWER_OUTLIER && f.variable().equals("height_cm"))
                .toList();
        assertEquals(1, flagged.size(), "only H17 stands out on height_cm: " + flagged);
        Finding f = flagged.get(0);
        JsonNode flag = Json.mapper().valueToTree(f.detail());
        assertEquals("H17", flag.path("interviewer").asText(), flag.toString());
        assertEquals(interviews, flag.path("interviews").asLong(), flag.toString());
        assertEquals(share, flag.path("value").asDouble(), 5e-5, flag.toString());
        assertEquals(0.0, flag.path("rest").asDouble(), 1e-12, "no other interviewer keys 999");
        assertTrue(f.sentence().contains("H17"), f.sentence());

        JsonNode plant = plant("interviewer-not-measured-" + wave);
        CaseLists.CaseList cases = caseLists.get(wave).stream()
                .filter(c -> c.kind().equals(FindingKind.INTERVIEWER_OUTLIER.name()) && c.variable().equals("height_cm"))
                .findFirst().orElseThrow(() -> new AssertionError("no case list for H17 in " + wave));
        assertEquals(sentinels, cases.total());
        assertEquals(plant.path("cases").path("total").asLong(), cases.total());
        List<String> expected = new ArrayList<>();
        plant.path("cases").path("keys").forEach(k -> expected.add(k.asText()));
        assertEquals(expected, cases.rows().stream().map(CaseLists.CaseRow::respondentKey).toList(),
                "exactly the households whose height H17 keyed as 999, in key order");
        assertTrue(cases.rows().stream().allMatch(r -> "999".equals(r.value())), "the offending value only");
    }

    // ---- the mode plant -------------------------------------------------------------------------------------

    @Test
    void neighbourhoodSafetyRisesBecauseTheModeMixChangedNotWithinAnyMode() {
        Finding f = mainBaseline("2025-Q1", "neighbourhood_safe", FindingKind.SHIFT);
        assertEquals(Verdict.MATERIAL, f.verdict(), f.sentence());
        Breakdown b = breakdown(f, "interview_mode");
        // R 4.2.2, survey 4.1.1: svyby(~neighbourhood_safe, ~interview_mode, svydesign(ids = ~1), svymean)
        assertEquals(0.501031, b.overall(), 1e-6);
        assertEquals(0.486139, b.composition(), 1e-5, "the mode mix carries the rise");
        assertEquals(0.2641, b.statistic(), 1e-3); // regTermTest Wald chi-square, 2 df
        assertEquals(2, b.df());
        assertEquals(0.8763, b.pValue(), 1e-3);
        for (DomainChange d : b.domains()) {
            assertTrue(d.qValue() > 0.05, d.domain() + " did not change within itself: " + d);
        }
        DomainChange telephone = b.domains().stream().filter(d -> d.domain().equals("telephone")).findFirst()
                .orElseThrow();
        assertEquals(0.030147, telephone.change(), 1e-6);
        assertEquals(0.026478, telephone.se(), 1e-5);
    }

    // ---- the seasonal plant ---------------------------------------------------------------------------------

    @ParameterizedTest(name = "{0}: MATERIAL against the previous quarter, STABLE against {1}")
    @CsvSource({"2025-Q1, 2024-Q1", "2025-Q2, 2024-Q2", "2025-Q3, 2024-Q3"})
    void heatingHoursChangeWithTheSeasonButNotAgainstTheSameQuarterAYearBack(String wave, String yearBack) {
        Finding previous = mainBaseline(wave, "heating_hours", FindingKind.SHIFT);
        assertEquals(Verdict.MATERIAL, previous.verdict(), previous.sentence());
        Finding sameQuarter = against(wave, yearBack, "heating_hours", FindingKind.SHIFT)
                .orElseThrow(() -> new AssertionError("no comparison of heating_hours against " + yearBack));
        assertEquals(Verdict.STABLE, sameQuarter.verdict(), sameQuarter.sentence());
        assertTrue(sameQuarter.against().contains(yearBack), sameQuarter.against());
    }

    // ---- support --------------------------------------------------------------------------------------------

    /** The finding against the run's first baseline (the previous wave). */
    static Finding mainBaseline(String wave, String variable, FindingKind kind) {
        FindingsReport r = byWave.get(wave);
        return r.findings().stream()
                .filter(f -> f.variable().equals(variable) && f.kind() == kind)
                .filter(f -> f.against() == null || f.against().startsWith(r.againstWave()))
                .findFirst().orElseThrow(() -> new AssertionError("no " + kind + " of " + variable + " in " + wave
                        + " against " + r.againstWave()));
    }

    /** The finding made against a named baseline judged alongside the first. */
    static Optional<Finding> against(String wave, String baseline, String variable, FindingKind kind) {
        return byWave.get(wave).findings().stream()
                .filter(f -> f.variable().equals(variable) && f.kind() == kind)
                .filter(f -> f.against() != null && f.against().startsWith(baseline))
                .findFirst();
    }

    static Breakdown breakdown(Finding f, String column) {
        return f.breakdowns().stream().filter(b -> b.column().equals(column)).findFirst()
                .orElseThrow(() -> new AssertionError("no breakdown by " + column + ": " + f.breakdowns()));
    }

    static JsonNode plant(String id) {
        for (JsonNode p : manifest.get("plants")) {
            if (p.get("id").asText().equals(id)) {
                return p;
            }
        }
        throw new AssertionError("no plant " + id + " in the manifest");
    }
}
