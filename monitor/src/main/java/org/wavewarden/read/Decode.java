package org.wavewarden.read;

import java.nio.charset.StandardCharsets;
import java.util.Locale;

import static org.wavewarden.read.CopyBinaryStream.int16;
import static org.wavewarden.read.CopyBinaryStream.int32;
import static org.wavewarden.read.CopyBinaryStream.int64;

/**
 * How a column travels in the binary COPY stream and is decoded: the binary send format of each type the scan reads
 * natively (PostgreSQL's {@code int2send} .. {@code numeric_send}, {@code date_send}: days since 2000-01-01), and
 * {@link #OUTPUT_TEXT} for every other type, which the server sends as the text of its own output function.
 *
 * <p>Integers, floats, booleans and dates are keyed by their bits ({@link #key}); text and {@code numeric} by their
 * bytes ({@link #bytesKeyed}). A number decodes to the double the server's text form reads back as in Java.
 */
enum Decode {
    INT2, INT4, INT8, FLOAT4, FLOAT8, BOOL, DATE, NUMERIC, TEXT, OUTPUT_TEXT;

    static Decode of(String postgresType) {
        return switch (postgresType.toLowerCase(Locale.ROOT)) {
            case "smallint", "int2" -> INT2;
            case "integer", "int4", "int" -> INT4;
            case "bigint", "int8" -> INT8;
            case "real", "float4" -> FLOAT4;
            case "double precision", "float8" -> FLOAT8;
            case "boolean", "bool" -> BOOL;
            case "date" -> DATE;
            case "numeric", "decimal" -> NUMERIC;
            case "text", "character varying", "varchar", "character", "bpchar", "name" -> TEXT;
            default -> OUTPUT_TEXT;
        };
    }

    boolean bytesKeyed() {
        return this == NUMERIC || this == TEXT || this == OUTPUT_TEXT;
    }

    boolean isNumber() {
        return this == INT2 || this == INT4 || this == INT8 || this == FLOAT4 || this == FLOAT8 || this == NUMERIC;
    }

    /** The 64-bit key of a cell of a type keyed by its bits (not {@link #bytesKeyed}). */
    long key(byte[] b, int p) {
        return switch (this) {
            case INT2 -> (short) int16(b, p);
            case INT4, FLOAT4, DATE -> int32(b, p);
            case INT8, FLOAT8 -> int64(b, p);
            case BOOL -> b[p] != 0 ? 1 : 0;
            default -> throw new IllegalArgumentException("decode " + this + " is keyed by its bytes");
        };
    }

    /** A numeric cell's value, as the server's text form would read back in Java (float4 widened exactly). */
    double number(byte[] b, int p, int len) {
        return switch (this) {
            case INT2 -> (short) int16(b, p);
            case INT4 -> int32(b, p);
            case INT8 -> int64(b, p);
            case FLOAT4 -> Float.intBitsToFloat(int32(b, p));
            case FLOAT8 -> Double.longBitsToDouble(int64(b, p));
            case NUMERIC -> numericValue(b, p, len);
            default -> throw new IllegalArgumentException("decode " + this + " is not a number");
        };
    }

    /** The value of a {@link #key}. */
    double number(long key) {
        return switch (this) {
            case INT2, INT4, INT8 -> key;
            case FLOAT4 -> Float.intBitsToFloat((int) key);
            case FLOAT8 -> Double.longBitsToDouble(key);
            default -> throw new IllegalArgumentException("decode " + this + " is not keyed by a number");
        };
    }

    /** A weight cell, or NaN when it is not a finite non-negative number (as {@link #weight(String)}). */
    double weight(byte[] b, int p, int len) {
        double w = isNumber() ? number(b, p, len) : weight(new String(b, p, len, StandardCharsets.UTF_8));
        return w >= 0 && Double.isFinite(w) ? w : Double.NaN;
    }

    /**
     * A binary numeric as the nearest double: exact digits up to 2^53 scaled by a power of ten of at most 22 are
     * one correctly rounded operation (Clinger 1990, "How to read floating point numbers accurately", PLDI);
     * anything else goes through the text form.
     */
    static double numericValue(byte[] b, int p, int len) {
        int ndigits = int16(b, p);
        int weight = (short) int16(b, p + 2);
        int sign = int16(b, p + 4);
        if (sign == 0xC000 || sign == 0xD000 || sign == 0xF000 || ndigits > 4) {
            return Double.parseDouble(ValueText.numeric(b, p, len));
        }
        long u = 0;
        for (int i = 0; i < ndigits; i++) {
            u = u * 10000 + int16(b, p + 8 + 2 * i);
        }
        int exp10 = 4 * (weight - ndigits + 1);
        double x;
        if (ndigits == 0) {
            x = 0;
        } else if (exp10 >= 0 && exp10 <= 22 && u < (1L << 53)) {
            x = u * POW10[exp10];
            if (x >= 0x1p53) {
                return Double.parseDouble(ValueText.numeric(b, p, len));
            }
        } else if (exp10 < 0 && exp10 >= -22 && u < (1L << 53)) {
            x = u / POW10[-exp10];
        } else {
            return Double.parseDouble(ValueText.numeric(b, p, len));
        }
        return sign == 0x4000 ? -x : x;
    }

    private static final double[] POW10 = new double[23];

    static {
        double v = 1;
        for (int i = 0; i < POW10.length; i++) {
            POW10[i] = v;
            v *= 10;
        }
    }

    /** A weight as the text form gives it, or NaN when it is NULL, not a number, negative or infinite. */
    static double weight(String text) {
        if (text == null || !org.wavewarden.missing.NumberText.isPlainDecimal(text)) {
            return Double.NaN;
        }
        double w = Double.parseDouble(text);
        return w >= 0 && Double.isFinite(w) ? w : Double.NaN;
    }
}
