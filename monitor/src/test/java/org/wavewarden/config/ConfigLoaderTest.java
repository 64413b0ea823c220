package org.wavewarden.config;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.testing.CliRun;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * A bad config is refused before anything connects: exit code 2 and one line naming the key and what was expected.
 * (Unknown tables and columns need the catalog; they are covered in WaveJudgeIntegrationTest.)
 */
class ConfigLoaderTest {

    static final String GOOD = """
            source:
              jdbcUrl: "jdbc:postgresql://127.0.0.1:1/survey"
              user: reader
              passwordEnv: SURVEY_PASSWORD
            alpha: 0.05
            datasets:
              - name: coastal
                table: survey.household_wave
                waveColumn: wave
                compareWith: {pooledLast: 3}
                schedule: "0 15 2 * * ?"
                variables:
                  - name: age
                    kind: continuous
                    unit: years
                    range: {min: 16, max: 99}
                    missingCodes: [{value: -9, reason: refused}]
                    threshold: {raw: 1.5}
                  - name: broadband
                    kind: binary
                    successValue: "yes"
                    threshold: {points: 2}
            """;

    @Test
    void aVariableLabelAndValueLabelsAreReadInTheOrderWritten() {
        VariableConfig v = ConfigLoader.parse(GOOD.replace("successValue: \"yes\"", "successValue: \"yes\"\n"
                + "        label: Broadband at home\n        valueLabels: {\"yes\": Has broadband, 2: \"No\", -9: Refused}"))
                .dataset("coastal").variables().get(1);
        assertEquals("Broadband at home", v.label());
        assertEquals(java.util.List.of("yes=Has broadband", "2=No", "-9=Refused"), v.valueLabels().entrySet().stream()
                .map(e -> e.getKey() + "=" + e.getValue()).toList());
    }

    @Test
    void aGoodConfigParsesIntoRecords() {
        WardenConfig c = ConfigLoader.parse(GOOD);
        assertEquals(0.05, c.alpha());
        DatasetConfig d = c.dataset("coastal");
        assertEquals(new CompareWith.PooledLast(3), d.compareWith());
        assertEquals(1.5, d.variables().get(0).threshold().raw());
        assertEquals("-9", d.variables().get(0).missingCodes().get(0).value());
        assertEquals(VariableKind.BINARY, d.variables().get(1).kind());
        assertInstanceOf(CompareWith.Previous.class, ConfigLoader.parse(GOOD.replace("compareWith: {pooledLast: 3}",
                "compareWith: previous")).dataset("coastal").compareWith());
    }

    /**
     * Each of these points at an unreachable server (port 1): a config that got past validation would exit 3, so
     * exit 2 also shows that nothing connected, let alone changed a database.
     */
    static Stream<Arguments> badConfigs() {
        return Stream.of(
                Arguments.of("misspelt top-level key", GOOD.replace("alpha:", "alfa:"),
                        "alfa: unknown key; did you mean 'alpha'?"),
                Arguments.of("misspelt variable key", GOOD.replace("unit: years", "units: years"),
                        "datasets[0].variables[0].units: unknown key; did you mean 'unit'?"),
                Arguments.of("value labels not a map", GOOD.replace("successValue: \"yes\"",
                                "successValue: \"yes\"\n        valueLabels: [yes, no]"),
                        "datasets[0].variables[1].valueLabels: expected a map of code to label"),
                Arguments.of("a value label that is not text", GOOD.replace("successValue: \"yes\"",
                                "successValue: \"yes\"\n        valueLabels: {\"yes\": [a, b]}"),
                        "datasets[0].variables[1].valueLabels.yes: expected the label as text"),
                Arguments.of("two keys naming one number", GOOD.replace("unit: years",
                                "unit: years\n        valueLabels: {1: one, 1.0: also one}"),
                        "datasets[0].variables[0].valueLabels.1.0: the code '1' names the same number"),
                Arguments.of("a variable label that is a map", GOOD.replace("unit: years",
                                "unit: years\n        label: {text: Age}"),
                        "datasets[0].variables[0].label: expected text"),
                Arguments.of("unknown kind", GOOD.replace("kind: continuous", "kind: contnuous"),
                        "datasets[0].variables[0].kind: expected one of continuous, ordinal, categorical, binary,"
                                + " text, date but got 'contnuous' (did you mean 'continuous'?)"),
                Arguments.of("alpha is text", GOOD.replace("alpha: 0.05", "alpha: five percent"),
                        "alpha: expected a number but got text"),
                Arguments.of("alpha outside (0, 1)", GOOD.replace("alpha: 0.05", "alpha: 1.5"),
                        "alpha: expected a number strictly between 0 and 1 but got 1.5"),
                Arguments.of("datasets missing", GOOD.substring(0, GOOD.indexOf("datasets:")),
                        "datasets: expected a list with at least one dataset"),
                Arguments.of("variables not a list", GOOD.substring(0, GOOD.indexOf("    variables:"))
                                + "    variables: age\n",
                        "datasets[0].variables: expected a list of variables"),
                Arguments.of("table carrying SQL", GOOD.replace("survey.household_wave", "\"x\\\"; DROP TABLE t; --\""),
                        "datasets[0].table: expected a plain SQL identifier"),
                Arguments.of("column carrying SQL", GOOD.replace("name: age", "name: \"age; --\""),
                        "datasets[0].variables[0].name: expected a plain SQL identifier"),
                Arguments.of("wave column carrying SQL", GOOD.replace("waveColumn: wave", "waveColumn: \"wave) OR (1=1\""),
                        "datasets[0].waveColumn: expected a plain SQL identifier"),
                Arguments.of("inline password", GOOD.replace("passwordEnv: SURVEY_PASSWORD", "password: hunter2"),
                        "source.password: passwords are never written in the config"),
                Arguments.of("bad JDBC URL", GOOD.replace("jdbc:postgresql://127.0.0.1:1/survey", "mysql://x"),
                        "source.jdbcUrl: expected 'embedded' or a URL starting with jdbc:postgresql://"),
                Arguments.of("bad cron", GOOD.replace("0 15 2 * * ?", "every night"),
                        "datasets[0].schedule: expected a Quartz cron expression"),
                Arguments.of("raw threshold on a binary", GOOD.replace("threshold: {points: 2}", "threshold: {raw: 2}"),
                        "datasets[0].variables[1].threshold.raw: raw units apply to continuous and ordinal variables"),
                Arguments.of("points on a continuous", GOOD.replace("threshold: {raw: 1.5}", "threshold: {points: 1.5}"),
                        "datasets[0].variables[0].threshold.points: percentage points apply to binary and categorical"),
                Arguments.of("effect threshold on the wrong scale", GOOD.replace("threshold: {raw: 1.5}",
                        "threshold: {effect: 15}"), "datasets[0].variables[0].threshold.effect: effect-scale thresholds"
                        + " of continuous variables are judged on Hedges' g, Cliff's delta"),
                Arguments.of("range min above max", GOOD.replace("{min: 16, max: 99}", "{min: 99, max: 16}"),
                        "datasets[0].variables[0].range: min 99.0 is above max 16.0"),
                Arguments.of("pooledLast not a whole number", GOOD.replace("pooledLast: 3", "pooledLast: 2.5"),
                        "datasets[0].compareWith.pooledLast: expected a whole number of waves"),
                Arguments.of("two password sources", GOOD.replace("passwordEnv: SURVEY_PASSWORD",
                        "passwordEnv: SURVEY_PASSWORD\n  passwordFile: /run/secret"),
                        "source.passwordEnv: give either passwordEnv or passwordFile, not both"),
                Arguments.of("required key missing", GOOD.replace("    waveColumn: wave\n", ""),
                        "datasets[0].waveColumn: missing"),
                Arguments.of("successValue on a continuous", GOOD.replace("unit: years", "successValue: x"),
                        "datasets[0].variables[0].successValue: only binary variables have a successValue"),
                Arguments.of("not YAML", "source: [unclosed", "(file): not valid YAML"),
                Arguments.of("duplicate variable", GOOD.replace("name: broadband", "name: age"),
                        "datasets[0].variables[1].name: variable 'age' is listed twice"),
                Arguments.of("identifier with a comment", GOOD.replace("waveColumn: wave", "waveColumn: \"x; --\""),
                        "datasets[0].waveColumn: expected a plain SQL identifier"),
                Arguments.of("quiet period not a duration", GOOD.replace("    schedule:", "    quietPeriod: 10 minutes\n"
                        + "    schedule:"), "datasets[0].quietPeriod: expected an ISO-8601 duration"),
                Arguments.of("webhook secret inline", GOOD.replace("    schedule:", "    alerts: {webhook: {url:"
                        + " \"https://h.example/x\", secret: abc}}\n    schedule:"),
                        "datasets[0].alerts.webhook.secret: secrets are never written in the config"),
                Arguments.of("webhook URL not http", GOOD.replace("    schedule:", "    alerts: {webhook: {url:"
                        + " \"ftp://h.example/x\", secretEnv: S}}\n    schedule:"),
                        "datasets[0].alerts.webhook.url: expected an http:// or https:// URL"),
                Arguments.of("unknown alert kind", GOOD.replace("    schedule:", "    alerts: {jsonLines: {path: a.jsonl,"
                        + " kinds: [BLANKS]}}\n    schedule:"),
                        "datasets[0].alerts.jsonLines.kinds[0]: unknown finding kind 'BLANKS'; did you mean 'BLANK'?"),
                Arguments.of("readiness table without column", GOOD.replace("    schedule:",
                        "    readyTable: survey.released\n    schedule:"),
                        "datasets[0].readyColumn: readyTable and readyColumn go together"),
                Arguments.of("reference mean on a binary", GOOD.replace("successValue: \"yes\"",
                        "successValue: \"yes\"\n        reference: {mean: 0.5}"),
                        "datasets[0].variables[1].reference.mean: a reference mean applies to continuous and ordinal"),
                Arguments.of("reference shares above one", GOOD.replace("successValue: \"yes\"",
                        "successValue: \"yes\"\n        reference: {shares: {\"yes\": 0.7, \"no\": 0.6}}"),
                        "datasets[0].variables[1].reference.shares: expected at least one share, summing to at most 1"),
                Arguments.of("port out of range", GOOD + "daemon: {httpPort: 70000}\n",
                        "daemon.httpPort: expected a port from 0 to 65535"),
                Arguments.of("design without clusters", releases("weightColumn: w\n    design: {strata: district}"),
                        "datasets[0].design.clusters: missing: the column naming each respondent's primary sampling"),
                Arguments.of("design without weights", releases("design: {clusters: village}"),
                        "datasets[0].weightColumn: missing: a design needs the survey weights"),
                Arguments.of("misspelt design key", releases("weightColumn: w\n    design: {cluster: village}"),
                        "datasets[0].design.cluster: unknown key; did you mean 'clusters'?"),
                Arguments.of("design cluster is the weight", releases("weightColumn: w\n    design: {clusters: w}"),
                        "datasets[0].design.clusters: expected a column of its own, but 'w' is the weight column"),
                Arguments.of("strata equal clusters", releases("weightColumn: w\n    design: {strata: v, clusters: v}"),
                        "datasets[0].design.clusters: expected a column other than the strata column"),
                Arguments.of("design column carrying SQL", releases("weightColumn: w\n    design: {clusters: \"v; --\"}"),
                        "datasets[0].design.clusters: expected a plain SQL identifier"),
                Arguments.of("relationships not a list", withRelationships("age ~ income"),
                        "datasets[0].relationships: expected a list of {x, y, threshold}"),
                Arguments.of("relationship without y", withRelationships("[{x: age}]"),
                        "datasets[0].relationships[0].y: missing"),
                Arguments.of("relationship of a column with itself", withRelationships("[{x: age, y: age}]"),
                        "datasets[0].relationships[0].y: expected a column other than x, but both are 'age'"),
                Arguments.of("relationship listed twice", withRelationships("[{x: age, y: income},"
                        + " {x: income, y: age}]"),
                        "datasets[0].relationships[1]: the pair income and age is listed twice"),
                Arguments.of("relationship threshold beyond the scale", withRelationships("[{x: age, y: income,"
                        + " threshold: 2.5}]"), "datasets[0].relationships[0].threshold: expected a difference of"
                        + " correlations above 0 and below 2 (such as 0.1) but got 2.5"),
                Arguments.of("relationship threshold as text", withRelationships("[{x: age, y: income,"
                        + " threshold: small}]"), "datasets[0].relationships[0].threshold: expected a number"),
                Arguments.of("misspelt relationship key", withRelationships("[{x: age, why: income}]"),
                        "datasets[0].relationships[0].why: unknown key"),
                Arguments.of("relationship column carrying SQL", withRelationships("[{x: \"age; --\", y: income}]"),
                        "datasets[0].relationships[0].x: expected a plain SQL identifier"),
                Arguments.of("releases without a respondent key", releases("releases: {column: revision}"),
                        "datasets[0].respondentKey: missing: releases are compared respondent by respondent"),
                Arguments.of("releases with both layouts", releases("respondentKey: household_id\n    releases:"
                                + " {column: revision, previousTable: survey.household_wave_v1}"),
                        "datasets[0].releases: expected exactly one of column (a release column in the same table)"
                                + " or previousTable"),
                Arguments.of("releases with neither layout", releases("respondentKey: household_id\n    releases: {}"),
                        "datasets[0].releases: expected exactly one of column"),
                Arguments.of("releases not a mapping", releases("respondentKey: household_id\n    releases: revision"),
                        "datasets[0].releases: expected a mapping but got text"),
                Arguments.of("misspelt previous table", releases("respondentKey: household_id\n    releases:"
                        + " {previous_table: survey.household_wave_v1}"),
                        "datasets[0].releases.previous_table: unknown key; did you mean 'previousTable'?"),
                Arguments.of("misspelt respondent key", releases("respondent_key: household_id"),
                        "datasets[0].respondent_key: unknown key; did you mean 'respondentKey'?"),
                Arguments.of("respondent key carrying SQL", releases("respondentKey: \"id) OR (1=1\""),
                        "datasets[0].respondentKey: expected a plain SQL identifier"),
                Arguments.of("release column carrying SQL", releases("respondentKey: household_id\n    releases:"
                        + " {column: \"rev; --\"}"), "datasets[0].releases.column: expected a plain SQL identifier"),
                Arguments.of("previous table carrying SQL", releases("respondentKey: household_id\n    releases:"
                        + " {previousTable: \"x\\\"; DROP TABLE t; --\"}"),
                        "datasets[0].releases.previousTable: expected a plain SQL identifier"),
                Arguments.of("release column is the wave column", releases("respondentKey: household_id\n"
                        + "    releases: {column: wave}"), "datasets[0].releases.column: expected a column of its own"
                        + " telling the releases apart, but 'wave' is the wave column"),
                Arguments.of("respondent key is the wave column", releases("respondentKey: wave"),
                        "datasets[0].respondentKey: expected the column identifying a respondent, not the wave"
                                + " column 'wave'"),
                Arguments.of("previous table is the table itself", releases("respondentKey: household_id\n"
                        + "    releases: {previousTable: survey.household_wave}"),
                        "datasets[0].releases.previousTable: expected another table than the dataset's own"),
                Arguments.of("previous table a pattern beside one table", releases("respondentKey: household_id\n"
                        + "    releases: {previousTable: \"v1.wave_{wave}\"}"),
                        "datasets[0].releases.previousTable: expected one table"),
                Arguments.of("previous table not a pattern beside a pattern", releases("respondentKey: household_id\n"
                        + "    releases: {previousTable: survey.old}").replace("table: survey.household_wave\n"
                        + "    waveColumn: wave", "tablePattern: \"survey.wave_{wave}\""),
                        "datasets[0].releases.previousTable: expected a pattern containing {wave}"),
                Arguments.of("a variable that is the respondent key", releases("respondentKey: age"),
                        "datasets[0].variables[0].name: 'age' is also datasets[0].respondentKey, a column that is"
                                + " never compared as a variable"));
    }

    /** Configs that used to load and then said something other than what they meant (or nothing at all). */
    static Stream<Arguments> configsThatSaidTwoThingsOrNothing() {
        return Stream.of(
                Arguments.of("a key given twice", GOOD.replace("kind: continuous", "kind: continuous\n        kind:"
                        + " ordinal"), "datasets[0].variables[0].kind: the key is given twice in the same mapping"
                        + " (line 15)"),
                Arguments.of("a top-level key given twice", GOOD + "alpha: 0.01\n",
                        "alpha: the key is given twice"),
                Arguments.of("the weight column declared as a variable", releases("weightColumn: age"),
                        "datasets[0].variables[0].name: 'age' is also datasets[0].weightColumn"),
                Arguments.of("the wave column declared as a variable", GOOD.replace("name: age", "name: wave"),
                        "datasets[0].variables[0].name: 'wave' is also datasets[0].waveColumn"),
                Arguments.of("an excluded column declared as a variable", releases("exclude: [id, broadband]"),
                        "datasets[0].variables[1].name: 'broadband' is also datasets[0].exclude[1]"),
                Arguments.of("a stratum column declared as a variable", releases("weightColumn: w\n    design:"
                        + " {strata: broadband, clusters: village}"),
                        "datasets[0].variables[1].name: 'broadband' is also datasets[0].design.strata"),
                Arguments.of("a cluster column declared as a variable", releases("weightColumn: w\n    design:"
                        + " {clusters: age}"), "datasets[0].variables[0].name: 'age' is also datasets[0].design.clusters"),
                Arguments.of("Cliff's delta above 1 on an ordinal", GOOD.replace("kind: continuous",
                        "kind: ordinal").replace("threshold: {raw: 1.5}", "threshold: {effect: 1.5}"),
                        "datasets[0].variables[0].threshold.effect: effect-scale thresholds of ordinal variables"
                                + " are judged on Cliff's delta or rank-biserial r, so at most 1"),
                Arguments.of("an effect above 1 on a continuous, judged on Cliff's delta when skewed",
                        GOOD.replace("threshold: {raw: 1.5}", "threshold: {effect: 1.5}"),
                        "datasets[0].variables[0].threshold.effect: effect-scale thresholds of continuous variables"),
                Arguments.of("Cramér's V above 1", GOOD.replace("kind: binary", "kind: categorical")
                        .replace("        successValue: \"yes\"\n", "").replace("{points: 2}", "{effect: 1.2}"),
                        "datasets[0].variables[1].threshold.effect: effect-scale thresholds of categorical variables"
                                + " are judged on Cramér's V, so at most 1"),
                Arguments.of("Cohen's h above pi", GOOD.replace("{points: 2}", "{effect: 3.2}"),
                        "datasets[0].variables[1].threshold.effect: effect-scale thresholds of binary variables are"
                                + " judged on Cohen's h, so at most pi"),
                Arguments.of("an effect threshold on a text variable", GOOD.replace("kind: binary", "kind: text")
                        .replace("        successValue: \"yes\"\n", "").replace("{points: 2}", "{effect: 0.2}"),
                        "datasets[0].variables[1].threshold.effect: effect-scale thresholds apply to compared"),
                Arguments.of("more than 100 percentage points", GOOD.replace("{points: 2}", "{points: 101}"),
                        "datasets[0].variables[1].threshold.points: expected at most 100 percentage points"),
                Arguments.of("a cron that never fires again", GOOD.replace("0 15 2 * * ?", "0 0 0 1 1 ? 2001"),
                        "datasets[0].schedule: the cron expression '0 0 0 1 1 ? 2001' never fires again"),
                Arguments.of("a location test that is neither means nor ranks", GOOD.replace("unit: years",
                        "unit: years\n        locationTest: median"),
                        "datasets[0].variables[0].locationTest: expected means or ranks but got 'median'"),
                Arguments.of("a location test pinned on a binary variable", GOOD.replace("successValue: \"yes\"",
                        "successValue: \"yes\"\n        locationTest: means"),
                        "datasets[0].variables[1].locationTest: only continuous variables choose between means and"
                                + " ranks"),
                Arguments.of("a baseline outside the explicit wave order", GOOD.replace("compareWith: {pooledLast: 3}",
                        "compareWith: {baseline: 2019}\n    waveOrder: [\"2020\", \"2021\"]"),
                        "datasets[0].compareWith.baseline: wave '2019' is not in datasets[0].waveOrder"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("configsThatSaidTwoThingsOrNothing")
    void aConfigThatWouldSayTwoThingsOrNothingExitsTwoNamingTheKey(String what, String yaml, String expected,
                                                                  @TempDir Path dir) throws Exception {
        aBadConfigExitsTwoNamingTheKey(what, yaml, expected, dir);
    }

    @Test
    void aContinuousVariablesLocationTestCanBePinned() {
        assertEquals(LocationTestPin.RANKS, ConfigLoader.parse(GOOD.replace("unit: years", "unit: years\n"
                + "        locationTest: ranks")).dataset("coastal").variables().get(0).locationTest());
        assertEquals(null, ConfigLoader.parse(GOOD).dataset("coastal").variables().get(0).locationTest());
    }

    @Test
    void effectThresholdsUpToTheirScalesBoundAreAccepted() {
        assertEquals(1.0, ConfigLoader.parse(GOOD.replace("threshold: {raw: 1.5}", "threshold: {effect: 1}"))
                .dataset("coastal").variables().get(0).threshold().effect());
        assertEquals(3.0, ConfigLoader.parse(GOOD.replace("{points: 2}", "{effect: 3}"))
                .dataset("coastal").variables().get(1).threshold().effect());
        assertEquals(100.0, ConfigLoader.parse(GOOD.replace("{points: 2}", "{points: 100}"))
                .dataset("coastal").variables().get(1).threshold().points());
    }

    /** GOOD with the given dataset keys added (indented as dataset keys). */
    static String releases(String keys) {
        return GOOD.replace("    schedule:", "    " + keys + "\n    schedule:");
    }

    @Test
    void aDesignParsesWithOrWithoutStrata() {
        DatasetConfig both = ConfigLoader.parse(releases("weightColumn: w\n    design: {strata: district, clusters:"
                + " village}")).dataset("coastal");
        assertEquals(new DesignColumns("district", "village"), both.design());
        assertTrue(both.isBookkeeping("district") && both.isBookkeeping("village"), "never compared as answers");
        assertEquals(null, ConfigLoader.parse(releases("weightColumn: w\n    design: {clusters: village}"))
                .dataset("coastal").design().strata());
        assertEquals(null, ConfigLoader.parse(GOOD).dataset("coastal").design());
    }

    @Test
    void releasesParseForBothLayouts() {
        DatasetConfig column = ConfigLoader.parse(releases("respondentKey: household_id\n    releases: {column:"
                + " revision}")).dataset("coastal");
        assertEquals("household_id", column.respondentKey());
        assertEquals(new ReleasesConfig("revision", null), column.releases());
        assertEquals("revision", column.releaseColumn());
        assertTrue(column.isBookkeeping("revision") && column.isBookkeeping("household_id")
                && !column.isBookkeeping("age"));

        DatasetConfig table = ConfigLoader.parse(releases("respondentKey: household_id\n    releases:"
                + " {previousTable: survey_v1.household_wave}")).dataset("coastal");
        assertEquals(new ReleasesConfig(null, "survey_v1.household_wave"), table.releases());
        assertEquals(null, table.releaseColumn());

        DatasetConfig pattern = ConfigLoader.parse(releases("respondentKey: household_id\n    releases:"
                + " {previousTable: \"v1.wave_{wave}\"}").replace("table: survey.household_wave\n    waveColumn: wave",
                "tablePattern: \"survey.wave_{wave}\"")).dataset("coastal");
        assertEquals("v1.wave_{wave}", pattern.releases().previousTable());

        DatasetConfig keyOnly = ConfigLoader.parse(releases("respondentKey: household_id")).dataset("coastal");
        assertEquals("household_id", keyOnly.respondentKey());
        assertEquals(null, keyOnly.releases());
        assertEquals(null, ConfigLoader.parse(GOOD).dataset("coastal").respondentKey());
    }

    private static String withRelationships(String yaml) {
        return GOOD.replace("    variables:\n", "    relationships: " + yaml + "\n    variables:\n");
    }

    @Test
    void relationshipsParseWithTheirThresholdOrNoneForTheDefault() {
        DatasetConfig d = ConfigLoader.parse(withRelationships("[{x: age, y: income, threshold: 0.15},"
                + " {x: age, y: hours}]")).dataset("coastal");
        assertEquals(java.util.List.of(new RelationshipConfig("age", "income", 0.15),
                new RelationshipConfig("age", "hours", null)), d.relationships());
        assertEquals("age ~ income", d.relationships().get(0).label());
        assertEquals(java.util.List.of(), ConfigLoader.parse(GOOD).dataset("coastal").relationships());
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("badConfigs")
    void aBadConfigExitsTwoNamingTheKey(String what, String yaml, String expected, @TempDir Path dir) throws Exception {
        Path file = dir.resolve("bad.yaml");
        Files.writeString(file, yaml);
        CliRun r = CliRun.of("waves", "--config", file.toString());
        assertEquals(2, r.exitCode(), what + ": " + r.err());
        assertTrue(r.err().startsWith("config error at " + expected), what + " printed: " + r.err());
        assertEquals(1, r.err().strip().lines().count(), "one line: " + r.err());
    }

    @Test
    void theShippedConfigsAreValid() {
        for (String f : new String[] {"demo.yaml", "example-external.yaml", "compose.yaml"}) {
            WardenConfig c = ConfigLoader.load(Path.of("..", "config", f));
            assertTrue(!c.datasets().isEmpty(), f);
        }
        WardenConfig ext = ConfigLoader.load(Path.of("..", "config", "example-external.yaml"));
        assertEquals("WAVEWARDEN_HOOK_SECRET", ext.dataset("labour-panel").alerts().webhook().secretEnv());
        assertEquals(java.time.Duration.ofMinutes(30), ext.dataset("labour-panel").quietPeriod());
        assertEquals(0.31, ext.dataset("labour-panel").variables().get(4).reference().shares().get("north"));
        assertEquals(new RelationshipConfig("hours_worked", "job_satisfaction", 0.1),
                ext.dataset("labour-panel").relationships().get(0));
    }

    @Test
    void aMissingConfigFileExitsTwo() {
        CliRun r = CliRun.of("waves", "--config", "no-such-file.yaml");
        assertEquals(2, r.exitCode());
        assertTrue(r.err().startsWith("config error at (file): cannot read no-such-file.yaml"), r.err());
    }

    @Test
    void usageErrorsExitTwoWithHelp() {
        CliRun r = CliRun.of("check", "--config", "x.yaml");
        assertEquals(2, r.exitCode());
        assertTrue(r.err().contains("Missing required option: '--wave=WAVE'"), r.err());
        assertEquals(0, CliRun.of("check", "--help").exitCode());
    }
}
