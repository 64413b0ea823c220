package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class DdiCodebookReadTest {

    static Path fixture(String name) {
        try {
            return Path.of(DdiCodebookReadTest.class.getResource("/codebook/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    private static VariableMeta variable(String name) throws IOException {
        return DdiCodebook.read(fixture("harrowmere-household.ddi.xml")).variable(name).orElseThrow();
    }

    @Test
    void readsEveryVariableInOrderWithTheStudyTitle() throws IOException {
        DatasetCodebook c = DdiCodebook.read(fixture("harrowmere-household.ddi.xml"));
        assertEquals(List.of("tenure", "Housing_Satisfaction", "commute_minutes", "move_in_date", "children"),
                c.variables().stream().map(VariableMeta::name).toList());
        assertEquals("Harrowmere County Household Living Conditions Survey", c.title());
        assertTrue(c.source().startsWith("harrowmere-household.ddi.xml"), c.source());
    }

    @Test
    void aNominalTextVariableHasItsLabelValueLabelsAndTheCategoryMarkedMissing() throws IOException {
        VariableMeta v = variable("tenure");
        assertEquals("Tenure of the home", v.label());
        assertEquals(StorageType.TEXT, v.storage());
        assertEquals(4, v.width());
        assertEquals(Measure.NOMINAL, v.measure());
        assertEquals(Map.of("OWN", "Owned outright", "MORT", "Owned with a mortgage", "PRIV", "Private tenant",
                "COUN", "Council tenant", "FREE", "Rent free", "DK", "Don't know"), v.valueLabels());
        assertEquals(List.of("OWN", "MORT", "PRIV", "COUN", "FREE", "DK"), List.copyOf(v.valueLabels().keySet()));
        assertEquals(List.of(new MissingCodeSpec("DK", "Don't know")), v.missingCodes());
    }

    @Test
    void numericCodesTakeTheOneTextFormAndInvalidItemsAndRangesAreMissing() throws IOException {
        VariableMeta v = variable("housing_satisfaction");
        assertEquals(Measure.ORDINAL, v.measure());
        assertEquals(0, v.decimals());
        assertEquals(List.of("1", "5", "-9", "-8"), List.copyOf(v.valueLabels().keySet()));
        assertEquals(List.of(new MissingCodeSpec("-9", "Refused"), new MissingCodeSpec("-8", "Does not apply")),
                v.missingCodes());
        assertEquals(List.of(new MissingRangeSpec(null, -90.0, "declared invalid range in the codebook")),
                v.missingRanges());
        assertEquals(new RangeSpec(1.0, 5.0), v.validRange());
    }

    @Test
    void aContinuousIntervalIsAScaleWithItsUnitFromTheVarsMeasUnit() throws IOException {
        VariableMeta v = variable("commute_minutes");
        assertEquals(Measure.SCALE, v.measure());
        assertEquals("minutes", v.unit());
    }

    @Test
    void anInvalidRangesKeyIsItsReasonAndAMissingCategorysTxtIsItsReason() throws IOException {
        VariableMeta v = variable("commute_minutes");
        assertEquals(List.of(new MissingRangeSpec(-99.0, -91.0, "not stated")), v.missingRanges());
        assertEquals(List.of(new MissingCodeSpec("-99", "refused to say")), v.missingCodes());
        assertEquals(Map.of("-99", "Not stated"), v.valueLabels(), "the txt is a reason, not a value label");
    }

    /** varType (DDI-Codebook 2.5 codebook.xsd) has measUnit as an attribute and no measure element. */
    @Test
    void aMeasureElementInsideAVarIsNotReadAsItsUnit(@TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("measure.xml"), "<codeBook xmlns=\"ddi:codebook:2_5\"><dataDscr>"
                + "<var name=\"a\" intrvl=\"contin\"><catgry><catValu>1</catValu><measure measUnit=\"kg\"/>"
                + "</catgry></var></dataDscr></codeBook>");
        assertNull(DdiCodebook.read(f).variable("a").orElseThrow().unit());
    }

    @Test
    void theKeyOfAnInvalidRangeNamesEveryRangeAndUnlabelledItemOfIt(@TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("key.xml"), "<codeBook xmlns=\"ddi:codebook:2_5\"><dataDscr>"
                + "<var name=\"a\"><invalrng><range min=\"-9\" max=\"-7\"/><item VALUE=\"99\"/><item VALUE=\"98\"/>"
                + "<key>\n  not asked\n</key></invalrng><invalrng><range min=\"997\"/></invalrng>"
                + "<catgry><catValu>98</catValu><labl>Don't know</labl></catgry></var></dataDscr></codeBook>");
        VariableMeta v = DdiCodebook.read(f).variable("a").orElseThrow();
        assertEquals(List.of(new MissingRangeSpec(-9.0, -7.0, "not asked"),
                new MissingRangeSpec(997.0, null, "declared invalid range in the codebook")), v.missingRanges());
        assertEquals(List.of(new MissingCodeSpec("99", "not asked"), new MissingCodeSpec("98", "Don't know")),
                v.missingCodes());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
            "the text of varFormat         | <varFormat type='numeric' formatname='DATE' category='date'>"
                    + "DATE11</varFormat> | DATE11 | DATE",
            "a formatname with its width   | <varFormat type='character' formatname='A20'/> | A20 | TEXT",
            "a formatname without a width  | <varFormat type='numeric' formatname='DATETIME'/> | | DATETIME",
            "no varFormat                  | | | NUMBER"})
    void theFormatIsVarFormatsTextElseAFormatNameWithAWidth(String what, String varFormat, String format,
                                                            StorageType storage, @TempDir Path dir)
            throws IOException {
        Path f = Files.writeString(dir.resolve("format.xml"), "<codeBook xmlns='ddi:codebook:2_5'><dataDscr>"
                + "<var name='a'>" + (varFormat == null ? "" : varFormat) + "</var></dataDscr></codeBook>");
        VariableMeta v = DdiCodebook.read(f).variable("a").orElseThrow();
        assertEquals(format, v.format());
        assertEquals(storage, v.storage());
        assertEquals(storage == StorageType.TEXT ? 20 : null, v.width());
    }

    @Test
    void whiteSpaceInsideLabelsIsCollapsed(@TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("wrapped.xml"), "<codeBook xmlns='ddi:codebook:2_5'><dataDscr>"
                + "<var name='a'><labl>\n  Minutes to work,\n\t one way  </labl></var></dataDscr></codeBook>");
        assertEquals("Minutes to work, one way", DdiCodebook.read(f).variable("a").orElseThrow().label());
    }

    @Test
    void aDateFormatMakesADateAndADiscreteNumberWithoutNatureHasNoLevel() throws IOException {
        assertEquals(StorageType.DATE, variable("move_in_date").storage());
        assertEquals("DATE11", variable("move_in_date").format());
        VariableMeta children = variable("children");
        assertEquals(Measure.UNKNOWN, children.measure());
        assertEquals(StorageType.NUMBER, children.storage());
        assertNull(children.unit());
    }

    @ParameterizedTest(name = "{0} {1} -> {2}")
    @CsvSource({"character, A20, , TEXT", "numeric, F8.2, , NUMBER", "numeric, ADATE10, , DATE",
            "numeric, EDATE10, , DATE", "numeric, DATETIME20, , DATETIME", "numeric, , date, DATE",
            ", , , NUMBER"})
    void storageFollowsTheFormatTypeNameAndCategory(String type, String formatName, String category,
                                                    StorageType expected) {
        assertEquals(expected, DdiReader.storage(type, formatName, category));
    }

    @Test
    void aFileWithoutTheNamespaceIsReadAsAnOlderCodebook(@TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("old.xml"), "<?xml version=\"1.0\"?><codeBook version=\"2.1\">"
                + "<dataDscr><var name=\"district\" nature=\"nominal\"><labl>District</labl>"
                + "<catgry><catValu>BRN</catValu><labl>Brannock</labl></catgry></var></dataDscr></codeBook>");
        VariableMeta v = DdiCodebook.read(f).variable("district").orElseThrow();
        assertEquals("District", v.label());
        assertEquals(Map.of("BRN", "Brannock"), v.valueLabels());
    }

    @Test
    void anExternalEntityIsRefusedWithoutBeingRead(@TempDir Path dir) throws IOException {
        Path secret = Files.writeString(dir.resolve("secret.txt"), "top-secret-content");
        Path f = Files.writeString(dir.resolve("xxe.xml"), "<?xml version=\"1.0\"?>\n"
                + "<!DOCTYPE codeBook [<!ENTITY xxe SYSTEM \"" + secret.toUri() + "\">]>\n"
                + "<codeBook xmlns=\"ddi:codebook:2_5\"><dataDscr><var name=\"a\"><labl>&xxe;</labl></var>"
                + "</dataDscr></codeBook>");
        CodebookFormatException e = assertThrows(CodebookFormatException.class, () -> DdiCodebook.read(f));
        assertTrue(e.getMessage().contains("xxe.xml, line 2"), e.getMessage());
        assertTrue(e.getMessage().contains("DOCTYPE"), e.getMessage());
        assertTrue(!e.getMessage().contains("top-secret-content"), e.getMessage());
    }

    @Test
    void anUndeclaredEntityIsRefusedAsBadXml(@TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("entity.xml"), "<codeBook xmlns=\"ddi:codebook:2_5\"><dataDscr>\n"
                + "<var name=\"a\"><labl>&xxe;</labl></var></dataDscr></codeBook>");
        CodebookFormatException e = assertThrows(CodebookFormatException.class, () -> DdiCodebook.read(f));
        assertTrue(e.getMessage().startsWith("entity.xml, line 2"), e.getMessage());
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(delimiter = '|', value = {
            "not well-formed | <codeBook xmlns='ddi:codebook:2_5'><dataDscr>\\n<var name='a'></dataDscr></codeBook>"
                    + " | line 2",
            "another root | <catalog>\\n</catalog> | element <catalog>: not a DDI-Codebook document",
            "a bad nature | <codeBook><dataDscr>\\n<var name='a' nature='loud'/></dataDscr></codeBook>"
                    + " | line 2, element <var name=\"a\"> nature: expected nominal",
            "a bad range | <codeBook><dataDscr>\\n<var name='a'><valrng><range min='x'/></valrng></var></dataDscr>"
                    + "</codeBook> | <range> min: expected a number but got 'x'",
            "no variables | <codeBook><stdyDscr/></codeBook> | describes no variable",
            "a nameless var | <codeBook><dataDscr><var/></dataDscr></codeBook> | without a name",
            "a var twice | <codeBook><dataDscr><var name='a'/>\\n<var name='A'/></dataDscr></codeBook>"
                    + " | line 2, element <var name=\"A\">: variable A is described twice"})
    void aBadFileIsRefusedNamingTheFileLineAndElement(String what, String xml, String expected,
                                                      @TempDir Path dir) throws IOException {
        Path f = Files.writeString(dir.resolve("bad.xml"), xml.replace("\\n", "\n"));
        CodebookFormatException e = assertThrows(CodebookFormatException.class, () -> DdiCodebook.read(f));
        assertTrue(e.getMessage().startsWith("bad.xml, line "), e.getMessage());
        assertTrue(e.getMessage().contains(expected), e.getMessage());
    }
}
