package org.wavewarden.read;

import org.junit.jupiter.api.Test;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.ArrayDeque;
import java.util.Arrays;
import java.util.Deque;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The framing of the binary COPY stream, on streams laid out as the PostgreSQL documentation's "Binary Format"
 * section describes them, cut into messages at every possible place.
 */
class CopyBinaryStreamTest {

    /** Header, one tuple (text 'héllo', NULL, int4 -7), the trailer. */
    private static byte[] stream(int headerExtension) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.writeBytes(new byte[] {'P', 'G', 'C', 'O', 'P', 'Y', '\n', (byte) 0xFF, '\r', '\n', 0});
        out.writeBytes(ByteBuffer.allocate(8).putInt(0).putInt(headerExtension).array());
        out.writeBytes(new byte[headerExtension]);
        byte[] text = "héllo".getBytes(StandardCharsets.UTF_8);
        out.writeBytes(ByteBuffer.allocate(2).putShort((short) 3).array());
        out.writeBytes(ByteBuffer.allocate(4).putInt(text.length).array());
        out.writeBytes(text);
        out.writeBytes(ByteBuffer.allocate(4).putInt(-1).array());
        out.writeBytes(ByteBuffer.allocate(8).putInt(4).putInt(-7).array());
        out.writeBytes(ByteBuffer.allocate(2).putShort((short) -1).array());
        return out.toByteArray();
    }

    private static CopyBinaryStream over(byte[] all, int... cuts) {
        Deque<byte[]> messages = new ArrayDeque<>();
        int from = 0;
        for (int cut : cuts) {
            messages.add(Arrays.copyOfRange(all, from, cut));
            from = cut;
        }
        messages.add(Arrays.copyOfRange(all, from, all.length));
        return new CopyBinaryStream(messages::poll);
    }

    private static void readTuple(CopyBinaryStream in) throws Exception {
        in.header();
        assertEquals(3, in.int16());
        assertEquals("héllo", in.text());
        assertNull(in.text());
        int len = in.int32();
        assertEquals(4, len);
        in.need(len);
        assertEquals(-7, CopyBinaryStream.int32(in.buf, in.pos));
        in.skip(len);
        assertEquals(-1, in.int16());
    }

    @Test
    void aTupleReadsTheSameWhereverTheMessagesAreCut() throws Exception {
        byte[] all = stream(0);
        readTuple(over(all));
        for (int cut = 1; cut < all.length; cut++) {
            readTuple(over(all, cut));
        }
        for (int cut = 1; cut + 1 < all.length; cut++) {
            readTuple(over(all, cut, cut + 1));
        }
    }

    @Test
    void aHeaderExtensionIsSkipped() throws Exception {
        readTuple(over(stream(5), 12));
    }

    @Test
    void aStreamWithoutTheSignatureIsRefused() {
        byte[] all = stream(0);
        all[0] = 'X';
        var e = assertThrows(IllegalStateException.class, () -> over(all).header());
        assertTrue(e.getMessage().contains("header"), e.getMessage());
    }

    @Test
    void aStreamEndingInsideARowIsRefused() throws Exception {
        byte[] all = stream(0);
        CopyBinaryStream in = over(Arrays.copyOf(all, all.length - 6));
        in.header();
        in.int16();
        in.text();
        in.text();
        var e = assertThrows(IllegalStateException.class, () -> in.skip(in.int32()));
        assertTrue(e.getMessage().contains("ended inside a row"), e.getMessage());
    }

    @Test
    void bigEndianIntegersReadAsTheirSignedValues() {
        byte[] b = {(byte) 0xFF, (byte) 0xFE, 0, 0, 0, 0, 0, 1};
        assertEquals(0xFFFE, CopyBinaryStream.int16(b, 0));
        assertEquals(-131072, CopyBinaryStream.int32(b, 0));
        assertEquals(0xFFFE000000000001L, CopyBinaryStream.int64(b, 0));
    }
}
