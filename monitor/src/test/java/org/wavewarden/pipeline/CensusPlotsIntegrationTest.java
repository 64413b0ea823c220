package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Population;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Harrowmere County's dwelling census and a survey drawn as a sample of the very same rows, both judged on a real
 * PostgreSQL server. A census counted every dwelling, so nothing it stores or draws may carry a sampling interval:
 * every interval in its findings' details is its estimate, and its digest draws points without whiskers, error bars
 * or trend bands. The sample of the same rows keeps all of them, which shows that the checks below can see them.
 */
class CensusPlotsIntegrationTest {

    /*
     * 3,000 dwellings in both waves. Between them rents rise by 60 (on 500 to 799), more dwellings are let than
     * owned, inspection dates move a year later, a few more dwellings leave the floor area blank, and the link of
     * floor area to rooms weakens: one change of every kind whose detail carries intervals (location, categories,
     * dates, missing rates, a relationship). Garden sizes keep their centre (0 to 99 evenly, then half 0 to 9 and half
     * 90 to 99: the same mean and, by symmetry, a Cliff's delta of exactly 0) but change their shape.
     */
    static final String WAVES = """
            CREATE SCHEMA dwellings;
            CREATE TABLE dwellings.w_1 AS SELECT g AS dwelling_id, 500 + (g * 37) % 300 AS rent,
              (ARRAY['owned', 'owned', 'let', 'council'])[1 + g % 4] AS tenure,
              DATE '2019-01-01' + (g * 53) % 700 AS inspected,
              CASE WHEN g % 25 = 0 THEN NULL ELSE 40 + g % 90 + (g * 13) % 20 END AS floor_area,
              1 + (g % 90) / 15 AS rooms, (g * 37) % 100 AS garden
            FROM generate_series(1, 3000) g;
            CREATE TABLE dwellings.w_2 AS SELECT g AS dwelling_id, 560 + (g * 37) % 300 AS rent,
              (ARRAY['owned', 'let', 'let', 'council'])[1 + g % 4] AS tenure,
              DATE '2020-01-01' + (g * 53) % 700 AS inspected,
              CASE WHEN g % 25 = 0 OR g % 30 = 1 THEN NULL ELSE 40 + (g * 7) % 90 + g % 20 END AS floor_area,
              1 + (g % 90) / 15 AS rooms,
              CASE WHEN g % 2 = 0 THEN ((g / 2) * 37) % 10 ELSE 90 + ((g / 2) * 37) % 10 END AS garden
            FROM generate_series(1, 3000) g;
            """;

    static final String DATASET = """
              - name: %s
                tablePattern: dwellings.w_{wave}
                population: %s
                exclude: [dwelling_id]
                variables:
                  - {name: rent, kind: continuous}
                  - {name: tenure, kind: categorical}
                  - {name: inspected, kind: date}
                  - {name: floor_area, kind: continuous}
                  - {name: rooms, kind: ordinal}
                  - {name: garden, kind: continuous}
                relationships: [{x: floor_area, y: rooms, threshold: 0.15}]
            """;

    @TempDir
    static Path dir;
    static Session session;
    static WardenConfig cfg;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("census_plots");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute(WAVES);
        }
        cfg = ConfigLoader.parse("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_census_plots}
                datasets:
                """.formatted(url) + DATASET.formatted("dwelling_census", "census")
                + DATASET.formatted("dwelling_survey", "sample"));
        session = Session.open(cfg, null, Map.of());
        session.migrate();
    }

    @AfterAll
    static void close() {
        session.close();
    }

    /** Judges both waves of {@code d}, the second into {@code out} (findings.json); its digest as HTML. */
    static String judged(DatasetConfig d, Path out) {
        WaveJudge judge = new WaveJudge(session, Clock.systemUTC());
        judge.judge(d, "1", null, null, n -> { });
        var report = judge.judge(d, "2", null, out, n -> { }).report();
        return new DigestAssembler(session).html(d, List.of(report), Instant.parse("2026-06-30T08:00:00Z"));
    }

    /** Every interval in a JSON tree: each object's pair of limits, {ciLow, ciHigh} or {low, high}. */
    static List<double[]> intervals(JsonNode node, List<double[]> out) {
        if (node.isObject()) {
            for (String[] pair : new String[][] {{"ciLow", "ciHigh"}, {"low", "high"}}) {
                if (node.hasNonNull(pair[0]) && node.hasNonNull(pair[1]) && node.get(pair[0]).isNumber()
                        && node.get(pair[1]).isNumber()) {
                    out.add(new double[] {node.get(pair[0]).asDouble(), node.get(pair[1]).asDouble()});
                }
            }
        }
        node.forEach(child -> intervals(child, out));
        return out;
    }

    /** The findings' details as stored in findings.json, and the kinds of the findings that have one. */
    static JsonNode findings(Path out) throws Exception {
        return Json.mapper().readTree(Files.readString(out.resolve("findings.json"))).get("findings");
    }

    static Set<String> kindsWithDetail(JsonNode findings) {
        Set<String> kinds = new TreeSet<>();
        findings.forEach(f -> {
            if (f.hasNonNull("detail")) {
                kinds.add(f.get("kind").asText());
            }
        });
        return kinds;
    }

    static List<double[]> detailIntervals(JsonNode findings) {
        List<double[]> out = new ArrayList<>();
        findings.forEach(f -> intervals(f.path("detail"), out));
        return out;
    }

    /** The digest's drawn intervals: whisker and error-bar lines, and the bands of the trends. */
    static int drawnIntervals(String html) {
        Matcher m = Pattern.compile("<line class=\"ci |<polygon class=\"band\"").matcher(html);
        int n = 0;
        while (m.find()) {
            n++;
        }
        return n;
    }

    static int drawnPlots(String html) {
        Matcher m = Pattern.compile("<svg").matcher(html);
        int n = 0;
        while (m.find()) {
            n++;
        }
        return n;
    }

    @Test
    void aCensusStoresAndDrawsNoSamplingIntervalWhileASampleOfTheSameRowsDoes() throws Exception {
        DatasetConfig census = cfg.datasets().get(0);
        DatasetConfig survey = cfg.datasets().get(1);
        assertEquals(Population.CENSUS, census.population());
        assertEquals(Population.SAMPLE, survey.population());
        Path censusOut = dir.resolve("census");
        Path surveyOut = dir.resolve("survey");
        String censusHtml = judged(census, censusOut);
        String surveyHtml = judged(survey, surveyOut);

        JsonNode counted = findings(censusOut);
        JsonNode sampled = findings(surveyOut);
        Set<String> expectedKinds = Set.of(FindingKind.SHIFT.name(), FindingKind.MISSING_RATE_CHANGE.name(),
                FindingKind.SHAPE_CHANGE.name(), FindingKind.RELATIONSHIP_CHANGE.name());
        assertTrue(kindsWithDetail(counted).containsAll(expectedKinds), kindsWithDetail(counted).toString());
        assertEquals(kindsWithDetail(sampled), kindsWithDetail(counted), "the same findings, only read differently");

        List<double[]> censusIntervals = detailIntervals(counted);
        assertTrue(censusIntervals.size() > 10, "the census's details hold their estimates' limits: "
                + censusIntervals.size());
        for (double[] limits : censusIntervals) {
            assertEquals(limits[0], limits[1], "a census interval of no width: " + limits[0] + " to " + limits[1]);
        }
        assertTrue(detailIntervals(sampled).stream().anyMatch(l -> l[1] > l[0]),
                "the sample's details carry intervals of positive width");

        assertTrue(drawnPlots(censusHtml) >= 4, "the census's alerts are drawn: " + drawnPlots(censusHtml));
        assertEquals(0, drawnIntervals(censusHtml), "no whisker, error bar or band in a census's digest");
        assertFalse(censusHtml.contains("with confidence intervals") || censusHtml.contains("with its confidence"
                + " interval"), "no chart of a census names intervals it does not draw");
        assertTrue(drawnIntervals(surveyHtml) > 0, "the sample's digest draws its intervals");
    }
}
