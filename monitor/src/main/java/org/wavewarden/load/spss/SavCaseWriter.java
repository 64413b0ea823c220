package org.wavewarden.load.spss;

import org.wavewarden.codebook.StorageType;
import org.wavewarden.codebook.VariableMeta;

import java.io.IOException;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.util.Arrays;
import java.util.zip.Deflater;

/**
 * The data record of a system file: each case cut into 8-byte elements (numbers, and strings in their segments),
 * stored as they are, bytecode-compressed, or bytecode-compressed and then zlib-compressed in blocks.
 */
final class SavCaseWriter {

    /** Bytecode compression stores integers from 1 - BIAS to 251 - BIAS as one byte. */
    static final int BIAS = 100;
    /** The block size every known writer of .zsav files uses, and the only one readers have seen. */
    static final int ZLIB_BLOCK = 0x3ff000;

    private static final int CODE_RAW = 253;
    private static final int CODE_SPACES = 254;
    private static final int CODE_SYSMIS = 255;
    private static final long SYSMIS_BITS = Double.doubleToRawLongBits(SavWriterLayout.SYSMIS);

    private final SavWriterLayout layout;
    private final SavWriter.Compression compression;
    private final SavWriterOutput out;
    private final byte[] element = new byte[8];
    private final byte[] commands = new byte[8];
    private final byte[] raw = new byte[64];
    private int nCommands;
    private int nRaw;
    private final Zlib zlib;
    private long cases;

    SavCaseWriter(SavWriterLayout layout, SavWriter.Compression compression, SavWriterOutput out) throws IOException {
        this.layout = layout;
        this.compression = compression;
        this.out = out;
        this.zlib = compression == SavWriter.Compression.ZLIB ? new Zlib(out) : null;
    }

    long cases() {
        return cases;
    }

    void write(Object[] values) throws IOException {
        long number = cases + 1;
        if (values == null || values.length != layout.variables().size()) {
            throw new IllegalArgumentException("case " + number + " has " + (values == null ? 0 : values.length)
                    + " values; the codebook has " + layout.variables().size() + " variables");
        }
        for (int i = 0; i < values.length; i++) {
            SavWriterLayout.Variable v = layout.variables().get(i);
            if (v.numeric()) {
                number(number(v.meta(), values[i], number));
            } else {
                string(v, values[i], number);
            }
        }
        cases++;
    }

    /** Ends the data: the last partial block of bytecodes padded with the ignored code 0, the zlib trailer. */
    void finish() throws IOException {
        if (nCommands > 0) {
            Arrays.fill(commands, nCommands, 8, (byte) 0);
            nCommands = 8;
            flushCommands();
        }
        if (zlib != null) {
            zlib.finish();
        }
    }

    private static double number(VariableMeta m, Object value, long caseNumber) {
        if (value == null) {
            return SavWriterLayout.SYSMIS;
        }
        if (value instanceof Number n) {
            double d = n.doubleValue();
            return Double.isNaN(d) ? SavWriterLayout.SYSMIS : d;
        }
        if (value instanceof LocalDate d && m.storage() != StorageType.NUMBER) {
            return SavWriterLayout.seconds(d.atStartOfDay());
        }
        if (value instanceof LocalDateTime t && m.storage() != StorageType.NUMBER) {
            return SavWriterLayout.seconds(t);
        }
        throw new IllegalArgumentException("variable '" + m.name() + "', case " + caseNumber + ": a "
                + value.getClass().getSimpleName() + " cannot be stored in a " + m.storage().name().toLowerCase()
                + " variable");
    }

    private void string(SavWriterLayout.Variable v, Object value, long caseNumber) throws IOException {
        if (value != null && !(value instanceof String)) {
            throw new IllegalArgumentException("variable '" + v.meta().name() + "', case " + caseNumber + ": a "
                    + value.getClass().getSimpleName() + " cannot be stored in a text variable");
        }
        byte[] text = SavWriterLayout.padded(value == null ? "" : (String) value, v.width());
        if (text == null) {
            throw new IllegalArgumentException("variable '" + v.meta().name() + "', case " + caseNumber
                    + ": the value is " + SavWriterLayout.utf8((String) value).length
                    + " bytes in UTF-8, longer than the variable's width of " + v.width());
        }
        // Segment s of a very long string holds bytes from s * 255 on, though its width only counts 252 of them.
        for (int s = 0; s < v.segments(); s++) {
            int from = v.segments() == 1 ? 0 : s * SavWriterLayout.SEGMENT_BYTES;
            int used = v.segments() == 1 ? text.length
                    : Math.max(0, Math.min(SavWriterLayout.SEGMENT_BYTES, text.length - from));
            for (int e = 0; e < v.segmentElements(s); e++) {
                Arrays.fill(element, (byte) ' ');
                int start = e * 8;
                if (start < used) {
                    System.arraycopy(text, from + start, element, 0, Math.min(8, used - start));
                }
                stringElement(element);
            }
        }
    }

    private void number(double d) throws IOException {
        if (compression == SavWriter.Compression.NONE) {
            out.float64(d);
            return;
        }
        long bits = Double.doubleToRawLongBits(d);
        if (bits == SYSMIS_BITS) {
            command(CODE_SYSMIS);
        } else if (d == Math.rint(d) && d >= 1 - BIAS && d <= 251 - BIAS && bits != Long.MIN_VALUE) {
            command((int) d + BIAS);
        } else {
            for (int i = 0; i < 8; i++) {
                raw[nRaw++] = (byte) (bits >>> (8 * i));
            }
            command(CODE_RAW);
        }
    }

    private void stringElement(byte[] b) throws IOException {
        if (compression == SavWriter.Compression.NONE) {
            out.bytes(b);
            return;
        }
        boolean spaces = true;
        for (byte x : b) {
            spaces &= x == ' ';
        }
        if (spaces) {
            command(CODE_SPACES);
        } else {
            System.arraycopy(b, 0, raw, nRaw, 8);
            nRaw += 8;
            command(CODE_RAW);
        }
    }

    private void command(int code) throws IOException {
        commands[nCommands++] = (byte) code;
        if (nCommands == 8) {
            flushCommands();
        }
    }

    private void flushCommands() throws IOException {
        if (zlib != null) {
            zlib.write(commands, 0, 8);
            zlib.write(raw, 0, nRaw);
        } else {
            out.bytes(commands);
            out.bytes(raw, 0, nRaw);
        }
        nCommands = 0;
        nRaw = 0;
    }

    /**
     * The zlib layer of a .zsav file: the bytecode stream cut into blocks of {@link #ZLIB_BLOCK} bytes, each
     * compressed on its own, after a header that points at the trailer describing every block.
     */
    private static final class Zlib {
        private final SavWriterOutput out;
        private final long headerAt;
        private final byte[] block = new byte[ZLIB_BLOCK];
        private final byte[] compressed = new byte[1 << 16];
        private final Deflater deflater = new Deflater(Deflater.DEFAULT_COMPRESSION);
        private int filled;
        private final java.util.List<long[]> descriptors = new java.util.ArrayList<>();
        private long uncompressedAt;

        Zlib(SavWriterOutput out) throws IOException {
            this.out = out;
            this.headerAt = out.position();
            this.uncompressedAt = headerAt;
            out.int64(headerAt).int64(0).int64(0);
        }

        void write(byte[] b, int offset, int length) throws IOException {
            while (length > 0) {
                int n = Math.min(length, ZLIB_BLOCK - filled);
                System.arraycopy(b, offset, block, filled, n);
                filled += n;
                offset += n;
                length -= n;
                if (filled == ZLIB_BLOCK) {
                    compressBlock();
                }
            }
        }

        private void compressBlock() throws IOException {
            deflater.reset();
            deflater.setInput(block, 0, filled);
            deflater.finish();
            long compressedAt = out.position();
            int size = 0;
            while (!deflater.finished()) {
                int n = deflater.deflate(compressed);
                out.bytes(compressed, 0, n);
                size += n;
            }
            descriptors.add(new long[]{uncompressedAt, compressedAt, filled, size});
            uncompressedAt += filled;
            filled = 0;
        }

        void finish() throws IOException {
            // No cases, no block: a block that inflates to nothing is refused by R's haven 2.5.1.
            if (filled > 0) {
                compressBlock();
            }
            deflater.end();
            long trailerAt = out.position();
            out.int64(-BIAS).int64(0).int32(ZLIB_BLOCK).int32(descriptors.size());
            for (long[] d : descriptors) {
                out.int64(d[0]).int64(d[1]).int32((int) d[2]).int32((int) d[3]);
            }
            long trailerLength = out.position() - trailerAt;
            out.patchInt64(headerAt + 8, trailerAt);
            out.patchInt64(headerAt + 16, trailerLength);
        }
    }
}
