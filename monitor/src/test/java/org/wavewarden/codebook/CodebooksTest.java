package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.ConfigException;
import org.wavewarden.config.ConfigFingerprint;
import org.wavewarden.config.ConfigLoader;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The {@code codebook:} key of a dataset: read relative to the config file, merged, fingerprinted. */
class CodebooksTest {

    static String config(String codebook) {
        return """
                source:
                  jdbcUrl: "jdbc:postgresql://127.0.0.1:5432/survey"
                  user: postgres
                datasets:
                  - name: other
                    table: src.other
                    waveColumn: wave
                  - name: household
                    table: src.household
                    waveColumn: wave
                    exclude: [respondent_id]
                    codebook: %s
                    variables:
                      - name: commute_minutes
                        kind: continuous
                """.formatted(codebook);
    }

    private static Path copy(String fixture, Path dir, String as) throws IOException {
        Path target = dir.resolve(as);
        Files.createDirectories(target.getParent());
        return Files.copy(DdiCodebookReadTest.fixture(fixture), target);
    }

    @Test
    void aDdiCodebookBesideTheConfigFillsTheDatasetsVariablesAndTheMergeIsReported(@TempDir Path dir)
            throws IOException {
        copy("harrowmere-household.ddi.xml", dir, "codebooks/household.xml");
        Codebooks.Resolved r = Codebooks.resolve(ConfigLoader.parse(config("{ddi: codebooks/household.xml}")), dir);
        List<VariableConfig> vs = r.config().datasets().get(1).variables();
        assertEquals(List.of("commute_minutes", "tenure", "housing_satisfaction", "move_in_date", "children"),
                vs.stream().map(VariableConfig::name).toList());
        assertEquals(VariableKind.CONTINUOUS, vs.get(0).kind());
        assertEquals("minutes", vs.get(0).unit());
        assertEquals(VariableKind.CATEGORICAL, vs.get(1).kind());
        assertEquals(List.of(new MissingCodeSpec("DK", "Don't know")), vs.get(1).missingCodes());
        assertEquals(VariableKind.ORDINAL, vs.get(2).kind());
        assertEquals(VariableKind.DATE, vs.get(3).kind());
        assertEquals(null, vs.get(4).kind());
        assertEquals("household: codebook household.xml, DDI-Codebook XML (5 variables) merged with 1 from the YAML;"
                + " the YAML wins", r.report().get(0));
        assertTrue(r.report().contains("household: tenure: only in the codebook; label, 6 value labels and 1 missing"
                + " code from the codebook; kind categorical (codebook: nominal)"), r.report().toString());
        assertEquals(List.of(), r.config().datasets().get(0).variables(), "a dataset without a codebook is as it was");
    }

    @Test
    void aCsvCodebookIsReadTheSameWayAndAnAbsolutePathIsTakenAsItIs(@TempDir Path dir) throws IOException {
        Path csv = copy("harrowmere-household.codebook.csv", dir, "elsewhere/household.csv");
        Codebooks.Resolved r = Codebooks.resolve(ConfigLoader.parse(config("{csv: \"" + csv.toAbsolutePath()
                + "\"}")), dir.resolve("config-folder"));
        assertEquals(List.of("commute_minutes", "tenure", "housing_satisfaction"), r.config().datasets().get(1)
                .variables().stream().map(VariableConfig::name).toList());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
            "{dd: x.xml} | datasets[1].codebook.dd | unknown key; did you mean 'ddi'?",
            "{ddi: x.xml, csv: x.csv} | datasets[1].codebook | expected exactly one of ddi",
            "{} | datasets[1].codebook | expected exactly one of ddi",
            "x.xml | datasets[1].codebook | expected a mapping",
            "{ddi: ''} | datasets[1].codebook.ddi | empty"})
    void aBadCodebookKeyIsAConfigErrorNamingIt(String codebook, String key, String problem) {
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.parse(config(codebook)));
        assertEquals(key, e.key());
        assertTrue(e.problem().contains(problem), e.getMessage());
    }

    @Test
    void aMissingCodebookFileIsAConfigErrorAtItsKey(@TempDir Path dir) {
        ConfigException e = assertThrows(ConfigException.class, () -> Codebooks.resolve(ConfigLoader.parse(
                config("{ddi: nowhere.xml}")), dir));
        assertEquals("datasets[1].codebook.ddi", e.key());
        assertTrue(e.problem().contains("nowhere.xml: no such file"), e.getMessage());
    }

    @Test
    void aCodebookThatCannotBeReadIsAConfigErrorWithItsFileLineAndColumn(@TempDir Path dir) throws IOException {
        Files.writeString(dir.resolve("household.csv"), "variable,missing_from\ncommute_minutes,low\n");
        ConfigException e = assertThrows(ConfigException.class, () -> Codebooks.resolve(ConfigLoader.parse(
                config("{csv: household.csv}")), dir));
        assertEquals("datasets[1].codebook.csv", e.key());
        assertEquals("household.csv, line 2, column 2, column missing_from: expected a number but got 'low'",
                e.problem());
    }

    @Test
    void theFingerprintChangesWithTheCodebooksContentEvenWhereTheMergeDoesNot(@TempDir Path dir) throws IOException {
        Path xml = copy("harrowmere-household.ddi.xml", dir, "household.xml");
        WardenConfig parsed = ConfigLoader.parse(config("{ddi: household.xml}"));
        String before = ConfigFingerprint.of(Codebooks.resolve(parsed, dir).config(), Codebooks.resolve(parsed, dir)
                .config().datasets().get(1));
        assertEquals(before, ConfigFingerprint.of(Codebooks.resolve(parsed, dir).config(),
                Codebooks.resolve(parsed, dir).config().datasets().get(1)), "the same file gives the same fingerprint");
        Files.writeString(xml, Files.readString(xml).replace("Living Conditions Survey", "Living Conditions Study"));
        WardenConfig after = Codebooks.resolve(parsed, dir).config();
        assertEquals(Codebooks.resolve(parsed, dir).config().datasets().get(1).variables(),
                after.datasets().get(1).variables());
        assertNotEquals(before, ConfigFingerprint.of(after, after.datasets().get(1)));
    }
}
