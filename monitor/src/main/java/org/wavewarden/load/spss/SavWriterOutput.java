package org.wavewarden.load.spss;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;

/**
 * Little-endian output to a system file that knows its position, so that what is only known at the end (the case
 * count, the zlib trailer's place) can be written back into fields laid down earlier.
 */
final class SavWriterOutput {

    private final FileChannel channel;
    private final ByteBuffer buffer = ByteBuffer.allocate(1 << 16).order(ByteOrder.LITTLE_ENDIAN);
    private long flushed;

    SavWriterOutput(FileChannel channel) {
        this.channel = channel;
    }

    long position() {
        return flushed + buffer.position();
    }

    SavWriterOutput int32(int v) throws IOException {
        room(4);
        buffer.putInt(v);
        return this;
    }

    SavWriterOutput int64(long v) throws IOException {
        room(8);
        buffer.putLong(v);
        return this;
    }

    SavWriterOutput float64(double v) throws IOException {
        room(8);
        buffer.putDouble(v);
        return this;
    }

    SavWriterOutput bytes(byte[] b) throws IOException {
        return bytes(b, 0, b.length);
    }

    SavWriterOutput bytes(byte[] b, int offset, int length) throws IOException {
        while (length > 0) {
            room(1);
            int n = Math.min(length, buffer.remaining());
            buffer.put(b, offset, n);
            offset += n;
            length -= n;
        }
        return this;
    }

    /** {@code b} cut or padded with {@code pad} to exactly {@code length} bytes. */
    SavWriterOutput fixed(byte[] b, int length, byte pad) throws IOException {
        int n = Math.min(b.length, length);
        bytes(b, 0, n);
        for (int i = n; i < length; i++) {
            room(1);
            buffer.put(pad);
        }
        return this;
    }

    /** Overwrites the 8 bytes at {@code at}, which must already have been written. */
    void patchInt64(long at, long v) throws IOException {
        flush();
        ByteBuffer b = ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN).putLong(v).flip();
        write(b, at);
    }

    /** Overwrites the 4 bytes at {@code at}, which must already have been written. */
    void patchInt32(long at, int v) throws IOException {
        flush();
        ByteBuffer b = ByteBuffer.allocate(4).order(ByteOrder.LITTLE_ENDIAN).putInt(v).flip();
        write(b, at);
    }

    void flush() throws IOException {
        buffer.flip();
        while (buffer.hasRemaining()) {
            flushed += channel.write(buffer, flushed);
        }
        buffer.clear();
    }

    private void write(ByteBuffer b, long at) throws IOException {
        while (b.hasRemaining()) {
            at += channel.write(b, at);
        }
    }

    private void room(int n) throws IOException {
        if (buffer.remaining() < n) {
            flush();
        }
    }
}
