package org.wavewarden.store;

import org.junit.jupiter.api.Test;
import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.Session;
import org.wavewarden.profile.WaveProfile;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.time.Instant;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * A finding's breakdowns are part of the run: written to the results schema with the finding and read back equal,
 * every number, label and note, a missing q-value or "elsewhere" staying missing and a p-value that could not be
 * computed staying not a number.
 */
class StoredBreakdownsTest {

    @Test
    void aRunWrittenAndReadBackKeepsEveryFindingsBreakdownsEqual() throws Exception {
        String url = TestDatabase.freshDatabase("stored_breakdowns");
        WardenConfig cfg = ConfigLoader.parse(SmallSurvey.config(url, ""));
        DomainChange kes = new DomainChange("KES \"<b>\" \u00e9", 210, 230, 0.121, 0.301, 0.18, 0.031, 0.119, 0.241,
                1.2e-8, 7.2e-8, 0.16, 0.17, 0.0297);
        DomainChange gul = new DomainChange("GUL", 400, 380, 0.2, 0.21, 0.01, 0.02, -0.03, 0.05, Double.NaN,
                Double.NaN, 0.3, 0.29, 0.00295);
        Breakdown district = new Breakdown("district", "owns_car", "share answering 'yes'", DomainMeasure.Kind.SHARE,
                "points", "design-based (linearised over all PSUs, strata)", List.of(kes, gul), 0.044, 0.0117, 25.3,
                1, 4.9e-7, null, 0.01, List.of("MOR"), 7, 2, 19).withQValue(2.1e-6);
        Breakdown mode = new Breakdown("interview_mode", "owns_car", "share answering 'yes'",
                DomainMeasure.Kind.SHARE, "points", "unweighted", List.of(gul), 0.044, 0.0, 0.4, 0, 0.52, null, null,
                List.of(), 0, 0, 0);
        Finding withBreakdowns = new Finding("owns_car", FindingKind.SHIFT, "two-proportion z", 4.1, 0.00004,
                0.0004, new Finding.Effect("share difference (points)", 4.4, 2.3, 6.5, 3.0), Verdict.MATERIAL, 1900L,
                1950L, "Share answering 'yes' rose.", null).withBreakdowns(List.of(district, mode));
        Finding without = Finding.dataQuality("height_cm", FindingKind.HEAPING, 1900L, 1950L, "Heaping.", null);
        try (Session s = Session.open(cfg, null, Map.of())) {
            s.migrate();
            Instant now = Instant.parse("2026-03-02T09:15:00Z");
            List<Finding> findings = List.of(withBreakdowns, without);
            long run = s.store().writeRun(new ResultsStore.RunWrite("small-survey", "w2", "w1", "checksum-w2", now,
                            now, 0.05, "BENJAMINI_HOCHBERG", "test", "fingerprint"),
                    new WaveProfile("w2", 0, Map.of(), Map.of()), findings, Alerts.group(findings));
            FindingsReport stored = s.store().storedReport(run).orElseThrow();
            Finding back = stored.findings().stream().filter(f -> f.variable().equals("owns_car")).findFirst()
                    .orElseThrow();
            assertEquals(List.of(district, mode), back.breakdowns());
            assertEquals(withBreakdowns.sentence(), back.sentence());
            assertEquals(List.of(), stored.findings().stream().filter(f -> f.variable().equals("height_cm"))
                    .findFirst().orElseThrow().breakdowns());
        }
    }
}
