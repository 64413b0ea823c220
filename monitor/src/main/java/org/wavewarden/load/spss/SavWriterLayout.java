package org.wavewarden.load.spss;

import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;

import java.nio.charset.StandardCharsets;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.format.DateTimeParseException;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * How each variable of a codebook is laid out in a system file: its short name, its width and segments, its format,
 * its value labels and missing values in the file's own form. Everything the format cannot hold is refused here,
 * before a byte is written, with the variable named.
 */
final class SavWriterLayout {

    /** Width of one segment of a very long string, and how much of the string's width each segment but the last holds. */
    static final int SEGMENT_BYTES = 255;
    static final int SEGMENT_SPAN = 252;
    /** The widest string the format holds (SPSS's limit of a string variable). */
    static final int MAX_STRING_WIDTH = 32767;
    /** Documented limits of SPSS: variable labels 255 bytes, value labels 120 bytes (the subtype 21 bound). */
    static final int MAX_VARIABLE_LABEL = 255;
    static final int MAX_VALUE_LABEL = 120;
    static final int MAX_NAME = 64;
    static final int MAX_FILE_LABEL = 64;

    static final double SYSMIS = -Double.MAX_VALUE;
    static final double HIGHEST = Double.MAX_VALUE;
    /**
     * The open low end of a missing range: the second-largest negative number, as PSPP and older SPSS write it.
     * SPSS 21 and later write -DBL_MAX, the bits of SYSMIS, which R's haven 2.5.1 reads back as NaN, not -Inf.
     */
    static final double LOWEST = Math.nextUp(-Double.MAX_VALUE);

    /** Dates are seconds since the start of the Gregorian calendar, 14 October 1582. */
    static final LocalDateTime EPOCH = LocalDateTime.of(1582, 10, 14, 0, 0);

    private static final Set<String> RESERVED = Set.of("ALL", "AND", "BY", "EQ", "GE", "GT", "LE", "LT", "NE", "NOT",
            "OR", "TO", "WITH");
    private static final Pattern FORMAT = Pattern.compile("([A-Za-z]+)(\\d+)(?:\\.(\\d+))?");

    /**
     * One variable as the file holds it.
     *
     * @param meta          the codebook's variable
     * @param label         the variable label in UTF-8, null when there is none
     * @param shortName     the 8-byte name of its first variable record
     * @param segmentNames  the short names of the further segments of a very long string (empty otherwise)
     * @param width         0 for numbers, the string's width in bytes otherwise
     * @param format        the print and write format as the variable record codes it
     * @param displayWidth  the display column width of subtype 11
     * @param dictionaryIndex 1-based index of its first variable record among all records
     * @param valueLabels   the value labels in the codebook's order
     * @param missing       the missing values in the variable record's order: range first, then discrete values
     * @param missingCode   the variable record's count: 0-3 discrete, -2 a range, -3 a range and a value
     */
    record Variable(VariableMeta meta, byte[] label, String shortName, List<String> segmentNames, int width, int format,
                    int displayWidth, int dictionaryIndex, List<Label> valueLabels, List<byte[]> missing,
                    int missingCode) {

        boolean numeric() {
            return width == 0;
        }

        int segments() {
            return segments(width);
        }

        static int segments(int width) {
            return width <= SEGMENT_BYTES ? 1 : (width + SEGMENT_SPAN - 1) / SEGMENT_SPAN;
        }

        /** The width declared by segment {@code s}'s variable record. */
        int segmentWidth(int s) {
            if (width <= SEGMENT_BYTES) {
                return width;
            }
            return s < segments() - 1 ? SEGMENT_BYTES : width - s * SEGMENT_SPAN;
        }

        /** The 8-byte elements segment {@code s} takes in a case. */
        int segmentElements(int s) {
            return width == 0 ? 1 : (segmentWidth(s) + 7) / 8;
        }

        int elements() {
            int n = 0;
            for (int s = 0; s < segments(); s++) {
                n += segmentElements(s);
            }
            return n;
        }

        int measureCode() {
            return switch (meta.measure()) {
                case NOMINAL -> 1;
                case ORDINAL -> 2;
                case SCALE -> 3;
                case UNKNOWN -> 0;
            };
        }

        /** Numbers right-aligned, text left-aligned, as SPSS shows them. */
        int alignment() {
            return numeric() ? 1 : 0;
        }

        boolean longString() {
            return width > 8;
        }
    }

    /**
     * One value label as the file stores it.
     *
     * @param value 8 raw bytes for numbers and strings of up to 8 bytes; the value padded to the width otherwise
     * @param label the label in UTF-8
     */
    record Label(byte[] value, byte[] label) {
    }

    private final List<Variable> variables;
    private final int elements;
    private final byte[] fileLabel;

    private SavWriterLayout(List<Variable> variables, byte[] fileLabel) {
        this.variables = variables;
        this.fileLabel = fileLabel;
        this.elements = variables.stream().mapToInt(Variable::elements).sum();
    }

    List<Variable> variables() {
        return variables;
    }

    /** 8-byte elements per case: the header's nominal case size. */
    int elements() {
        return elements;
    }

    byte[] fileLabel() {
        return fileLabel;
    }

    static SavWriterLayout of(DatasetCodebook codebook) {
        // Trailing blanks would be lost in the label's blank padding anyway; leading ones are the title's own.
        byte[] title = codebook.title() == null ? new byte[0] : utf8(codebook.title().stripTrailing());
        if (title.length > MAX_FILE_LABEL) {
            throw new IllegalArgumentException("the file label (the codebook's title) is " + title.length
                    + " bytes in UTF-8; a system file holds at most " + MAX_FILE_LABEL);
        }
        List<VariableMeta> metas = codebook.variables();
        Set<String> longNames = new HashSet<>();
        for (VariableMeta m : metas) {
            checkName(m.name());
            if (!longNames.add(m.name().toUpperCase(Locale.ROOT))) {
                throw new IllegalArgumentException("variable '" + m.name() + "': another variable has the same name"
                        + " apart from case, and SPSS names ignore case");
            }
        }
        String[] shortNames = shortNames(metas);
        Set<String> used = new HashSet<>(List.of(shortNames));
        List<Variable> out = new ArrayList<>();
        int index = 1;
        for (int i = 0; i < metas.size(); i++) {
            VariableMeta m = metas.get(i);
            int width = width(m);
            List<String> segmentNames = new ArrayList<>();
            for (int s = 1; s < Variable.segments(width); s++) {
                segmentNames.add(unique(shortNames[i], Integer.toString(s), used));
            }
            int format = format(m, width);
            int displayWidth = Math.max(1, (format >> 8) & 0xff);
            List<Label> labels = valueLabels(m, width);
            List<byte[]> missing = new ArrayList<>();
            int missingCode = missing(m, width, missing);
            Variable v = new Variable(m, label(m), shortNames[i], List.copyOf(segmentNames), width, format, displayWidth,
                    index, labels, List.copyOf(missing), missingCode);
            for (int s = 0; s < v.segments(); s++) {
                index += v.segmentElements(s);
            }
            out.add(v);
        }
        return new SavWriterLayout(List.copyOf(out), title);
    }

    static byte[] utf8(String s) {
        return s.getBytes(StandardCharsets.UTF_8);
    }

    private static void checkName(String name) {
        String why = null;
        int first = name.codePointAt(0);
        if (!(Character.isLetter(first) || first == '@')) {
            why = "must begin with a letter or @";
        } else if (!name.codePoints().skip(1).allMatch(c -> Character.isLetterOrDigit(c) || c == '_' || c == '.'
                || c == '$' || c == '#' || c == '@')) {
            why = "may hold only letters, digits and _ . $ # @";
        } else if (utf8(name).length > MAX_NAME) {
            why = "is longer than " + MAX_NAME + " bytes in UTF-8";
        } else if (RESERVED.contains(name.toUpperCase(Locale.ROOT))) {
            why = "is a reserved word of SPSS syntax";
        }
        if (why != null) {
            throw new IllegalArgumentException("variable '" + name + "': the name " + why
                    + ", so it cannot be an SPSS variable name");
        }
    }

    /**
     * Short names: a name that already is a valid 8-byte ASCII name keeps its upper-case form; the others are
     * shortened after those are taken, so shortening never takes a name another variable holds as it is.
     */
    private static String[] shortNames(List<VariableMeta> metas) {
        String[] out = new String[metas.size()];
        Set<String> used = new HashSet<>();
        for (int i = 0; i < metas.size(); i++) {
            String upper = metas.get(i).name().toUpperCase(Locale.ROOT);
            if (upper.length() <= 8 && upper.chars().allMatch(c -> c < 128) && used.add(upper)) {
                out[i] = upper;
            }
        }
        for (int i = 0; i < metas.size(); i++) {
            if (out[i] == null) {
                out[i] = unique(ascii(metas.get(i).name()), "", used);
            }
        }
        return out;
    }

    private static String ascii(String name) {
        StringBuilder b = new StringBuilder();
        for (char c : name.toUpperCase(Locale.ROOT).toCharArray()) {
            if ((c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '_' || c == '.' || c == '$' || c == '#'
                    || c == '@') {
                b.append(c);
            }
        }
        if (b.isEmpty() || !(Character.isLetter(b.charAt(0)) || b.charAt(0) == '@')) {
            b.insert(0, 'V');
        }
        return b.toString();
    }

    /** {@code base} cut so that {@code suffix} fits in 8 bytes, numbered on until no other variable holds it. */
    private static String unique(String base, String suffix, Set<String> used) {
        for (int n = 0; ; n++) {
            String tail = suffix + (n == 0 ? "" : "_" + n);
            String name = base.substring(0, Math.min(base.length(), 8 - tail.length())) + tail;
            if (!RESERVED.contains(name) && used.add(name)) {
                return name;
            }
        }
    }

    private static byte[] label(VariableMeta m) {
        if (m.label() == null || m.label().isEmpty()) {
            return null;
        }
        byte[] label = utf8(m.label());
        if (label.length > MAX_VARIABLE_LABEL) {
            throw new IllegalArgumentException("variable '" + m.name() + "': its label is " + label.length
                    + " bytes in UTF-8; a system file holds variable labels of at most " + MAX_VARIABLE_LABEL);
        }
        return label;
    }

    private static int width(VariableMeta m) {
        if (m.storage() != StorageType.TEXT) {
            return 0;
        }
        if (m.width() == null) {
            throw new IllegalArgumentException("variable '" + m.name() + "': a text variable needs its width"
                    + " (bytes) to be written to a system file");
        }
        if (m.width() < 1 || m.width() > MAX_STRING_WIDTH) {
            throw new IllegalArgumentException("variable '" + m.name() + "': width " + m.width()
                    + " is outside 1-" + MAX_STRING_WIDTH + ", the widths a system file holds");
        }
        return m.width();
    }

    /** A format type, the storage it shows, and its smallest width, from the format description's table. */
    private record FormatType(int code, StorageType storage, int minWidth, boolean decimals) {
    }

    private static final Map<String, FormatType> FORMATS = Map.ofEntries(
            Map.entry("F", new FormatType(5, StorageType.NUMBER, 1, true)),
            Map.entry("COMMA", new FormatType(3, StorageType.NUMBER, 1, true)),
            Map.entry("DOT", new FormatType(32, StorageType.NUMBER, 1, true)),
            Map.entry("DOLLAR", new FormatType(4, StorageType.NUMBER, 2, true)),
            Map.entry("PCT", new FormatType(31, StorageType.NUMBER, 2, true)),
            Map.entry("E", new FormatType(17, StorageType.NUMBER, 6, true)),
            Map.entry("N", new FormatType(16, StorageType.NUMBER, 1, false)),
            Map.entry("DATE", new FormatType(20, StorageType.DATE, 9, false)),
            Map.entry("ADATE", new FormatType(23, StorageType.DATE, 8, false)),
            Map.entry("EDATE", new FormatType(38, StorageType.DATE, 8, false)),
            Map.entry("SDATE", new FormatType(39, StorageType.DATE, 8, false)),
            Map.entry("JDATE", new FormatType(24, StorageType.DATE, 5, false)),
            Map.entry("DATETIME", new FormatType(22, StorageType.DATETIME, 17, false)));

    static final int FORMAT_A = 1;
    static final int FORMAT_F = 5;

    static int code(int type, int width, int decimals) {
        return (type << 16) | (width << 8) | decimals;
    }

    /**
     * The codebook's format when SPSS would accept it for the variable's storage, else one derived from the storage:
     * text A(width), dates DATE11, date-times DATETIME20, numbers F8 with the codebook's decimals (2 when unknown).
     * The bounds on decimals are kept on the safe side of what SPSS allows (a digit before the point and, for E,
     * room for the exponent), so a format accepted here is never one a reader warns about.
     */
    private static int format(VariableMeta m, int width) {
        if (m.storage() == StorageType.TEXT) {
            return code(FORMAT_A, Math.min(width, SEGMENT_BYTES), 0);
        }
        if (m.format() != null) {
            Matcher f = FORMAT.matcher(m.format().strip());
            if (f.matches()) {
                FormatType t = FORMATS.get(f.group(1).toUpperCase(Locale.ROOT));
                int w = f.group(2).length() > 3 ? Integer.MAX_VALUE : Integer.parseInt(f.group(2));
                int d = f.group(3) == null ? 0 : f.group(3).length() > 2 ? Integer.MAX_VALUE
                        : Integer.parseInt(f.group(3));
                if (t != null && t.storage() == m.storage() && w >= t.minWidth() && w <= 40
                        && (d == 0 || (t.decimals() && d <= 16 && w >= d + (t.code() == 17 ? 7 : t.minWidth() + 1)))) {
                    return code(t.code(), w, d);
                }
            }
        }
        return switch (m.storage()) {
            case DATE -> code(20, 11, 0);
            case DATETIME -> code(22, 20, 0);
            default -> {
                int d = m.decimals() == null ? 2 : Math.max(0, Math.min(16, m.decimals()));
                yield code(FORMAT_F, Math.max(8, d + 2), d);
            }
        };
    }

    /** A numeric code, a date or a date-time as the double the file stores. */
    static double number(VariableMeta m, String text, String what) {
        String t = text.strip();
        try {
            double v = Double.parseDouble(t);
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("variable '" + m.name() + "': " + what + " '" + text
                        + "' is not a finite number");
            }
            return v;
        } catch (NumberFormatException notNumber) {
            try {
                if (m.storage() == StorageType.DATE) {
                    return seconds(LocalDate.parse(t).atStartOfDay());
                }
                if (m.storage() == StorageType.DATETIME) {
                    return seconds(LocalDateTime.parse(t));
                }
            } catch (DateTimeParseException notDate) {
                // reported below
            }
            throw new IllegalArgumentException("variable '" + m.name() + "': " + what + " '" + text
                    + "' is not a number" + (m.storage() == StorageType.NUMBER ? "" : " or an ISO date"));
        }
    }

    static double seconds(LocalDateTime t) {
        long whole = ChronoUnit.SECONDS.between(EPOCH, t.withNano(0));
        return whole + t.getNano() / 1e9;
    }

    static byte[] float64(double v) {
        long bits = Double.doubleToRawLongBits(v);
        byte[] b = new byte[8];
        for (int i = 0; i < 8; i++) {
            b[i] = (byte) (bits >>> (8 * i));
        }
        return b;
    }

    /** A string value padded with spaces to {@code width} bytes; null when it does not fit. */
    static byte[] padded(String value, int width) {
        byte[] raw = utf8(value);
        if (raw.length > width) {
            return null;
        }
        byte[] out = new byte[width];
        System.arraycopy(raw, 0, out, 0, raw.length);
        java.util.Arrays.fill(out, raw.length, width, (byte) ' ');
        return out;
    }

    private static List<Label> valueLabels(VariableMeta m, int width) {
        List<Label> out = new ArrayList<>();
        Set<String> seen = new HashSet<>();
        for (Map.Entry<String, String> e : m.valueLabels().entrySet()) {
            byte[] label = utf8(e.getValue() == null ? "" : e.getValue());
            if (label.length > MAX_VALUE_LABEL) {
                throw new IllegalArgumentException("variable '" + m.name() + "': the label of value '" + e.getKey()
                        + "' is " + label.length + " bytes in UTF-8; a system file holds value labels of at most "
                        + MAX_VALUE_LABEL);
            }
            byte[] value;
            if (width == 0) {
                double v = number(m, e.getKey(), "value label code");
                value = float64(v);
                if (!seen.add(Double.toString(v + 0.0))) {
                    throw new IllegalArgumentException("variable '" + m.name() + "': value " + e.getKey()
                            + " is labelled twice");
                }
            } else {
                String key = stripEnd(e.getKey());
                value = utf8(key).length > width ? null : padded(key, width > 8 ? width : 8);
                if (value == null) {
                    throw new IllegalArgumentException("variable '" + m.name() + "': the labelled value '"
                            + e.getKey() + "' is longer than the variable's width of " + width + " bytes");
                }
                if (!seen.add(key)) {
                    throw new IllegalArgumentException("variable '" + m.name() + "': value '" + e.getKey()
                            + "' is labelled twice");
                }
            }
            out.add(new Label(value, label));
        }
        return out;
    }

    private static String stripEnd(String s) {
        int end = s.length();
        while (end > 0 && s.charAt(end - 1) == ' ') {
            end--;
        }
        return s.substring(0, end);
    }

    /**
     * Fills {@code out} with the variable's missing values as the file stores them and returns the count the
     * variable record declares: up to three values, one range, or one range and one value. Strings hold only
     * discrete values of at most 8 bytes.
     *
     * <p>Strings of every width keep them in the variable record (8 bytes each, the rest of a wider value implied
     * blank), never in the long string missing values record (subtype 22): with two or more values, GNU PSPP 1.6.2
     * and R's haven 2.5.1 disagree on that record's layout (PSPP wants the value length before each value, haven
     * once before all) and each warns about or refuses the other's, while both read the variable record alike.
     */
    private static int missing(VariableMeta m, int width, List<byte[]> out) {
        List<MissingCodeSpec> codes = m.missingCodes();
        List<MissingRangeSpec> ranges = m.missingRanges();
        if (width > 0) {
            if (!ranges.isEmpty()) {
                throw new IllegalArgumentException("variable '" + m.name() + "': a text variable cannot have a"
                        + " missing range in a system file");
            }
            if (codes.size() > 3) {
                throw new IllegalArgumentException("variable '" + m.name() + "': " + codes.size()
                        + " missing values; a system file holds at most 3 for a variable");
            }
            for (MissingCodeSpec c : codes) {
                String value = stripEnd(c.value());
                if (utf8(value).length > Math.min(8, width)) {
                    throw new IllegalArgumentException("variable '" + m.name() + "': missing value '" + c.value()
                            + "' is longer than " + Math.min(8, width) + " bytes; a system file holds string missing"
                            + " values of at most 8 bytes and never wider than the variable");
                }
                out.add(padded(value, 8));
            }
            return codes.size();
        }
        if (ranges.size() > 1) {
            throw new IllegalArgumentException("variable '" + m.name() + "': " + ranges.size()
                    + " missing ranges; a system file holds one range for a variable");
        }
        if (ranges.size() == 1 && codes.size() > 1) {
            throw new IllegalArgumentException("variable '" + m.name() + "': a missing range and " + codes.size()
                    + " missing values; a system file holds one range with at most one value");
        }
        if (codes.size() > 3) {
            throw new IllegalArgumentException("variable '" + m.name() + "': " + codes.size()
                    + " missing values; a system file holds at most 3 for a variable");
        }
        if (ranges.size() == 1) {
            MissingRangeSpec r = ranges.get(0);
            double low = r.low() == null ? LOWEST : r.low();
            double high = r.high() == null ? HIGHEST : r.high();
            if (low > high) {
                throw new IllegalArgumentException("variable '" + m.name() + "': missing range " + r.low() + " to "
                        + r.high() + " is empty");
            }
            out.add(float64(low));
            out.add(float64(high));
        }
        for (MissingCodeSpec c : codes) {
            out.add(float64(number(m, c.value(), "missing value")));
        }
        return ranges.isEmpty() ? codes.size() : -(2 + codes.size());
    }
}
