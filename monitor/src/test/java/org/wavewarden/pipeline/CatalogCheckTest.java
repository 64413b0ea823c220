package org.wavewarden.pipeline;

import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.wavewarden.testing.CliRun;
import org.wavewarden.testing.SmallSurvey;
import org.wavewarden.testing.TestDatabase;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The checks that need the source catalog or its data: a config that names columns of the wrong type, a success
 * value that never occurs or a baseline wave that does not exist exits 2 naming the key, before the results schema
 * is created.
 */
class CatalogCheckTest {

    @TempDir
    static Path dir;
    static String url;

    @BeforeAll
    static void load() throws Exception {
        url = TestDatabase.freshDatabase("catalog_check");
        SmallSurvey.createTable(url);
        Path[] csv = SmallSurvey.writeWaves(dir);
        Path config = dir.resolve("import.yaml");
        Files.writeString(config, SmallSurvey.config(url, null));
        for (int w = 1; w <= 2; w++) {
            assertEquals(0, CliRun.of("import", "--config", config.toString(), "--wave", "w" + w,
                    csv[w - 1].toString()).exitCode());
        }
    }

    /** The small survey's config with dataset keys added after exclude and variables appended. */
    static String config(String datasetKeys, String variables) {
        return SmallSurvey.config(url, variables).replace("    exclude: [respondent_id]",
                "    exclude: [respondent_id]" + (datasetKeys == null ? "" : "\n    " + datasetKeys));
    }

    static Stream<Arguments> refused() {
        return Stream.of(
                Arguments.of("kind date on a text column", config(null, "      - {name: remark, kind: date}"),
                        "datasets[0].variables[3].kind: kind date needs a date or timestamp column, but remark is"
                                + " text"),
                Arguments.of("kind date on a float column", config(null, "      - {name: spread, kind: date}")
                                .replace("      - name: spread\n        kind: continuous\n", ""),
                        "datasets[0].variables[2].kind: kind date needs a date or timestamp column, but spread is"
                                + " double precision"),
                Arguments.of("a text weight column", config("weightColumn: remark", null),
                        "datasets[0].weightColumn: expected a numeric column"),
                Arguments.of("a stratum column that does not exist", config("weightColumn: spread\n    design:"
                        + " {strata: district, clusters: region}", null).replace("      - name: spread\n"
                        + "        kind: continuous\n", "").replace("      - name: region\n        kind: categorical\n",
                        ""), "datasets[0].design.strata: column district does not exist"),
                Arguments.of("a boolean's success value written as yes", config(null,
                        "      - {name: has_car, kind: binary, successValue: \"yes\"}"),
                        "datasets[0].variables[3].successValue: 'yes' never occurs in column has_car of any wave, so"
                                + " its share would read 0% in every wave; values that do occur include ['f', 't']"),
                Arguments.of("a text column's success value that never occurs", config(null, null).replace("      - name: region\n"
                        + "        kind: categorical\n", "      - {name: region, kind: binary, successValue: \"North\"}\n"),
                        "datasets[0].variables[1].successValue: 'North' never occurs in column region of any wave, so"
                                + " its share would read 0% in every wave; values that do occur include ['east',"
                                + " 'north', 'south', 'west']"),
                Arguments.of("a success value outside the codes", config(null,
                        "      - {name: satisfied, kind: binary, successValue: \"9\"}"),
                        "datasets[0].variables[3].successValue: '9' never occurs in column satisfied"),
                Arguments.of("an unknown baseline wave", config("compareWith: {baseline: w9}", null),
                        "datasets[0].compareWith.baseline: no wave 'w9' in src.answers; waves there include [w1, w2]"),
                Arguments.of("an unknown baseline wave among rules judged alongside",
                        config("compareWith: [previous, {baseline: w9}]", null),
                        "datasets[0].compareWith[1].baseline: no wave 'w9' in src.answers"),
                Arguments.of("a domain column that does not exist",
                        config("breakdowns: {columns: [region, district]}", null),
                        "datasets[0].breakdowns.columns[1]: column district does not exist in the source table"),
                Arguments.of("a key variable that does not exist", config("breakdowns: {columns: [region],"
                                + " interviewer: region, keyVariables: [score, height_cm]}", null),
                        "datasets[0].breakdowns.keyVariables[1]: column height_cm does not exist in the source"
                                + " table"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("refused")
    void aConfigTheSourceContradictsExitsTwoBeforeAnythingIsWritten(String what, String yaml, String expected)
            throws Exception {
        Path file = dir.resolve("bad.yaml");
        Files.writeString(file, yaml);
        CliRun r = CliRun.of("check", "--config", file.toString(), "--wave", "w2", "--out",
                dir.resolve("out").toString());
        assertEquals(2, r.exitCode(), what + ": " + r.err());
        assertTrue(r.err().startsWith("config error at " + expected), what + " printed: " + r.err());
        assertEquals(0, schemas("ww_results"), "the results schema is not created");
    }

    @Test
    void aSuccessValueThatOccursAndAKnownBaselineAreAccepted() throws Exception {
        Path file = dir.resolve("good.yaml");
        Files.writeString(file, config("compareWith: {baseline: w1}\n    weightColumn: spread",
                "      - {name: has_car, kind: binary, successValue: t}\n"
                        + "      - {name: satisfied, kind: binary, successValue: \"1\"}")
                .replace("      - name: spread\n        kind: continuous\n", "")
                .replace("schema: ww_results", "schema: ww_accepted"));
        CliRun r = CliRun.of("check", "--all", "--config", file.toString(), "--wave", "w2", "--out",
                dir.resolve("good-out").toString());
        assertEquals(0, r.exitCode(), r.err());
        assertTrue(r.out().contains("has_car"), r.out());
    }

    static long schemas(String name) throws Exception {
        try (Connection c = TestDatabase.connect(url); var st = c.createStatement();
             ResultSet rs = st.executeQuery("SELECT count(*) FROM information_schema.schemata WHERE schema_name = '"
                     + name + "'")) {
            rs.next();
            return rs.getLong(1);
        }
    }
}
