package org.wavewarden.read;

import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Each type's binary send form decodes to the value its text form reads back as. */
class DecodeTest {

    @ParameterizedTest(name = "{0} travels as {1}")
    @CsvSource({
            "smallint, INT2", "int4, INT4", "BIGINT, INT8", "real, FLOAT4", "double precision, FLOAT8",
            "bool, BOOL", "date, DATE", "decimal, NUMERIC", "character varying, TEXT", "bpchar, TEXT",
            "timestamp with time zone, OUTPUT_TEXT", "inet, OUTPUT_TEXT", "integer[], OUTPUT_TEXT"
    })
    void eachPostgresTypeHasItsDecoding(String type, Decode decode) {
        assertEquals(decode, Decode.of(type));
    }

    @Test
    void onlyTextAndNumericAreKeyedByTheirBytes() {
        for (Decode d : Decode.values()) {
            assertEquals(d == Decode.TEXT || d == Decode.OUTPUT_TEXT || d == Decode.NUMERIC, d.bytesKeyed(), d.name());
        }
        assertTrue(Decode.NUMERIC.isNumber());
        assertFalse(Decode.DATE.isNumber());
    }

    @Test
    void integersAndFloatsDecodeFromTheirBitsAndFromTheirKeysAlike() {
        Random r = new Random(3);
        for (int i = 0; i < 2000; i++) {
            short s = (short) r.nextInt();
            int n = r.nextInt();
            long l = r.nextLong();
            float f = Float.intBitsToFloat(r.nextInt());
            double d = Double.longBitsToDouble(r.nextLong());
            check(Decode.INT2, ByteBuffer.allocate(2).putShort(s).array(), s);
            check(Decode.INT4, ByteBuffer.allocate(4).putInt(n).array(), n);
            check(Decode.INT8, ByteBuffer.allocate(8).putLong(l).array(), l);
            check(Decode.FLOAT4, ByteBuffer.allocate(4).putFloat(f).array(), f);
            check(Decode.FLOAT8, ByteBuffer.allocate(8).putDouble(d).array(), d);
        }
    }

    private static void check(Decode decode, byte[] b, double expected) {
        assertEquals(expected, decode.number(b, 0, b.length), 0.0);
        assertEquals(expected, decode.number(decode.key(b, 0)), 0.0);
    }

    @Test
    void aBooleanIsKeyedOneOrZero() {
        assertEquals(1, Decode.BOOL.key(new byte[] {1}, 0));
        assertEquals(0, Decode.BOOL.key(new byte[] {0}, 0));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({
            // text as numeric_out prints it; ndigits, weight, sign, dscale, base-10000 digits
            "0.1, 1, -1, 0, 1, 1000",
            "-2.5, 2, 0, 16384, 1, 2 5000",
            "99999999999999999999, 5, 4, 0, 0, 9999 9999 9999 9999 9999", // more than four digits: via the text
            "1e-30, 1, -8, 0, 30, 100",
            "123456789012.34, 4, 2, 0, 2, 1234 5678 9012 3400"
    })
    void aNumericDecodesToTheDoubleItsTextReadsAs(String text, int ndigits, int weight, int sign, int dscale,
                                                  String digits) {
        byte[] b = ValueTextTest.numeric(ndigits, weight, sign, dscale, digits);
        assertEquals(Double.parseDouble(text), Decode.NUMERIC.number(b, 0, b.length), 0.0, text);
    }

    @Test
    void aWeightIsAFiniteNonNegativeNumberElseNaN() {
        assertEquals(2.5, Decode.FLOAT8.weight(ByteBuffer.allocate(8).putDouble(2.5).array(), 0, 8), 0.0);
        assertTrue(Double.isNaN(Decode.FLOAT8.weight(ByteBuffer.allocate(8).putDouble(-1).array(), 0, 8)));
        assertTrue(Double.isNaN(Decode.FLOAT4.weight(ByteBuffer.allocate(4).putFloat(Float.NaN).array(), 0, 4)));
        assertTrue(Double.isNaN(Decode.FLOAT8.weight(
                ByteBuffer.allocate(8).putDouble(Double.POSITIVE_INFINITY).array(), 0, 8)));
        byte[] text = "1.25".getBytes(StandardCharsets.UTF_8);
        assertEquals(1.25, Decode.TEXT.weight(text, 0, text.length), 0.0);
        byte[] word = "heavy".getBytes(StandardCharsets.UTF_8);
        assertTrue(Double.isNaN(Decode.TEXT.weight(word, 0, word.length)));
    }
}
