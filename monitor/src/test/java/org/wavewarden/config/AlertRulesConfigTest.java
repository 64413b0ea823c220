package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.review.ReviewReason;

import java.time.LocalDate;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A dataset's population, its changes expected ahead and its mute rules, as the configuration declares them: read
 * into records, every bad value refused at its full key path, and the fingerprint moved by what changes judging
 * (the population) and by nothing that only decides what becomes of an alert.
 */
class AlertRulesConfigTest {

    /** Two datasets, so that key paths show the index; the second has an explicit wave order. */
    private static String yaml(String first, String second) {
        return """
                source:
                  jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey"
                  user: reader
                datasets:
                  - name: household
                    table: survey.household
                    waveColumn: wave
                %s
                  - name: register
                    table: survey.dwellings
                    waveColumn: wave
                    waveOrder: [spring-24, autumn-24, spring-25, autumn-25]
                %s
                """.formatted(indent(first), indent(second));
    }

    private static String indent(String block) {
        return block.isEmpty() ? "" : block.strip().indent(4).stripTrailing();
    }

    @Test
    void aDatasetWithoutTheKeysIsASampleWithoutRules() {
        DatasetConfig d = ConfigLoader.parse(yaml("", "")).dataset("household");
        assertEquals(Population.SAMPLE, d.population());
        assertEquals(AlertRules.NONE, d.alertRules());
    }

    @ParameterizedTest(name = "population: {0}")
    @CsvSource({"sample, SAMPLE", "census, CENSUS", "register, REGISTER"})
    void thePopulationIsOneOfThree(String written, Population read) {
        assertEquals(read, ConfigLoader.parse(yaml("population: " + written, "")).dataset("household").population());
    }

    @Test
    void expectedChangesAreReadWithOneWaveOrARange() {
        DatasetConfig d = ConfigLoader.parse(yaml("", """
                expectedChanges:
                  - variable: tenure
                    waves: spring-25
                    reason: planned-change
                    note: the question on tenure was reworded
                    by: Dwellings Register Office
                  - variable: "heating_*"
                    waves: {from: autumn-24, to: spring-25}
                    reason: fix-upstream
                    by: R. Ashdown
                """)).dataset("register");
        assertEquals(List.of(
                new ExpectedChange("tenure", "spring-25", "spring-25", ReviewReason.PLANNED_CHANGE,
                        "the question on tenure was reworded", "Dwellings Register Office"),
                new ExpectedChange("heating_*", "autumn-24", "spring-25", ReviewReason.FIX_UPSTREAM, null,
                        "R. Ashdown")), d.alertRules().expectedChanges());
    }

    @Test
    void muteRulesAreReadWithTheirScopeAndExpiry() {
        DatasetConfig d = ConfigLoader.parse(yaml("""
                mutes:
                  - variable: occupation
                    kind: MISSING_RATE_CHANGE
                    untilDate: 2025-03-31
                    reason: the occupation coding is being redone
                    by: M. Pellow
                  - untilWave: 2025-Q2
                    untilDate: 2025-06-30
                    reason: a known outage of the field system
                    by: M. Pellow
                """, "")).dataset("household");
        assertEquals(List.of(
                new MuteRule("occupation", FindingKind.MISSING_RATE_CHANGE, null, LocalDate.of(2025, 3, 31),
                        "the occupation coding is being redone", "M. Pellow"),
                new MuteRule(null, null, "2025-Q2", LocalDate.of(2025, 6, 30), "a known outage of the field system",
                        "M. Pellow")), d.alertRules().mutes());
    }

    /** Each row: the keys of the first or second dataset (the other left plain), the key path, the message. */
    @ParameterizedTest(name = "{1}")
    @CsvSource(delimiter = '|', textBlock = """
            population: sampel | datasets[0].population | expected one of sample, census, register but got 'sampel' (did you mean 'sample'?)
            population: [census] | datasets[0].population | expected text but got a list
            population: CENSUS | datasets[0].population | expected one of sample, census, register but got 'CENSUS' (did you mean 'census'?)
            expectedChanges: {variable: tenure} | datasets[0].expectedChanges | expected a list of {variable, waves, reason, note, by} but got a mapping
            expectedChanges: [tenure] | datasets[0].expectedChanges[0] | expected a mapping but got text (tenure)
            expectedChanges: [{variable: tenure, waves: 2025-Q1, reason: mode, by: Ann}] | datasets[0].expectedChanges[0].reason | expected one of planned-change, fix-upstream, real-change, no-problem but got "mode"
            expectedChanges: [{variable: tenure, waves: 2025-Q1, reason: planed-change, by: Ann}] | datasets[0].expectedChanges[0].reason | expected one of planned-change, fix-upstream, real-change, no-problem but got "planed-change" (did you mean 'planned-change'?)
            expectedChanges: [{variable: tenure, waves: 2025-Q1, reason: real-change}] | datasets[0].expectedChanges[0].by | missing
            expectedChanges: [{variable: tenure, waves: 2025-Q1, reason: real-change, by: " "}] | datasets[0].expectedChanges[0].by | expected a value but it is empty
            expectedChanges: [{waves: 2025-Q1, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].variable | missing
            expectedChanges: [{variable: tenure, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].waves | missing: expected one wave label, or {from, to} for a range of waves
            expectedChanges: [{variable: tenure, waves: {from: 2025-Q1}, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].waves.to | missing
            expectedChanges: [{variable: tenure, waves: {from: 2025-Q1, to: 2025-Q2, step: 1}, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].waves.step | unknown key; expected one of from, to
            expectedChanges: [{variable: tenure, wave: 2025-Q1, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].wave | unknown key; did you mean 'waves'?
            mutes: [{variable: occupation, untilDate: 2025-03-31, reason: recoding, by: Ann}, {kind: SHIFT, reason: noisy, by: Ann}] | datasets[0].mutes[1].untilWave | missing: a mute ends at a wave (untilWave), a day (untilDate, such as 2025-06-30) or both, whichever comes first
            mutes: [{kind: SHIFTS, untilDate: 2025-03-31, reason: noisy, by: Ann}] | datasets[0].mutes[0].kind | unknown finding kind 'SHIFTS'; did you mean 'SHIFT'?
            mutes: [{kind: SHIFT, untilDate: 31.03.2025, reason: noisy, by: Ann}] | datasets[0].mutes[0].untilDate | expected an ISO date such as 2025-06-30 but got '31.03.2025'
            mutes: [{kind: SHIFT, untilDate: 2025-02-30, reason: noisy, by: Ann}] | datasets[0].mutes[0].untilDate | expected an ISO date such as 2025-06-30 but got '2025-02-30'
            mutes: [{kind: SHIFT, untilDate: 2025-03-31, reason: noisy}] | datasets[0].mutes[0].by | missing
            mutes: [{kind: SHIFT, untilDate: 2025-03-31, by: Ann}] | datasets[0].mutes[0].reason | missing
            expectedChanges: [{variable: tenure, waves: [2025-Q1, 2025-Q2], reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].waves | expected text but got a list
            expectedChanges: [{variable: "", waves: 2025-Q1, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].variable | expected a value but it is empty
            expectedChanges: [{variable: "ten\\ture", waves: 2025-Q1, reason: real-change, by: Ann}] | datasets[0].expectedChanges[0].variable | expected a variable name or a pattern with * but got text with a control character
            mutes: {variable: occupation} | datasets[0].mutes | expected a list of {variable, kind, untilWave, untilDate, reason, by} but got a mapping
            mutes: [{kind: shift, untilDate: 2025-03-31, reason: noisy, by: Ann}] | datasets[0].mutes[0].kind | unknown finding kind 'shift'; did you mean 'SHIFT'?
            mutes: [{kind: SHIFT, untilDate: 2025-03-31, reason: noisy, by: Ann, forever: true}] | datasets[0].mutes[0].forever | unknown key; expected one of variable, kind, untilWave, untilDate, reason, by
            """)
    void aBadValueInTheFirstDatasetNamesItsKey(String keys, String key, String problem) {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(yaml(keys, "")));
        assertEquals(key, e.key(), e.getMessage());
        assertEquals(problem, e.problem());
    }

    /** With an explicit wave order every wave named must be one of it, and a range must run forwards. */
    @ParameterizedTest(name = "{1}")
    @CsvSource(delimiter = '|', textBlock = """
            expectedChanges: [{variable: tenure, waves: sprng-25, reason: real-change, by: Ann}] | datasets[1].expectedChanges[0].waves | wave 'sprng-25' is not in the waveOrder [spring-24, autumn-24, spring-25, autumn-25] (did you mean 'spring-25'?)
            expectedChanges: [{variable: tenure, waves: {from: spring-25, to: autumn-24}, reason: real-change, by: Ann}] | datasets[1].expectedChanges[0].waves.to | wave 'autumn-24' comes before from 'spring-25' in the waveOrder [spring-24, autumn-24, spring-25, autumn-25]
            expectedChanges: [{variable: tenure, waves: {from: 2024, to: spring-25}, reason: real-change, by: Ann}] | datasets[1].expectedChanges[0].waves.from | wave '2024' is not in the waveOrder [spring-24, autumn-24, spring-25, autumn-25]
            mutes: [{variable: tenure, untilWave: winter-25, reason: noisy, by: Ann}] | datasets[1].mutes[0].untilWave | wave 'winter-25' is not in the waveOrder [spring-24, autumn-24, spring-25, autumn-25]
            """)
    void aWaveOutsideAnExplicitOrderIsRefused(String keys, String key, String problem) {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(yaml("", keys)));
        assertEquals(key, e.key(), e.getMessage());
        assertEquals(problem, e.problem());
    }

    /** On the command line a bad rule is refused like any bad config: exit 2, one line, before anything connects. */
    @Test
    void theCommandLineRefusesABadRuleBeforeConnecting(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir)
            throws Exception {
        java.nio.file.Path file = dir.resolve("bad.yaml");
        java.nio.file.Files.writeString(file, yaml("", "expectedChanges: [{variable: tenure, waves: {from: spring-25,"
                + " to: autumn-24}, reason: real-change, by: Ann}]"));
        for (String[] command : new String[][] {{"waves"}, {"alerts", "list"}, {"signoff", "--show"}}) {
            List<String> args = new java.util.ArrayList<>(List.of(command));
            args.addAll(List.of("--config", file.toString()));
            org.wavewarden.testing.CliRun r = org.wavewarden.testing.CliRun.of(args.toArray(String[]::new));
            assertEquals(2, r.exitCode(), r.err());
            assertEquals("config error at datasets[1].expectedChanges[0].waves.to: wave 'autumn-24' comes before from"
                    + " 'spring-25' in the waveOrder [spring-24, autumn-24, spring-25, autumn-25]", r.err().strip());
        }
    }

    @Test
    void aKeyGivenTwiceInARuleIsRefusedAtItsPath() {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(yaml("""
                mutes:
                  - variable: occupation
                    untilDate: 2025-03-31
                    untilDate: 2026-03-31
                    reason: recoding
                    by: Ann
                """, "")));
        assertEquals("datasets[0].mutes[0].untilDate", e.key(), e.getMessage());
        assertTrue(e.problem().startsWith("the key is given twice in the same mapping"), e.problem());
    }

    @Test
    void numberedWavesMayBeWrittenAsNumbers() {
        DatasetConfig d = ConfigLoader.parse(yaml("expectedChanges: [{variable: score, waves: {from: 3, to: 4},"
                + " reason: fix-upstream, by: Ann}]\nmutes: [{variable: score, untilWave: 5, reason: noisy, by: Ann}]",
                "")).dataset("household");
        assertEquals("3", d.alertRules().expectedChanges().get(0).fromWave());
        assertEquals("4", d.alertRules().expectedChanges().get(0).toWave());
        assertEquals("5", d.alertRules().mutes().get(0).untilWave());
    }

    @Test
    void aRangeOfOneWaveInAnExplicitOrderIsAccepted() {
        DatasetConfig d = ConfigLoader.parse(yaml("", "expectedChanges: [{variable: tenure, waves: {from: autumn-24,"
                + " to: autumn-24}, reason: no-problem, by: Ann}]")).dataset("register");
        assertEquals("autumn-24", d.alertRules().expectedChanges().get(0).toWave());
    }

    private static String fingerprint(String keys) {
        WardenConfig c = ConfigLoader.parse(yaml(keys, ""));
        return ConfigFingerprint.of(c, c.dataset("household"));
    }

    @Test
    void thePopulationChangesTheFingerprintBecauseItChangesHowWavesAreJudged() {
        String plain = fingerprint("");
        assertEquals(plain, fingerprint("population: sample"), "a declared sample is the default");
        assertNotEquals(plain, fingerprint("population: census"));
        assertNotEquals(fingerprint("population: census"), fingerprint("population: register"));
    }

    @Test
    void expectedChangesAndMutesLeaveTheFingerprintAlone() {
        assertEquals(fingerprint(""), fingerprint("""
                expectedChanges: [{variable: tenure, waves: 2025-Q1, reason: planned-change, by: Ann}]
                mutes: [{variable: occupation, untilDate: 2025-03-31, reason: recoding, by: Ann}]
                """));
    }

    /**
     * The demo declares its planned move to telephone fieldwork ahead, and carries a mute rule only as an example of
     * the shape: it ended before the demo's waves can be judged, so it mutes nothing planted.
     */
    @Test
    void theDemoDeclaresTheModeChangeAheadAndAnEndedExampleMute() {
        DatasetConfig d = ConfigLoader.load(java.nio.file.Path.of("..", "config", "demo.yaml"))
                .dataset("harrowmere-household");
        assertEquals(Population.SAMPLE, d.population());
        assertEquals(List.of(new ExpectedChange("interview_mode", "2025-Q1", "2025-Q1", ReviewReason.PLANNED_CHANGE,
                "Fieldwork moved from the web form to telephone interviews in 2025-Q1, as planned in 2024.",
                "Harrowmere County Survey Office")), d.alertRules().expectedChanges());
        MuteRule example = d.alertRules().mutes().get(0);
        assertEquals(1, d.alertRules().mutes().size());
        assertEquals(LocalDate.of(2024, 3, 31), example.untilDate());
        assertEquals(null, example.untilWave());
        assertEquals(true, example.untilDate().isBefore(LocalDate.now(java.time.ZoneOffset.UTC)), "already ended");
    }
}
