package org.wavewarden.load.spss;

import org.wavewarden.codebook.DatasetCodebook;
import org.wavewarden.deliver.ToolVersion;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.time.LocalDateTime;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.Locale;
import java.util.UUID;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * Writes an SPSS system file from a codebook and its cases, following the "System File Format" appendix of the GNU
 * PSPP developers' manual: little-endian, IEEE 754, UTF-8 throughout (character code 65001 and the encoding record).
 */
public final class SavWriter {

    /** How the cases are stored: as they are, bytecode-compressed (.sav), or zlib-compressed (.zsav). */
    public enum Compression { NONE, BYTECODE, ZLIB }

    /** Where the header's case count sits: after the record type, product name and four other int32 fields. */
    private static final int HEADER_CASES_AT = 4 + 60 + 4 * 4;
    private static final String PRODUCT = "@(#) SPSS DATA FILE Wavewarden ";
    private static final DateTimeFormatter DATE = DateTimeFormatter.ofPattern("dd MMM yy", Locale.ENGLISH);
    private static final DateTimeFormatter TIME = DateTimeFormatter.ofPattern("HH:mm:ss", Locale.ENGLISH);

    private SavWriter() {
    }

    /**
     * Writes {@code cases} (values as {@link org.wavewarden.load.CaseSource#next} gives them, in the codebook's
     * variable order) with the codebook's variable labels, value labels, missing values and ranges, measurement
     * levels and formats, in UTF-8, stamped with the current local time.
     */
    public static void write(Path file, DatasetCodebook codebook, Iterable<Object[]> cases, Compression compression)
            throws IOException {
        write(file, codebook, cases, compression, LocalDateTime.now().withNano(0));
    }

    /**
     * As {@link #write(Path, DatasetCodebook, Iterable, Compression)}, stamped with {@code created}: the same
     * codebook, cases and time give the same bytes, so a delivered file can be regenerated and compared.
     *
     * <p>A text variable needs its width in bytes; a value that does not fit, a value of the wrong type, more than
     * three missing values (or a range and more than one), a string missing value longer than 8 bytes, a value label
     * longer than 120 bytes, a variable label longer than 255 bytes, a file label (the title) longer than 64 bytes, a
     * name SPSS does not accept, or two names equal apart from case are refused with an
     * {@link IllegalArgumentException} naming the variable; no file is left behind then.
     */
    public static void write(Path file, DatasetCodebook codebook, Iterable<Object[]> cases, Compression compression,
                             LocalDateTime created) throws IOException {
        SavWriterLayout layout = SavWriterLayout.of(codebook);
        Path dir = file.toAbsolutePath().getParent();
        // Written beside the target and moved over it, so a refused case never leaves half a file.
        Path part = dir.resolve("." + file.getFileName() + "." + UUID.randomUUID() + ".part");
        boolean done = false;
        try {
            try (FileChannel channel = FileChannel.open(part, StandardOpenOption.WRITE,
                    StandardOpenOption.CREATE_NEW)) {
                SavWriterOutput out = new SavWriterOutput(channel);
                long casesRecordAt = dictionary(out, layout, compression, created);
                SavCaseWriter data = new SavCaseWriter(layout, compression, out);
                for (Object[] c : cases) {
                    data.write(c);
                }
                data.finish();
                out.flush();
                long n = data.cases();
                out.patchInt32(HEADER_CASES_AT, n > Integer.MAX_VALUE ? -1 : (int) n);
                out.patchInt64(casesRecordAt, n);
                channel.force(true);
            }
            try {
                Files.move(part, file, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(part, file, StandardCopyOption.REPLACE_EXISTING);
            }
            done = true;
        } finally {
            if (!done) {
                Files.deleteIfExists(part);
            }
        }
    }

    /** The header and dictionary records up to the termination record; returns where subtype 16's case count sits. */
    private static long dictionary(SavWriterOutput out, SavWriterLayout layout, Compression compression,
                                   LocalDateTime created) throws IOException {
        header(out, layout, compression, created);
        for (SavWriterLayout.Variable v : layout.variables()) {
            variable(out, v);
        }
        for (SavWriterLayout.Variable v : layout.variables()) {
            if (!v.longString() && !v.valueLabels().isEmpty()) {
                out.int32(3).int32(v.valueLabels().size());
                for (SavWriterLayout.Label l : v.valueLabels()) {
                    out.bytes(l.value()).bytes(new byte[]{(byte) l.label().length}).bytes(l.label());
                    out.fixed(new byte[0], pad(1 + l.label().length, 8), (byte) ' ');
                }
                out.int32(4).int32(1).int32(v.dictionaryIndex());
            }
        }
        integerInfo(out);
        out.int32(7).int32(4).int32(8).int32(3);
        out.float64(SavWriterLayout.SYSMIS).float64(SavWriterLayout.HIGHEST).float64(SavWriterLayout.LOWEST);
        displayParameters(out, layout);
        StringBuilder names = new StringBuilder();
        for (SavWriterLayout.Variable v : layout.variables()) {
            names.append(names.isEmpty() ? "" : "\t").append(v.shortName()).append('=').append(v.meta().name());
        }
        textRecord(out, 13, SavWriterLayout.utf8(names.toString()));
        StringBuilder veryLong = new StringBuilder();
        for (SavWriterLayout.Variable v : layout.variables()) {
            if (v.segments() > 1) {
                veryLong.append(v.shortName()).append('=').append(String.format(Locale.ROOT, "%05d", v.width()))
                        .append("\0\t");
            }
        }
        if (!veryLong.isEmpty()) {
            textRecord(out, 14, SavWriterLayout.utf8(veryLong.toString()));
        }
        out.int32(7).int32(16).int32(8).int32(2).int64(1);
        long casesAt = out.position();
        out.int64(0);
        textRecord(out, 20, SavWriterLayout.utf8("UTF-8"));
        longStringValueLabels(out, layout);
        out.int32(999).int32(0);
        return casesAt;
    }

    private static void header(SavWriterOutput out, SavWriterLayout layout, Compression compression,
                               LocalDateTime created) throws IOException {
        out.bytes(SavWriterLayout.utf8(compression == Compression.ZLIB ? "$FL3" : "$FL2"));
        out.fixed(SavWriterLayout.utf8(PRODUCT + ToolVersion.current()), 60, (byte) ' ');
        out.int32(2).int32(layout.elements()).int32(compression.ordinal()).int32(0).int32(-1);
        out.float64(SavCaseWriter.BIAS);
        out.fixed(SavWriterLayout.utf8(DATE.format(created)), 9, (byte) ' ');
        out.fixed(SavWriterLayout.utf8(TIME.format(created)), 8, (byte) ' ');
        out.fixed(layout.fileLabel(), 64, (byte) ' ');
        out.fixed(new byte[0], 3, (byte) 0);
    }

    private static void variable(SavWriterOutput out, SavWriterLayout.Variable v) throws IOException {
        byte[] labelBytes = v.label();
        int width0 = v.segmentWidth(0);
        out.int32(2).int32(width0).int32(labelBytes == null ? 0 : 1).int32(v.missingCode());
        out.int32(v.format()).int32(v.format());
        out.fixed(SavWriterLayout.utf8(v.shortName()), 8, (byte) ' ');
        if (labelBytes != null) {
            out.int32(labelBytes.length).bytes(labelBytes).fixed(new byte[0], pad(labelBytes.length, 4), (byte) 0);
        }
        if (v.missingCode() != 0) {
            for (byte[] m : v.missing()) {
                out.bytes(m);
            }
        }
        continuations(out, width0);
        for (int s = 1; s < v.segments(); s++) {
            int w = v.segmentWidth(s);
            int format = SavWriterLayout.code(SavWriterLayout.FORMAT_A, w, 0);
            out.int32(2).int32(w).int32(0).int32(0).int32(format).int32(format);
            out.fixed(SavWriterLayout.utf8(v.segmentNames().get(s - 1)), 8, (byte) ' ');
            continuations(out, w);
        }
    }

    /** A string wider than 8 bytes takes one more variable record, of type -1, for every further 8 bytes. */
    private static void continuations(SavWriterOutput out, int width) throws IOException {
        for (int i = 8; i < width; i += 8) {
            out.int32(2).int32(-1).int32(0).int32(0).int32(0).int32(0).fixed(new byte[0], 8, (byte) ' ');
        }
    }

    private static final Pattern VERSION = Pattern.compile("(\\d+)\\.(\\d+)\\.(\\d+)");

    private static void integerInfo(SavWriterOutput out) throws IOException {
        Matcher m = VERSION.matcher(ToolVersion.current());
        boolean known = m.lookingAt();
        out.int32(7).int32(3).int32(4).int32(8);
        out.int32(known ? Integer.parseInt(m.group(1)) : 0).int32(known ? Integer.parseInt(m.group(2)) : 0)
                .int32(known ? Integer.parseInt(m.group(3)) : 0);
        // machine code -1, IEEE 754, compression code always 1, little-endian, UTF-8
        out.int32(-1).int32(1).int32(1).int32(2).int32(65001);
    }

    /** One entry per segment: a very long string's later segments show the width that is left. */
    private static void displayParameters(SavWriterOutput out, SavWriterLayout layout) throws IOException {
        int segments = layout.variables().stream().mapToInt(SavWriterLayout.Variable::segments).sum();
        out.int32(7).int32(11).int32(4).int32(3 * segments);
        for (SavWriterLayout.Variable v : layout.variables()) {
            for (int s = 0; s < v.segments(); s++) {
                out.int32(v.measureCode());
                out.int32(s == 0 ? v.displayWidth() : v.width() - s * SavWriterLayout.SEGMENT_SPAN);
                out.int32(v.alignment());
            }
        }
    }

    private static void longStringValueLabels(SavWriterOutput out, SavWriterLayout layout) throws IOException {
        ByteArrayOutputStream body = new ByteArrayOutputStream();
        for (SavWriterLayout.Variable v : layout.variables()) {
            if (v.longString() && !v.valueLabels().isEmpty()) {
                byte[] name = SavWriterLayout.utf8(v.meta().name());
                int32(body, name.length);
                body.writeBytes(name);
                int32(body, v.width());
                int32(body, v.valueLabels().size());
                for (SavWriterLayout.Label l : v.valueLabels()) {
                    int32(body, l.value().length);
                    body.writeBytes(l.value());
                    int32(body, l.label().length);
                    body.writeBytes(l.label());
                }
            }
        }
        if (body.size() > 0) {
            textRecord(out, 21, body.toByteArray());
        }
    }

    /** An extension record of single bytes. */
    private static void textRecord(SavWriterOutput out, int subtype, byte[] data) throws IOException {
        out.int32(7).int32(subtype).int32(1).int32(data.length).bytes(data);
    }

    private static void int32(ByteArrayOutputStream b, int v) {
        b.write(v);
        b.write(v >>> 8);
        b.write(v >>> 16);
        b.write(v >>> 24);
    }

    /** Bytes that bring {@code length} up to a multiple of {@code unit}. */
    private static int pad(int length, int unit) {
        return (unit - length % unit) % unit;
    }

    static List<String> shortNames(DatasetCodebook codebook) {
        return SavWriterLayout.of(codebook).variables().stream().map(SavWriterLayout.Variable::shortName).toList();
    }
}
