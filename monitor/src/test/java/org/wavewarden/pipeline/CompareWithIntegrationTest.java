package org.wavewarden.pipeline;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/** What a wave is compared against: the previous wave, a fixed baseline, or the pooled last k waves. */
class CompareWithIntegrationTest {

    @TempDir
    static Path dir;
    static String url;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("compare_with");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("c.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
        for (int w = 1; w <= 3; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
    }

    static JudgedWave judge(String compareWith, String against) {
        WardenConfig c = ConfigLoader.parse(SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    compareWith: " + compareWith));
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            return new WaveJudge(s, Clock.systemUTC()).judge(c.datasets().get(0), "w3", against, null, null);
        }
    }

    static Finding score(JudgedWave j) {
        return j.report().findings().stream().filter(f -> f.variable().equals("score") && f.kind() == FindingKind.SHIFT)
                .findFirst().orElseThrow();
    }

    @Test
    void aFixedBaselineWaveIsUsed() {
        JudgedWave j = judge("{baseline: w1}", null);
        assertEquals("w1", j.report().againstWave());
        assertEquals(600, score(j).nBaseline());
    }

    @Test
    void thePooledLastWavesAreMerged() {
        JudgedWave j = judge("{pooledLast: 2}", null);
        assertEquals("pooled w1 .. w2", j.report().againstWave());
        assertEquals(1200, score(j).nBaseline());
    }

    @Test
    void everyWaveIsAlsoTestedAgainstAConfiguredReference() {
        String yaml = SmallSurvey.config(url, null)
                .replace("        kind: continuous\n        unit: points",
                        "        kind: continuous\n        unit: points\n        reference: {mean: 50}")
                .replace("        kind: categorical\n",
                        "        kind: categorical\n        reference: {shares: {north: 0.25, south: 0.25, east: 0.25}}\n");
        WardenConfig c = ConfigLoader.parse(yaml);
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            WaveJudge judge = new WaveJudge(s, Clock.systemUTC());
            JudgedWave w3 = judge.judge(c.datasets().get(0), "w3", null, null, null);
            Finding score = find(w3, "score");
            assertEquals("one-sample t", score.test());
            assertEquals("MATERIAL", String.valueOf(score.verdict()), score.sentence());
            assertEquals(null, score.nBaseline());
            Finding region = find(w3, "region");
            // Regions are drawn uniformly, so nothing is significant; but 600 answers are too few to show the shares
            // within w 0.1 of the reference: the honest verdict is UNCERTAIN, not STABLE.
            assertEquals("UNCERTAIN", String.valueOf(region.verdict()), region.sentence());
            assertEquals("chi-square goodness of fit", region.test().toLowerCase(java.util.Locale.ROOT)
                    .replace("pearson ", ""));
            // The first wave has nothing to be compared with, but it still meets its reference.
            JudgedWave w1 = judge.judge(c.datasets().get(0), "w1", null, null, null);
            assertEquals("STABLE", String.valueOf(find(w1, "score").verdict()), find(w1, "score").sentence());
        }
    }

    @Test
    void aWeightColumnIsKeptOutOfTheComparisonAndItsSumsStoredInTheSummary() {
        WardenConfig c = ConfigLoader.parse(SmallSurvey.config(url, null).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]\n    weightColumn: satisfied"));
        try (Session s = Session.open(c, null, Map.of())) {
            s.migrate();
            JudgedWave j = new WaveJudge(s, Clock.systemUTC()).judge(c.datasets().get(0), "w2", null, null, null);
            assertEquals(0, j.report().findings().stream().filter(f -> f.variable().equals("satisfied")).count());
            var profile = s.store().latestSummary("small-survey", "w2").orElseThrow().profile();
            double[] north = profile.weights().get("region").get("north");
            long northCount = profile.columns().get("region").valueCounts().get("north");
            // satisfied runs 1..5, so the weight sum lies between the count and five times it.
            assertEquals(true, north[0] >= northCount && north[0] <= 5 * northCount, java.util.Arrays.toString(north));
        }
    }

    static Finding find(JudgedWave j, String variable) {
        return j.report().findings().stream().filter(f -> f.variable().equals(variable)
                && f.kind() == FindingKind.REFERENCE).findFirst().orElseThrow(() -> new AssertionError(
                "no REFERENCE finding for " + variable));
    }

    @Test
    void anExplicitAgainstOverridesTheRule() {
        JudgedWave j = judge("{pooledLast: 2}", "w1");
        assertEquals("w1", j.report().againstWave());
        assertEquals(600, score(j).nBaseline());
    }
}
