package org.wavewarden.load.spss;

import org.wavewarden.codebook.Codes;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;
import org.wavewarden.load.CaseSource;

import java.io.BufferedInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.Charset;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.DateTimeException;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalLong;

/**
 * An SPSS system file read as the "System File Format" appendix of the GNU PSPP developers' manual describes it:
 * the dictionary at open, then one case per {@link #next} from a buffered stream, so a wave of any size is never
 * held in memory. Uncompressed, bytecode-compressed and zlib-compressed (.zsav) data are read; text is decoded in
 * the file's own encoding (the character encoding record, else the character code of the integer info record).
 */
public final class SavReader implements CaseSource {

    /** The reason given for a user-missing value that has no value label. */
    public static final String DECLARED_MISSING = "declared missing (SPSS user-missing)";

    /** SPSS dates and times count seconds from the start of the Gregorian calendar's first full day. */
    private static final LocalDateTime EPOCH = LocalDateTime.of(1582, 10, 14, 0, 0);

    private final SavInput raw;
    private final InputStream stream;
    private final Dictionary dictionary;
    private final DatasetCodebook codebook;
    private final List<Variable> variables;
    private final SlotReader slots;
    private final byte[] caseBytes;
    private long casesRead;

    private SavReader(Path file, InputStream stream, SavInput raw) throws IOException {
        this.stream = stream;
        this.raw = raw;
        this.dictionary = new Dictionary(raw);
        this.variables = dictionary.variables();
        this.codebook = dictionary.codebook(file.getFileName() == null ? file.toString() : file.getFileName().toString());
        this.slots = dictionary.slotReader();
        this.caseBytes = new byte[dictionary.slotCount * 8];
    }

    static SavReader open(Path file) throws IOException {
        long size = Files.size(file);
        InputStream in = new BufferedInputStream(Files.newInputStream(file), 64 * 1024);
        SavInput raw = new SavInput(in, file.toString(), size);
        try {
            return new SavReader(file, in, raw);
        } catch (IOException e) {
            in.close();
            throw e;
        } catch (RuntimeException e) {
            in.close();
            throw new SavFormatException(file.toString(), raw.record(), raw.offset(),
                    "the dictionary cannot be read: " + e, e);
        }
    }

    @Override
    public DatasetCodebook codebook() {
        return codebook;
    }

    /** The variable the file is weighted by (SPSS {@code WEIGHT BY}), if any. */
    public Optional<String> weightVariable() {
        return Optional.ofNullable(dictionary.weightVariable);
    }

    /** The number of cases the header (or the 64-bit case count record) announces, when it gives one. */
    public OptionalLong caseCount() {
        return dictionary.caseCount < 0 ? OptionalLong.empty() : OptionalLong.of(dictionary.caseCount);
    }

    /** The file's document lines (SPSS {@code DOCUMENT}), trailing blanks removed. */
    public List<String> documents() {
        return dictionary.documents;
    }

    /** The product that wrote the file, as its header names it ("GNU pspp 1.6.2 - x86_64-pc-linux-gnu"). */
    public String product() {
        return dictionary.product;
    }

    @Override
    public boolean next(Object[] values) throws IOException {
        if (values.length < variables.size()) {
            throw new IllegalArgumentException("a case has " + variables.size() + " values, the array holds "
                    + values.length);
        }
        if (dictionary.caseCount >= 0 && casesRead >= dictionary.caseCount) {
            return false;
        }
        try {
            for (int s = 0; s < dictionary.slotCount; s++) {
                if (!slots.next(caseBytes, s * 8)) {
                    if (s == 0 && dictionary.caseCount < 0) {
                        return false;
                    }
                    throw slots.input().error(s == 0
                            ? "the data end after " + casesRead + " of " + dictionary.caseCount + " cases"
                            : "the data end inside the case");
                }
            }
            for (int i = 0; i < variables.size(); i++) {
                values[i] = value(variables.get(i));
            }
        } catch (SavFormatException e) {
            throw e.inCase(casesRead + 1);
        } catch (RuntimeException e) {
            throw new SavFormatException(raw.file(), "case " + (casesRead + 1), raw.offset(),
                    "the case cannot be read: " + e, e);
        }
        casesRead++;
        return true;
    }

    private Object value(Variable v) throws SavFormatException {
        if (!v.isString()) {
            double d = raw.float64(caseBytes, v.firstSlot * 8);
            if (Double.isNaN(d) || d == dictionary.sysmis) {
                return null;
            }
            try {
                return switch (v.storage) {
                    case DATE -> EPOCH.toLocalDate().plusDays(Math.floorDiv((long) Math.floor(d), 86_400L));
                    case DATETIME -> {
                        long millis = Math.round(d * 1000.0);
                        yield EPOCH.plusSeconds(Math.floorDiv(millis, 1000L))
                                .plusNanos(Math.floorMod(millis, 1000L) * 1_000_000L);
                    }
                    default -> d;
                };
            } catch (DateTimeException | ArithmeticException e) {
                throw new SavFormatException(raw.file(), "case " + (casesRead + 1), raw.offset(),
                        "variable " + v.name + " holds " + d + ", which is no date", e);
            }
        }
        byte[] text = new byte[v.width];
        int filled = 0;
        for (Segment seg : v.segments) {
            int take = Math.min(Math.min(seg.width, 255), v.width - filled);
            if (take <= 0) {
                break;
            }
            System.arraycopy(caseBytes, seg.firstSlot * 8, text, filled, take);
            filled += take;
        }
        return dictionary.text(text, filled);
    }

    @Override
    public void close() throws IOException {
        try {
            slots.close();
        } finally {
            stream.close();
        }
    }

    /** One variable record that is not a continuation: a numeric, a string, or one segment of a very long string. */
    private static final class Segment {
        final int firstSlot;
        final int width;
        int slotCount = 1;
        final byte[] shortName;
        final byte[] label;
        final int missingCount;
        final byte[][] missing;
        final SavFormat print;
        int measure;
        final List<byte[][]> valueLabels = new ArrayList<>();

        Segment(int firstSlot, int width, byte[] shortName, byte[] label, int missingCount, byte[][] missing,
                SavFormat print) {
            this.firstSlot = firstSlot;
            this.width = width;
            this.shortName = shortName;
            this.label = label;
            this.missingCount = missingCount;
            this.missing = missing;
            this.print = print;
        }
    }

    /** A variable as the user sees it: one segment, or the segments of a very long string put back together. */
    private record Variable(String name, int firstSlot, int width, StorageType storage, List<Segment> segments) {
        boolean isString() {
            return width > 0;
        }
    }

    /** Reads one 8-byte slot of case data at a time, whatever the compression. */
    private interface SlotReader {
        boolean next(byte[] into, int at) throws IOException;

        SavInput input();

        default void close() throws IOException {
        }
    }

    private static final class PlainSlots implements SlotReader {
        private final SavInput in;
        private final byte[] slot = new byte[8];

        PlainSlots(SavInput in) {
            this.in = in;
        }

        @Override
        public boolean next(byte[] into, int at) throws IOException {
            if (!in.fill(slot)) {
                return false;
            }
            System.arraycopy(slot, 0, into, at, 8);
            return true;
        }

        @Override
        public SavInput input() {
            return in;
        }
    }

    /** Bytecode compression: a group of eight command bytes, then the uncompressible values they announce. */
    private static final class BytecodeSlots implements SlotReader {
        private final SavInput in;
        private final double bias;
        private final double sysmis;
        private final ZlibBlocks zlib;
        private final byte[] commands = new byte[8];
        private final byte[] slot = new byte[8];
        private int next = 8;
        private boolean ended;

        BytecodeSlots(SavInput in, double bias, double sysmis, ZlibBlocks zlib) {
            this.in = in;
            this.bias = bias;
            this.sysmis = sysmis;
            this.zlib = zlib;
        }

        @Override
        public boolean next(byte[] into, int at) throws IOException {
            while (!ended) {
                if (next == 8) {
                    if (!in.fill(commands)) {
                        return false;
                    }
                    next = 0;
                }
                int code = commands[next++] & 0xff;
                switch (code) {
                    case 0:
                        continue;
                    case 252:
                        ended = true;
                        return false;
                    case 253:
                        if (!in.fill(slot)) {
                            throw in.error("the data end before an uncompressed value");
                        }
                        System.arraycopy(slot, 0, into, at, 8);
                        return true;
                    case 254:
                        java.util.Arrays.fill(into, at, at + 8, (byte) ' ');
                        return true;
                    case 255:
                        put(into, at, sysmis);
                        return true;
                    default:
                        put(into, at, code - bias);
                        return true;
                }
            }
            return false;
        }

        private void put(byte[] into, int at, double value) {
            long bits = Double.doubleToRawLongBits(value);
            for (int i = 0; i < 8; i++) {
                int shift = in.littleEndian() ? 8 * i : 8 * (7 - i);
                into[at + i] = (byte) (bits >>> shift);
            }
        }

        @Override
        public SavInput input() {
            return in;
        }

        @Override
        public void close() {
            if (zlib != null) {
                zlib.close();
            }
        }
    }

    /** The file header and every dictionary record up to the dictionary termination record (type 999). */
    private static final class Dictionary {
        private final SavInput in;
        final String product;
        private final int compression;
        private final int weightIndex;
        long caseCount;
        private final double bias;
        private final byte[] fileLabel;
        private final List<Segment> segments = new ArrayList<>();
        int slotCount;
        private final List<byte[]> documentBytes = new ArrayList<>();
        List<String> documents = List.of();
        private int characterCode = -1;
        double sysmis = -Double.MAX_VALUE;
        private double highest = Double.MAX_VALUE;
        private double lowest = Math.nextUp(-Double.MAX_VALUE);
        private byte[] longNames;
        private byte[] veryLongStrings;
        private byte[] encodingName;
        private byte[] longStringLabels;
        private long longStringLabelsAt;
        private byte[] longStringMissing;
        private long longStringMissingAt;
        private Charset charset;
        String weightVariable;
        private List<Variable> variables;
        private final Map<Variable, Map<String, String>> stringLabels = new HashMap<>();
        private final Map<Variable, List<String>> stringMissing = new HashMap<>();

        Dictionary(SavInput in) throws IOException {
            this.in = in;
            byte[] magic = in.bytes(4);
            String m = new String(magic, StandardCharsets.US_ASCII);
            if (!m.equals("$FL2") && !m.equals("$FL3")) {
                throw in.error("not an SPSS system file (it does not start with $FL2 or $FL3)");
            }
            String productText = new String(in.bytes(60), StandardCharsets.ISO_8859_1).trim();
            product = productText.replaceFirst("^@\\(#\\) SPSS DATA FILE\\s*-?\\s*", "");
            byte[] layout = in.bytes(4);
            int little = in.int32(layout, 0);
            if (little != 2 && little != 3) {
                in.littleEndian(false);
                if (in.int32(layout, 0) != 2 && in.int32(layout, 0) != 3) {
                    throw in.error("the layout code is neither 2 nor 3 in either byte order");
                }
            }
            in.int32();
            compression = in.int32();
            if (compression < 0 || compression > 2 || (compression == 2 && !m.equals("$FL3"))) {
                throw in.error("unknown compression " + compression);
            }
            weightIndex = in.int32();
            caseCount = in.int32();
            bias = in.float64();
            in.bytes(17);
            fileLabel = in.bytes(64);
            in.bytes(3);
            readRecords();
            if (slotCount == 0) {
                throw in.error("the file has no variables");
            }
            for (Segment s : segments) {
                int expected = s.width == 0 ? 1 : (s.width + 7) / 8;
                if (s.slotCount != expected) {
                    throw in.error("variable " + latin(s.shortName) + " of width " + s.width + " has "
                            + s.slotCount + " continuation-counted slots, expected " + expected);
                }
            }
            charset = charset();
            variables = assemble();
        }

        private void readRecords() throws IOException {
            while (true) {
                in.record("record type");
                long start = in.offset();
                int type = in.int32();
                switch (type) {
                    case 2 -> {
                        in.record("variable record at byte " + start);
                        variable();
                    }
                    case 3 -> {
                        in.record("value label record at byte " + start);
                        valueLabels();
                    }
                    case 6 -> {
                        in.record("document record at byte " + start);
                        int lines = in.int32();
                        in.require(lines, 80, "a document line count");
                        for (int i = 0; i < lines; i++) {
                            documentBytes.add(in.bytes(80));
                        }
                    }
                    case 7 -> extension(start);
                    case 999 -> {
                        in.record("dictionary termination record at byte " + start);
                        in.int32();
                        return;
                    }
                    default -> throw in.error("unknown record type " + type);
                }
            }
        }

        private void variable() throws IOException {
            int type = in.int32();
            int hasLabel = in.int32();
            int missingCount = in.int32();
            SavFormat print = SavFormat.unpack(in.int32());
            in.int32();
            byte[] name = in.bytes(8);
            if (type < -1 || type > 255) {
                throw in.error("variable type " + type + " is neither -1, 0 nor a string width up to 255");
            }
            byte[] label = null;
            if (hasLabel == 1) {
                int length = in.int32();
                label = in.bytes(length);
                in.skip((4 - length % 4) % 4);
            } else if (hasLabel != 0) {
                throw in.error("has_var_label is " + hasLabel);
            }
            int n = Math.abs(missingCount);
            if (missingCount < -3 || missingCount == -1 || missingCount > 3) {
                throw in.error("missing value count " + missingCount);
            }
            byte[][] missing = new byte[n][];
            for (int i = 0; i < n; i++) {
                missing[i] = in.bytes(8);
            }
            if (type == -1) {
                if (segments.isEmpty() || segments.get(segments.size() - 1).width == 0) {
                    throw in.error("a continuation record follows no string variable");
                }
                segments.get(segments.size() - 1).slotCount++;
            } else {
                segments.add(new Segment(slotCount, type, name, label, missingCount, missing, print));
            }
            slotCount++;
        }

        private void valueLabels() throws IOException {
            int count = in.int32();
            in.require(count, 16, "a value label count");
            List<byte[][]> labelled = new ArrayList<>(count);
            for (int i = 0; i < count; i++) {
                byte[] value = in.bytes(8);
                int length = in.bytes(1)[0] & 0xff;
                byte[] label = in.bytes(length);
                in.skip((8 - (length + 1) % 8) % 8);
                labelled.add(new byte[][]{value, label});
            }
            in.record("value label variables record after the value labels");
            if (in.int32() != 4) {
                throw in.error("value labels are not followed by the record of the variables they label");
            }
            int vars = in.int32();
            in.require(vars, 4, "a labelled variable count");
            for (int i = 0; i < vars; i++) {
                int index = in.int32();
                Segment target = segmentAtSlot(index - 1);
                if (target == null) {
                    throw in.error("value labels name variable index " + index + ", which no variable starts at");
                }
                target.valueLabels.addAll(labelled);
            }
        }

        private Segment segmentAtSlot(int slot) {
            for (Segment s : segments) {
                if (s.firstSlot == slot) {
                    return s;
                }
            }
            return null;
        }

        private void extension(long start) throws IOException {
            in.record("extension record at byte " + start);
            int subtype = in.int32();
            int size = in.int32();
            int count = in.int32();
            in.record("extension record subtype " + subtype + " at byte " + start);
            if (size <= 0 && count != 0) {
                throw in.error("element size " + size);
            }
            in.require(count, Math.max(size, 1), "an element count");
            long bytes = (long) size * count;
            if (bytes > Integer.MAX_VALUE - 16) {
                throw in.error("an extension record of " + bytes + " bytes");
            }
            long payloadAt = in.offset();
            switch (subtype) {
                case 3 -> {
                    byte[] b = in.bytes((int) bytes);
                    if (size == 4 && count >= 8) {
                        characterCode = in.int32(b, 28);
                    }
                }
                case 4 -> {
                    byte[] b = in.bytes((int) bytes);
                    if (size == 8 && count >= 3) {
                        sysmis = in.float64(b, 0);
                        highest = in.float64(b, 8);
                        lowest = in.float64(b, 16);
                    }
                }
                case 11 -> {
                    byte[] b = in.bytes((int) bytes);
                    int stride = count == 3 * segments.size() ? 3 : count == 2 * segments.size() ? 2 : 0;
                    if (size == 4 && stride > 0) {
                        for (int i = 0; i < segments.size(); i++) {
                            segments.get(i).measure = in.int32(b, i * stride * 4);
                        }
                    }
                }
                case 13 -> longNames = in.bytes((int) bytes);
                case 14 -> veryLongStrings = in.bytes((int) bytes);
                case 16 -> {
                    byte[] b = in.bytes((int) bytes);
                    if (size == 8 && count == 2) {
                        caseCount = in.int64(b, 8);
                    }
                }
                case 20 -> encodingName = in.bytes((int) bytes);
                case 21 -> {
                    longStringLabelsAt = payloadAt;
                    longStringLabels = in.bytes((int) bytes);
                }
                case 22 -> {
                    longStringMissingAt = payloadAt;
                    longStringMissing = in.bytes((int) bytes);
                }
                default -> in.skip(bytes);
            }
        }

        private Charset charset() throws SavFormatException {
            if (encodingName != null) {
                String name = new String(encodingName, StandardCharsets.US_ASCII).trim();
                try {
                    return Charset.forName(name);
                } catch (IllegalArgumentException e) {
                    throw new SavFormatException(in.file(), "character encoding record", in.offset(),
                            "the character encoding '" + name + "' is not known", e);
                }
            }
            String name = switch (characterCode) {
                case 65001 -> "UTF-8";
                case 20127 -> "US-ASCII";
                case -1, 1, 2, 3, 4 -> "windows-1252";
                default -> {
                    if (characterCode >= 28591 && characterCode <= 28606) {
                        yield "ISO-8859-" + (characterCode - 28590);
                    }
                    yield "windows-" + characterCode;
                }
            };
            try {
                return Charset.forName(name);
            } catch (IllegalArgumentException e) {
                try {
                    return Charset.forName("cp" + characterCode);
                } catch (IllegalArgumentException again) {
                    throw new SavFormatException(in.file(), "integer info record", in.offset(),
                            "the character code " + characterCode + " is not known", again);
                }
            }
        }

        String text(byte[] b, int length) {
            int end = length;
            while (end > 0 && (b[end - 1] == ' ' || b[end - 1] == 0)) {
                end--;
            }
            return new String(b, 0, end, charset);
        }

        private String text(byte[] b) {
            return text(b, b.length);
        }

        private static String latin(byte[] b) {
            return new String(b, StandardCharsets.ISO_8859_1).trim();
        }

        private List<Variable> assemble() throws SavFormatException {
            Map<String, String> longName = new HashMap<>();
            if (longNames != null) {
                for (String pair : new String(longNames, charset).split("\t")) {
                    int eq = pair.indexOf('=');
                    if (eq > 0 && !pair.substring(eq + 1).isBlank()) {
                        longName.put(pair.substring(0, eq).trim().toUpperCase(Locale.ROOT), pair.substring(eq + 1).trim());
                    }
                }
            }
            Map<String, Integer> veryLong = new HashMap<>();
            if (veryLongStrings != null) {
                for (String pair : new String(veryLongStrings, charset).split("[\u0000\t]+")) {
                    int eq = pair.indexOf('=');
                    if (eq > 0) {
                        try {
                            veryLong.put(pair.substring(0, eq).trim().toUpperCase(Locale.ROOT),
                                    Integer.parseInt(pair.substring(eq + 1).trim()));
                        } catch (NumberFormatException e) {
                            throw new SavFormatException(in.file(), "very long string record", in.offset(),
                                    "the width in '" + pair + "' is not a number", e);
                        }
                    }
                }
            }
            List<Variable> out = new ArrayList<>();
            for (int i = 0; i < segments.size(); i++) {
                Segment first = segments.get(i);
                String shortName = text(first.shortName);
                if (shortName.isBlank()) {
                    throw new SavFormatException(in.file(), "variable record " + (i + 1), in.offset(),
                            "a variable has no name");
                }
                String name = longName.getOrDefault(shortName.toUpperCase(Locale.ROOT), shortName);
                Integer width = veryLong.get(shortName.toUpperCase(Locale.ROOT));
                List<Segment> parts = new ArrayList<>();
                parts.add(first);
                int totalWidth = first.width;
                if (width != null && width > 255) {
                    int n = (width + 251) / 252;
                    if (i + n > segments.size()) {
                        throw new SavFormatException(in.file(), "very long string record", in.offset(),
                                "variable " + name + " of width " + width + " needs " + n
                                        + " segments, the dictionary has " + (segments.size() - i));
                    }
                    for (int k = 1; k < n; k++) {
                        parts.add(segments.get(i + k));
                    }
                    i += n - 1;
                    totalWidth = width;
                }
                StorageType storage = totalWidth > 0 ? StorageType.TEXT : first.print.numericStorage();
                out.add(new Variable(name, first.firstSlot, totalWidth, storage, List.copyOf(parts)));
                if (weightIndex > 0 && first.firstSlot == weightIndex - 1) {
                    weightVariable = name;
                }
            }
            documents = documentBytes.stream().map(this::text).toList();
            readLongStringLabels(out);
            readLongStringMissing(out);
            return out;
        }

        private Variable byName(List<Variable> all, String name) {
            for (Variable v : all) {
                if (v.name.equalsIgnoreCase(name)) {
                    return v;
                }
            }
            return null;
        }

        /** A cursor over an extension record's payload that fails with the record and offset when it runs out. */
        private final class Payload {
            private final byte[] b;
            private final long at;
            private final String record;
            private int pos;

            Payload(byte[] b, long at, String record) {
                this.b = b;
                this.at = at;
                this.record = record;
            }

            boolean more() {
                return pos < b.length;
            }

            int int32() throws SavFormatException {
                need(4);
                int v = in.int32(b, pos);
                pos += 4;
                return v;
            }

            byte[] bytes(int n) throws SavFormatException {
                if (n < 0) {
                    throw new SavFormatException(in.file(), record, at + pos, "a negative length " + n);
                }
                need(n);
                byte[] out = java.util.Arrays.copyOfRange(b, pos, pos + n);
                pos += n;
                return out;
            }

            private void need(int n) throws SavFormatException {
                if (n > b.length - pos) {
                    throw new SavFormatException(in.file(), record, at + pos,
                            "the record ends " + (n - (b.length - pos)) + " bytes early");
                }
            }
        }

        private void readLongStringLabels(List<Variable> all) throws SavFormatException {
            if (longStringLabels == null) {
                return;
            }
            Payload p = new Payload(longStringLabels, longStringLabelsAt, "long string value label record");
            while (p.more()) {
                String name = text(p.bytes(p.int32()));
                p.int32();
                int n = p.int32();
                Map<String, String> labelled = new LinkedHashMap<>();
                for (int k = 0; k < n; k++) {
                    String value = text(p.bytes(p.int32()));
                    byte[] label = p.bytes(p.int32());
                    labelled.put(value, new String(label, charset));
                }
                Variable v = byName(all, name);
                if (v != null && v.isString()) {
                    stringLabels.computeIfAbsent(v, x -> new LinkedHashMap<>()).putAll(labelled);
                }
            }
        }

        private void readLongStringMissing(List<Variable> all) throws SavFormatException {
            if (longStringMissing == null) {
                return;
            }
            Payload p = new Payload(longStringMissing, longStringMissingAt, "long string missing value record");
            while (p.more()) {
                String name = text(p.bytes(p.int32()));
                int n = p.bytes(1)[0] & 0xff;
                List<String> values = new ArrayList<>();
                for (int k = 0; k < n; k++) {
                    values.add(text(p.bytes(p.int32())));
                }
                Variable v = byName(all, name);
                if (v != null && v.isString()) {
                    stringMissing.computeIfAbsent(v, x -> new ArrayList<>()).addAll(values);
                }
            }
        }

        List<Variable> variables() {
            return variables;
        }

        SlotReader slotReader() throws IOException {
            return switch (compression) {
                case 0 -> {
                    in.record("uncompressed case data");
                    yield new PlainSlots(in);
                }
                case 1 -> {
                    in.record("bytecode-compressed case data");
                    yield new BytecodeSlots(in, bias, sysmis, null);
                }
                default -> {
                    in.record("zlib data header");
                    long headerAt = in.offset();
                    long zheader = in.int64();
                    long ztrailer = in.int64();
                    long ztrailerLength = in.int64();
                    // The trailer closes the file: a file cut anywhere, even after the last case, is caught here.
                    if (zheader != headerAt || ztrailer < headerAt + 24 || ztrailerLength < 24
                            || ztrailer - in.offset() > in.remaining()
                            || ztrailerLength > in.remaining() - (ztrailer - in.offset())) {
                        throw in.error("the zlib data header (at " + zheader + ", trailer at " + ztrailer + " of "
                                + ztrailerLength + " bytes) does not fit the file");
                    }
                    in.record("zlib-compressed case data");
                    ZlibBlocks blocks = new ZlibBlocks(in, ztrailer - in.offset());
                    SavInput inflated = new SavInput(blocks, in.file(), Long.MAX_VALUE);
                    inflated.littleEndian(in.littleEndian());
                    inflated.record("case data inflated from the zlib blocks (offset counts inflated bytes)");
                    yield new BytecodeSlots(inflated, bias, sysmis, blocks);
                }
            };
        }

        DatasetCodebook codebook(String fileName) {
            List<VariableMeta> metas = new ArrayList<>();
            for (Variable v : variables) {
                metas.add(meta(v));
            }
            // Only the trailing blanks are padding; leading ones belong to the label as it was written.
            String title = text(fileLabel);
            return new DatasetCodebook(fileName + ", SPSS system file written by " + product,
                    title.isBlank() ? null : title, metas);
        }

        private VariableMeta meta(Variable v) {
            Segment first = v.segments.get(0);
            String label = first.label == null ? null : new String(first.label, charset);
            Map<String, String> valueLabels = new LinkedHashMap<>();
            for (byte[][] vl : first.valueLabels) {
                String code;
                if (v.isString()) {
                    code = text(vl[0]);
                } else {
                    double d = in.float64(vl[0], 0);
                    if (!Double.isFinite(d) || d == sysmis) {
                        continue;
                    }
                    code = Codes.of(d);
                }
                valueLabels.put(code, new String(vl[1], charset));
            }
            valueLabels.putAll(stringLabels.getOrDefault(v, Map.of()));
            List<MissingCodeSpec> codes = new ArrayList<>();
            List<MissingRangeSpec> ranges = new ArrayList<>();
            if (v.isString()) {
                List<String> values = new ArrayList<>();
                if (first.missingCount > 0) {
                    for (byte[] m : first.missing) {
                        values.add(text(m));
                    }
                }
                values.addAll(stringMissing.getOrDefault(v, List.of()));
                for (String s : values) {
                    codes.add(new MissingCodeSpec(s, valueLabels.getOrDefault(s, DECLARED_MISSING)));
                }
            } else {
                int discreteFrom = 0;
                if (first.missingCount < 0) {
                    Double low = openEnd(in.float64(first.missing[0], 0), true);
                    Double high = openEnd(in.float64(first.missing[1], 0), false);
                    ranges.add(new MissingRangeSpec(low, high, DECLARED_MISSING));
                    discreteFrom = 2;
                }
                for (int k = discreteFrom; k < first.missing.length; k++) {
                    double d = in.float64(first.missing[k], 0);
                    if (Double.isFinite(d)) {
                        String code = Codes.of(d);
                        codes.add(new MissingCodeSpec(code, valueLabels.getOrDefault(code, DECLARED_MISSING)));
                    }
                }
            }
            Measure measure = switch (first.measure) {
                case 1 -> Measure.NOMINAL;
                case 2 -> Measure.ORDINAL;
                case 3 -> Measure.SCALE;
                default -> Measure.UNKNOWN;
            };
            return new VariableMeta(v.name, label, v.storage, v.isString() ? v.width : null,
                    v.isString() ? null : first.print.decimals(), first.print.text(v.isString(), v.width), measure,
                    null, valueLabels, codes, ranges, null);
        }

        /** SPSS writes LO and HI as its lowest and highest numbers (the machine limits record says which). */
        private Double openEnd(double value, boolean low) {
            if (Double.isInfinite(value) || Double.isNaN(value)) {
                return null;
            }
            if (low && value <= lowest) {
                return null;
            }
            if (!low && value >= highest) {
                return null;
            }
            return value;
        }
    }
}
