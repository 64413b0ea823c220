package org.wavewarden.load;

import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.Charset;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.CodingErrorAction;

/**
 * Decodes a byte stream strictly: bytes that are not valid in the charset stop the reading with their offset in the
 * file, instead of being replaced, so an import never loads a silently damaged value. The characters decoded before
 * the bad bytes are handed out first, so the reader of the text knows the line and field it is in when it hears of
 * them.
 */
final class DecodingReader extends Reader {

    /** Bytes at {@code offset} (counted from the start of the file, after decompression) are not valid. */
    static final class MalformedBytesException extends IOException {
        private static final long serialVersionUID = 1L;

        final long offset;
        final String bytes;

        MalformedBytesException(long offset, String bytes) {
            super("bytes " + bytes + " at offset " + offset);
            this.offset = offset;
            this.bytes = bytes;
        }
    }

    private final InputStream in;
    private final CharsetDecoder decoder;
    private final ByteBuffer bytes = ByteBuffer.allocate(1 << 16);
    private long filled;
    private boolean eof;
    private boolean flushed;
    private MalformedBytesException pending;

    DecodingReader(InputStream in, Charset charset) {
        this.in = in;
        this.decoder = charset.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        bytes.flip();
    }

    @Override
    public int read(char[] cbuf, int off, int len) throws IOException {
        if (len == 0) {
            return 0;
        }
        CharBuffer out = CharBuffer.wrap(cbuf, off, len);
        while (out.position() == off) {
            if (pending != null) {
                throw pending;
            }
            if (flushed) {
                return -1;
            }
            if (!eof && bytes.remaining() < 16) {
                bytes.compact();
                int n = in.read(bytes.array(), bytes.position(), bytes.remaining());
                if (n < 0) {
                    eof = true;
                } else {
                    bytes.position(bytes.position() + n);
                    filled += n;
                }
                bytes.flip();
            }
            CoderResult r = decoder.decode(bytes, out, eof);
            if (r.isError()) {
                StringBuilder shown = new StringBuilder();
                for (int i = 0; i < r.length(); i++) {
                    shown.append(i == 0 ? "" : " ").append(String.format("0x%02X", bytes.get(bytes.position() + i)));
                }
                pending = new MalformedBytesException(filled - bytes.remaining(), shown.toString());
            } else if (eof && r.isUnderflow() && !bytes.hasRemaining()) {
                decoder.flush(out);
                flushed = true;
            }
        }
        return out.position() - off;
    }

    @Override
    public void close() throws IOException {
        in.close();
    }
}
