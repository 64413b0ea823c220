package org.wavewarden.cli;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.codebook.CsvCodebook;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.Identifiers.TableName;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.demo.LeisureScenarioGenerator;
import org.wavewarden.load.CaseImporter;
import org.wavewarden.load.CsvWaveImporter;
import org.wavewarden.load.spss.SavFiles;
import org.wavewarden.load.spss.SavReader;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.TestDatabase;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * {@code scaffold --codebook FILE} on a real PostgreSQL server, with the codebook files a user has: the leisure
 * survey's first wave imported from its SPSS system file and scaffolded from the demo's DDI-Codebook 2.5 file, and a
 * CSV wave imported and scaffolded from the CSV codebook that docs/codebook-csv.md gives as its example. Each YAML is
 * loaded as written, with no edit, and says what the codebook says.
 */
class ScaffoldFromCodebookFileIntegrationTest {

    @TempDir
    static Path dir;
    static Path root;
    static CliRun leisureRun;
    static Path leisureYaml;
    static CliRun householdRun;
    static Path householdYaml;

    @BeforeAll
    static void importAndScaffold() throws Exception {
        root = Path.of("").toAbsolutePath();
        while (!Files.isDirectory(root.resolve("demo-data"))) {
            root = root.getParent();
        }
        String url = TestDatabase.freshDatabase("scaffoldfile");
        Path leisure = root.resolve("demo-data").resolve(LeisureScenarioGenerator.FOLDER);
        Path csvCodebook = dir.resolve("household-codebook.csv");
        Files.writeString(csvCodebook, documentedExample(), StandardCharsets.UTF_8);
        Path wave = dir.resolve("household-2025-Q1.csv");
        Files.writeString(wave, householdWave(), StandardCharsets.UTF_8);
        try (Connection c = TestDatabase.connect(url)) {
            c.createStatement().execute("CREATE SCHEMA survey");
            try (SavReader cases = SavFiles.open(leisure.resolve(LeisureScenarioGenerator.WAVES.get(0).fileName()))) {
                CaseImporter.load(c, TableName.parse("table", "survey.leisure"), "wave",
                        LeisureScenarioGenerator.WAVES.get(0).label(), cases, false, true, null);
            }
            CsvWaveImporter.load(c, TableName.parse("table", "survey.household"), "wave", "2025-Q1", wave, false,
                    null, CsvWaveImporter.CsvFormat.detect(), true, CsvCodebook.read(csvCodebook), null);
        }
        leisureYaml = dir.resolve("leisure.yaml");
        leisureRun = CliRun.of("scaffold", "--jdbc-url", url, "--user", "postgres", "--table", "survey.leisure",
                "--wave-column", "wave", "--codebook",
                leisure.resolve(LeisureScenarioGenerator.CODEBOOK_FILE).toString(), "--out", leisureYaml.toString());
        householdYaml = dir.resolve("household.yaml");
        householdRun = CliRun.of("scaffold", "--jdbc-url", url, "--user", "postgres", "--table", "survey.household",
                "--wave-column", "wave", "--codebook", csvCodebook.toString(), "--out", householdYaml.toString());
    }

    /** The example of docs/codebook-csv.md, as the page shows it: the first fenced block after "## Example". */
    static String documentedExample() throws Exception {
        String page = Files.readString(root.resolve("docs").resolve("codebook-csv.md"));
        int example = page.indexOf("## Example");
        int open = page.indexOf("```\n", example) + 4;
        return page.substring(open, page.indexOf("```", open));
    }

    /** One wave of the example's three variables, with each kind of declared missing answer among the rows. */
    static String householdWave() {
        StringBuilder csv = new StringBuilder("resp_id,tenure,commute_minutes,housing_satisfaction\n");
        String[] tenure = {"OWN", "COUN", "OWN", "COUN", "DK"};
        for (int i = 1; i <= 60; i++) {
            int minutes = i % 12 == 0 ? -99 : i % 17 == 0 ? -95 : 5 + (i * 13) % 80;
            int satisfaction = i % 15 == 0 ? -9 : 1 + i % 5;
            csv.append(i).append(',').append(tenure[i % tenure.length]).append(',').append(minutes).append(',')
                    .append(satisfaction).append('\n');
        }
        return csv.toString();
    }

    static VariableConfig variable(DatasetConfig d, String name) {
        return d.variables().stream().filter(v -> v.name().equals(name)).findFirst()
                .orElseThrow(() -> new AssertionError(name + " not among " + d.variables()));
    }

    static Map<String, String> labels(String... codeThenLabel) {
        Map<String, String> out = new LinkedHashMap<>();
        for (int i = 0; i < codeThenLabel.length; i += 2) {
            out.put(codeThenLabel[i], codeThenLabel[i + 1]);
        }
        return out;
    }

    @Test
    void theLeisureSurveysDdiCodebookScaffoldsEveryVariableOfTheImportedWave() throws Exception {
        assertEquals(0, leisureRun.exitCode(), leisureRun.err() + leisureRun.out());
        String yaml = Files.readString(leisureYaml);
        DatasetConfig d = ConfigLoader.load(leisureYaml).dataset("leisure");
        assertEquals(List.of("district", "library_visits", "main_activity", "satisfaction", "age", "sport_hours",
                "travel_minutes", "ebook_user", "membership", "visit_date", "comments"),
                d.variables().stream().map(VariableConfig::name).toList(), yaml);
        assertEquals(List.of("respondent_id"), d.exclude(), yaml);
        assertFalse(yaml.contains("has no column in the table"), yaml);
        assertTrue(yaml.contains("codebook \"" + LeisureScenarioGenerator.CODEBOOK_FILE + ", DDI-Codebook XML\""),
                yaml);
    }

    @Test
    void theLeisureScaffoldCarriesTheCodebooksKindsLabelsUnitsAndRanges() throws Exception {
        DatasetConfig d = ConfigLoader.load(leisureYaml).dataset("leisure");
        String yaml = Files.readString(leisureYaml);
        VariableConfig district = variable(d, "district");
        assertEquals(VariableKind.CATEGORICAL, district.kind(), yaml);
        assertEquals("District of residence", district.label());
        assertEquals(labels("1", "Gullhaven", "2", "Saltmarsh", "3", "Brannock", "4", "Tidewick", "5", "Morrow Fen",
                "6", "Kestle Point"), district.valueLabels());

        VariableConfig satisfaction = variable(d, "satisfaction");
        assertEquals(VariableKind.ORDINAL, satisfaction.kind(), yaml);
        assertEquals(List.of(new MissingCodeSpec("8", "Don't know"), new MissingCodeSpec("9", "Refused")),
                satisfaction.missingCodes());

        VariableConfig visits = variable(d, "library_visits");
        assertEquals(VariableKind.CONTINUOUS, visits.kind(), yaml);
        assertEquals("visits per month", visits.unit());
        assertEquals(List.of(new MissingCodeSpec("-9", "Refused"), new MissingCodeSpec("-8", "Don't know")),
                visits.missingCodes());

        VariableConfig age = variable(d, "age");
        assertEquals(VariableKind.CONTINUOUS, age.kind(), yaml);
        assertEquals("years", age.unit());
        assertEquals("Age in years", age.label());
        // the DDI invalrng's key is the range's reason, the one the findings count its answers under
        assertEquals(List.of(new MissingRangeSpec(997.0, 999.0, "not given")), age.missingRanges());

        VariableConfig travel = variable(d, "travel_minutes");
        assertEquals(VariableKind.CONTINUOUS, travel.kind(), yaml);
        assertEquals("minutes", travel.unit());
        assertEquals(new RangeSpec(0.0, 180.0), travel.range());
        assertEquals("hours per week", variable(d, "sport_hours").unit());

        assertEquals(VariableKind.BINARY, variable(d, "ebook_user").kind(), yaml);
        assertEquals(labels("0", "No", "1", "Yes"), variable(d, "ebook_user").valueLabels());
        assertEquals(VariableKind.CATEGORICAL, variable(d, "membership").kind(), yaml);
        assertEquals(VariableKind.DATE, variable(d, "visit_date").kind(), yaml);
        assertEquals("Any other comments", variable(d, "comments").label());
    }

    @Test
    void theDocumentedCsvCodebookScaffoldsItsKindsLabelsMissingCodesAndRanges() throws Exception {
        assertEquals(0, householdRun.exitCode(), householdRun.err() + householdRun.out());
        String yaml = Files.readString(householdYaml);
        DatasetConfig d = ConfigLoader.load(householdYaml).dataset("household");
        assertEquals(List.of("tenure", "commute_minutes", "housing_satisfaction"),
                d.variables().stream().map(VariableConfig::name).toList(), yaml);
        assertEquals(List.of("resp_id"), d.exclude(), yaml);
        assertFalse(yaml.contains("has no column in the table"), yaml);

        VariableConfig tenure = variable(d, "tenure");
        // the example labels two answers besides "don't know", and the wave gives no other
        assertEquals(VariableKind.BINARY, tenure.kind(), yaml);
        assertTrue(yaml.contains("kind: binary  # codebook: nominal with 2 labelled answers"), yaml);
        assertEquals("Tenure of the home", tenure.label());
        assertEquals(labels("OWN", "Owned outright", "COUN", "Council tenant", "DK", "Don't know"),
                tenure.valueLabels());
        // no reason in the row: the code's label is its reason
        assertEquals(List.of(new MissingCodeSpec("DK", "Don't know")), tenure.missingCodes());

        VariableConfig commute = variable(d, "commute_minutes");
        assertEquals(VariableKind.CONTINUOUS, commute.kind(), yaml);
        assertEquals("Minutes to work, one way", commute.label());
        assertEquals("minutes", commute.unit());
        assertEquals(new RangeSpec(0.0, 300.0), commute.range());
        assertEquals(List.of(new MissingRangeSpec(-99.0, -91.0, "not stated")), commute.missingRanges());

        VariableConfig satisfaction = variable(d, "housing_satisfaction");
        assertEquals(VariableKind.ORDINAL, satisfaction.kind(), yaml);
        assertEquals(new RangeSpec(1.0, 5.0), satisfaction.range());
        assertEquals(labels("1", "Very dissatisfied", "5", "Very satisfied", "-9", "Refused"),
                satisfaction.valueLabels());
        assertEquals(List.of(new MissingCodeSpec("-9", "refused")), satisfaction.missingCodes());
        assertNull(satisfaction.unit());
    }
}
