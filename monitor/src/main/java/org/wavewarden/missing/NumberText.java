package org.wavewarden.missing;

import java.math.BigDecimal;
import java.util.regex.Pattern;

/** Reading and writing numbers in the plain decimal text form PostgreSQL prints. */
final class NumberText {

    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?");

    private NumberText() {
    }

    /** The number written in {@code text} (surrounding whitespace allowed), or null when it is not a finite number. */
    static BigDecimal parse(String text) {
        String t = text.strip();
        if (t.isEmpty() || t.length() > 60 || !NUMBER.matcher(t).matches()) {
            return null;
        }
        try {
            return new BigDecimal(t);
        } catch (NumberFormatException e) {
            return null;
        }
    }

    static String plain(double x) {
        if (x == Math.rint(x) && Math.abs(x) < 1e15) {
            return Long.toString((long) x);
        }
        return BigDecimal.valueOf(x).stripTrailingZeros().toPlainString();
    }

    /**
     * How round a number is: the power of ten of its last significant digit (50000 gives 4, 12.5 gives -1), plus one
     * half when that digit is a 5, since answers heap on multiples of 5 as well as of 10. Zero is the roundest.
     */
    static double roundness(double x) {
        if (x == 0) {
            return Double.POSITIVE_INFINITY;
        }
        BigDecimal d = BigDecimal.valueOf(x).stripTrailingZeros();
        double r = -d.scale();
        int last = d.unscaledValue().abs().mod(java.math.BigInteger.TEN).intValue();
        return last == 5 ? r + 0.5 : r;
    }
}
