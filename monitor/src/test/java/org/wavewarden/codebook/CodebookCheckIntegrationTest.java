package org.wavewarden.codebook;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A real {@code check} on PostgreSQL of a dataset whose config lists no variable at all: a DDI codebook beside the
 * config says what each column is, and the run screens and compares by it.
 */
class CodebookCheckIntegrationTest {

    @TempDir
    static Path dir;
    static CliRun run;
    static JsonNode findings;

    @BeforeAll
    static void check() throws Exception {
        String url = TestDatabase.freshDatabase("codebook_check");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA h;
                    CREATE TABLE h.household AS SELECT
                      CASE WHEN g <= 600 THEN '2025-Q1' ELSE '2025-Q2' END AS wave,
                      g AS respondent_id,
                      (ARRAY['OWN', 'MORT', 'COUN', 'DK'])[1 + g % 4] AS tenure,
                      1 + g % 6 AS region,
                      1 + (g * 7) % 8 AS rooms,
                      CASE WHEN g % 10 = 0 THEN -9 ELSE 1000 + (g * 37) % 2000 END AS income
                    FROM generate_series(1, 1200) g;
                    """);
        }
        Files.writeString(dir.resolve("household.xml"), """
                <?xml version="1.0" encoding="UTF-8"?>
                <codeBook xmlns="ddi:codebook:2_5" version="2.5">
                  <dataDscr>
                    <var name="tenure" nature="nominal"><labl>Tenure of the home</labl>
                      <catgry><catValu>OWN</catValu><labl>Owned outright</labl></catgry>
                      <catgry><catValu>MORT</catValu><labl>Owned with a mortgage</labl></catgry>
                      <catgry><catValu>COUN</catValu><labl>Council tenant</labl></catgry>
                      <catgry missing="Y"><catValu>DK</catValu><labl>Don't know</labl></catgry>
                      <varFormat type="character"/></var>
                    <var name="region" nature="nominal"><labl>Region</labl><varFormat type="numeric"/></var>
                    <var name="rooms" nature="ratio"><labl>Rooms in the home</labl><varFormat type="numeric"/></var>
                    <var name="income" nature="ratio"><labl>Monthly income</labl>
                      <catgry missing="Y"><catValu>-9</catValu><labl>Refused</labl></catgry>
                      <varFormat type="numeric"/></var>
                  </dataDscr>
                </codeBook>
                """);
        Path config = Files.writeString(dir.resolve("household.yaml"), """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_codebook}
                datasets:
                  - name: household
                    table: h.household
                    waveColumn: wave
                    exclude: [respondent_id]
                    codebook: {ddi: household.xml}
                  - name: household-guessed
                    table: h.household
                    waveColumn: wave
                    exclude: [respondent_id]
                """.formatted(url));
        check(config, "household", "2025-Q1");
        run = check(config, "household", "2025-Q2");
        findings = findings("household");
        check(config, "household-guessed", "2025-Q1");
        check(config, "household-guessed", "2025-Q2");
        guessed = findings("household-guessed");
    }

    static JsonNode guessed;

    private static CliRun check(Path config, String dataset, String wave) {
        CliRun r = CliRun.of("check", "--all", "--config", config.toString(), "--dataset", dataset, "--wave", wave,
                "--out", dir.resolve(dataset + "-" + wave).toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        return r;
    }

    private static JsonNode findings(String dataset) throws java.io.IOException {
        return Json.mapper().readTree(Files.readString(dir.resolve(dataset + "-2025-Q2").resolve("findings.json")));
    }

    private static JsonNode finding(JsonNode report, String variable, String kind) {
        for (JsonNode f : report.get("findings")) {
            if (f.get("variable").asText().equals(variable) && f.get("kind").asText().equals(kind)) {
                return f;
            }
        }
        return null;
    }

    @Test
    void theCodebooksMissingCodesAreLeftOutAndCountedByTheirLabels() {
        JsonNode income = finding(findings, "income", "MISSING_CODE");
        assertEquals(60, income.get("detail").get("counts").get("Refused").asInt());
        assertEquals(540, finding(findings, "income", "SHIFT").get("nCurrent").asInt());
        JsonNode tenure = finding(findings, "tenure", "MISSING_CODE");
        assertEquals(150, tenure.get("detail").get("counts").get("Don't know").asInt());
        assertEquals(450, finding(findings, "tenure", "SHIFT").get("nCurrent").asInt());
    }

    @Test
    void withoutTheCodebookTheSameMinusNineIsOnlyFoundAsASentinel() {
        assertNull(finding(guessed, "income", "MISSING_CODE"), "nothing declares -9 without the codebook");
        boolean sentinel = false;
        for (JsonNode f : guessed.get("findings")) {
            sentinel |= f.get("variable").asText().equals("income") && f.get("kind").asText().endsWith("SENTINEL");
        }
        assertTrue(sentinel, "the disguised-missing detector finds the -9s: " + guessed.get("findings"));
    }

    @Test
    void theCodebooksKindsAreUsedWhereInferenceWouldGuessOtherwise() {
        assertEquals("Pearson chi-square", finding(findings, "region", "SHIFT").get("test").asText(),
                "six integer codes declared nominal are compared as categories");
        assertTrue(finding(findings, "rooms", "SHIFT").get("detail").get("testChoice").asText()
                .contains("chosen from wave 2025-Q1"), "eight integers declared ratio are compared as a continuous"
                + " variable, whose test is chosen from its first wave");
        assertEquals(0, findings.get("inference").size(), findings.get("inference").toString());
        String inferred = guessed.get("inference").toString();
        assertTrue(inferred.contains("region: ordinal") && inferred.contains("rooms: ordinal"), inferred);
        assertTrue(!"Pearson chi-square".equals(finding(guessed, "region", "SHIFT").get("test").asText()));
        assertEquals("ordinal scale: rank methods", finding(guessed, "rooms", "SHIFT").get("detail")
                .get("testChoice").asText());
    }

    @Test
    void theMergeIsPrintedOnceToStandardError() {
        String line = "household: tenure: only in the codebook; label, 4 value labels and 1 missing code from the"
                + " codebook; kind categorical (codebook: nominal)";
        assertEquals(1, run.err().split(java.util.regex.Pattern.quote(line), -1).length - 1, run.err());
    }
}
