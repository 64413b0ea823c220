package org.wavewarden.load.spss;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;

import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The committed fixtures of {@code src/test/resources/spss}, written by R 4.2.2 with haven 2.5.1 (write-haven.R) and
 * by GNU PSPP 1.6.2 (write-pspp.sh, pspp-data.sps), read by the reader and held against what R 4.2.2 with haven 2.5.1
 * reads back from the same file ({@code read_sav(user_na = TRUE)}, readback.R) and against PSPP 1.6.2's
 * {@code DISPLAY DICTIONARY}. make-fixtures.sh regenerates all of them.
 */
class SavReaderRoundTripTest {

    static Path fixture(String name) {
        try {
            return Path.of(SavReaderRoundTripTest.class.getResource("/spss/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"haven-none.sav", "haven-byte.sav", "haven.zsav", "pspp-none.sav", "pspp-byte.sav",
            "pspp.zsav", "pspp-latin1.sav"})
    void everyValueLabelAndMissingDeclarationMatchesWhatHavenReadsBack(String file) throws Exception {
        ToolReadback.Comparison c = ToolReadback.compareWithHaven(fixture(file), fixture(file + ".haven.tsv"),
                fixture(file + ".pspp.csv"));

        assertEquals(List.of(), c.differences());
        assertTrue(c.variables() >= 2 && c.values() >= c.variables() * 3L && c.measures() == c.variables(),
                () -> "too little was compared: " + c);
        if (!file.contains("latin1")) {
            assertTrue(c.labels() >= 10 && c.missing() >= 6, () -> "too little was compared: " + c);
        }
    }

    @Test
    void longStringMissingValuesMatchPsppsDictionaryWhereHavenCannotReadTheFile() throws Exception {
        // haven 2.5.1 refuses this file ("Invalid file, or file has unsupported features"); PSPP 1.6.2 lists the
        // employer's missing values as "Charity", "n/a" in its DISPLAY DICTIONARY.
        List<Map<String, String>> pspp = ToolReadback.psppVariables(fixture("pspp-longmiss.sav.pspp.csv"));
        String psppMissing = pspp.stream().filter(r -> r.get("Name").equals("employer")).findFirst()
                .orElseThrow().get("Missing Values");
        assertEquals("\"Charity \"; \"n/a     \"", psppMissing);

        try (SavReader reader = SavFiles.open(fixture("pspp-longmiss.sav"))) {
            VariableMeta employer = reader.codebook().variable("employer").orElseThrow();
            assertEquals(List.of(new MissingCodeSpec("Charity", SavReader.DECLARED_MISSING),
                    new MissingCodeSpec("n/a", SavReader.DECLARED_MISSING)), employer.missingCodes());
            assertEquals(Map.of("Private firm", "Private company or firm", "NONE GIVEN", "No answer"),
                    employer.valueLabels());
            assertEquals(20, employer.width());
        }
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"pspp-none.sav", "pspp-byte.sav", "pspp.zsav"})
    void psppFilesNameTheirWeightProductTitleAndDocuments(String file) throws Exception {
        // pspp-data.sps says WEIGHT BY wt, FILE LABEL and DOCUMENT; GNU PSPP 1.6.2 wrote the file.
        try (SavReader reader = SavFiles.open(fixture(file))) {
            DatasetCodebook book = reader.codebook();
            assertEquals("wt", reader.weightVariable().orElseThrow());
            assertEquals("Household survey fixture", book.title());
            assertTrue(book.source().startsWith(file + ", SPSS system file written by GNU pspp 1.6.2"),
                    book.source());
            assertTrue(reader.documents().get(0).contains("Quarterly household survey, round-trip fixture."),
                    () -> reader.documents().toString());
            assertEquals(8L, reader.caseCount().orElseThrow());
        }
    }

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"haven-none.sav", "haven-byte.sav", "haven.zsav"})
    void havenFilesCarryNoWeightAndAVeryLongStringOf420Bytes(String file) throws Exception {
        // write-haven.R: haven 2.5.1 writes no WEIGHT BY; the longest comment is 420 bytes.
        try (SavReader reader = SavFiles.open(fixture(file))) {
            assertTrue(reader.weightVariable().isEmpty());
            VariableMeta comment = reader.codebook().variable("comment").orElseThrow();
            assertEquals(420, comment.width());
            assertEquals("A420", comment.format());
        }
    }
}
