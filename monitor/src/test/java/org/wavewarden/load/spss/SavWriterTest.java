package org.wavewarden.load.spss;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.EnumSource;
import org.junit.jupiter.params.provider.MethodSource;
import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.codebook.Measure;
import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;
import org.wavewarden.config.MissingCodeSpec;
import org.wavewarden.config.MissingRangeSpec;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import java.util.zip.Inflater;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The writer held to the "System File Format" appendix of the GNU PSPP developers' manual (the published
 * description of the format), byte by byte where the description fixes the bytes; and what it refuses.
 */
class SavWriterTest {

    @TempDir
    Path dir;

    private static final LocalDateTime CREATED = SavWriterSamples.CREATED;

    static VariableMeta number(String name) {
        return new VariableMeta(name, null, StorageType.NUMBER, null, 0, null, Measure.SCALE, null, null, null, null,
                null);
    }

    static VariableMeta text(String name, int width) {
        return new VariableMeta(name, null, StorageType.TEXT, width, null, null, Measure.NOMINAL, null, null, null,
                null, null);
    }

    static DatasetCodebook codebook(VariableMeta... variables) {
        return new DatasetCodebook("test", null, List.of(variables));
    }

    private byte[] write(DatasetCodebook codebook, List<Object[]> cases, SavWriter.Compression compression)
            throws IOException {
        Path file = dir.resolve("f-" + compression + ".sav");
        SavWriter.write(file, codebook, cases, compression, CREATED);
        return Files.readAllBytes(file);
    }

    private static List<Object[]> rows(Object... singleValues) {
        List<Object[]> out = new ArrayList<>();
        for (Object v : singleValues) {
            out.add(new Object[]{v});
        }
        return out;
    }

    /** Walks the dictionary records as the format description lays them out; where the data begins. */
    record Dictionary(int dataAt, Map<Integer, byte[]> extensions) {

        static Dictionary of(byte[] f) {
            ByteBuffer b = ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN);
            b.position(176);
            Map<Integer, byte[]> ext = new LinkedHashMap<>();
            while (true) {
                int type = b.getInt();
                switch (type) {
                    case 2 -> {
                        b.getInt();
                        int hasLabel = b.getInt();
                        int missing = b.getInt();
                        b.position(b.position() + 16);
                        if (hasLabel == 1) {
                            int len = b.getInt();
                            b.position(b.position() + (len + 3) / 4 * 4);
                        }
                        b.position(b.position() + 8 * Math.abs(missing));
                    }
                    case 3 -> {
                        int n = b.getInt();
                        for (int i = 0; i < n; i++) {
                            b.position(b.position() + 8);
                            int len = b.get() & 0xff;
                            b.position(b.position() + (len + 1 + 7) / 8 * 8 - 1);
                        }
                    }
                    case 4 -> b.position(b.position() + 4 * b.getInt());
                    case 7 -> {
                        int subtype = b.getInt();
                        int size = b.getInt();
                        int count = b.getInt();
                        byte[] data = new byte[size * count];
                        b.get(data);
                        ext.put(subtype, data);
                    }
                    case 999 -> {
                        b.getInt();
                        return new Dictionary(b.position(), ext);
                    }
                    default -> throw new AssertionError("record type " + type + " at " + (b.position() - 4));
                }
            }
        }
    }

    private static ByteBuffer le(byte[] f) {
        return ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN);
    }

    private static String ascii(byte[] f, int from, int length) {
        return new String(f, from, length, StandardCharsets.UTF_8);
    }

    @ParameterizedTest
    @EnumSource(SavWriter.Compression.class)
    void theHeaderCarriesTheLayoutCaseSizeCompressionCaseCountBiasCreationTimeAndFileLabel(
            SavWriter.Compression compression) throws IOException {
        // A number (1 element), A3 (1), A40 (5), A400: segments of 255 (32 elements) and 400 - 252 = 148 (19).
        DatasetCodebook cb = new DatasetCodebook("test", "Haushalte – Welle 3", List.of(number("n"), text("s", 3),
                text("m", 40), text("l", 400)));
        byte[] f = write(cb, List.of(new Object[]{1.0, "a", "b", "c"}, new Object[]{2.0, "d", "e", "f"}), compression);
        ByteBuffer b = le(f);
        assertEquals(compression == SavWriter.Compression.ZLIB ? "$FL3" : "$FL2", ascii(f, 0, 4));
        assertTrue(ascii(f, 4, 60).startsWith("@(#) SPSS DATA FILE Wavewarden "), ascii(f, 4, 60));
        assertEquals(2, b.getInt(64), "layout code");
        assertEquals(1 + 1 + 5 + 32 + 19, b.getInt(68), "nominal case size");
        assertEquals(compression.ordinal(), b.getInt(72), "compression");
        assertEquals(0, b.getInt(76), "weight index");
        assertEquals(2, b.getInt(80), "cases");
        assertEquals(100.0, b.getDouble(84), "bias");
        assertEquals("15 Jan 2609:30:00", ascii(f, 92, 17), "creation date and time");
        byte[] label = "Haushalte – Welle 3".getBytes(StandardCharsets.UTF_8);
        assertEquals(new String(label, StandardCharsets.UTF_8) + " ".repeat(64 - label.length), ascii(f, 109, 64));
        assertArrayEquals(new byte[3], Arrays.copyOfRange(f, 173, 176), "padding");
        Dictionary d = Dictionary.of(f);
        ByteBuffer count = le(d.extensions().get(16));
        assertEquals(1, count.getLong(0));
        assertEquals(2, count.getLong(8), "cases as 64 bits");
        assertEquals("UTF-8", new String(d.extensions().get(20), StandardCharsets.US_ASCII));
        assertEquals(65001, le(d.extensions().get(3)).getInt(28), "character code");
        assertEquals(2, le(d.extensions().get(3)).getInt(24), "little-endian");
        ByteBuffer floats = le(d.extensions().get(4));
        assertEquals(-Double.MAX_VALUE, floats.getDouble(0), "SYSMIS");
        assertEquals(Double.MAX_VALUE, floats.getDouble(8), "HIGHEST");
        assertEquals(0xffeffffffffffffeL, floats.getLong(16), "LOWEST, the second-largest negative number");
        assertEquals(List.of(3, 4, 11, 13, 14, 16, 20), List.copyOf(d.extensions().keySet()),
                "extension records in ascending order of subtype");
        assertEquals("L=00400\0\t", new String(d.extensions().get(14), StandardCharsets.US_ASCII),
                "the very long string's width");
        assertEquals("N=n\tS=s\tM=m\tL=l", new String(d.extensions().get(13), StandardCharsets.UTF_8));
        assertEquals(3 * (1 + 1 + 1 + 2), d.extensions().get(11).length / 4,
                "measure, width and alignment for every segment");
    }

    @Test
    void bytecodeCompressionStoresSmallIntegersAsOneByteAndTheRestAfterEachBlockOfEightCodes() throws IOException {
        byte[] f = write(codebook(number("x")), rows(1.0, -99.0, 151.0, 152.0, 2.5, null, -100.0),
                SavWriter.Compression.BYTECODE);
        ByteBuffer data = le(Arrays.copyOfRange(f, Dictionary.of(f).dataAt(), f.length));
        // codes: value + bias 100 for integers 1 - 100 .. 251 - 100; 253 raw value follows; 255 SYSMIS; 0 padding
        byte[] codes = new byte[8];
        data.get(codes);
        assertArrayEquals(new byte[]{101, 1, (byte) 251, (byte) 253, (byte) 253, (byte) 255, (byte) 253, 0}, codes);
        assertEquals(152.0, data.getDouble());
        assertEquals(2.5, data.getDouble());
        assertEquals(-100.0, data.getDouble());
        assertFalse(data.hasRemaining());
    }

    @Test
    void bytecodeCompressionWritesBlankEightBytesOfTextAsOneCode() throws IOException {
        byte[] f = write(codebook(text("s", 16)), rows("abc", null, "        x"), SavWriter.Compression.BYTECODE);
        ByteBuffer data = le(Arrays.copyOfRange(f, Dictionary.of(f).dataAt(), f.length));
        byte[] codes = new byte[8];
        data.get(codes);
        assertArrayEquals(new byte[]{(byte) 253, (byte) 254, (byte) 254, (byte) 254, (byte) 254, (byte) 253, 0, 0},
                codes);
        byte[] rest = new byte[16];
        data.get(rest);
        assertEquals("abc     x       ", new String(rest, StandardCharsets.US_ASCII));
        assertFalse(data.hasRemaining());
    }

    @Test
    void uncompressedCasesAreEightByteElementsWithTextPaddedWithSpaces() throws IOException {
        byte[] f = write(codebook(number("x"), text("s", 3)), List.of(new Object[]{2.5, "äb"}, new Object[]{null, null}),
                SavWriter.Compression.NONE);
        ByteBuffer data = le(Arrays.copyOfRange(f, Dictionary.of(f).dataAt(), f.length));
        assertEquals(2.5, data.getDouble());
        byte[] s = new byte[8];
        data.get(s);
        assertEquals("äb" + " ".repeat(5), new String(s, StandardCharsets.UTF_8), "3 bytes of text, 5 of padding");
        assertEquals(-Double.MAX_VALUE, data.getDouble(), "null is SYSMIS");
        data.get(s);
        assertEquals(" ".repeat(8), new String(s, StandardCharsets.US_ASCII));
        assertFalse(data.hasRemaining());
    }

    static Stream<Arguments> dates() {
        // Seconds since 14 October 1582: 1970-01-01 is 141,428 days later (12,219,379,200 s, the offset R's haven
        // subtracts; checked live in SavWriterIndependentReadersTest), 1582-10-15 one day.
        return Stream.of(
                Arguments.of(LocalDate.of(1582, 10, 15), 86_400.0),
                Arguments.of(LocalDate.of(1970, 1, 1), 12_219_379_200.0),
                Arguments.of(LocalDateTime.of(1970, 1, 1, 0, 0, 1, 500_000_000), 12_219_379_201.5),
                Arguments.of(LocalDateTime.of(1582, 10, 14, 0, 0), 0.0));
    }

    @ParameterizedTest(name = "{0} is {1} s")
    @MethodSource("dates")
    void datesAndDateTimesAreSecondsSinceTheStartOfTheGregorianCalendar(Object value, double seconds)
            throws IOException {
        StorageType storage = value instanceof LocalDate ? StorageType.DATE : StorageType.DATETIME;
        VariableMeta v = new VariableMeta("d", null, storage, null, null, null, Measure.SCALE, null, null, null, null,
                null);
        byte[] f = write(codebook(v), rows(value), SavWriter.Compression.NONE);
        assertEquals(seconds, le(f).getDouble(Dictionary.of(f).dataAt()));
    }

    @Test
    void aZsavHoldsTheBytecodeStreamInZlibBlocksDescribedByItsTrailer() throws Exception {
        // Text that bytecode cannot shorten: about 260 bytes a case, so 40,000 cases take three 4 MB blocks.
        DatasetCodebook cb = codebook(number("n"), text("t", 255));
        List<Object[]> cases = new ArrayList<>();
        for (int i = 0; i < 40_000; i++) {
            cases.add(new Object[]{(double) i, ("case " + i + " ").repeat(40).substring(0, 255)});
        }
        byte[] sav = write(cb, cases, SavWriter.Compression.BYTECODE);
        byte[] zsav = write(cb, cases, SavWriter.Compression.ZLIB);
        byte[] bytecode = Arrays.copyOfRange(sav, Dictionary.of(sav).dataAt(), sav.length);

        long zheader = Dictionary.of(zsav).dataAt();
        ByteBuffer b = le(zsav);
        assertEquals(zheader, b.getLong((int) zheader), "the header's own offset");
        long trailer = b.getLong((int) zheader + 8);
        long trailerLength = b.getLong((int) zheader + 16);
        assertEquals(zsav.length, trailer + trailerLength, "the trailer ends the file");
        assertEquals(-100, b.getLong((int) trailer), "the bias as a negative integer");
        assertEquals(0, b.getLong((int) trailer + 8));
        assertEquals(0x3ff000, b.getInt((int) trailer + 16), "block size");
        int blocks = b.getInt((int) trailer + 20);
        assertEquals(3, blocks);
        assertEquals(24 + 24 * blocks, trailerLength);
        ByteArrayOutputStream inflated = new ByteArrayOutputStream();
        long uncompressedAt = zheader;
        long compressedAt = zheader + 24;
        for (int i = 0; i < blocks; i++) {
            int at = (int) trailer + 24 + 24 * i;
            assertEquals(uncompressedAt, b.getLong(at), "block " + i + " uncompressed offset");
            assertEquals(compressedAt, b.getLong(at + 8), "block " + i + " compressed offset");
            int size = b.getInt(at + 16);
            int compressed = b.getInt(at + 20);
            assertTrue(i == blocks - 1 ? size <= 0x3ff000 : size == 0x3ff000, "block " + i + " size " + size);
            Inflater inflater = new Inflater();
            inflater.setInput(zsav, (int) compressedAt, compressed);
            byte[] out = new byte[size];
            assertEquals(size, inflater.inflate(out));
            assertTrue(inflater.finished());
            inflated.writeBytes(out);
            uncompressedAt += size;
            compressedAt += compressed;
        }
        assertEquals(trailer, compressedAt, "the last block ends where the trailer begins");
        assertArrayEquals(bytecode, inflated.toByteArray(), "the blocks inflate to the .sav file's bytecode data");
    }

    @Test
    void aZsavWithoutCasesHasNoBlocks() throws IOException {
        byte[] f = write(codebook(number("n")), List.of(), SavWriter.Compression.ZLIB);
        int zheader = Dictionary.of(f).dataAt();
        ByteBuffer b = le(f);
        assertEquals(zheader + 24, b.getLong(zheader + 8), "the trailer follows the header");
        assertEquals(0, b.getInt(zheader + 24 + 20), "blocks");
        assertEquals(f.length, zheader + 48);
    }

    @ParameterizedTest
    @EnumSource(SavWriter.Compression.class)
    void theSameCodebookCasesAndTimeGiveTheSameBytes(SavWriter.Compression compression) throws IOException {
        SavWriterSamples.Sample s = SavWriterSamples.household(37);
        byte[] first = Files.readAllBytes(s.write(dir.resolve(Files.createDirectory(dir.resolve("a"))), compression));
        byte[] second = Files.readAllBytes(s.write(Files.createDirectory(dir.resolve("b")), compression));
        assertArrayEquals(first, second);
        Path later = dir.resolve("later.sav");
        SavWriter.write(later, s.codebook(), s.rows(), compression, CREATED.plusDays(1));
        byte[] third = Files.readAllBytes(later);
        assertEquals("16 Jan 26", ascii(third, 92, 9));
        Arrays.fill(third, 92, 101, (byte) 0);
        Arrays.fill(first, 92, 101, (byte) 0);
        assertArrayEquals(first, third, "only the creation date differs");
    }

    @ParameterizedTest
    @EnumSource(SavWriter.Compression.class)
    void missingValuesOfAStringWiderThanEightBytesAreReadBackFromTheVariableRecord(
            SavWriter.Compression compression) throws IOException {
        VariableMeta comment = new VariableMeta("comment", null, StorageType.TEXT, 20, null, null, Measure.NOMINAL,
                null, Map.of("DK", "Don't know"), List.of(new MissingCodeSpec("DK", "Don't know"),
                new MissingCodeSpec("REFUSED", "refused"), new MissingCodeSpec("n/a", "not asked")), null, null);
        Path file = dir.resolve("comment-" + compression + ".sav");
        SavWriter.write(file, codebook(comment), rows("a comment of 20 byte", "REFUSED", "DK"), compression,
                CREATED);
        assertFalse(Dictionary.of(Files.readAllBytes(file)).extensions().containsKey(22),
                "no long string missing values record: the values sit in the variable record");
        try (SavReader reader = SavFiles.open(file)) {
            VariableMeta read = reader.codebook().variables().get(0);
            assertEquals(20, read.width());
            // A value without a value label gets the reader's own reason: the file has no place for a reason.
            assertEquals(List.of(new MissingCodeSpec("DK", "Don't know"),
                    new MissingCodeSpec("REFUSED", SavReader.DECLARED_MISSING),
                    new MissingCodeSpec("n/a", SavReader.DECLARED_MISSING)), read.missingCodes());
            List<Object> values = new ArrayList<>();
            Object[] row = new Object[1];
            while (reader.next(row)) {
                values.add(row[0]);
            }
            assertEquals(List.of("a comment of 20 byte", "REFUSED", "DK"), values);
        }
    }

    @Test
    void longNamesGetUniqueShortNamesAndANameThatFitsKeepsItsOwn() {
        List<String> shorts = SavWriter.shortNames(codebook(number("income_monthly_eur"), number("income_monthly_gbp"),
                number("income_m"), number("größe"), number("Age")));
        assertEquals(List.of("INCOME_1", "INCOME_2", "INCOME_M", "GRSSE", "AGE"), shorts);
    }

    @Test
    void eachSegmentOfAVeryLongStringHasItsOwnShortName() throws IOException {
        byte[] f = write(codebook(text("open_answer", 600)), rows("x"), SavWriter.Compression.NONE);
        // 600 bytes: (600 + 251) / 252 = 3 segments of widths 255, 255, 600 - 2 * 252 = 96
        ByteBuffer b = le(f);
        List<String> names = new ArrayList<>();
        List<Integer> widths = new ArrayList<>();
        for (int at = 176; b.getInt(at) == 2; at += 32) {
            if (b.getInt(at + 4) != -1) {
                widths.add(b.getInt(at + 4));
                names.add(ascii(f, at + 24, 8).strip());
            }
        }
        assertEquals(List.of(255, 255, 96), widths);
        assertEquals(3, names.stream().distinct().count(), names.toString());
        assertEquals("OPEN_ANS", names.get(0));
    }

    private static VariableMeta withMissing(List<MissingCodeSpec> codes, List<MissingRangeSpec> ranges) {
        return new VariableMeta("q7", null, StorageType.NUMBER, null, 0, null, Measure.NOMINAL, null, null, codes,
                ranges, null);
    }

    private static List<MissingCodeSpec> codes(String... values) {
        return Arrays.stream(values).map(v -> new MissingCodeSpec(v, "no answer")).toList();
    }

    static Stream<Arguments> refused() {
        MissingRangeSpec range = new MissingRangeSpec(-99.0, -91.0, "no answer");
        return Stream.of(
                Arguments.of("four missing values", codebook(withMissing(codes("-1", "-2", "-3", "-4"), null)),
                        "q7", "at most 3"),
                Arguments.of("a range and two values", codebook(withMissing(codes("-1", "-2"), List.of(range))),
                        "q7", "one range with at most one value"),
                Arguments.of("two ranges", codebook(withMissing(null, List.of(range, range))), "q7", "one range"),
                Arguments.of("a missing value that is not a number", codebook(withMissing(codes("DK"), null)), "q7",
                        "not a number"),
                Arguments.of("a value label of 121 bytes", codebook(new VariableMeta("q8", null, StorageType.NUMBER,
                        null, 0, null, Measure.NOMINAL, null, Map.of("1", "x".repeat(121)), null, null, null)),
                        "q8", "at most 120"),
                Arguments.of("a variable label of 256 bytes", codebook(new VariableMeta("q9", "ä".repeat(128),
                        StorageType.NUMBER, null, 0, null, Measure.NOMINAL, null, null, null, null, null)),
                        "q9", "at most 255"),
                Arguments.of("names equal apart from case", codebook(number("Age"), number("AGE")), "AGE",
                        "apart from case"),
                Arguments.of("a name starting with a digit", codebook(number("1st_visit")), "1st_visit",
                        "must begin with a letter"),
                Arguments.of("a name with a hyphen", codebook(number("visit-date")), "visit-date", "may hold only"),
                Arguments.of("a reserved word", codebook(number("with")), "with", "reserved word"),
                Arguments.of("a name of 65 bytes", codebook(number("v".repeat(65))), "v".repeat(65), "64 bytes"),
                Arguments.of("a text missing value of 9 bytes", codebook(new VariableMeta("s1", null,
                        StorageType.TEXT, 20, null, null, Measure.NOMINAL, null, null, codes("123456789"), null,
                        null)), "s1", "at most 8 bytes"),
                Arguments.of("a text missing range", codebook(new VariableMeta("s2", null, StorageType.TEXT, 20,
                        null, null, Measure.NOMINAL, null, null, null, List.of(range), null)), "s2", "missing range"),
                Arguments.of("text without a width", codebook(new VariableMeta("s3", null, StorageType.TEXT, null,
                        null, null, Measure.NOMINAL, null, null, null, null, null)), "s3", "width"),
                Arguments.of("a labelled text value wider than the variable", codebook(new VariableMeta("s4", null,
                        StorageType.TEXT, 2, null, null, Measure.NOMINAL, null, Map.of("abc", "x"), null, null,
                        null)), "s4", "longer than the variable's width"),
                Arguments.of("a file label of 65 bytes", new DatasetCodebook("t", "x".repeat(65),
                        List.of(number("n"))), "file label", "at most 64"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("refused")
    void whatTheFormatCannotHoldIsRefusedNamingTheVariableAndNoFileIsLeft(String what, DatasetCodebook cb,
                                                                         String named, String why) throws IOException {
        Path file = dir.resolve("refused.sav");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SavWriter.write(file, cb, List.of(), SavWriter.Compression.BYTECODE, CREATED));
        assertTrue(e.getMessage().contains(named) && e.getMessage().contains(why), e.getMessage());
        try (Stream<Path> left = Files.list(dir)) {
            assertEquals(List.of(), left.toList());
        }
    }

    static Stream<Arguments> badCases() {
        return Stream.of(
                Arguments.of("text longer than its width", codebook(number("n"), text("city", 4)),
                        new Object[]{1.0, "Zürich"}, "'city', case 2", "7 bytes"),
                Arguments.of("text in a number", codebook(number("n"), text("city", 4)), new Object[]{"x", "Bern"},
                        "'n', case 2", "String"),
                Arguments.of("a number in text", codebook(number("n"), text("city", 4)), new Object[]{1.0, 5.0},
                        "'city', case 2", "Double"),
                Arguments.of("too few values", codebook(number("n"), text("city", 4)), new Object[]{1.0},
                        "case 2", "1 values"));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("badCases")
    void aCaseTheVariableCannotHoldIsRefusedNamingVariableAndCaseAndTheOldFileStays(
            String what, DatasetCodebook cb, Object[] bad, String named, String why) throws IOException {
        Path file = dir.resolve("wave.sav");
        Files.writeString(file, "the previous delivery");
        List<Object[]> cases = List.of(new Object[]{1.0, "Bern"}, bad, new Object[]{3.0, "Chur"});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SavWriter.write(file, cb, cases, SavWriter.Compression.ZLIB, CREATED));
        assertTrue(e.getMessage().contains(named) && e.getMessage().contains(why), e.getMessage());
        assertEquals("the previous delivery", Files.readString(file));
        try (Stream<Path> left = Files.list(dir)) {
            assertEquals(List.of(file), left.toList(), "no partial file beside it");
        }
    }

    @Test
    void aValidFormatOfTheCodebookIsKeptAndAnInvalidOneIsReplacedByOneDerivedFromTheStorage() throws IOException {
        VariableMeta dollars = new VariableMeta("a", null, StorageType.NUMBER, null, 2, "DOLLAR10.2", Measure.SCALE,
                null, null, null, null, null);
        VariableMeta tooNarrow = new VariableMeta("b", null, StorageType.NUMBER, null, 3, "F3.3", Measure.SCALE, null,
                null, null, null, null);
        VariableMeta dateOnNumber = new VariableMeta("c", null, StorageType.NUMBER, null, null, "DATE11",
                Measure.SCALE, null, null, null, null, null);
        VariableMeta usDate = new VariableMeta("d", null, StorageType.DATE, null, null, "ADATE10", Measure.SCALE,
                null, null, null, null, null);
        VariableMeta stamp = new VariableMeta("e", null, StorageType.DATETIME, null, null, "nonsense", Measure.SCALE,
                null, null, null, null, null);
        byte[] f = write(codebook(dollars, tooNarrow, dateOnNumber, usDate, stamp), List.of(),
                SavWriter.Compression.NONE);
        ByteBuffer b = le(f);
        List<Integer> formats = new ArrayList<>();
        for (int at = 176; b.getInt(at) == 2; at += 32) {
            formats.add(b.getInt(at + 16));
            assertEquals(b.getInt(at + 16), b.getInt(at + 20), "print and write formats agree");
        }
        // type << 16 | width << 8 | decimals, types from the description's table: DOLLAR 4, F 5, ADATE 23, DATETIME 22
        assertEquals(List.of(4 << 16 | 10 << 8 | 2, 5 << 16 | 8 << 8 | 3, 5 << 16 | 8 << 8 | 2, 23 << 16 | 10 << 8,
                22 << 16 | 20 << 8), formats);
    }
}
