package org.wavewarden.load;

import org.postgresql.copy.CopyIn;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.sql.SQLException;
import java.time.LocalDate;
import java.time.LocalDateTime;
import java.time.temporal.ChronoUnit;

/**
 * Writes rows in PostgreSQL's {@code COPY ... FROM STDIN (FORMAT binary)} framing (PostgreSQL documentation, "COPY",
 * section "Binary Format": the signature and header, per tuple a 16-bit field count, per field a 32-bit length, -1
 * for NULL, and the type's binary send form; -1 as field count ends the data), handed to the driver in blocks so a
 * wave is streamed, never held whole. Binary values need no escaping, so no text of the file can change the framing.
 */
final class CopyBinaryOut {

    private static final byte[] SIGNATURE = {'P', 'G', 'C', 'O', 'P', 'Y', '\n', (byte) 0xFF, '\r', '\n', 0};
    /** Dates and timestamps are counted from 2000-01-01 in PostgreSQL's binary forms. */
    private static final LocalDate PG_EPOCH = LocalDate.of(2000, 1, 1);
    private static final LocalDateTime PG_EPOCH_TIME = PG_EPOCH.atStartOfDay();
    private static final int BLOCK = 1 << 16;

    private final CopyIn copy;
    private ByteBuffer buf = ByteBuffer.allocate(BLOCK);

    CopyBinaryOut(CopyIn copy) throws SQLException {
        this.copy = copy;
        buf.put(SIGNATURE).putInt(0).putInt(0);
    }

    void startRow(int fields) throws SQLException {
        room(2);
        buf.putShort((short) fields);
    }

    void nullField() throws SQLException {
        room(4);
        buf.putInt(-1);
    }

    void float8(double v) throws SQLException {
        room(12);
        buf.putInt(8).putDouble(v);
    }

    void text(String s) throws SQLException {
        byte[] b = s.getBytes(StandardCharsets.UTF_8);
        room(4 + b.length);
        buf.putInt(b.length).put(b);
    }

    void date(LocalDate d) throws SQLException {
        room(8);
        buf.putInt(4).putInt(Math.toIntExact(ChronoUnit.DAYS.between(PG_EPOCH, d)));
    }

    void timestamp(LocalDateTime t) throws SQLException {
        room(12);
        buf.putInt(8).putLong(ChronoUnit.MICROS.between(PG_EPOCH_TIME, t));
    }

    /** Ends the data and returns the rows the server took. */
    long finish() throws SQLException {
        room(2);
        buf.putShort((short) -1);
        flush();
        return copy.endCopy();
    }

    private void room(int n) throws SQLException {
        if (buf.remaining() < n) {
            flush();
            if (buf.capacity() < n) {
                buf = ByteBuffer.allocate(n);
            }
        }
    }

    private void flush() throws SQLException {
        if (buf.position() > 0) {
            copy.writeToCopy(buf.array(), 0, buf.position());
            buf.clear();
        }
    }
}
