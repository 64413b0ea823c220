package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.util.HashMap;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Date variables on a real PostgreSQL server: a date of an event before the interview (moving in) is compared
 * between waves as a distribution of dates, and a date that follows each wave's own period (the interview date) is
 * not compared, with the reason given.
 */
class DateComparisonIntegrationTest {

    @TempDir
    static Path dir;
    static Path config;
    static final Map<String, JsonNode> BY_WAVE = new HashMap<>();

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("date_comparison");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Move-in dates spread over the 20 years from 2000 (7305 days); wave 3 moved on by 1826 days (5 years).
            st.execute("""
                    CREATE SCHEMA d;
                    CREATE TABLE d.w_1 AS SELECT DATE '2000-01-01' + (g * 7) % 7305 AS move_in,
                        DATE '2024-01-01' + g % 91 AS interviewed FROM generate_series(1, 3000) g;
                    CREATE TABLE d.w_2 AS SELECT DATE '2000-01-01' + (g * 11) % 7305 AS move_in,
                        DATE '2024-04-01' + g % 91 AS interviewed FROM generate_series(1, 3000) g;
                    CREATE TABLE d.w_3 AS SELECT DATE '2000-01-01' + (g * 11) % 7305 + 1826 AS move_in,
                        DATE '2024-07-01' + g % 91 AS interviewed FROM generate_series(1, 3000) g;
                    """);
        }
        config = dir.resolve("d.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_dates}
                datasets:
                  - name: dated
                    tablePattern: d.w_{wave}
                    variables:
                      - {name: move_in, kind: date}
                      - {name: interviewed, kind: date}
                """.formatted(url));
        for (String wave : new String[] {"1", "2", "3"}) {
            Path out = dir.resolve("out-" + wave);
            CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--out", out.toString());
            assertEquals(0, r.exitCode(), r.err() + r.out());
            BY_WAVE.put(wave, Json.mapper().readTree(Files.readString(out.resolve("findings.json"))));
        }
    }

    static JsonNode finding(String wave, String variable, String kind) {
        for (JsonNode f : BY_WAVE.get(wave).get("findings")) {
            if (f.get("variable").asText().equals(variable) && f.get("kind").asText().equals(kind)) {
                return f;
            }
        }
        throw new AssertionError("no " + kind + " of " + variable + " in wave " + wave + ": "
                + BY_WAVE.get(wave).get("findings"));
    }

    /**
     * KS distance and p-value on the dates as day numbers, from R 4.2.2:
     * {@code g <- 1:3000; w1 <- as.numeric(as.Date("2000-01-01") + (g * 7) %% 7305);
     * w2 <- as.numeric(as.Date("2000-01-01") + (g * 11) %% 7305); w3 <- w2 + 1826; ks.test(w1, w2); ks.test(w2, w3)}
     * (ks.test warns of ties between the samples and gives the asymptotic p, as n1 n2 exceeds 10000).
     */
    @ParameterizedTest
    @CsvSource({
            "2, 0.033000000000000002, 0.076237011640453378, STABLE",
            "3, 0.27666666666666667, 0.0, MATERIAL"})
    void moveInDatesAreComparedAsADistributionOfDatesMatchingR(String wave, double d, double p, String verdict) {
        JsonNode shift = finding(wave, "move_in", "SHIFT");
        assertEquals("Kolmogorov-Smirnov", shift.get("test").asText());
        assertEquals(d, shift.get("statistic").asDouble(), 1e-12);
        assertEquals(p, shift.get("pValue").asDouble(), 1e-9);
        assertEquals(verdict, shift.get("verdict").asText(), shift.toString());
    }

    @Test
    void theSentenceGivesEachWavesMedianDateAndTheShareOutsideTheBaselinesSpan() {
        // Medians from R 4.2.2: as.Date(median(w2), origin = "1970-01-01") and the same for w3, 2009-01-16 and
        // 2014-01-16; range(as.Date(w2, origin = "1970-01-01")) is 2000-01-08 to 2019-12-31, and the share of w3
        // outside it, mean(w3 > max(w2) | w3 < min(w2)), is 0.22133.
        JsonNode shift = finding("3", "move_in", "SHIFT");
        String sentence = shift.get("sentence").asText();
        assertTrue(sentence.startsWith("The median date of move_in moved from 2009-01-16 to 2014-01-16 (+1826 days;"),
                sentence);
        assertTrue(sentence.contains("; 22.1% of this wave's dates lie outside the baseline's span 2000-01-08 to"
                + " 2019-12-31;"), sentence);
        assertEquals(0.22133333333333333, shift.get("detail").get("shareOutsideBaselineSpan").asDouble(), 1e-12);
        assertEquals(1826, shift.get("detail").get("medianShiftDays").asDouble(), 1e-9);
    }

    @Test
    void interviewDatesThatFollowEachWavesPeriodAreSkippedWithTheReason() {
        for (String wave : new String[] {"2", "3"}) {
            String sentence = finding(wave, "interviewed", "SKIPPED").get("sentence").asText();
            assertTrue(sentence.contains("the two waves' dates cover different periods") && sentence.contains(
                    "such as interview dates, are not compared as a distribution"), sentence);
        }
        assertTrue(finding("2", "interviewed", "SKIPPED").get("sentence").asText().contains("2024-01-01 to 2024-03-31"
                + " in the baseline, 2024-04-01 to 2024-06-30 in this wave; KS distance 1.000"));
    }
}
