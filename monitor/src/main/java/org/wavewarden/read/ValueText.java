package org.wavewarden.read;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.time.LocalDate;

import static org.wavewarden.read.CopyBinaryStream.int16;

/**
 * The text a value is tallied under: what PostgreSQL's output function prints for it, which is what text COPY
 * sends, made from the binary form once per distinct value.
 *
 * <p>Floating-point text follows PostgreSQL 12 and later with {@code extra_float_digits > 0} (the JDBC driver sets
 * 3): the shortest decimal that reads back as the same value, the closest such when several have that length,
 * printed in fixed notation for decimal exponents from -4 up to 14 ({@code real}: up to 5) and as {@code 1e+20}
 * otherwise, as the server's Ryu-based {@code float8out} and {@code float4out} do (Adams 2018, "Ryu: fast
 * float-to-string conversion", PLDI). Dates follow {@code DateStyle = ISO}, which the scan sets. Numeric cells are
 * printed from the binary numeric layout (base-10000 digits, weight, sign, display scale) as {@code numeric_out}
 * prints them. A text longer than {@link WaveScanner#MAX_VALUE_CHARS} is tallied under its stand-in
 * ({@link #kept}).
 */
final class ValueText {

    private ValueText() {
    }

    /** A value as tallied: itself, or when longer than {@link WaveScanner#MAX_VALUE_CHARS} its stand-in. */
    static String kept(String v) {
        return v == null || v.length() <= WaveScanner.MAX_VALUE_CHARS ? v : shortened(v);
    }

    /** A long value's stand-in: its first 200 characters, its length and a hash, distinct for distinct values. */
    static String shortened(String v) {
        return v.substring(0, 200) + "\u2026[" + v.length() + " chars, #" + Integer.toHexString(v.hashCode()) + "]";
    }

    /** The text of a byte-keyed cell: a numeric's full text however long (a stand-in is no number), else UTF-8. */
    static String ofBytes(Decode d, byte[] b, int p, int len) {
        return d == Decode.NUMERIC ? numeric(b, p, len) : new String(b, p, len, StandardCharsets.UTF_8);
    }

    /** The text of a cell keyed by its bits ({@link Decode#key}). */
    static String of(Decode d, long key) {
        return switch (d) {
            case INT2, INT4, INT8 -> Long.toString(key);
            case BOOL -> key != 0 ? "t" : "f";
            case DATE -> dateText((int) key);
            case FLOAT4 -> float4Text(Float.intBitsToFloat((int) key));
            case FLOAT8 -> float8Text(Double.longBitsToDouble(key));
            default -> throw new IllegalArgumentException("decode " + d + " is not keyed by a long");
        };
    }

    /** {@code date_out} under {@code DateStyle = ISO}: days since 2000-01-01, proleptic Gregorian, years BC marked. */
    static String dateText(int days) {
        if (days == Integer.MAX_VALUE) {
            return "infinity";
        }
        if (days == Integer.MIN_VALUE) {
            return "-infinity";
        }
        LocalDate d = LocalDate.of(2000, 1, 1).plusDays(days);
        int y = d.getYear();
        boolean bc = y <= 0;
        String year = Integer.toString(bc ? 1 - y : y);
        StringBuilder sb = new StringBuilder(16);
        sb.append("0".repeat(Math.max(0, 4 - year.length()))).append(year).append('-');
        two(sb, d.getMonthValue()).append('-');
        two(sb, d.getDayOfMonth());
        return bc ? sb.append(" BC").toString() : sb.toString();
    }

    private static StringBuilder two(StringBuilder sb, int v) {
        return sb.append(v < 10 ? "0" : "").append(v);
    }

    /** {@code float8out} with shortest-exact output. */
    static String float8Text(double v) {
        double a = Math.abs(v);
        return floatText(v, Math.nextDown(a), Math.ulp(a), Double.toString(a), 17, 15);
    }

    /** {@code float4out} with shortest-exact output; float to double widening is exact, so one routine serves. */
    static String float4Text(float v) {
        float a = Math.abs(v);
        return floatText(v, Math.nextDown(a), Math.ulp(a), Float.toString(a), 9, 6);
    }

    /**
     * The shortest decimal strictly between the midpoints to the neighbouring representable values, as PostgreSQL
     * prints floats; {@code nextDown} and {@code ulp} are of |v| in its own precision.
     */
    private static String floatText(double v, double nextDown, double ulp, String javaText, int maxDigits,
                                    int fixedLimit) {
        if (Double.isNaN(v)) {
            return "NaN";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "Infinity" : "-Infinity";
        }
        if (v == 0) {
            return 1 / v < 0 ? "-0" : "0";
        }
        BigDecimal exact = new BigDecimal(Math.abs(v));
        BigDecimal low = exact.add(new BigDecimal(nextDown)).multiply(HALF);
        BigDecimal high = exact.add(new BigDecimal(ulp).multiply(HALF));
        BigDecimal s = shortest(exact, low, high, digits(javaText), maxDigits);
        return (v < 0 ? "-" : "") + layout(s, fixedLimit);
    }

    private static final BigDecimal HALF = new BigDecimal("0.5");
    private static final MathContext[] FLOOR = new MathContext[20];
    private static final MathContext[] CEILING = new MathContext[20];

    static {
        for (int p = 1; p < 20; p++) {
            FLOOR[p] = new MathContext(p, RoundingMode.FLOOR);
            CEILING[p] = new MathContext(p, RoundingMode.CEILING);
        }
    }

    /** Significant digits of Java's own shortest-ish text, the first guess of the length. */
    private static int digits(String javaText) {
        String m = javaText.substring(0, javaText.indexOf('E') < 0 ? javaText.length() : javaText.indexOf('E'));
        return Math.max(1, new BigDecimal(m).stripTrailingZeros().precision());
    }

    /**
     * The shortest decimal strictly between the midpoints to the neighbouring values, the nearest of that length.
     * The server's Ryu never takes a midpoint itself even when reading it back would round to the value, so
     * {@code 2e23} prints as {@code 1.9999999999999998e+23}. The length is searched from Java's {@code toString}
     * (Java 17's is sometimes a digit or more too long, sometimes takes a midpoint); the test is monotone because
     * every p-1 digit decimal is a p digit decimal.
     */
    private static BigDecimal shortest(BigDecimal exact, BigDecimal low, BigDecimal high, int guess, int most) {
        int p = Math.min(guess, most);
        BigDecimal best = nearest(exact, low, high, p);
        while (best == null && p < most) {
            best = nearest(exact, low, high, ++p);
        }
        if (best == null) {
            throw new IllegalStateException("no decimal of " + most + " digits reads back as " + exact);
        }
        while (p > 1) {
            BigDecimal shorter = nearest(exact, low, high, p - 1);
            if (shorter == null) {
                break;
            }
            best = shorter;
            p--;
        }
        return best.stripTrailingZeros();
    }

    /** The p-digit decimal nearest to the exact value among the two around it inside (low, high), or null. */
    private static BigDecimal nearest(BigDecimal exact, BigDecimal low, BigDecimal high, int p) {
        BigDecimal down = exact.round(FLOOR[p]);
        BigDecimal up = exact.round(CEILING[p]);
        boolean d = down.compareTo(low) > 0;
        boolean u = up.compareTo(high) < 0 && up.compareTo(down) != 0;
        if (d && u) {
            int c = exact.subtract(down).compareTo(up.subtract(exact));
            if (c != 0) {
                return c < 0 ? down : up;
            }
            return down.unscaledValue().testBit(0) ? up : down; // a tie goes to the even last digit
        }
        return d ? down : u ? up : null;
    }

    /** PostgreSQL's layout of shortest digits: fixed for exponents -4 .. fixedBelow-1, else {@code d.ddde+XX}. */
    static String layout(BigDecimal positive, int fixedBelow) {
        String digits = positive.unscaledValue().toString();
        int exp = digits.length() - 1 - positive.scale();
        StringBuilder sb = new StringBuilder(digits.length() + 8);
        if (exp >= -4 && exp < fixedBelow) {
            if (exp < 0) {
                sb.append("0.").append("0".repeat(-exp - 1)).append(digits);
            } else if (digits.length() <= exp + 1) {
                sb.append(digits).append("0".repeat(exp + 1 - digits.length()));
            } else {
                sb.append(digits, 0, exp + 1).append('.').append(digits, exp + 1, digits.length());
            }
            return sb.toString();
        }
        sb.append(digits.charAt(0));
        if (digits.length() > 1) {
            sb.append('.').append(digits, 1, digits.length());
        }
        int e = Math.abs(exp);
        sb.append('e').append(exp < 0 ? '-' : '+').append(e < 10 ? "0" : "").append(e);
        return sb.toString();
    }

    /** {@code numeric_out} of the binary numeric layout (int16 ndigits, weight, sign, dscale; base-10000 digits). */
    static String numeric(byte[] b, int p, int len) {
        if (len < 8) {
            throw new IllegalStateException("numeric cell of " + len + " bytes");
        }
        int ndigits = int16(b, p);
        int weight = (short) int16(b, p + 2);
        int sign = int16(b, p + 4);
        int dscale = int16(b, p + 6);
        switch (sign) {
            case 0xC000 -> {
                return "NaN";
            }
            case 0xD000 -> {
                return "Infinity";
            }
            case 0xF000 -> {
                return "-Infinity";
            }
            default -> {
            }
        }
        int[] dig = new int[ndigits];
        for (int i = 0; i < ndigits; i++) {
            dig[i] = int16(b, p + 8 + 2 * i);
        }
        StringBuilder sb = new StringBuilder(4 * (Math.max(weight, 0) + 1) + dscale + 2);
        if (sign == 0x4000) {
            sb.append('-');
        }
        if (weight < 0) {
            sb.append('0');
        } else {
            for (int d = 0; d <= weight; d++) {
                int v = d < ndigits ? dig[d] : 0;
                if (d == 0) {
                    sb.append(v);
                } else {
                    four(sb, v);
                }
            }
        }
        if (dscale > 0) {
            sb.append('.');
            int start = sb.length();
            for (int d = weight + 1; sb.length() - start < dscale; d++) {
                four(sb, d >= 0 && d < ndigits ? dig[d] : 0);
            }
            sb.setLength(start + dscale);
        }
        return sb.toString();
    }

    private static void four(StringBuilder sb, int v) {
        if (v < 1000) {
            sb.append('0');
        }
        if (v < 100) {
            sb.append('0');
        }
        if (v < 10) {
            sb.append('0');
        }
        sb.append(v);
    }
}
