package org.wavewarden.codebook;

import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.config.RangeSpec;

import java.io.IOException;
import java.io.Writer;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

/** DDI-Codebook 2.5 XML: read as a {@link DatasetCodebook}, and written from one. */
public final class DdiCodebook {

    /** The namespace of DDI-Codebook 2.5. */
    public static final String NAMESPACE = "ddi:codebook:2_5";

    private static final String SCHEMA_LOCATION =
            "http://www.ddialliance.org/Specification/DDI-Codebook/2.5/XMLSchema/codebook.xsd";

    private DdiCodebook() {
    }

    /**
     * Reads a DDI-Codebook 2.5 document (older ones without a namespace too) as described in {@link DdiReader}.
     *
     * @throws CodebookFormatException when the file is not such a document, naming the line and element at fault
     */
    public static DatasetCodebook read(Path file) throws IOException {
        return DdiReader.read(file);
    }

    /**
     * Writes a DDI-Codebook 2.5 document (one file description, one {@code var} per variable). Elements follow the
     * order of the 2.5 schema's {@code varType} sequence (labl, valrng, invalrng, catgry, varFormat), so the document
     * validates against it. The output depends only on the codebook: no date, host or tool name is written, and the
     * same codebook gives the same bytes.
     *
     * <p>How the codebook's fields are put: the variable label is {@code labl}; the measurement level is
     * {@code @nature} (nominal, ordinal; a scale is {@code ratio}, or {@code interval} for dates, where zero means
     * nothing) with {@code @intrvl} {@code contin} for scales and {@code discrete} otherwise; the unit is
     * {@code @measUnit}; value labels are {@code catgry} with {@code catValu} and {@code labl}, and a declared missing
     * value is a {@code catgry} with {@code @missing="Y"} whose {@code txt} gives its reason where that is not its
     * value label (a missing value without a value label has no {@code labl}, so reading it back adds none); a
     * missing range is an {@code invalrng} with its {@code range} and its reason as the {@code key}; the valid range is
     * {@code valrng}; the source format is {@code varFormat} with {@code @schema="SPSS"}, and a text or date variable
     * without one still has a {@code varFormat} saying so ({@code @type}, {@code @category="date"}, DATETIME for a
     * date and time).
     *
     * <p>{@link #read} gives back the same codebook (apart from its source, which names the file read), with two
     * exceptions: white space inside text is collapsed, and declared missing values come back in the order of the
     * categories (labelled codes in their labels' order, then the unlabelled ones).
     */
    public static void write(DatasetCodebook codebook, Writer out) throws IOException {
        Xml x = new Xml(out);
        x.line(0, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>");
        x.line(0, "<codeBook xmlns=\"" + NAMESPACE + "\" xmlns:xsi=\"http://www.w3.org/2001/XMLSchema-instance\""
                + " xsi:schemaLocation=\"" + NAMESPACE + " " + SCHEMA_LOCATION + "\" version=\"2.5\">");
        x.line(1, "<stdyDscr>");
        x.line(2, "<citation>");
        x.line(3, "<titlStmt>");
        x.line(4, "<titl>" + Xml.text(codebook.title() == null || codebook.title().isBlank() ? codebook.source()
                : codebook.title()) + "</titl>");
        x.line(3, "</titlStmt>");
        x.line(2, "</citation>");
        x.line(1, "</stdyDscr>");
        x.line(1, "<fileDscr ID=\"F1\">");
        x.line(2, "<fileTxt>");
        if (codebook.source() != null && !codebook.source().isBlank()) {
            x.line(3, "<fileName>" + Xml.text(codebook.source()) + "</fileName>");
        }
        x.line(3, "<dimensns>");
        x.line(4, "<varQnty>" + codebook.variables().size() + "</varQnty>");
        x.line(3, "</dimensns>");
        x.line(2, "</fileTxt>");
        x.line(1, "</fileDscr>");
        x.line(1, "<dataDscr>");
        int n = 0;
        for (VariableMeta v : codebook.variables()) {
            writeVar(x, v, ++n);
        }
        x.line(1, "</dataDscr>");
        x.line(0, "</codeBook>");
        out.flush();
    }

    private static void writeVar(Xml x, VariableMeta v, int n) throws IOException {
        StringBuilder open = new StringBuilder("<var ID=\"V" + n + "\" name=\"" + Xml.text(v.name()) + "\" files=\"F1\"");
        if (v.decimals() != null) {
            open.append(" dcml=\"").append(v.decimals()).append('"');
        }
        open.append(" intrvl=\"").append(v.measure() == Measure.SCALE ? "contin" : "discrete").append('"');
        if (v.unit() != null && !v.unit().isBlank()) {
            open.append(" measUnit=\"").append(Xml.text(v.unit())).append('"');
        }
        String nature = nature(v);
        if (nature != null) {
            open.append(" nature=\"").append(nature).append('"');
        }
        open.append(" representationType=\"").append(representation(v)).append("\">");
        x.line(2, open.toString());
        if (v.label() != null && !v.label().isBlank()) {
            x.line(3, "<labl>" + Xml.text(v.label()) + "</labl>");
        }
        RangeSpec valid = v.validRange();
        if (valid != null && (valid.min() != null || valid.max() != null)) {
            x.line(3, "<valrng>");
            x.line(4, range(valid.min(), valid.max()));
            x.line(3, "</valrng>");
        }
        for (MissingRangeSpec r : v.missingRanges()) {
            x.line(3, "<invalrng>");
            x.line(4, range(r.low(), r.high()));
            if (r.reason() != null && !r.reason().isBlank()) {
                x.line(4, "<key>" + Xml.text(r.reason()) + "</key>");
            }
            x.line(3, "</invalrng>");
        }
        for (Map.Entry<String, Category> c : categories(v).entrySet()) {
            Category cat = c.getValue();
            x.line(3, cat.missing() ? "<catgry missing=\"Y\">" : "<catgry>");
            x.line(4, "<catValu>" + Xml.text(c.getKey()) + "</catValu>");
            if (cat.label() != null && !cat.label().isBlank()) {
                x.line(4, "<labl>" + Xml.text(cat.label()) + "</labl>");
            }
            if (cat.reason() != null && !cat.reason().isBlank() && !cat.reason().equals(cat.label())) {
                x.line(4, "<txt>" + Xml.text(cat.reason()) + "</txt>");
            }
            x.line(3, "</catgry>");
        }
        boolean dated = v.storage() == StorageType.DATE || v.storage() == StorageType.DATETIME;
        String date = dated ? " category=\"date\"" : "";
        String type = "<varFormat type=\"" + (v.storage() == StorageType.TEXT ? "character" : "numeric") + "\"";
        if (v.format() != null && !v.format().isBlank()) {
            String name = v.format().replaceFirst("[0-9.]+$", "");
            x.line(3, type + " formatname=\"" + Xml.text(name) + "\" schema=\"SPSS\"" + date + ">"
                    + Xml.text(v.format()) + "</varFormat>");
        } else if (v.storage() == StorageType.DATETIME) {
            // category="date" alone would read back as a date: the format's name tells a date and time apart
            x.line(3, type + " formatname=\"DATETIME\" schema=\"SPSS\"" + date + "/>");
        } else if (v.storage() != StorageType.NUMBER) {
            x.line(3, type + date + "/>");
        }
        x.line(2, "</var>");
    }

    /** A category: its value label (null when it has none) and, for a declared missing value, its reason. */
    private record Category(String label, boolean missing, String reason) {
    }

    /** Labelled codes in the codebook's order, then declared missing codes without a label. */
    private static Map<String, Category> categories(VariableMeta v) {
        Map<String, String> reasons = new LinkedHashMap<>();
        for (MissingCodeSpec m : v.missingCodes()) {
            reasons.putIfAbsent(m.value(), m.reason());
        }
        Map<String, Category> out = new LinkedHashMap<>();
        v.valueLabels().forEach((code, label) -> out.put(code, new Category(label, reasons.containsKey(code),
                reasons.get(code))));
        reasons.forEach((code, reason) -> out.putIfAbsent(code, new Category(null, true, reason)));
        return out;
    }

    private static String nature(VariableMeta v) {
        return switch (v.measure()) {
            case NOMINAL -> "nominal";
            case ORDINAL -> "ordinal";
            // a date's zero is an arbitrary origin: differences mean something, ratios do not
            case SCALE -> v.storage() == StorageType.DATE || v.storage() == StorageType.DATETIME ? "interval" : "ratio";
            case UNKNOWN -> null;
        };
    }

    private static String representation(VariableMeta v) {
        return switch (v.storage()) {
            case TEXT -> "text";
            case DATE, DATETIME -> "datetime";
            case NUMBER -> v.measure() != Measure.SCALE && !v.valueLabels().isEmpty() ? "code" : "numeric";
        };
    }

    private static String range(Double low, Double high) {
        StringBuilder sb = new StringBuilder("<range");
        if (low != null) {
            sb.append(" min=\"").append(Codes.of(low)).append('"');
        }
        if (high != null) {
            sb.append(" max=\"").append(Codes.of(high)).append('"');
        }
        return sb.append("/>").toString();
    }

    /** Indented lines with {@code \n} ends, whatever the platform. */
    private static final class Xml {
        private final Writer out;

        Xml(Writer out) {
            this.out = out;
        }

        void line(int depth, String s) throws IOException {
            out.write("  ".repeat(depth));
            out.write(s);
            out.write('\n');
        }

        /** Character data and attribute values escaped; characters XML 1.0 cannot hold are refused. */
        static String text(String s) {
            if (s == null) {
                return "";
            }
            StringBuilder sb = new StringBuilder(s.length() + 8);
            for (int i = 0; i < s.length(); i++) {
                char c = s.charAt(i);
                switch (c) {
                    case '&' -> sb.append("&amp;");
                    case '<' -> sb.append("&lt;");
                    case '>' -> sb.append("&gt;");
                    case '"' -> sb.append("&quot;");
                    case '\t' -> sb.append("&#9;");
                    case '\n' -> sb.append("&#10;");
                    case '\r' -> sb.append("&#13;");
                    default -> {
                        if (c < 0x20 || c == 0xFFFE || c == 0xFFFF) {
                            throw new IllegalArgumentException(String.format(Locale.ROOT,
                                    "character U+%04X cannot be written in XML", (int) c));
                        }
                        sb.append(c);
                    }
                }
            }
            return sb.toString();
        }
    }
}
