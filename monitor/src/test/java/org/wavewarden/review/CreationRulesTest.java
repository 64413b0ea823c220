package org.wavewarden.review;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MuteRule;
import org.wavewarden.deliver.Alert;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;

/**
 * What the configuration decides for an alert when it is created: explained by the first expected change whose
 * variable and waves match, otherwise muted by the first mute rule (configured ones before stored ones) whose scope
 * matches and that has not expired, otherwise nothing (the alert opens). A change to a signed-off wave's findings is
 * never decided by a rule.
 */
class CreationRulesTest {

    /** The waves the source lists, in the natural order of their labels. */
    private static final List<String> LISTED = List.of("2024-Q3", "2024-Q4", "2025-Q1", "2025-Q2");

    private static final DatasetConfig HOUSEHOLD = ConfigLoader.parse("""
            source: {jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey", user: reader}
            datasets:
              - name: household
                table: survey.household
                waveColumn: wave
                expectedChanges:
                  - {variable: interview_mode, waves: 2025-Q1, reason: planned-change, note: fieldwork by telephone,
                     by: County Survey Office}
                  - {variable: "heating_*", waves: {from: 2024-Q4, to: 2025-Q1}, reason: real-change,
                     by: E. Marsh}
                  - {variable: "*", waves: 2025-Q1, reason: no-problem, by: never reached for interview_mode}
                mutes:
                  - {variable: occupation, kind: PLACEHOLDER, untilDate: 2025-03-31, reason: recoding, by: M. Pellow}
                  - {variable: "income_*", untilWave: 2025-Q3, reason: fix-upstream, by: M. Pellow}
                  - {kind: MISSING_RATE_CHANGE, untilWave: 2025-Q2, untilDate: 2025-04-30, reason: field system,
                     by: R. Ashdown}
            """).dataset("household");

    /** Stored by a command: consulted after the configured rules. */
    private static final List<MuteRule> STORED = List.of(
            new MuteRule("region", FindingKind.SHIFT, "2024-Q4", null, "looked at", "T. Quill"),
            new MuteRule("income_net", null, null, LocalDate.of(2030, 1, 1), "stored second", "T. Quill"));

    private static Finding finding(String variable, FindingKind kind) {
        if (!kind.isDataQuality()) {
            return new Finding(variable, kind, "Mann-Whitney", 2.5, 0.01, 0.02,
                    new Finding.Effect("cliffs_delta", 0.21, 0.08, 0.33, 0.147), Verdict.MATERIAL, 500L, 520L,
                    "The answers on " + variable + " moved.", Map.of());
        }
        return Finding.dataQuality(variable, kind, 500L, 520L, "Odd values in " + variable + ".", Map.of());
    }

    /** An alert on a variable, led by the first kind, with the others as its further facets. */
    private static Alert alert(String variable, String kinds) {
        List<Finding> facets = new ArrayList<>();
        for (String k : kinds.split("\\+")) {
            facets.add(finding(variable, FindingKind.valueOf(k)));
        }
        return new Alert(facets);
    }

    private static String decide(DatasetConfig d, List<String> listed, String wave, String today, Alert a) {
        Optional<CreationDecision> c = CreationRules.decider(d, listed, wave, LocalDate.parse(today), STORED).apply(a);
        return c.map(x -> x.action() + " " + (x.reason() == null ? "-" : x.reason().key()) + " by " + x.actor()
                + " from " + x.source()).orElse("OPEN");
    }

    @ParameterizedTest(name = "{0} {1} {2} on {3}")
    @CsvSource(delimiter = '|', textBlock = """
            # expected changes: the first that matches explains, within its waves only
            interview_mode        | SHIFT                     | 2025-Q1 | 2025-05-02 | EXPLAINED planned-change by County Survey Office from expected change "interview_mode" 2025-Q1
            interview_mode        | SHIFT                     | 2025-Q2 | 2025-05-02 | OPEN
            interview_mode        | SHIFT                     | 2024-Q4 | 2025-05-02 | OPEN
            heating_fuel          | SHIFT                     | 2024-Q3 | 2025-05-02 | OPEN
            heating_fuel          | SHIFT                     | 2024-Q4 | 2025-05-02 | EXPLAINED real-change by E. Marsh from expected change "heating_*" 2024-Q4..2025-Q1
            heating_fuel          | PLACEHOLDER               | 2025-Q1 | 2025-05-02 | EXPLAINED real-change by E. Marsh from expected change "heating_*" 2024-Q4..2025-Q1
            heating_fuel          | SHIFT                     | 2025-Q2 | 2025-05-02 | OPEN
            tenure                | SHIFT                     | 2025-Q1 | 2025-05-02 | EXPLAINED no-problem by never reached for interview_mode from expected change "*" 2025-Q1
            # a relationship alert is named x ~ y: a pattern matching either variable matches it
            age ~ heating_cost    | RELATIONSHIP_CHANGE       | 2024-Q4 | 2025-05-02 | EXPLAINED real-change by E. Marsh from expected change "heating_*" 2024-Q4..2025-Q1
            heating_cost ~ age    | RELATIONSHIP_CHANGE       | 2024-Q4 | 2025-05-02 | EXPLAINED real-change by E. Marsh from expected change "heating_*" 2024-Q4..2025-Q1
            age ~ rooms           | RELATIONSHIP_CHANGE       | 2024-Q4 | 2025-05-02 | OPEN
            # mute by variable and kind, until a day (inclusive); the kind matches the lead or any facet
            occupation            | PLACEHOLDER               | 2025-Q2 | 2025-03-31 | MUTED - by M. Pellow from config mute rule "occupation" PLACEHOLDER until 2025-03-31
            occupation            | PLACEHOLDER               | 2025-Q2 | 2025-04-01 | OPEN
            occupation            | SHIFT+PLACEHOLDER         | 2025-Q2 | 2025-03-01 | MUTED - by M. Pellow from config mute rule "occupation" PLACEHOLDER until 2025-03-31
            occupation            | SHIFT                     | 2025-Q2 | 2025-03-01 | OPEN
            # mute until a wave not yet listed: placed by the natural order of the labels; a reason key is kept
            income_monthly        | SHIFT                     | 2025-Q2 | 2026-01-01 | MUTED fix-upstream by M. Pellow from config mute rule "income_*" every kind until wave 2025-Q3
            # both expiries: whichever comes first ends the mute
            district              | MISSING_RATE_CHANGE       | 2025-Q2 | 2025-04-30 | MUTED - by R. Ashdown from config mute rule "*" MISSING_RATE_CHANGE until wave 2025-Q2 or 2025-04-30
            district              | MISSING_RATE_CHANGE       | 2025-Q2 | 2025-05-01 | OPEN
            district              | SHIFT+MISSING_RATE_CHANGE | 2025-Q2 | 2025-01-15 | MUTED - by R. Ashdown from config mute rule "*" MISSING_RATE_CHANGE until wave 2025-Q2 or 2025-04-30
            # stored rules come after the configured ones, with the same scope and expiry rules
            region                | SHIFT                     | 2024-Q4 | 2025-05-02 | MUTED - by T. Quill from stored mute rule "region" SHIFT until wave 2024-Q4
            region                | SHIFT                     | 2025-Q2 | 2025-05-02 | OPEN
            income_net            | SHIFT                     | 2025-Q2 | 2025-05-02 | MUTED fix-upstream by M. Pellow from config mute rule "income_*" every kind until wave 2025-Q3
            # a signed-off wave whose findings changed is always raised open, even where a rule covers everything
            (wave)                | SIGNED_WAVE_CHANGED       | 2025-Q1 | 2025-01-15 | OPEN
            (wave)                | SIGNED_WAVE_CHANGED       | 2025-Q2 | 2025-01-15 | OPEN
            # an expected change comes before any mute
            interview_mode        | MISSING_RATE_CHANGE       | 2025-Q1 | 2025-01-15 | EXPLAINED planned-change by County Survey Office from expected change "interview_mode" 2025-Q1
            """)
    void theConfigurationDecides(String variable, String kinds, String wave, String today, String expected) {
        assertEquals(expected, decide(HOUSEHOLD, LISTED, wave, today, alert(variable, kinds)));
    }

    /** Numbered waves sort as numbers, so wave 10 is later than wave 9 although "10" sorts before "9" as text. */
    @ParameterizedTest(name = "wave {0}")
    @CsvSource({"9, MUTED", "10, MUTED", "11, OPEN"})
    void numberedWavesAreReadAsNumbers(String wave, String expected) {
        DatasetConfig d = ConfigLoader.parse("""
                source: {jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey", user: reader}
                datasets:
                  - name: numbered
                    table: survey.numbered
                    waveColumn: wave
                    mutes: [{variable: score, untilWave: 10, reason: noisy, by: Ann}]
                """).dataset("numbered");
        // Only the waves fielded so far are listed: for wave 9, the mute's last wave 10 is placed by its number.
        List<String> all = List.of("8", "9", "10", "11");
        List<String> listed = all.subList(0, all.indexOf(wave) + 1);
        String got = decide(d, listed, wave, "2025-01-01", alert("score", "SHIFT")).split(" ")[0];
        assertEquals(expected, got);
    }

    /** In an explicit order the places are the configured ones, including waves not fielded yet. */
    @ParameterizedTest(name = "wave {0}")
    @CsvSource({"spring-24, OPEN", "autumn-24, EXPLAINED", "spring-25, EXPLAINED", "autumn-25, OPEN"})
    void anExplicitOrderPlacesTheWaves(String wave, String expected) {
        DatasetConfig d = ConfigLoader.parse("""
                source: {jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey", user: reader}
                datasets:
                  - name: register
                    table: survey.dwellings
                    waveColumn: wave
                    waveOrder: [spring-24, autumn-24, spring-25, autumn-25]
                    expectedChanges:
                      - {variable: tenure, waves: {from: autumn-24, to: spring-25}, reason: planned-change, by: Ann}
                """).dataset("register");
        // Only the waves fielded so far are listed; the range's last wave is placed by the configured order.
        List<String> listed = List.of("spring-24", "autumn-24", "spring-25", "autumn-25")
                .subList(0, List.of("spring-24", "autumn-24", "spring-25", "autumn-25").indexOf(wave) + 1);
        assertEquals(expected, decide(d, listed, wave, "2025-01-01", alert("tenure", "SHIFT")).split(" ")[0]);
    }

    @Test
    void aDatasetWithoutRulesOpensEveryAlert() {
        DatasetConfig d = ConfigLoader.parse("""
                source: {jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey", user: reader}
                datasets: [{name: plain, table: survey.plain, waveColumn: wave}]
                """).dataset("plain");
        assertEquals("OPEN", CreationRules.decider(d, LISTED, "2025-Q1", LocalDate.of(2025, 1, 1), List.of())
                .apply(alert("interview_mode", "SHIFT")).map(c -> c.action().name()).orElse("OPEN"));
    }

    /** Patterns are whole-name globs: * is any run of characters, every other character is itself. */
    @ParameterizedTest(name = "{0} against {1}")
    @CsvSource(delimiter = '|', textBlock = """
            income        | income         | true
            income        | income_monthly | false
            income*       | income_monthly | true
            *_monthly     | income_monthly | true
            inc*ly        | income_monthly | true
            income.*      | income_monthly | false
            income.*      | income.x       | true
            age           | age ~ income   | true
            income        | age ~ income   | true
            age ~ income  | age ~ income   | true
            ag            | age ~ income   | false
            *             | age ~ income   | true
            """)
    void patterns(String pattern, String variable, boolean matches) {
        assertEquals(matches, CreationRules.matches(pattern, variable));
    }
}
