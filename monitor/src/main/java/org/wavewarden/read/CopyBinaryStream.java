package org.wavewarden.read;

import java.nio.charset.StandardCharsets;
import java.sql.SQLException;
import java.util.Arrays;

/**
 * The framing of PostgreSQL's {@code COPY ... (FORMAT binary)} stream over the driver's messages: the signature and
 * header, then per tuple a 16-bit field count (-1 ends the data) and per field a 32-bit length (-1 is NULL) and its
 * bytes, all big-endian (PostgreSQL documentation, "COPY", section "Binary Format"). A message is usually one row,
 * so a field is read in place in {@link #buf} from {@link #pos}; one that spans messages is gathered into one array
 * first.
 */
final class CopyBinaryStream {

    /** Where the stream's messages come from: the driver's {@code CopyOut::readFromCopy}, null at the end. */
    @FunctionalInterface
    interface Messages {
        byte[] next() throws SQLException;
    }

    private static final byte[] SIGNATURE = {'P', 'G', 'C', 'O', 'P', 'Y', '\n', (byte) 0xFF, '\r', '\n', 0};
    private final Messages messages;
    byte[] buf = new byte[0];
    int pos;

    CopyBinaryStream(Messages messages) {
        this.messages = messages;
    }

    void header() throws SQLException {
        need(SIGNATURE.length + 8);
        if (!Arrays.equals(buf, pos, pos + SIGNATURE.length, SIGNATURE, 0, SIGNATURE.length)) {
            throw new IllegalStateException("the server did not send a COPY binary header");
        }
        pos += SIGNATURE.length + 4; // flags: no OIDs in COPY of a query
        int extension = int32();
        skip(extension);
    }

    /** A tuple's field count, or -1 at the trailer. */
    int int16() throws SQLException {
        need(2);
        int v = (short) int16(buf, pos);
        pos += 2;
        return v;
    }

    /** A field's length, or -1 for NULL. */
    int int32() throws SQLException {
        need(4);
        int v = int32(buf, pos);
        pos += 4;
        return v;
    }

    /** A text field (length-prefixed), or null for NULL. */
    String text() throws SQLException {
        int len = int32();
        if (len < 0) {
            return null;
        }
        need(len);
        String t = new String(buf, pos, len, StandardCharsets.UTF_8);
        pos += len;
        return t;
    }

    void skip(int n) throws SQLException {
        need(n);
        pos += n;
    }

    /** Makes n bytes available from {@code pos}, fetching messages as needed. */
    void need(int n) throws SQLException {
        while (buf.length - pos < n) {
            byte[] next = messages.next();
            if (next == null) {
                throw new IllegalStateException("the COPY stream ended inside a row");
            }
            int rest = buf.length - pos;
            if (rest == 0) {
                buf = next;
            } else {
                byte[] joined = new byte[rest + next.length];
                System.arraycopy(buf, pos, joined, 0, rest);
                System.arraycopy(next, 0, joined, rest, next.length);
                buf = joined;
            }
            pos = 0;
        }
    }

    /** An unsigned big-endian 16-bit integer at {@code b[p]}. */
    static int int16(byte[] b, int p) {
        return ((b[p] & 0xFF) << 8) | (b[p + 1] & 0xFF);
    }

    static int int32(byte[] b, int p) {
        return ((b[p] & 0xFF) << 24) | ((b[p + 1] & 0xFF) << 16) | ((b[p + 2] & 0xFF) << 8) | (b[p + 3] & 0xFF);
    }

    static long int64(byte[] b, int p) {
        return ((long) int32(b, p) << 32) | (int32(b, p + 4) & 0xFFFFFFFFL);
    }
}
