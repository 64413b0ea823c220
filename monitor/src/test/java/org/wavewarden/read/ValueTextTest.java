package org.wavewarden.read;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

import java.nio.ByteBuffer;
import java.util.Random;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * The text a value is tallied under is what the server's output function prints. The server side of each check is
 * a literal printed by PostgreSQL 14 (the scanner tests compare every form with a live server's text COPY as well).
 */
class ValueTextTest {

    @Test
    void shortestFloatTextReadsBackInAtMostSeventeenDigits() {
        // Property on seeded random bit patterns: the text reads back as the same value, in 17 (float: 9) digits or fewer.
        Random r = new Random(11);
        for (int i = 0; i < 20000; i++) {
            double d = Double.longBitsToDouble(r.nextLong());
            if (Double.isNaN(d)) {
                continue;
            }
            String s = ValueText.float8Text(d);
            assertEquals(d, Double.parseDouble(s), s);
            assertTrue(digits(s) <= 17, s);
            float f = Float.intBitsToFloat(r.nextInt());
            if (!Float.isNaN(f)) {
                String t = ValueText.float4Text(f);
                assertEquals(f, Float.parseFloat(t), t);
                assertTrue(digits(t) <= 9, t);
            }
        }
    }

    @Test
    void floatTextFollowsTheServersLayout() {
        // PostgreSQL 14 float8out / float4out, extra_float_digits = 3 (as the JDBC driver sets it).
        assertEquals("1e+20", ValueText.float8Text(1e20));
        assertEquals("100000000000000", ValueText.float8Text(1e14));
        assertEquals("1e+15", ValueText.float8Text(1e15));
        assertEquals("0.0001", ValueText.float8Text(1e-4));
        assertEquals("1e-05", ValueText.float8Text(1e-5));
        assertEquals("0.30000000000000004", ValueText.float8Text(0.1 + 0.2));
        assertEquals("-0", ValueText.float8Text(-0.0));
        assertEquals("5e-324", ValueText.float8Text(Double.MIN_VALUE));
        assertEquals("1.9999999999999998e+23", ValueText.float8Text(2e23)); // a midpoint is never taken
        assertEquals("1e+06", ValueText.float4Text(1e6f));
        assertEquals("123456", ValueText.float4Text(123456f));
    }

    private static int digits(String s) {
        String m = s.toLowerCase(java.util.Locale.ROOT).split("e")[0].replace("-", "").replace(".", "");
        return m.replaceFirst("^0+", "").replaceFirst("0+$", "").length();
    }

    @ParameterizedTest(name = "day {0} prints as {1}")
    @CsvSource({
            "0, 2000-01-01",
            "-1, 1999-12-31",
            "366, 2001-01-01",
            "-730119, 0001-01-01",
            "-730120, 0001-12-31 BC",   // the year before 1 AD is 1 BC; no year zero
            "2147483647, infinity",
            "-2147483648, -infinity"
    })
    void dateTextIsTheIsoFormOfDaysSinceTwoThousand(int days, String text) {
        assertEquals(text, ValueText.dateText(days));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource({
            // ndigits, weight, sign, dscale, base-10000 digits (as numeric_send lays out the value)
            "123.450, 2, 0, 0, 3, 123 4500",
            "-0.0001, 1, -1, 16384, 4, 1",
            "12345678, 2, 1, 0, 0, 1234 5678",
            "0, 0, 0, 0, 0, ''",
            "0.00, 0, 0, 0, 2, ''",
            "NaN, 0, 0, 49152, 0, ''",
            "Infinity, 0, 0, 53248, 0, ''",
            "-Infinity, 0, 0, 61440, 0, ''",
            "10000, 1, 1, 0, 0, 1"
    })
    void numericTextIsWhatNumericOutPrints(String text, int ndigits, int weight, int sign, int dscale,
                                           String digits) {
        byte[] b = numeric(ndigits, weight, sign, dscale, digits);
        assertEquals(text, ValueText.numeric(b, 0, b.length));
        if (!text.contains("Inf") && !text.equals("NaN")) {
            assertEquals(Double.parseDouble(text), Decode.numericValue(b, 0, b.length), 0.0, text);
        }
    }

    @Test
    void aValueLongerThanKeptIsTalliedUnderAStandInThatKeepsValuesApart() {
        String a = "x".repeat(WaveScanner.MAX_VALUE_CHARS + 1);
        String b = "x".repeat(WaveScanner.MAX_VALUE_CHARS) + "y";
        assertEquals("x".repeat(WaveScanner.MAX_VALUE_CHARS), ValueText.kept("x".repeat(WaveScanner.MAX_VALUE_CHARS)));
        assertTrue(ValueText.kept(a).startsWith("x".repeat(200) + "\u2026[257 chars, #"), ValueText.kept(a));
        assertTrue(ValueText.kept(a).length() < WaveScanner.MAX_VALUE_CHARS);
        assertTrue(!ValueText.kept(a).equals(ValueText.kept(b)));
    }

    /** A numeric in its binary send form. */
    static byte[] numeric(int ndigits, int weight, int sign, int dscale, String digits) {
        ByteBuffer buf = ByteBuffer.allocate(8 + 2 * ndigits);
        buf.putShort((short) ndigits).putShort((short) weight).putShort((short) sign).putShort((short) dscale);
        if (ndigits > 0) {
            for (String d : digits.split(" ")) {
                buf.putShort(Short.parseShort(d));
            }
        }
        return buf.array();
    }
}
