package org.wavewarden.codebook;

import java.math.BigDecimal;

/**
 * The one text form of a numeric code, as PostgreSQL prints the number in a numeric column and as tallies hold it:
 * {@code 1} not {@code 1.0}, {@code -9}, {@code 2.5}. Value labels and missing values of numeric variables are keyed
 * by this form, so a label found in an SPSS dictionary matches the answer counted in the wave.
 */
public final class Codes {

    private Codes() {
    }

    public static String of(double value) {
        if (Double.isNaN(value) || Double.isInfinite(value)) {
            throw new IllegalArgumentException("a code must be a finite number, was " + value);
        }
        if (value == Math.rint(value) && Math.abs(value) < 1e15) {
            return Long.toString((long) value);
        }
        return BigDecimal.valueOf(value).stripTrailingZeros().toPlainString();
    }

    /**
     * A code as a codebook file writes it, in the one text form: numbers of a numeric variable through
     * {@link #of(double)} ("1.0" and "1" are the same answer), text codes and what does not parse as they are.
     */
    public static String of(String text, StorageType storage) {
        if (storage == StorageType.NUMBER) {
            try {
                return of(Double.parseDouble(text));
            } catch (IllegalArgumentException e) {
                return text;
            }
        }
        return text;
    }
}
