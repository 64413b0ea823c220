package org.wavewarden.cli;

import com.fasterxml.jackson.databind.JsonNode;
import org.jdbi.v3.core.Jdbi;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.postgresql.ds.PGSimpleDataSource;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.deliver.Json;
import org.wavewarden.store.ResultsSchema;
import org.wavewarden.store.WaveCodebooks;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * On a real PostgreSQL server: a household survey imported with its codebook saved beside the newest wave, scaffolded
 * into a configuration with no hand-written variable, loaded as it is, and judged; the findings use the codebook's
 * missing codes, ranges and kinds.
 */
class ScaffoldCommandIntegrationTest {

    @TempDir
    static Path dir;
    static String url;
    static Path scaffolded;
    static CliRun scaffold;

    static final String SCHEMA = "ww_scaffold";

    @BeforeAll
    static void importAndScaffold() throws Exception {
        url = TestDatabase.freshDatabase("scaffold");
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement()) {
            // Per wave 600 households: tenure 1..3 with 30 refusals (-9); hours 10..60 with 20 "not asked" (-95) and
            // 10 "don't know" (998); satisfaction 1..5; four districts; a weight. In 2025-Q2 council tenancy (2)
            // grows at the cost of owners (1).
            st.execute("""
                    CREATE SCHEMA survey;
                    CREATE TABLE survey.household (resp_id integer, wave text, tenure integer, hours integer,
                                                   satisfied integer, district text, hh_weight double precision);
                    INSERT INTO survey.household
                    SELECT g, w,
                           CASE WHEN g <= 30 THEN -9
                                WHEN w = '2025-Q2' AND g % 10 < 5 THEN 2
                                ELSE 1 + g % 3 END,
                           CASE WHEN g <= 20 THEN -95 WHEN g <= 30 THEN 998 ELSE 10 + (g * 7) % 51 END,
                           1 + (g * 3) % 5,
                           (ARRAY['North', 'South', 'East', 'West'])[1 + g % 4],
                           0.5 + (g % 11) / 10.0
                    FROM unnest(ARRAY['2025-Q1', '2025-Q2']) w, generate_series(1, 600) g;
                    """);
        }
        PGSimpleDataSource ds = new PGSimpleDataSource();
        ds.setURL(url);
        ds.setUser("postgres");
        ResultsSchema.migrate(ds, SCHEMA);
        Map<String, String> tenureLabels = new LinkedHashMap<>();
        tenureLabels.put("1", "Owner");
        tenureLabels.put("2", "Council tenant");
        tenureLabels.put("3", "Private renter: \"other\" # incl. family");
        tenureLabels.put("-9", "Refused");
        DatasetCodebook codebook = new DatasetCodebook("household-2025-Q2.sav, SPSS system file", "Household survey",
                List.of(
                        new VariableMeta("RESP_ID", "Household identifier", StorageType.NUMBER, null, 0, "F8.0",
                                Measure.NOMINAL, null, Map.of(), List.of(), List.of(), null),
                        new VariableMeta("tenure", "Tenure of the home", StorageType.NUMBER, null, 0, "F2.0",
                                Measure.NOMINAL, null, tenureLabels, List.of(new MissingCodeSpec("-9", "Refused")),
                                List.of(), null),
                        new VariableMeta("hours", "Hours worked last week", StorageType.NUMBER, null, 0, "F3.0",
                                Measure.SCALE, "hours", Map.of(), List.of(),
                                List.of(new MissingRangeSpec(-99.0, -90.0, "not asked"),
                                        new MissingRangeSpec(998.0, null, "don't know")), null),
                        new VariableMeta("satisfied", "Satisfaction with the area", StorageType.NUMBER, null, 0,
                                "F1.0", Measure.ORDINAL, null, Map.of("1", "Very dissatisfied", "5",
                                "Very satisfied"), List.of(), List.of(), null)));
        new WaveCodebooks(Jdbi.create(ds), SCHEMA).save("household", "2025-Q2", codebook, Instant.EPOCH);

        scaffolded = dir.resolve("household.yaml");
        scaffold = CliRun.of("scaffold", "--jdbc-url", url, "--user", "postgres", "--results-schema", SCHEMA,
                "--table", "survey.household", "--wave-column", "wave", "--out", scaffolded.toString());
    }

    static VariableConfig variable(DatasetConfig d, String name) {
        return d.variables().stream().filter(v -> v.name().equals(name)).findFirst()
                .orElseThrow(() -> new AssertionError(name + " not among " + d.variables()));
    }

    @Test
    void theScaffoldLoadsAsItIsWithTheSavedCodebooksKindsCodesAndLabels() throws Exception {
        assertEquals(0, scaffold.exitCode(), scaffold.err() + scaffold.out());
        assertTrue(scaffold.err().contains("the one saved with wave 2025-Q2"), scaffold.err());
        DatasetConfig d = ConfigLoader.load(scaffolded).dataset("household");
        String yaml = Files.readString(scaffolded);
        assertEquals("hh_weight", d.weightColumn(), yaml);
        assertEquals(List.of("resp_id"), d.exclude(), yaml);
        VariableConfig tenure = variable(d, "tenure");
        assertEquals(VariableKind.CATEGORICAL, tenure.kind());
        assertEquals("Private renter: \"other\" # incl. family", tenure.valueLabels().get("3"));
        assertEquals(List.of(new MissingCodeSpec("-9", "Refused")), tenure.missingCodes());
        VariableConfig hours = variable(d, "hours");
        assertEquals(VariableKind.CONTINUOUS, hours.kind());
        assertEquals("hours", hours.unit());
        assertEquals(2, hours.missingRanges().size());
        assertEquals(VariableKind.ORDINAL, variable(d, "satisfied").kind());
        assertEquals(VariableKind.CATEGORICAL, variable(d, "district").kind());
        assertTrue(yaml.contains("kind: categorical  # inferred: 4 distinct text values: read as codes in wave"
                + " \"2025-Q2\""), yaml);
    }

    @Test
    void theScaffoldDrivesACheckWhoseFindingsUseTheCodebooksMissingValues() throws Exception {
        assertEquals(0, scaffold.exitCode(), scaffold.err() + scaffold.out());
        Path out = dir.resolve("out");
        CliRun r = CliRun.of("check", "--config", scaffolded.toString(), "--wave", "2025-Q2", "--out",
                out.toString());
        assertEquals(0, r.exitCode(), r.err() + r.out());
        JsonNode findings = Json.mapper().readTree(Files.readString(out.resolve("findings.json"))).get("findings");
        List<JsonNode> all = new ArrayList<>();
        findings.forEach(all::add);
        JsonNode tenureCodes = all.stream().filter(f -> f.get("variable").asText().equals("tenure")
                && f.get("kind").asText().equals("MISSING_CODE")).findFirst().orElseThrow(() ->
                new AssertionError(all.toString()));
        assertEquals(30, tenureCodes.get("detail").get("counts").get("Refused").asLong());
        JsonNode hoursCodes = all.stream().filter(f -> f.get("variable").asText().equals("hours")
                && f.get("kind").asText().equals("MISSING_CODE")).findFirst().orElseThrow(() ->
                new AssertionError(all.toString()));
        assertEquals(20, hoursCodes.get("detail").get("counts").get("not asked").asLong());
        assertEquals(10, hoursCodes.get("detail").get("counts").get("don't know").asLong());
        assertTrue(all.stream().noneMatch(f -> f.get("variable").asText().equals("hours")
                && f.get("kind").asText().equals("NUMERIC_SENTINEL")), "998 is declared, not disguised: " + all);
        assertTrue(all.stream().anyMatch(f -> f.get("variable").asText().equals("tenure")
                && f.get("kind").asText().equals("SHIFT")), "council tenancy grew: " + all);
        assertTrue(all.stream().noneMatch(f -> f.get("variable").asText().equals("resp_id")), all.toString());
    }

    @Test
    void anExistingDatasetOfAConfigIsScaffoldedFromItsTable() throws Exception {
        Path config = dir.resolve("existing.yaml");
        Files.writeString(config, """
                source: {jdbcUrl: "%s", user: postgres}
                results: {schema: %s}
                datasets:
                  - {name: household, table: survey.household, waveColumn: wave, respondentKey: resp_id}
                """.formatted(url, SCHEMA));
        CliRun r = CliRun.of("scaffold", "--config", config.toString(), "--dataset", "household");
        assertEquals(0, r.exitCode(), r.err());
        DatasetConfig d = ConfigLoader.parse(r.out()).dataset("household");
        assertEquals("resp_id", d.respondentKey());
        assertEquals(VariableKind.CATEGORICAL, variable(d, "tenure").kind());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
            "no connection|--table survey.household --wave-column wave|--config",
            "no wave column|URL --table survey.household|--wave-column",
            "no table|URL --wave-column wave|--table",
            "unknown table|URL --table survey.nothing --wave-column wave|--table",
            "unknown wave column|URL --table survey.household --wave-column round|--wave-column",
            "bad table name|URL --table 'survey.house hold' --wave-column wave|--table",
            "dataset without config|URL --dataset household|--dataset",
            "codebook of unknown format|URL --table survey.household --wave-column wave --codebook CODEBOOK|--codebook",
            "missing codebook|URL --table survey.household --wave-column wave --codebook nowhere.xml|--codebook",
    })
    void wrongArgumentsExitWithTwoNamingTheOption(String what, String args, String option) throws Exception {
        Path odd = dir.resolve("codebook.txt");
        Files.writeString(odd, "not a codebook");
        List<String> argv = new ArrayList<>(List.of("scaffold"));
        for (String a : args.split(" (?=--)|(?<=--[a-z-]{1,20}) ")) {
            switch (a) {
                case "URL" -> argv.addAll(List.of("--jdbc-url", url, "--user", "postgres", "--results-schema",
                        SCHEMA));
                case "CODEBOOK" -> argv.add(odd.toString());
                default -> argv.add(a.startsWith("'") ? a.substring(1, a.length() - 1) : a);
            }
        }
        CliRun r = CliRun.of(argv.toArray(String[]::new));
        assertEquals(2, r.exitCode(), what + " " + argv + ": " + r.err() + r.out());
        assertTrue(r.err().contains(option), r.err());
    }
}
