package org.wavewarden.load.spss;

import java.io.IOException;
import java.io.InputStream;
import java.util.zip.DataFormatException;
import java.util.zip.Inflater;

/**
 * The case data of a .zsav file: one or more zlib streams laid end to end between the zlib header and trailer,
 * inflated one after another into the bytecode-compressed cases. The bytes are taken from the file as they are
 * needed, so the file is never held in memory.
 */
final class ZlibBlocks extends InputStream {

    private final SavInput raw;
    private long compressedLeft;
    private final Inflater inflater = new Inflater();
    private final byte[] buffer = new byte[64 * 1024];
    private int bufferEnd;
    private boolean inStream;

    ZlibBlocks(SavInput raw, long compressedBytes) {
        this.raw = raw;
        this.compressedLeft = compressedBytes;
    }

    @Override
    public int read() throws IOException {
        byte[] one = new byte[1];
        int n = read(one, 0, 1);
        return n < 0 ? -1 : one[0] & 0xff;
    }

    @Override
    public int read(byte[] b, int off, int len) throws IOException {
        if (len == 0) {
            return 0;
        }
        while (true) {
            if (inflater.finished()) {
                int left = inflater.getRemaining();
                inflater.reset();
                inStream = false;
                if (left > 0) {
                    inflater.setInput(buffer, bufferEnd - left, left);
                    inStream = true;
                }
            }
            if (inflater.needsInput()) {
                if (compressedLeft == 0) {
                    if (inStream) {
                        throw raw.error("the zlib-compressed data end inside a block");
                    }
                    return -1;
                }
                int want = (int) Math.min(buffer.length, compressedLeft);
                byte[] chunk = raw.bytes(want);
                System.arraycopy(chunk, 0, buffer, 0, want);
                bufferEnd = want;
                compressedLeft -= want;
                inflater.setInput(buffer, 0, want);
                inStream = true;
            }
            try {
                int n = inflater.inflate(b, off, len);
                if (n > 0) {
                    return n;
                }
                if (inflater.needsDictionary()) {
                    throw raw.error("a zlib block asks for a preset dictionary");
                }
            } catch (DataFormatException e) {
                throw new SavFormatException(raw.file(), raw.record(), raw.offset(),
                        "a zlib block is damaged: " + e.getMessage(), e);
            }
        }
    }

    @Override
    public void close() {
        inflater.end();
    }
}
