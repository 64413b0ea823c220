package org.wavewarden.load.spss;

import java.io.IOException;
import java.io.InputStream;

/**
 * The raw bytes of a system file in the file's byte order, with the offset of the next byte and the record being
 * read, so every failure can say where it happened. Counts read from the file are checked against the bytes left
 * before anything is allocated: a damaged count cannot make the reader allocate gigabytes or loop.
 */
final class SavInput {

    private final InputStream in;
    private final String file;
    private final long size;
    private long offset;
    private boolean littleEndian = true;
    private String record = "file header";

    SavInput(InputStream in, String file, long size) {
        this.in = in;
        this.file = file;
        this.size = size;
    }

    void littleEndian(boolean little) {
        this.littleEndian = little;
    }

    boolean littleEndian() {
        return littleEndian;
    }

    void record(String name) {
        this.record = name;
    }

    String record() {
        return record;
    }

    long offset() {
        return offset;
    }

    long remaining() {
        return size - offset;
    }

    String file() {
        return file;
    }

    InputStream stream() {
        return in;
    }

    SavFormatException error(String problem) {
        return new SavFormatException(file, record, offset, problem);
    }

    /** Fails unless {@code count} items of {@code itemBytes} each can still follow in the file. */
    void require(long count, long itemBytes, String what) throws SavFormatException {
        if (count < 0 || (itemBytes > 0 && count > remaining() / itemBytes)) {
            throw error(what + " of " + count + " does not fit in the " + Math.max(remaining(), 0)
                    + " bytes left in the file");
        }
    }

    byte[] bytes(int n) throws IOException {
        require(n, 1, "a length");
        byte[] b = new byte[n];
        int done = 0;
        while (done < n) {
            int r = in.read(b, done, n - done);
            if (r < 0) {
                throw error("the file ends " + (n - done) + " bytes early");
            }
            done += r;
        }
        offset += n;
        return b;
    }

    /** Reads into {@code b}; false at a clean end of file before its first byte. */
    boolean fill(byte[] b) throws IOException {
        int done = 0;
        while (done < b.length) {
            int r = in.read(b, done, b.length - done);
            if (r < 0) {
                if (done == 0) {
                    return false;
                }
                offset += done;
                throw error("the file ends " + (b.length - done) + " bytes into an 8-byte value");
            }
            done += r;
        }
        offset += b.length;
        return true;
    }

    void skip(long n) throws IOException {
        require(n, 1, "a length");
        long left = n;
        while (left > 0) {
            long s = in.skip(left);
            if (s <= 0) {
                if (in.read() < 0) {
                    throw error("the file ends " + left + " bytes early");
                }
                s = 1;
            }
            left -= s;
            offset += s;
        }
    }

    int int32() throws IOException {
        return int32(bytes(4), 0);
    }

    long int64() throws IOException {
        return int64(bytes(8), 0);
    }

    double float64() throws IOException {
        return Double.longBitsToDouble(int64());
    }

    int int32(byte[] b, int at) {
        if (littleEndian) {
            return (b[at] & 0xff) | (b[at + 1] & 0xff) << 8 | (b[at + 2] & 0xff) << 16 | (b[at + 3] & 0xff) << 24;
        }
        return (b[at] & 0xff) << 24 | (b[at + 1] & 0xff) << 16 | (b[at + 2] & 0xff) << 8 | (b[at + 3] & 0xff);
    }

    long int64(byte[] b, int at) {
        long lo = int32(b, at) & 0xffffffffL;
        long hi = int32(b, at + 4) & 0xffffffffL;
        return littleEndian ? (hi << 32 | lo) : (lo << 32 | hi);
    }

    double float64(byte[] b, int at) {
        return Double.longBitsToDouble(int64(b, at));
    }
}
