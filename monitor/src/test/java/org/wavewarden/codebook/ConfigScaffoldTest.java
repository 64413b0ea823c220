package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.ConnectionConfig;
import org.wavewarden.config.DatasetConfig;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;
import org.wavewarden.read.SourceColumn;

import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The scaffolded YAML: every column placed, each choice explained, and every label read back exactly. */
class ConfigScaffoldTest {

    static final ConnectionConfig SOURCE = new ConnectionConfig("jdbc:postgresql://127.0.0.1:5432/survey", "reader",
            "SURVEY_PASSWORD", null);

    static ColumnTally tally(String column, ColumnType type, Map<String, Long> values) {
        long rows = values.values().stream().mapToLong(Long::longValue).sum();
        return new ColumnTally(column, type, rows, 0, values, false);
    }

    static Map<String, Long> integers(int from, int to, long each) {
        Map<String, Long> out = new LinkedHashMap<>();
        for (int v = from; v <= to; v++) {
            out.put(String.valueOf(v), each);
        }
        return out;
    }

    static VariableMeta meta(String name, String label, Measure measure, Map<String, String> valueLabels,
                             List<MissingCodeSpec> codes, List<MissingRangeSpec> ranges, RangeSpec valid) {
        return new VariableMeta(name, label, StorageType.NUMBER, null, null, null, measure, null, valueLabels, codes,
                ranges, valid);
    }

    static ConfigScaffold.Input input(List<SourceColumn> columns, Map<String, ColumnTally> tallies,
                                      DatasetCodebook codebook) {
        return new ConfigScaffold.Input(SOURCE, new WardenConfig.ResultsConfig(null, "ww_results"), "household",
                "survey.household", "wave", columns, "2025-Q1", tallies, codebook, null, null, List.of());
    }

    static DatasetConfig load(String yaml) {
        return ConfigLoader.parse(yaml).dataset("household");
    }

    static VariableConfig variable(DatasetConfig d, String name) {
        return d.variables().stream().filter(v -> v.name().equals(name)).findFirst()
                .orElseThrow(() -> new AssertionError(name + " not among " + d.variables()));
    }

    @ParameterizedTest
    @ValueSource(strings = {
            "Tenant: \"council\" # or housing association",
            "line one\nline two\r\nline three",
            "tab\there, backslash \\ and a trailing \\",
            "Propriétaire – 持ち家 – Ägäis – 🏠",
            "- starts like a list item",
            "{looks: [like, flow]}",
            "&anchor *alias !tag %directive @at `tick",
            "'single quotes' and \"double\"",
            "null",
            "yes",
            "0x1F",
            "   leading and trailing spaces   ",
            "line\u2028separator\u2029paragraph\u0085next\u00a0nbsp",
            "control \u0001\u0007\u001b and bom \ufeff",
            "",
    })
    void aHostileLabelIsWrittenAsYamlThatReadsBackExactly(String hostile) {
        DatasetCodebook codebook = new DatasetCodebook("household.xml", null, List.of(
                meta("tenure", hostile, Measure.NOMINAL, Map.of("1", hostile, "2", "Owner", "3", "Other"),
                        List.of(new MissingCodeSpec("-9", hostile)), List.of(), null)));
        String yaml = ConfigScaffold.yaml(input(List.of(new SourceColumn("wave", ColumnType.TEXT, "text"),
                        new SourceColumn("tenure", ColumnType.INTEGER, "integer")),
                Map.of("tenure", tally("tenure", ColumnType.INTEGER, integers(1, 3, 10))), codebook));
        VariableConfig tenure = variable(load(yaml), "tenure");
        // A blank label says nothing and is left out; the loader's default reason stands in for a blank one.
        assertEquals(hostile.isBlank() ? null : hostile, tenure.label(), yaml);
        assertEquals(hostile.isBlank() ? null : hostile, tenure.valueLabels().get("1"), yaml);
        assertEquals(hostile.isBlank() ? "missing code" : hostile, tenure.missingCodes().get(0).reason(), yaml);
    }

    @Test
    void theCodebookDecidesKindsLabelsCodesAndRangesAndSaysSo() {
        DatasetCodebook codebook = new DatasetCodebook("household.xml", "Household survey", List.of(
                meta("tenure", "Tenure of the home", Measure.NOMINAL,
                        Map.of("1", "Owner", "2", "Council tenant", "3", "Private renter", "-9", "Refused"),
                        List.of(new MissingCodeSpec("-9", "Refused")), List.of(), null),
                meta("hours", "Hours worked last week", Measure.SCALE, Map.of(), List.of(),
                        List.of(new MissingRangeSpec(-99.0, -90.0, "not asked"), new MissingRangeSpec(998.0, null,
                                "don't know")), new RangeSpec(0.0, 97.0)),
                meta("satisfied", "Satisfied with the area", Measure.ORDINAL, Map.of("1", "Not at all", "5", "Very"),
                        List.of(), List.of(), null),
                meta("owns_car", null, Measure.NOMINAL, Map.of("1", "Yes", "2", "No", "9", "No answer"),
                        List.of(new MissingCodeSpec("9", "No answer")), List.of(), null)));
        Map<String, ColumnTally> tallies = new HashMap<>();
        tallies.put("tenure", tally("tenure", ColumnType.INTEGER, Map.of("1", 40L, "2", 30L, "3", 20L, "-9", 5L)));
        tallies.put("hours", tally("hours", ColumnType.INTEGER, integers(0, 60, 5)));
        tallies.put("satisfied", tally("satisfied", ColumnType.INTEGER, integers(1, 5, 20)));
        tallies.put("owns_car", tally("owns_car", ColumnType.INTEGER, Map.of("1", 50L, "2", 45L, "9", 5L)));
        tallies.put("district", tally("district", ColumnType.TEXT, Map.of("North", 30L, "South", 30L, "East", 20L,
                "West", 15L)));
        tallies.put("income", tally("income", ColumnType.DECIMAL, integers(800, 4000, 1)));
        String yaml = ConfigScaffold.yaml(input(List.of(
                new SourceColumn("resp_id", ColumnType.INTEGER, "integer"),
                new SourceColumn("wave", ColumnType.TEXT, "text"),
                new SourceColumn("tenure", ColumnType.INTEGER, "integer"),
                new SourceColumn("hours", ColumnType.INTEGER, "integer"),
                new SourceColumn("satisfied", ColumnType.INTEGER, "integer"),
                new SourceColumn("owns_car", ColumnType.INTEGER, "integer"),
                new SourceColumn("district", ColumnType.TEXT, "text"),
                new SourceColumn("income", ColumnType.DECIMAL, "numeric"),
                new SourceColumn("hh_weight", ColumnType.DECIMAL, "double precision")), tallies, codebook));
        DatasetConfig d = load(yaml);

        assertEquals("hh_weight", d.weightColumn());
        assertTrue(yaml.contains("weightColumn: \"hh_weight\"  # its name reads as a survey weight"), yaml);
        assertEquals(List.of("resp_id"), d.exclude());
        assertTrue(yaml.contains("respondent identifier"), yaml);

        VariableConfig tenure = variable(d, "tenure");
        assertEquals(VariableKind.CATEGORICAL, tenure.kind());
        assertTrue(yaml.contains("kind: categorical  # codebook: nominal"), yaml);
        assertEquals("Tenure of the home", tenure.label());
        assertEquals("Council tenant", tenure.valueLabels().get("2"));
        assertEquals(List.of(new org.wavewarden.config.MissingCodeSpec("-9", "Refused")), tenure.missingCodes());

        VariableConfig hours = variable(d, "hours");
        assertEquals(VariableKind.CONTINUOUS, hours.kind());
        assertEquals(new RangeSpec(0.0, 97.0), hours.range());
        assertEquals(List.of(new MissingRangeSpec(-99.0, -90.0, "not asked"), new MissingRangeSpec(998.0, null,
                "don't know")), hours.missingRanges());

        assertEquals(VariableKind.ORDINAL, variable(d, "satisfied").kind());
        assertTrue(yaml.contains("# range: {min: 1, max: 5}  # observed in wave"), yaml);
        assertEquals(VariableKind.BINARY, variable(d, "owns_car").kind(), "two labelled answers besides the code");

        VariableConfig district = variable(d, "district");
        assertEquals(VariableKind.CATEGORICAL, district.kind());
        assertTrue(yaml.contains("kind: categorical  # inferred: 4 distinct text values: read as codes in wave"
                + " \"2025-Q1\""), yaml);
        assertEquals(VariableKind.CONTINUOUS, variable(d, "income").kind());
        assertTrue(yaml.contains("# range: {min: 800, max: 4000}  # observed in wave"), yaml);
        assertNull(variable(d, "income").range());
        assertFalse(d.variables().stream().anyMatch(v -> v.name().equals("wave")));
        assertEquals(9, d.variables().size() + d.exclude().size() + 2, "every column placed once");
    }

    @Test
    void aTablePerWaveIsWrittenAsItsPatternWithoutAWaveColumn() {
        String yaml = ConfigScaffold.yaml(new ConfigScaffold.Input(SOURCE, new WardenConfig.ResultsConfig(null,
                "ww_results"), "household", "pulse.wave_{wave}", null, List.of(new SourceColumn("age",
                ColumnType.INTEGER, "integer")), "7", Map.of("age", tally("age", ColumnType.INTEGER,
                integers(16, 90, 2))), null, null, null, List.of()));
        DatasetConfig d = load(yaml);
        assertEquals("pulse.wave_{wave}", d.tablePattern());
        assertNull(d.table());
        assertEquals(List.of("age"), d.variables().stream().map(VariableConfig::name).toList());
    }

    @Test
    void twoLabelledAnswersStayCategoricalWhenTheWaveUsesAThirdOne() {
        DatasetCodebook codebook = new DatasetCodebook("household.xml", null, List.of(
                meta("owns_car", null, Measure.NOMINAL, Map.of("1", "Yes", "2", "No"), List.of(), List.of(), null)));
        String yaml = ConfigScaffold.yaml(input(List.of(new SourceColumn("wave", ColumnType.TEXT, "text"),
                        new SourceColumn("owns_car", ColumnType.INTEGER, "integer")),
                Map.of("owns_car", tally("owns_car", ColumnType.INTEGER, Map.of("1", 40L, "2", 50L, "3", 10L))),
                codebook));
        assertEquals(VariableKind.CATEGORICAL, variable(load(yaml), "owns_car").kind(), yaml);
    }

    @Test
    void aScaleWhoseEveryAnswerIsALabelledCodeIsReadAsCodesAndAScaleWithUnlabelledAnswersStaysContinuous() {
        // haven writes every number with the measurement level scale, labelled or not.
        DatasetCodebook codebook = new DatasetCodebook("household.sav", null, List.of(
                meta("tenure", "Tenure", Measure.SCALE, Map.of("1", "Owner", "2", "Council tenant",
                        "3", "Private renter", "9", "Refused"), List.of(new MissingCodeSpec("9", "Refused")),
                        List.of(), null),
                meta("hours", "Hours", Measure.SCALE, Map.of("-9", "Refused", "1", "One hour", "2", "Two hours"),
                        List.of(new MissingCodeSpec("-9", "Refused")), List.of(), null)));
        String yaml = ConfigScaffold.yaml(input(List.of(new SourceColumn("wave", ColumnType.TEXT, "text"),
                        new SourceColumn("tenure", ColumnType.DECIMAL, "double precision"),
                        new SourceColumn("hours", ColumnType.DECIMAL, "double precision")),
                Map.of("tenure", tally("tenure", ColumnType.DECIMAL, Map.of("1", 40L, "2", 30L, "3", 20L, "9", 2L)),
                        "hours", tally("hours", ColumnType.DECIMAL, Map.of("1", 4L, "2", 5L, "37", 30L, "-9", 2L))),
                codebook));
        DatasetConfig d = load(yaml);
        assertEquals(VariableKind.CATEGORICAL, variable(d, "tenure").kind(), yaml);
        assertTrue(yaml.contains("# codebook: scale, but every answer in wave \"2025-Q1\" is one of its 3 labelled"
                + " codes"), yaml);
        assertEquals(VariableKind.CONTINUOUS, variable(d, "hours").kind(), yaml);
    }

    @Test
    void aCodebookKindThatDoesNotFitTheColumnGivesWayToInferenceWithANote() {
        DatasetCodebook codebook = new DatasetCodebook("household.csv", null, List.of(
                meta("remark", "Remarks", Measure.SCALE, Map.of(), List.of(), List.of(new MissingRangeSpec(null, -1.0,
                        "refused")), null)));
        Map<String, Long> remarks = new HashMap<>();
        for (int i = 0; i < 80; i++) {
            remarks.put("remark number " + i, 1L);
        }
        String yaml = ConfigScaffold.yaml(input(List.of(new SourceColumn("wave", ColumnType.TEXT, "text"),
                        new SourceColumn("remark", ColumnType.TEXT, "text")),
                Map.of("remark", tally("remark", ColumnType.TEXT, remarks)), codebook));
        VariableConfig remark = variable(load(yaml), "remark");
        assertEquals(VariableKind.TEXT, remark.kind());
        assertTrue(remark.missingRanges().isEmpty());
        assertTrue(yaml.contains("# the codebook's scale does not fit the text column"), yaml);
    }

    @Test
    void withoutACodebookEveryKindIsInferredAndTheSourceKeepsOnlyWhereThePasswordLives() {
        String yaml = ConfigScaffold.yaml(input(List.of(new SourceColumn("wave", ColumnType.TEXT, "text"),
                        new SourceColumn("age", ColumnType.INTEGER, "integer")),
                Map.of("age", tally("age", ColumnType.INTEGER, integers(16, 90, 3))), null));
        WardenConfig c = ConfigLoader.parse(yaml);
        assertEquals(SOURCE, c.source());
        assertEquals("ww_results", c.results().schema());
        VariableConfig age = c.dataset("household").variables().get(0);
        assertEquals(VariableKind.CONTINUOUS, age.kind());
        assertEquals("years", age.unit());
        assertTrue(yaml.contains("without a codebook"), yaml);
    }
}
