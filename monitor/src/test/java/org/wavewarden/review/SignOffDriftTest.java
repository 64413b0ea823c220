package org.wavewarden.review;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.deliver.Alerts;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.pipeline.WaveJudge;

import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** A rerun of a signed-off wave is compared with the run the release was signed on. */
class SignOffDriftTest {

    static final SignOff SIGNED = new SignOff(5, "harrowmere", "2024", "r1", "Ines Calloway",
            Instant.parse("2026-03-02T14:30:00Z"), 41, "cfg", "1.0", false, null, List.of());

    static Finding shift(String variable, Verdict verdict, double estimate, double p, double q) {
        return new Finding(variable, FindingKind.SHIFT, "Welch t", 2.0, p, q,
                new Finding.Effect("mean difference", estimate, estimate - 1, estimate + 1, 2), verdict, 400L, 410L,
                variable + " moved", null);
    }

    static final List<Finding> SIGNED_FINDINGS = List.of(
            shift("tenure", Verdict.STABLE, 0.4, 0.30, 0.45),
            shift("rent", Verdict.MATERIAL, 5.0, 1e-6, 1e-5),
            Finding.dataQuality("occupation", FindingKind.MISSING_CODE, 400L, 410L, "blank answers", null));

    @Test
    void theSameFindingsRecomputedAreNoChange() {
        List<Finding> again = List.of(
                shift("tenure", Verdict.STABLE, 0.4 * (1 + 1e-14), 0.30, 0.45),
                shift("rent", Verdict.MATERIAL, 5.0, 1e-6, 1e-5),
                Finding.dataQuality("occupation", FindingKind.MISSING_CODE, 400L, 410L, "blank answers", null));
        assertEquals(Optional.empty(), SignOffDrift.check(SIGNED, SIGNED_FINDINGS, again));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({
            // case,                              tenure verdict, tenure estimate, rent p, change listed
            "another verdict,                     MATERIAL,       0.4,             1e-6,   tenure SHIFT STABLE -> MATERIAL",
            "an estimate beyond rounding,         STABLE,         0.41,            1e-6,   tenure SHIFT STABLE -> STABLE (numbers changed)",
            "a p-value beyond rounding,           STABLE,         0.4,             2e-6,   rent SHIFT MATERIAL -> MATERIAL (numbers changed)",
    })
    void aChangeAReaderActsOnIsSaidLoudly(String what, Verdict tenureVerdict, double tenureEstimate, double rentP,
                                          String listed) {
        List<Finding> rerun = List.of(
                shift("tenure", tenureVerdict, tenureEstimate, 0.30, 0.45),
                shift("rent", Verdict.MATERIAL, 5.0, rentP, 1e-5),
                Finding.dataQuality("occupation", FindingKind.MISSING_CODE, 400L, 410L, "blank answers", null));
        Finding f = SignOffDrift.check(SIGNED, SIGNED_FINDINGS, rerun).orElseThrow();
        assertEquals(FindingKind.SIGNED_WAVE_CHANGED, f.kind());
        assertEquals(WaveJudge.EMPTY_WAVE_SUBJECT, f.variable());
        assertNull(f.verdict());
        assertEquals("Wave 2024 was signed off by Ines Calloway on 2026-03-02 on other numbers: 1 finding changed ("
                + listed + "). The release rests on findings that no longer hold.", f.sentence());
        assertTrue(Alerts.worthAPerson(f), "it is alerted");
    }

    @Test
    void findingsAddedAndGoneAreCountedAndTheFirstFewListed() {
        List<Finding> rerun = List.of(
                shift("rent", Verdict.UNCERTAIN, 1.0, 0.04, 0.2),
                shift("household_size", Verdict.MATERIAL, 0.9, 1e-4, 1e-3),
                shift("commute_minutes", Verdict.MATERIAL, 7, 1e-4, 1e-3));
        Finding f = SignOffDrift.check(SIGNED, SIGNED_FINDINGS, rerun).orElseThrow();
        assertEquals("Wave 2024 was signed off by Ines Calloway on 2026-03-02 on other numbers: 5 findings changed"
                + " (tenure SHIFT STABLE -> (none); rent SHIFT MATERIAL -> UNCERTAIN; occupation MISSING_CODE"
                + " present -> (none); and 2 more). The release rests on findings that no longer hold.", f.sentence());
        @SuppressWarnings("unchecked")
        Map<String, Object> detail = (Map<String, Object>) f.detail();
        assertEquals(5L, detail.get("signOffId"));
        assertEquals(41L, detail.get("signedRunId"));
        List<?> changes = (List<?>) detail.get("changes");
        assertEquals(5, changes.size());
        assertEquals(new SignOffDrift.Change("commute_minutes", "SHIFT", "(none)", "MATERIAL", "added"),
                changes.get(4));
    }

    @Test
    void anEarlierSignedWaveChangedFindingIsNotItselfAChange() {
        Finding earlier = Finding.dataQuality(WaveJudge.EMPTY_WAVE_SUBJECT, FindingKind.SIGNED_WAVE_CHANGED, null,
                null, "Wave 2024 was signed off ...", null);
        List<Finding> signedWithIt = new java.util.ArrayList<>(SIGNED_FINDINGS);
        signedWithIt.add(earlier);
        assertEquals(Optional.empty(), SignOffDrift.check(SIGNED, signedWithIt, SIGNED_FINDINGS));
    }

    @ParameterizedTest(name = "{0} and {1} moved: {2}")
    @CsvSource(nullValues = "null", value = {
            "0.5,      0.5,               false",
            "0.5,      0.5000000000001,   false",
            "0.5,      0.500000000002,    true",
            "0.0,      0.0,               false",
            "0.0,      1e-300,            true",
            "null,     null,              false",
            "null,     0.1,               true",
            "NaN,      NaN,               false",
    })
    void numbersAreTheSameWithinRoundingOfARecomputation(Double before, Double after, boolean moved) {
        assertEquals(moved, SignOffDrift.moved(before, after));
    }
}
