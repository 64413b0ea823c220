package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class CsvCodebookTest {

    private static final String HEADER = "variable,label,level,type,unit,valid_min,valid_max,code,code_label,missing,"
            + "reason,missing_from,missing_to\n";

    @Test
    void theDocumentedExampleReadsAsItsDocumentationSays() throws IOException {
        DatasetCodebook c = CsvCodebook.read(DdiCodebookReadTest.fixture("harrowmere-household.codebook.csv"));
        assertEquals(List.of("tenure", "commute_minutes", "housing_satisfaction"),
                c.variables().stream().map(VariableMeta::name).toList());
        VariableMeta tenure = c.variable("tenure").orElseThrow();
        assertEquals("Tenure of the home", tenure.label());
        assertEquals(Measure.NOMINAL, tenure.measure());
        assertEquals(StorageType.TEXT, tenure.storage());
        assertEquals(List.of("OWN", "COUN", "DK"), List.copyOf(tenure.valueLabels().keySet()));
        assertEquals(List.of(new MissingCodeSpec("DK", "Don't know")), tenure.missingCodes());
        VariableMeta commute = c.variable("commute_minutes").orElseThrow();
        assertEquals("Minutes to work, one way", commute.label());
        assertEquals(Measure.SCALE, commute.measure());
        assertEquals("minutes", commute.unit());
        assertEquals(new RangeSpec(0.0, 300.0), commute.validRange());
        assertEquals(List.of(new MissingRangeSpec(-99.0, -91.0, "not stated")), commute.missingRanges());
        VariableMeta satisfaction = c.variable("HOUSING_SATISFACTION").orElseThrow();
        assertEquals(Measure.ORDINAL, satisfaction.measure());
        assertEquals(Map.of("1", "Very dissatisfied", "5", "Very satisfied", "-9", "Refused"),
                satisfaction.valueLabels());
        assertEquals(List.of(new MissingCodeSpec("-9", "refused")), satisfaction.missingCodes());
    }

    @Test
    void theDocumentationShowsTheExampleFileTheTestsRead() throws IOException {
        String doc = Files.readString(Path.of("..", "docs", "codebook-csv.md"));
        String example = Files.readString(DdiCodebookReadTest.fixture("harrowmere-household.codebook.csv"))
                .replace("-9.0,", "-9,");
        assertTrue(doc.contains("```\n" + example + "```"), "docs/codebook-csv.md shows the example file");
        for (String column : CsvCodebook.COLUMNS) {
            assertTrue(doc.contains("`" + column + "`"), "the documentation describes the column " + column);
        }
    }

    @Test
    void headersMatchWithoutRegardToCaseOrOrderAndQuotedCellsMayHoldQuotesAndLineBreaks(@TempDir Path dir)
            throws IOException {
        Path f = Files.writeString(dir.resolve("c.csv"), "\uFEFFCode,Variable,Code_Label\r\n"
                + "1,occupation,\"the \"\"main\"\" job,\nas stated\"\r\n");
        VariableMeta v = CsvCodebook.read(f).variables().get(0);
        assertEquals(Map.of("1", "the \"main\" job,\nas stated"), v.valueLabels());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
            "an unknown column | variable,lable\\na,x | line 1, column 2, header 'lable': unknown column",
            "no variable column | label\\nx | line 1: the header has no column 'variable'",
            "a row without its variable | " + "variable,label\\na,x\\n,y | line 3, column 1, column variable",
            "two labels for one variable | variable,label\\na,x\\na,y | line 3, column 2, column label: variable a"
                    + " already has label 'x'",
            "a bad level | variable,level\\na,loud | line 2, variable a, column level: expected nominal",
            "a bad number | variable,missing_from\\na,low | line 2, column 2, column missing_from: expected a number",
            "a bad flag | variable,code,missing\\na,1,perhaps | line 2, column 3, column missing: expected yes or no",
            "a code twice | variable,code\\na,1\\na,1.0 | line 3, column 2, column code: code '1.0' of a is listed"
                    + " twice",
            "a reason without a code | variable,reason\\na,refused | line 2, column 2, column reason",
            "too many cells | variable,label\\na,x,y | line 2, column 3: the row has 3 cells but the header 2",
            "an unclosed quote | variable,label\\na,\"x | line 2, column 2: a quote is opened and never closed",
            "a stray quote | variable,label\\na,x\"y | line 2, column 2: a quote inside an unquoted cell",
            "empty | | line 1: empty"})
    void aBadCodebookIsRefusedNamingFileLineAndColumn(String what, String text, String expected,
                                                     @TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("bad.csv"), text == null ? "" : text.replace("\\n", "\n"));
        CodebookFormatException e = assertThrows(CodebookFormatException.class, () -> CsvCodebook.read(f));
        assertTrue(e.getMessage().startsWith("bad.csv, " + expected.substring(0, expected.indexOf(':') < 0
                ? expected.length() : expected.indexOf(':'))), e.getMessage());
        assertTrue(e.getMessage().contains(expected), e.getMessage());
    }

    @Test
    void aFileThatIsNotUtf8IsRefused(@TempDir Path dir) throws IOException {
        Path f = Files.write(dir.resolve("latin1.csv"), "variable,label\nage,\u00c2ge\n"
                .getBytes(StandardCharsets.ISO_8859_1));
        CodebookFormatException e = assertThrows(CodebookFormatException.class, () -> CsvCodebook.read(f));
        assertTrue(e.getMessage().contains("not UTF-8"), e.getMessage());
    }
}
