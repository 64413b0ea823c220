package org.wavewarden.codebook;

import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import javax.xml.stream.Location;
import javax.xml.stream.XMLInputFactory;
import javax.xml.stream.XMLStreamConstants;
import javax.xml.stream.XMLStreamException;
import javax.xml.stream.XMLStreamReader;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Reads the variable descriptions ({@code dataDscr/var}) of a DDI-Codebook document: 2.5 in its namespace
 * {@code ddi:codebook:2_5}, and the older 1.x/2.0/2.1 files that carry no namespace or ICPSR's. The study title is
 * taken from the first {@code titl} of the study description.
 *
 * <p>Per {@code var}: {@code @name}; its own {@code labl}; the measurement level from {@code @nature}, else
 * {@code @intrvl} ({@code contin} is a scale; {@code discrete} says nothing of order); {@code @dcml}; the unit from
 * {@code @measUnit} (the 2.5 schema's {@code varType} attribute; its content model has no element for a unit, and
 * {@code measure} belongs to {@code nCube}, not to {@code var}); storage from {@code varFormat} ({@code @type}
 * character or numeric; a date when {@code @category} is {@code date} or the SPSS format name is a date format);
 * the format from {@code varFormat}'s text ("DATE11"), else from {@code @formatname} when that carries a width
 * ({@code formatname="DATE"} alone names only the kind of format); {@code catgry} (a {@code catValu} with its
 * {@code labl}; {@code @missing="Y"} declares the code missing, with the reason its {@code txt} gives, else its
 * label); {@code invalrng} ({@code range @min/@max} and {@code item @VALUE}: missing ranges and codes, with the
 * reason its {@code key} gives); {@code valrng/range} (the valid range).
 *
 * <p>Text (labels, reasons, the title) has its white space collapsed to single spaces: a label wrapped over lines by
 * hand reads as one line.
 *
 * <p>The document is read without a DTD: a {@code DOCTYPE} is refused before any entity could be expanded, so an
 * external entity can neither read a local file nor reach the network.
 */
final class DdiReader {

    static final String NS_25 = "ddi:codebook:2_5";
    private static final Set<String> ACCEPTED_NS = Set.of("", NS_25, "http://www.icpsr.umich.edu/DDI");

    private final Path file;
    private XMLStreamReader r;

    private DdiReader(Path file) {
        this.file = file;
    }

    static DatasetCodebook read(Path file) throws IOException {
        return new DdiReader(file).read();
    }

    private static XMLInputFactory factory() {
        XMLInputFactory f = XMLInputFactory.newFactory();
        f.setProperty(XMLInputFactory.SUPPORT_DTD, false);
        f.setProperty(XMLInputFactory.IS_SUPPORTING_EXTERNAL_ENTITIES, false);
        f.setProperty(XMLInputFactory.IS_COALESCING, true);
        return f;
    }

    private DatasetCodebook read() throws IOException {
        try (InputStream in = Files.newInputStream(file)) {
            r = factory().createXMLStreamReader(in);
            try {
                return document();
            } finally {
                r.close();
            }
        } catch (XMLStreamException e) {
            Location l = e.getLocation();
            String msg = String.valueOf(e.getMessage());
            int cut = msg.indexOf("Message: ");
            throw new CodebookFormatException(file, l == null ? 0 : l.getLineNumber(),
                    l == null ? 0 : l.getColumnNumber(), null, "not well-formed XML: "
                    + (cut >= 0 ? msg.substring(cut + 9) : msg).strip());
        }
    }

    private DatasetCodebook document() throws XMLStreamException, IOException {
        String title = null;
        List<VariableMeta> vars = new ArrayList<>();
        Set<String> names = new HashSet<>();
        Deque<String> path = new ArrayDeque<>();
        boolean root = true;
        while (r.hasNext()) {
            int ev = r.next();
            if (ev == XMLStreamConstants.DTD) {
                throw fail("DOCTYPE", "a DOCTYPE declaration is not accepted in a codebook (no DTD, no entities are"
                        + " read, so none can reach a file or the network)");
            }
            if (ev == XMLStreamConstants.ENTITY_REFERENCE) {
                throw fail("&" + r.getLocalName() + ";", "an entity reference is not accepted in a codebook");
            }
            if (ev == XMLStreamConstants.END_ELEMENT) {
                path.pop();
                continue;
            }
            if (ev != XMLStreamConstants.START_ELEMENT) {
                continue;
            }
            String name = r.getLocalName();
            if (root) {
                String ns = r.getNamespaceURI() == null ? "" : r.getNamespaceURI();
                if (!name.equals("codeBook") || !ACCEPTED_NS.contains(ns)) {
                    throw fail("<" + name + ">", "not a DDI-Codebook document: expected the root element codeBook"
                            + " in namespace " + NS_25 + " (or none, for DDI 2.1 and older), found " + name
                            + (ns.isEmpty() ? "" : " in namespace " + ns));
                }
                root = false;
            }
            if (!accepted(r.getNamespaceURI())) {
                skip();
                continue;
            }
            if (name.equals("var") && "dataDscr".equals(path.peek())) {
                VariableMeta v = variable();
                if (!names.add(v.name().toLowerCase(Locale.ROOT))) {
                    throw fail("<var name=\"" + v.name() + "\">", "variable " + v.name() + " is described twice");
                }
                vars.add(v);
                continue;
            }
            if (name.equals("titl") && title == null && path.contains("stdyDscr") && path.contains("titlStmt")) {
                title = text();
                continue;
            }
            path.push(name);
        }
        if (vars.isEmpty()) {
            throw fail(null, "the codebook describes no variable (no dataDscr/var element)");
        }
        return new DatasetCodebook(file.getFileName() + ", DDI-Codebook XML", title, vars);
    }

    private static boolean accepted(String ns) {
        return ACCEPTED_NS.contains(ns == null ? "" : ns);
    }

    /** One {@code var}, the reader on its start tag; returns on its end tag. */
    private VariableMeta variable() throws XMLStreamException, IOException {
        String name = attr("name");
        if (name == null || name.isBlank()) {
            throw fail("<var>", "a var without a name attribute");
        }
        String where = "<var name=\"" + name + "\">";
        Measure measure = measure(attr("nature"), attr("intrvl"), where);
        Integer decimals = integer(attr("dcml"), where + " dcml");
        String unit = attr("measUnit") == null || attr("measUnit").isBlank() ? null
                : attr("measUnit").replaceAll("\\s+", " ").strip();
        String label = null;
        String formatType = null;
        String formatName = null;
        String formatText = null;
        String formatCategory = null;
        List<Category> categories = new ArrayList<>();
        List<InvalidRange> invalidRanges = new ArrayList<>();
        List<String[]> invalidItems = new ArrayList<>();
        List<Object> invalidBlock = null;
        String invalidKey = null;
        RangeSpec valid = null;
        int depth = 0;
        String block = null;
        Category category = null;
        while (true) {
            int ev = r.next();
            if (ev == XMLStreamConstants.END_ELEMENT) {
                if (depth == 0) {
                    break;
                }
                depth--;
                if (depth == 0) {
                    if ("catgry".equals(block) && category != null) {
                        if (category.value == null) {
                            throw fail(where + " <catgry>", "a category without a catValu");
                        }
                        categories.add(category);
                        category = null;
                    }
                    if ("invalrng".equals(block)) {
                        // the key may follow the ranges and items it describes
                        for (Object o : invalidBlock) {
                            if (o instanceof Double[] d) {
                                invalidRanges.add(new InvalidRange(d[0], d[1], invalidKey));
                            } else {
                                invalidItems.add(new String[] {(String) o, invalidKey});
                            }
                        }
                        invalidBlock = null;
                        invalidKey = null;
                    }
                    block = null;
                }
                continue;
            }
            if (ev == XMLStreamConstants.DTD || ev == XMLStreamConstants.ENTITY_REFERENCE) {
                throw fail(where, "an entity reference is not accepted in a codebook");
            }
            if (ev != XMLStreamConstants.START_ELEMENT) {
                continue;
            }
            String el = r.getLocalName();
            if (!accepted(r.getNamespaceURI())) {
                skip();
                continue;
            }
            if (depth == 0) {
                switch (el) {
                    case "labl" -> {
                        String l = text();
                        label = label == null ? l : label;
                        continue;
                    }
                    case "varFormat" -> {
                        formatType = attr("type");
                        formatName = attr("formatname");
                        formatCategory = attr("category");
                        formatText = text();
                        continue;
                    }
                    case "catgry" -> {
                        category = new Category("Y".equalsIgnoreCase(attr("missing")));
                        block = el;
                    }
                    case "invalrng" -> {
                        invalidBlock = new ArrayList<>();
                        block = el;
                    }
                    case "valrng" -> block = el;
                    default -> block = "other";
                }
                depth++;
                continue;
            }
            String at = where + " <" + block + "><" + el + ">";
            if ("catgry".equals(block) && depth == 1 && el.equals("catValu")) {
                category.value = text();
                continue;
            }
            if ("catgry".equals(block) && depth == 1 && el.equals("labl")) {
                String l = text();
                category.label = category.label == null && !l.isEmpty() ? l : category.label;
                continue;
            }
            if ("catgry".equals(block) && depth == 1 && el.equals("txt")) {
                String t = text();
                category.text = category.text == null && !t.isEmpty() ? t : category.text;
                continue;
            }
            if ("invalrng".equals(block) && depth == 1 && el.equals("key")) {
                String k = text();
                invalidKey = invalidKey == null && !k.isEmpty() ? k : invalidKey;
                continue;
            }
            if ("invalrng".equals(block) && el.equals("range")) {
                Double lo = number(attr("min"), at + " min");
                Double hi = number(attr("max"), at + " max");
                if (lo == null && hi == null) {
                    throw fail(at, "a range needs min, max or both");
                }
                invalidBlock.add(new Double[] {lo, hi});
            } else if ("invalrng".equals(block) && el.equals("item")) {
                String v = attr("VALUE");
                if (v == null || v.isBlank()) {
                    throw fail(at, "an item needs a VALUE");
                }
                invalidBlock.add(v.strip());
            } else if ("valrng".equals(block) && el.equals("range") && valid == null) {
                Double lo = number(attr("min"), at + " min");
                Double hi = number(attr("max"), at + " max");
                if (lo != null && hi != null && lo > hi) {
                    throw fail(at, "min " + lo + " is above max " + hi);
                }
                valid = lo == null && hi == null ? null : new RangeSpec(lo, hi);
            }
            depth++;
        }
        String format = formatText != null && !formatText.isEmpty() ? formatText
                : formatName != null && formatName.strip().matches(".*\\d") ? formatName.strip() : null;
        StorageType storage = storage(formatType, formatName == null || formatName.isBlank() ? format : formatName,
                formatCategory);
        Map<String, String> labels = new LinkedHashMap<>();
        List<MissingCodeSpec> missing = new ArrayList<>();
        Set<String> missingSeen = new HashSet<>();
        for (Category c : categories) {
            String code = Codes.of(c.value, storage);
            if (c.label != null) {
                labels.putIfAbsent(code, c.label);
            }
            if (c.missing && missingSeen.add(code)) {
                missing.add(new MissingCodeSpec(code, c.text != null ? c.text
                        : c.label != null ? c.label : "declared missing in the codebook"));
            }
        }
        for (String[] item : invalidItems) {
            String code = Codes.of(item[0], storage);
            if (missingSeen.add(code)) {
                missing.add(new MissingCodeSpec(code, labels.getOrDefault(code,
                        item[1] != null ? item[1] : "declared invalid in the codebook")));
            }
        }
        List<MissingRangeSpec> ranges = new ArrayList<>();
        for (InvalidRange d : invalidRanges) {
            ranges.add(new MissingRangeSpec(d.low(), d.high(), d.key() != null ? d.key()
                    : "declared invalid range in the codebook"));
        }
        Integer width = storage == StorageType.TEXT ? textWidth(format) : null;
        return new VariableMeta(name.strip(), label == null || label.isBlank() ? null : label, storage,
                width, decimals, format, measure, unit, labels, missing, ranges, valid);
    }

    /** One {@code catgry} as read: its code, first label, first text, and whether it is declared missing. */
    private static final class Category {
        final boolean missing;
        String value;
        String label;
        String text;

        Category(boolean missing) {
            this.missing = missing;
        }
    }

    /** One {@code invalrng/range} with the {@code key} of its {@code invalrng}, when there is one. */
    private record InvalidRange(Double low, Double high, String key) {
    }

    private Measure measure(String nature, String intrvl, String where) throws IOException {
        if (nature != null) {
            return switch (nature.strip().toLowerCase(Locale.ROOT)) {
                case "nominal" -> Measure.NOMINAL;
                case "ordinal" -> Measure.ORDINAL;
                case "interval", "ratio", "percent" -> Measure.SCALE;
                case "other" -> Measure.UNKNOWN;
                default -> throw fail(where + " nature", "expected nominal, ordinal, interval, ratio, percent or"
                        + " other but got '" + nature.strip() + "'");
            };
        }
        return intrvl != null && intrvl.strip().equalsIgnoreCase("contin") ? Measure.SCALE : Measure.UNKNOWN;
    }

    /**
     * Dates by DDI's {@code category="date"} or by an SPSS date format name (DATE11, ADATE10, EDATE, SDATE, JDATE);
     * date-times by DATETIME or YMDHMS. The format names are SPSS's, as codebooks written from SPSS files carry them.
     */
    static StorageType storage(String type, String formatName, String category) {
        String f = formatName == null ? "" : formatName.strip().toUpperCase(Locale.ROOT);
        if (f.startsWith("DATETIME") || f.startsWith("YMDHMS")) {
            return StorageType.DATETIME;
        }
        if ("date".equalsIgnoreCase(category) || f.matches("(A|E|S|J)?DATE\\d*(\\.\\d+)?")) {
            return StorageType.DATE;
        }
        if ("character".equalsIgnoreCase(type)) {
            return StorageType.TEXT;
        }
        return StorageType.NUMBER;
    }

    private static Integer textWidth(String format) {
        if (format != null && format.strip().toUpperCase(Locale.ROOT).matches("A\\d{1,9}")) {
            return Integer.parseInt(format.strip().substring(1));
        }
        return null;
    }

    private Double number(String text, String where) throws IOException {
        if (text == null || text.isBlank()) {
            return null;
        }
        try {
            double d = Double.parseDouble(text.strip());
            if (!Double.isFinite(d)) {
                throw new NumberFormatException();
            }
            return d;
        } catch (NumberFormatException e) {
            throw fail(where, "expected a number but got '" + text.strip() + "'");
        }
    }

    private Integer integer(String text, String where) throws IOException {
        if (text == null || text.isBlank()) {
            return null;
        }
        try {
            return Integer.valueOf(text.strip());
        } catch (NumberFormatException e) {
            throw fail(where, "expected a whole number but got '" + text.strip() + "'");
        }
    }

    private String attr(String local) {
        for (int i = 0; i < r.getAttributeCount(); i++) {
            if (r.getAttributeLocalName(i).equals(local)) {
                return r.getAttributeValue(i);
            }
        }
        return null;
    }

    /** The text inside the current element, its child elements' text included; the reader ends on its end tag. */
    private String text() throws XMLStreamException, IOException {
        StringBuilder s = new StringBuilder();
        int depth = 1;
        while (depth > 0) {
            int ev = r.next();
            switch (ev) {
                case XMLStreamConstants.START_ELEMENT -> depth++;
                case XMLStreamConstants.END_ELEMENT -> depth--;
                case XMLStreamConstants.CHARACTERS, XMLStreamConstants.CDATA, XMLStreamConstants.SPACE ->
                        s.append(r.getText());
                case XMLStreamConstants.ENTITY_REFERENCE ->
                        throw fail("&" + r.getLocalName() + ";", "an entity reference is not accepted in a codebook");
                default -> {
                }
            }
        }
        return s.toString().replaceAll("\\s+", " ").strip();
    }

    private void skip() throws XMLStreamException, IOException {
        text();
    }

    private CodebookFormatException fail(String element, String problem) {
        Location l = r.getLocation();
        return new CodebookFormatException(file, l == null ? 0 : l.getLineNumber(), 0,
                element == null ? null : "element " + element, problem);
    }
}
