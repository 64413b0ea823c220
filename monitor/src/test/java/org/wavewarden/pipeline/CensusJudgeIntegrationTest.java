package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Population;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.deliver.FindingsSchema;
import org.wavewarden.deliver.Json;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.Verdict;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.time.Clock;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The same two waves of Harrowmere's harbour register on a real PostgreSQL server, judged once as a full register and
 * once as a sample: the register's findings state sizes against thresholds with no p, q, interval or family and say
 * why; the sample's are tested.
 */
class CensusJudgeIntegrationTest {

    @TempDir
    static Path dir;
    static WardenConfig cfg;

    @BeforeAll
    static void load() throws Exception {
        String url = TestDatabase.freshDatabase("census");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // 2,000 moorings both waves; fees rise by 4 a year, a few more owners leave the boat length blank.
            st.execute("""
                    CREATE SCHEMA harbour;
                    CREATE TABLE harbour.w_1 AS SELECT g AS mooring_id, 400 + (g * 37) % 200 AS fee,
                      (ARRAY['Gullhaven', 'Kestle Point', 'Saltmarsh'])[1 + g % 3] AS district,
                      CASE WHEN g % 20 = 0 THEN NULL ELSE 5 + g % 9 END AS boat_length
                    FROM generate_series(1, 2000) g;
                    CREATE TABLE harbour.w_2 AS SELECT g AS mooring_id, 404 + (g * 37) % 200 AS fee,
                      (ARRAY['Gullhaven', 'Kestle Point', 'Saltmarsh'])[1 + g % 3] AS district,
                      CASE WHEN g % 20 = 0 OR g % 50 = 1 THEN NULL ELSE 5 + g % 9 END AS boat_length
                    FROM generate_series(1, 2000) g;
                    """);
        }
        String dataset = """
                  - name: %s
                    tablePattern: harbour.w_{wave}
                    variables:
                      - {name: fee, kind: continuous}
                      - {name: district, kind: categorical}
                      - {name: boat_length, kind: continuous}
                """;
        cfg = ConfigLoader.parse("""
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_census}
                datasets:
                """.formatted(url) + dataset.formatted("harbour_register") + dataset.formatted("harbour_sample"));
    }

    /**
     * What the register's two waves give a verdict on: each column's shift (the mooring number too, a column the
     * configuration does not list) and the boat length's blanks, whose share moves from one mooring in 20 to 7 in
     * 100. Nothing else is missing, so no other missing rate is judged.
     */
    static final List<String> JUDGED_IN_BOTH = List.of("boat_length MISSING_RATE_CHANGE", "boat_length SHIFT",
            "district SHIFT", "fee SHIFT", "mooring_id SHIFT");

    static DatasetConfig as(DatasetConfig d, Population p) {
        return new DatasetConfig(d.name(), d.table(), d.waveColumn(), d.tablePattern(), d.waveOrder(),
                d.compareWith(), d.schedule(), d.exclude(), d.variables(), d.quietPeriod(), d.alerts(),
                d.readyTable(), d.readyColumn(), d.weightColumn(), d.respondentKey(), d.releases(), d.design(),
                d.relationships(), d.codebook(), p, d.alertRules());
    }

    static List<Finding> judgedTwice(Session s, DatasetConfig d, Path out) {
        WaveJudge judge = new WaveJudge(s, Clock.systemUTC());
        judge.judge(d, "1", null, null, n -> { });
        return judge.judge(d, "2", null, out, n -> { }).report().findings();
    }

    static Finding one(List<Finding> findings, String variable, FindingKind kind) {
        return findings.stream().filter(f -> f.variable().equals(variable) && f.kind() == kind).findFirst()
                .orElseThrow(() -> new AssertionError(variable + " " + kind + " in " + findings));
    }

    @Test
    void aRegisterIsJudgedBySizeAndASampleOfTheSameRowsIsTested() throws Exception {
        try (Session s = Session.open(cfg, null, Map.of())) {
            s.migrate();
            Path out = dir.resolve("register");
            List<Finding> register = judgedTwice(s, as(cfg.datasets().get(0), Population.REGISTER), out);
            List<Finding> sample = judgedTwice(s, cfg.datasets().get(1), dir.resolve("sample"));

            List<Finding> judged = register.stream().filter(f -> f.verdict() != null).toList();
            assertEquals(JUDGED_IN_BOTH, judged.stream().map(f -> f.variable() + " " + f.kind()).sorted().toList(),
                    register.toString());
            for (Finding f : judged) {
                assertNull(f.pValue(), f.sentence());
                assertNull(f.qValue(), f.sentence());
                assertNull(f.fdrFamilySize(), f.sentence());
                assertNull(f.fdrMethod(), f.sentence());
                assertEquals(f.effect().estimate(), f.effect().ciLow(), f.sentence());
                assertEquals(f.effect().estimate(), f.effect().ciHigh(), f.sentence());
                assertTrue(f.sentence().startsWith("Every unit was observed (full register): the change is as large"
                        + " as it is, so no test is made"), f.sentence());
            }
            Finding fee = one(register, "fee", FindingKind.SHIFT);
            // +4 on fees spread evenly over 400 to 599: the rank methods' Cliff's delta, a real change below its
            // threshold, so MINOR. R 4.2.2: mean(sign(outer(b, a, "-"))) over the two waves' fees = 0.0396.
            assertEquals("Cliff's delta", fee.effect().name());
            assertEquals(0.0396, fee.effect().estimate(), 1e-12);
            assertEquals(Verdict.MINOR, fee.verdict(), fee.sentence());
            assertEquals(Verdict.STABLE, one(register, "district", FindingKind.SHIFT).verdict(),
                    "identical counts: no change at all");
            Finding blanks = one(register, "boat_length", FindingKind.MISSING_RATE_CHANGE);
            // R 4.2.2: 2 * asin(sqrt(0.07)) - 2 * asin(sqrt(0.05)) = 0.08449984, below Cohen's h 0.2.
            assertEquals(0.08449984, blanks.effect().estimate(), 1e-8);
            assertEquals(Verdict.MINOR, blanks.verdict(), blanks.sentence());
            assertTrue(blanks.sentence().contains("the shares are of all units, those that did not answer"
                    + " included; share missing (NULL) rose from 5.0% to 7.0% of units"), blanks.sentence());

            JsonNode written = Json.mapper().readTree(Files.readString(out.resolve("findings.json")));
            assertEquals(List.of(), FindingsSchema.problems(written));

            // The sample's fee is tested: many tied fees, so the rank test's normal approximation with the tie
            // correction and continuity correction. R 4.2.2: g <- 1:2000; a <- 400 + (g * 37) %% 200;
            // wilcox.test(a + 4, a) gives W = 2079200 and p-value 0.0301037049927575.
            Finding sampled = one(sample, "fee", FindingKind.SHIFT);
            assertEquals("Mann-Whitney U", sampled.test());
            assertEquals(2079200, sampled.statistic(), 1e-6);                  // R 4.2.2 wilcox.test, see above
            assertEquals(0.0301037049927575, sampled.pValue(), 1e-12);        // R 4.2.2 wilcox.test, see above
            List<Finding> tested = sample.stream().filter(f -> f.pValue() != null).toList();
            // One family for the whole run: every comparison judged, so at least every test that is reported.
            assertEquals(List.of(sampled.fdrFamilySize()), tested.stream().map(Finding::fdrFamilySize).distinct()
                    .toList());
            assertTrue(sampled.fdrFamilySize() >= tested.size(), sampled.fdrFamilySize() + " " + tested);
            assertTrue(sampled.qValue() >= sampled.pValue() && sampled.qValue() <= 1, sampled.sentence());
            assertTrue(sampled.effect().ciLow() < sampled.effect().ciHigh());
            assertEquals(fee.effect().estimate(), sampled.effect().estimate(), 1e-12,
                    "the same effect, only read differently");
        }
    }
}
