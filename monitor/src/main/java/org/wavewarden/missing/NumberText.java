package org.wavewarden.missing;

import java.math.BigDecimal;

/** Reading and writing numbers in the plain decimal text form PostgreSQL prints. */
public final class NumberText {

    /** Longest text read digit for digit; a double's 309 integer digits or 324 decimals, written out, fit easily. */
    static final int MAX_LENGTH = 2_000;

    private NumberText() {
    }

    /** The number written in {@code text} (surrounding whitespace allowed), or null when it is not a finite number. */
    static BigDecimal parse(String text) {
        String t = text.strip();
        // PostgreSQL prints a numeric in full: -1e-300 takes 303 characters, and a numeric may have thousands of
        // digits. Beyond MAX_LENGTH the nearest double stands in, which keeps BigDecimal's cost bounded.
        if (t.isEmpty() || !isPlainDecimal(t)) {
            return null;
        }
        try {
            if (t.length() > MAX_LENGTH) {
                double x = Double.parseDouble(t);
                return Double.isFinite(x) ? new BigDecimal(x) : null;
            }
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

    /**
     * {@code [-+]?(digits[.digits?] | .digits)([eE][-+]?digits)?}, checked by hand: this runs once per distinct
     * value of every numeric column, where a regular expression was the single largest cost.
     */
    public static boolean isPlainDecimal(String t) {
        int i = 0;
        int n = t.length();
        if (i < n && (t.charAt(i) == '-' || t.charAt(i) == '+')) {
            i++;
        }
        int intDigits = 0;
        while (i < n && Character.isDigit(t.charAt(i)) && t.charAt(i) < 128) {
            i++;
            intDigits++;
        }
        int fracDigits = 0;
        if (i < n && t.charAt(i) == '.') {
            i++;
            while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
                i++;
                fracDigits++;
            }
        }
        if (intDigits == 0 && fracDigits == 0) {
            return false;
        }
        if (i < n && (t.charAt(i) == 'e' || t.charAt(i) == 'E')) {
            i++;
            if (i < n && (t.charAt(i) == '-' || t.charAt(i) == '+')) {
                i++;
            }
            int expDigits = 0;
            while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
                i++;
                expDigits++;
            }
            if (expDigits == 0) {
                return false;
            }
        }
        return i == n;
    }
}
