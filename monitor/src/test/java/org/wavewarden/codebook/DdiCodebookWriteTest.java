package org.wavewarden.codebook;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.Node;
import org.w3c.dom.NodeList;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import javax.xml.parsers.DocumentBuilderFactory;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The DDI-Codebook 2.5 document {@link DdiCodebook#write} gives: where each thing a codebook says is put, in the order
 * the 2.5 schema (codebook.xsd of DDI-Codebook 2.5, 2012-01-17, complex type {@code varType}) requires.
 */
class DdiCodebookWriteTest {

    /** The children of {@code var} that the writer uses, in the order of the schema's {@code varType} sequence. */
    private static final List<String> VAR_SEQUENCE = List.of("labl", "valrng", "invalrng", "catgry", "varFormat");

    private static final VariableMeta TENURE;
    private static final VariableMeta AGE;
    private static final VariableMeta MOVED_IN;
    private static final VariableMeta NOTE;

    static {
        Map<String, String> tenure = new LinkedHashMap<>();
        tenure.put("1", "Owner");
        tenure.put("4", "Council tenant");
        tenure.put("-9", "Refused");
        TENURE = new VariableMeta("tenure", "Tenure of the home", StorageType.NUMBER, null, 0, "F2.0", Measure.NOMINAL,
                null, tenure, List.of(new MissingCodeSpec("-9", "Refused"), new MissingCodeSpec("-8", "not asked")),
                null, null);
        AGE = new VariableMeta("age", "Age <in years> & \"stated\"", StorageType.NUMBER, null, 0, "F3.0", Measure.SCALE,
                "years", null, null, List.of(new MissingRangeSpec(997.0, 999.0, "not given"),
                new MissingRangeSpec(null, -1.0, "keyed negative")), new RangeSpec(16.0, 99.0));
        MOVED_IN = new VariableMeta("moved_in", "Date moved in", StorageType.DATE, null, null, "DATE11", Measure.SCALE,
                null, null, null, null, null);
        NOTE = new VariableMeta("note", null, StorageType.TEXT, 300, null, "A300", Measure.NOMINAL, null, null, null,
                null, null);
    }

    private static final DatasetCodebook CODEBOOK = new DatasetCodebook("household.sav", "Living conditions",
            List.of(TENURE, AGE, MOVED_IN, NOTE));

    @Test
    void theDocumentIsDdiCodebook25WithOneVarPerVariableInOrder() throws Exception {
        Element root = parse(write(CODEBOOK)).getDocumentElement();
        assertEquals("codeBook", root.getLocalName());
        assertEquals("ddi:codebook:2_5", root.getNamespaceURI());
        assertEquals("2.5", root.getAttribute("version"));
        assertEquals(List.of("stdyDscr", "fileDscr", "dataDscr"), childNames(root));
        assertEquals("Living conditions", text(root, "titl"));
        assertEquals("household.sav", text(root, "fileName"));
        assertEquals("4", text(root, "varQnty"));
        List<String> names = new ArrayList<>();
        for (Element v : vars(root)) {
            names.add(v.getAttribute("name"));
            assertEquals("F1", v.getAttribute("files"), "every variable belongs to the one file described");
        }
        assertEquals(List.of("tenure", "age", "moved_in", "note"), names);
    }

    @Test
    void valueLabelsAreCategoriesAndDeclaredMissingCodesAreMarkedMissing() throws Exception {
        Element tenure = vars(parse(write(CODEBOOK)).getDocumentElement()).get(0);
        List<String> categories = new ArrayList<>();
        for (Element c : children(tenure, "catgry")) {
            categories.add(text(c, "catValu") + "=" + text(c, "labl") + ("Y".equals(c.getAttribute("missing"))
                    ? " missing" : "") + (text(c, "txt") == null ? "" : " because " + text(c, "txt")));
        }
        // -8 is declared missing without a value label: it is still a category, with its reason as its txt and no
        // labl, so that reading the document back gives it no value label
        assertEquals(List.of("1=Owner", "4=Council tenant", "-9=Refused missing", "-8=null missing because not asked"),
                categories);
        assertEquals("nominal", tenure.getAttribute("nature"));
        assertEquals("discrete", tenure.getAttribute("intrvl"));
        assertEquals("code", tenure.getAttribute("representationType"));
        assertEquals("Tenure of the home", text(tenure, "labl"));
    }

    @Test
    void aMissingValueWhoseReasonIsNotItsLabelHasTheReasonAsItsTxt() throws Exception {
        VariableMeta v = new VariableMeta("q", null, StorageType.NUMBER, null, null, null, Measure.NOMINAL, null,
                Map.of("-1", "No answer"), List.of(new MissingCodeSpec("-1", "skipped by routing")), null, null);
        Element q = vars(parse(write(new DatasetCodebook("f", "t", List.of(v)))).getDocumentElement()).get(0);
        Element c = children(q, "catgry").get(0);
        assertEquals(List.of("catValu", "labl", "txt"), childNames(c), "catgryType's sequence");
        assertEquals("No answer", text(c, "labl"));
        assertEquals("skipped by routing", text(c, "txt"));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({"TEXT, character, , ", "DATE, numeric, , date", "DATETIME, numeric, DATETIME, date"})
    void aTextOrDateVariableWithoutAFormatStillSaysHowItIsStored(StorageType storage, String type, String formatName,
                                                                  String category) throws Exception {
        VariableMeta v = new VariableMeta("v", null, storage, null, null, null, null, null, null, null, null, null);
        Element var = vars(parse(write(new DatasetCodebook("f", "t", List.of(v)))).getDocumentElement()).get(0);
        Element format = children(var, "varFormat").get(0);
        assertEquals(type, format.getAttribute("type"));
        assertEquals(formatName == null ? "" : formatName, format.getAttribute("formatname"));
        assertEquals(category == null ? "" : category, format.getAttribute("category"));
        assertEquals("", format.getTextContent());
    }

    @Test
    void aNumberWithoutAFormatHasNoVarFormat() throws Exception {
        VariableMeta v = new VariableMeta("n", null, StorageType.NUMBER, null, 2, null, null, null, null, null, null,
                null);
        Element var = vars(parse(write(new DatasetCodebook("f", "t", List.of(v)))).getDocumentElement()).get(0);
        assertTrue(children(var, "varFormat").isEmpty());
        assertEquals("2", var.getAttribute("dcml"));
    }

    @Test
    void missingRangesAreInvalidRangesWithTheirReasonAndTheValidRangeIsValrng() throws Exception {
        Element age = vars(parse(write(CODEBOOK)).getDocumentElement()).get(1);
        List<Element> invalid = children(age, "invalrng");
        assertEquals(2, invalid.size());
        Element first = children(invalid.get(0), "range").get(0);
        assertEquals("997", first.getAttribute("min"));
        assertEquals("999", first.getAttribute("max"));
        assertEquals("not given", text(invalid.get(0), "key"));
        Element open = children(invalid.get(1), "range").get(0);
        assertFalse(open.hasAttribute("min"), "an open low end (LO THRU -1) has no min");
        assertEquals("-1", open.getAttribute("max"));
        Element valid = children(children(age, "valrng").get(0), "range").get(0);
        assertEquals("16", valid.getAttribute("min"));
        assertEquals("99", valid.getAttribute("max"));
    }

    @Test
    void aScaleIsContinuousRatioWithItsUnitAndADateIsInterval() throws Exception {
        List<Element> vars = vars(parse(write(CODEBOOK)).getDocumentElement());
        Element age = vars.get(1);
        assertEquals("ratio", age.getAttribute("nature"));
        assertEquals("contin", age.getAttribute("intrvl"));
        assertEquals("years", age.getAttribute("measUnit"));
        assertEquals("0", age.getAttribute("dcml"));
        assertEquals("numeric", age.getAttribute("representationType"));
        Element date = vars.get(2);
        assertEquals("interval", date.getAttribute("nature"));
        assertEquals("datetime", date.getAttribute("representationType"));
        Element format = children(date, "varFormat").get(0);
        assertEquals("DATE11", format.getTextContent());
        assertEquals("DATE", format.getAttribute("formatname"));
        assertEquals("SPSS", format.getAttribute("schema"));
        assertEquals("date", format.getAttribute("category"));
        Element note = vars.get(3);
        assertEquals("text", note.getAttribute("representationType"));
        assertEquals("character", children(note, "varFormat").get(0).getAttribute("type"));
        assertTrue(children(note, "labl").isEmpty(), "no label is written where the codebook gives none");
    }

    @Test
    void childrenOfEveryVarFollowTheSchemaSequence() throws Exception {
        for (Element v : vars(parse(write(CODEBOOK)).getDocumentElement())) {
            int last = -1;
            for (String name : childNames(v)) {
                int at = VAR_SEQUENCE.indexOf(name);
                assertTrue(at >= 0, "unexpected child " + name);
                int before = last;
                assertTrue(at >= before, () -> v.getAttribute("name") + ": " + name + " after "
                        + VAR_SEQUENCE.get(before));
                last = at;
            }
        }
    }

    @Test
    void markupInLabelsIsWrittenAsTextAndReadBackUnchanged() throws Exception {
        String xml = write(CODEBOOK);
        assertFalse(xml.contains("<in years>"), xml);
        Element age = vars(parse(xml).getDocumentElement()).get(1);
        assertEquals("Age <in years> & \"stated\"", text(age, "labl"));
    }

    @Test
    void aLabelWithACharacterXmlCannotHoldIsRefused() {
        VariableMeta bad = new VariableMeta("x", "bell\u0007", StorageType.NUMBER, null, null, null, null, null, null,
                null, null, null);
        assertThrows(IllegalArgumentException.class, () -> write(new DatasetCodebook("f", "t", List.of(bad))));
    }

    @Test
    void theSameCodebookGivesTheSameBytesWithUnixLineEnds() throws Exception {
        String a = write(CODEBOOK);
        assertEquals(a, write(CODEBOOK));
        assertFalse(a.contains("\r"));
        assertTrue(a.startsWith("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"));
    }

    // ---- support --------------------------------------------------------------------------------------------

    static String write(DatasetCodebook codebook) throws IOException {
        StringWriter out = new StringWriter();
        DdiCodebook.write(codebook, out);
        return out.toString();
    }

    static Document parse(String xml) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setNamespaceAware(true);
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
        return f.newDocumentBuilder().parse(new ByteArrayInputStream(xml.getBytes(StandardCharsets.UTF_8)));
    }

    private static List<Element> vars(Element root) {
        List<Element> out = new ArrayList<>();
        NodeList all = root.getElementsByTagNameNS(DdiCodebook.NAMESPACE, "var");
        for (int i = 0; i < all.getLength(); i++) {
            out.add((Element) all.item(i));
        }
        return out;
    }

    private static List<Element> children(Element parent, String name) {
        List<Element> out = new ArrayList<>();
        for (Node n = parent.getFirstChild(); n != null; n = n.getNextSibling()) {
            if (n instanceof Element e && name.equals(e.getLocalName())) {
                assertEquals(DdiCodebook.NAMESPACE, e.getNamespaceURI());
                out.add(e);
            }
        }
        return out;
    }

    private static List<String> childNames(Element parent) {
        List<String> out = new ArrayList<>();
        for (Node n = parent.getFirstChild(); n != null; n = n.getNextSibling()) {
            if (n instanceof Element e) {
                out.add(e.getLocalName());
            }
        }
        return out;
    }

    private static String text(Element parent, String name) {
        NodeList nodes = parent.getElementsByTagNameNS(DdiCodebook.NAMESPACE, name);
        return nodes.getLength() == 0 ? null : nodes.item(0).getTextContent();
    }
}
