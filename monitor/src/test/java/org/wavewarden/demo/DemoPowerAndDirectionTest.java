package org.wavewarden.demo;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.deliver.FindingsReport;
import org.wavewarden.judge.Against;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The demo household survey end to end: the boat owners' mooring fee, with 30 to 40 answers a wave (288 in the
 * booster), can never be shown STABLE within the default Hedges' g 0.2 and says so in every wave; the height
 * sentinel 999 that disappears again is reported as cleared, not as a MATERIAL change.
 */
class DemoPowerAndDirectionTest {

    @TempDir
    static Path out;
    static final Map<String, FindingsReport> BY_WAVE = new LinkedHashMap<>();

    @BeforeAll
    static void runTheDemo() {
        DemoRun.Outcome outcome = DemoRun.run(out, new PrintWriter(new StringWriter(), true));
        outcome.reports().forEach(r -> BY_WAVE.put(r.wave(), r));
    }

    /**
     * The finding against the previous wave (the run's main baseline): the household demo also judges each wave
     * against the same quarter a year back, whose findings name that baseline in {@link Finding#against}.
     */
    static Optional<Finding> finding(String wave, String variable, FindingKind kind) {
        return BY_WAVE.get(wave).findings().stream().filter(f -> f.variable().equals(variable) && f.kind() == kind
                && f.against() == null).findFirst();
    }

    static List<Finding> againstAYearBack(String wave, String variable, FindingKind kind) {
        return BY_WAVE.get(wave).findings().stream().filter(f -> f.variable().equals(variable) && f.kind() == kind
                && f.against() != null).toList();
    }

    @Test
    void theBoatOwnersAreTooFewToJudgeInEveryWave() {
        List<String> compared = BY_WAVE.keySet().stream().skip(1).toList();
        assertEquals(6, compared.size());
        for (String wave : compared) {
            Finding f = finding(wave, "mooring_fee", FindingKind.SHIFT).orElseThrow();
            assertEquals(Verdict.UNCERTAIN, f.verdict(), wave + ": " + f.sentence());
            assertFalse(f.effect().resolvable(), wave);
            assertTrue(f.effect().minimumDetectable() > f.effect().threshold(), wave);
            assertTrue(f.sentence().startsWith(String.format(java.util.Locale.ROOT, "Too few answers to judge: with"
                    + " %,d and %,d answers, these waves can only show changes of at least ", f.nBaseline(),
                    f.nCurrent())), f.sentence());
            assertTrue(f.sentence().contains("cannot be resolved at this sample size."), f.sentence());
            // The same quarter a year back has as few boat owners: too few there as well, and said under its name.
            for (Finding y : againstAYearBack(wave, "mooring_fee", FindingKind.SHIFT)) {
                assertEquals(Verdict.UNCERTAIN, y.verdict(), wave + ": " + y.sentence());
                assertFalse(y.effect().resolvable(), wave);
                assertTrue(y.sentence().startsWith("A" + Against.phrase(y.against()).substring(1) + ": "), y.sentence());
                assertTrue(y.sentence().contains("Too few answers to judge: with"), y.sentence());
            }
        }
        assertTrue(compared.stream().anyMatch(w -> !againstAYearBack(w, "mooring_fee", FindingKind.SHIFT).isEmpty()),
                "the later waves are also judged against the same quarter a year back");
    }

    /**
     * The planted fee rise of 2025-Q2 on 35 and 37 answers: the significance boundary for those sizes (the
     * computation of power.t.test for unequal groups, R 4.2.2, with pt/qt and uniroot, see
     * MinimumDetectableEffectTest) is 0.468556. Tolerance 2%: g's interval carries Hedges' correction J (1.1% at 70
     * degrees of freedom), and near g = 0 its limits sit at the normal quantile where the boundary uses the t one.
     */
    @ParameterizedTest(name = "{0}: MDE {1} on {2} and {3} answers")
    @CsvSource({"2025-Q2, 0.468556, 35, 37"})
    void theDetectableChangeIsTheSignificanceBoundary(String wave, double boundary, long nB, long nC) {
        Finding f = finding(wave, "mooring_fee", FindingKind.SHIFT).orElseThrow();
        assertEquals(nB, f.nBaseline());
        assertEquals(nC, f.nCurrent());
        assertEquals("Hedges' g", f.effect().name());
        assertEquals(boundary, f.effect().minimumDetectable(), 0.02 * boundary);
    }

    /**
     * Each planted sentinel that disappears again (demo-data/manifest.yaml, shares measured with R 4.2.2): 999 for
     * height in 2.69% of the 2024-Q3 interviews and 1.98% of 2025-Q2's, 1900-01-01 for the move-in date in 2.47% of
     * 2024-Q4's. Cohen's h of a fall from p to none, 2 asin(sqrt(0)) - 2 asin(sqrt(p)) (R 4.2.2), is beyond 0.2
     * each time, so the verdict rule alone made every one MATERIAL.
     */
    @ParameterizedTest(name = "{0} {1}: {2}% to none, h {3}")
    @CsvSource({
            "2024-Q4, height_cm,     2.7, -0.3295",   // R 4.2.2: -2 * asin(sqrt(0.0269))
            "2025-Q3, height_cm,     2.0, -0.2824",   // R 4.2.2: -2 * asin(sqrt(0.0198))
            "2025-Q1, move_in_date,  2.5, -0.3156",   // R 4.2.2: -2 * asin(sqrt(0.0247))
    })
    void aSentinelThatDisappearedIsCleared(String wave, String variable, String percent, double h) {
        Finding f = finding(wave, variable, FindingKind.MISSING_RATE_CHANGE).orElseThrow(
                () -> new AssertionError(BY_WAVE.get(wave).findings().toString()));
        assertEquals(Verdict.CLEARED, f.verdict(), f.sentence());
        // The detector names the reason by what it found; the code itself is in the sentinel finding before.
        assertTrue(f.sentence().matches("Cleared: the share missing \\(disguised: [a-z ]+\\) fell from " + percent
                + "% of rows to none this wave \\(-" + percent + " points\\); nothing is left to look at: CLEARED\\."),
                f.sentence());
        assertEquals(h, f.effect().estimate(), 0.005, "shares rounded to 3 digits in the manifest");
    }
}
