package org.wavewarden.pipeline;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.deliver.FindingsSchema;
import org.wavewarden.deliver.Json;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Value labels and variable labels written in the YAML show wherever a code or a variable is named, on a real
 * PostgreSQL server: in the sentences ("share answering 'Council tenant' (COUN)"), beside every code in
 * {@code findings.json} (which still matches its schema), in the Markdown and HTML digests and on the console; and a
 * code answered without a label, while the variable's other codes have one, is a code-frame finding.
 *
 * <p>Wave 2 moves tenure from a quarter to three quarters council tenants, adds 30 answers coded XX (no label),
 * raises daily smokers (coded 1, labelled under the key "1") from 50% to 80%, and gives satisfaction (ordinal 1 to 5,
 * labelled) 30 answers coded 9, which has no label.
 */
class ValueLabelsIntegrationTest {

    @TempDir
    static Path dir;
    static Path config;
    static CliRun second;
    static JsonNode report;

    @BeforeAll
    static void judgeTwoWaves() throws Exception {
        String url = TestDatabase.freshDatabase("value_labels");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            st.execute("""
                    CREATE SCHEMA l;
                    CREATE TABLE l.w_1 AS SELECT
                        (ARRAY['OWN', 'COUN', 'HA', 'PRIV'])[1 + g % 4] AS tenure,
                        1 + g % 2 AS smoker,
                        1 + g % 5 AS satisfaction
                    FROM generate_series(1, 400) g;
                    CREATE TABLE l.w_2 AS SELECT
                        CASE WHEN g > 400 THEN 'XX' WHEN g % 4 = 3 THEN 'OWN' ELSE 'COUN' END AS tenure,
                        CASE WHEN g % 5 < 4 THEN 1 ELSE 2 END AS smoker,
                        CASE WHEN g > 400 THEN 9 ELSE 1 + g % 5 END AS satisfaction
                    FROM generate_series(1, 430) g;
                    """);
        }
        config = dir.resolve("l.yaml");
        Files.writeString(config, """
                source:
                  jdbcUrl: "%s"
                  user: postgres
                results: {schema: ww_labels}
                datasets:
                  - name: housing
                    tablePattern: l.w_{wave}
                    variables:
                      - name: tenure
                        kind: categorical
                        label: Tenure of the home
                        valueLabels: {OWN: Owner occupier, COUN: Council tenant, HA: Housing association,
                                      PRIV: Private renter}
                      - name: smoker
                        kind: binary
                        successValue: "1"
                        label: Smokes daily
                        valueLabels: {1: "Yes", 2.0: "No"}
                      - name: satisfaction
                        kind: ordinal
                        label: Satisfaction with the area
                        valueLabels: {1: Very low, 2: Low, 3: Middling, 4: High, 5: Very high}
                """.formatted(url));
        check("1");
        second = check("2");
        report = Json.mapper().readTree(Files.readString(dir.resolve("out-2").resolve("findings.json")));
    }

    static CliRun check(String wave) {
        CliRun r = CliRun.of("check", "--config", config.toString(), "--wave", wave, "--all", "--out",
                dir.resolve("out-" + wave).toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        return r;
    }

    static JsonNode finding(String variable, String kind) {
        for (JsonNode f : report.get("findings")) {
            if (f.get("variable").asText().equals(variable) && f.get("kind").asText().equals(kind)) {
                return f;
            }
        }
        throw new AssertionError("no " + kind + " of " + variable + " in " + report.toPrettyString());
    }

    @Test
    void theSentenceOfACategoricalShiftNamesTheCategoryByItsLabelWithItsCode() {
        String s = finding("tenure", "SHIFT").get("sentence").asText();
        assertTrue(s.startsWith("Share answering 'Council tenant' (COUN) rose from 25.0% to "), s);
    }

    @Test
    void aNumericCodeFindsTheLabelKeyedByTheSameNumber() {
        JsonNode shift = finding("smoker", "SHIFT");
        assertTrue(shift.get("sentence").asText().startsWith("Share answering 'Yes' (1) rose from 50.0% to 80.0%"),
                shift.get("sentence").asText());
        JsonNode plotted = shift.get("detail").get("plot").get("current").get(0);
        assertEquals("1", plotted.get("category").asText());
        assertEquals("Yes", plotted.get("label").asText());
    }

    @Test
    void everyFindingOfALabelledVariableCarriesTheVariableLabelAndTheFileMatchesTheSchema() {
        assertEquals(List.of(), FindingsSchema.problems(report));
        int seen = 0;
        for (JsonNode f : report.get("findings")) {
            String expected = switch (f.get("variable").asText()) {
                case "tenure" -> "Tenure of the home";
                case "smoker" -> "Smokes daily";
                case "satisfaction" -> "Satisfaction with the area";
                default -> null;
            };
            if (expected != null) {
                seen++;
                assertEquals(expected, f.get("label").asText(), f.toString());
            }
        }
        assertTrue(seen >= 5, report.toPrettyString());
    }

    @Test
    void everyCategoryRowOfTheDetailHasItsLabelBesideItsCode() {
        List<String> rows = new ArrayList<>();
        finding("tenure", "SHIFT").get("detail").get("categories").forEach(r -> rows.add(r.get("category").asText()
                + "=" + (r.get("label").isNull() ? "none" : r.get("label").asText())));
        assertEquals(List.of("COUN=Council tenant", "HA=Housing association", "OWN=Owner occupier",
                "PRIV=Private renter", "XX=none"), rows);
    }

    @Test
    void aCodeAnsweredWithoutALabelIsACodeFrameFindingWithItsCount() {
        JsonNode tenure = finding("tenure", "CODE_UNLABELLED");
        assertEquals("Code 'XX' has 30 answers and no value label in this wave, though the variable's other codes"
                + " have labels: a code outside the codebook?", tenure.get("sentence").asText());
        assertEquals("[\"XX\"]", tenure.get("detail").get("codes").toString());
        assertEquals("[30]", tenure.get("detail").get("counts").toString());
        JsonNode satisfaction = finding("satisfaction", "CODE_UNLABELLED");
        assertEquals("[\"9\"]", satisfaction.get("detail").get("codes").toString());
        // The appeared code keeps its place among the code-frame findings, now with its (missing) label beside it.
        assertEquals("[null]", finding("tenure", "CODE_APPEARED").get("detail").get("labels").toString());
    }

    @Test
    void theDigestsAndTheConsoleShowTheLabels() throws Exception {
        String md = Files.readString(dir.resolve("out-2").resolve("digest.md"));
        assertTrue(md.contains("| tenure (Tenure of the home) |"), md);
        assertTrue(md.contains("'Council tenant' (COUN)"), md);
        String html = Files.readString(dir.resolve("out-2").resolve("digest.html"));
        assertTrue(html.contains("<span class=\"vlabel\">Tenure of the home</span>"), html);
        assertTrue(html.contains(">Council tenant (COUN)</text>"), html);
        assertTrue(second.out().contains("Tenure of the home"), second.out());
    }
}
