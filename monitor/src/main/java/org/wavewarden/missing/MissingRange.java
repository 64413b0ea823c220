package org.wavewarden.missing;

import java.math.BigDecimal;
import java.util.Objects;

/**
 * A range of numbers that all stand for "no answer", with the reason: an SPSS user-missing range such as
 * {@code -99 THRU -91}, {@code LO THRU -1} or {@code 998 THRU HI}, a DDI invalid range. Both ends are included; an
 * open end is null. A range covers numbers only: it is matched in numeric columns, never against text.
 *
 * @param low    the lowest number in the range, or null for no lower end ({@code LO})
 * @param high   the highest number in the range, or null for no upper end ({@code HI})
 * @param reason why a value in the range is missing; counts are reported per reason
 */
public record MissingRange(Double low, Double high, String reason) {

    public MissingRange {
        Objects.requireNonNull(reason, "reason");
        if (reason.isBlank()) {
            throw new IllegalArgumentException("reason must not be blank (range " + low + ".." + high + ")");
        }
        if (low == null && high == null) {
            throw new IllegalArgumentException("a missing range needs at least one end (reason '" + reason + "')");
        }
        if ((low != null && !Double.isFinite(low)) || (high != null && !Double.isFinite(high))) {
            throw new IllegalArgumentException("the ends of a missing range must be finite numbers, were " + low
                    + " and " + high);
        }
        if (low != null && high != null && low > high) {
            throw new IllegalArgumentException("the low end " + low + " of a missing range is above its high end "
                    + high);
        }
    }

    /**
     * Whether the number lies in the range. Compared as decimals, so that a value printed as {@code -90.0} or with
     * more digits than a double holds is judged by what it says, not by its nearest double.
     */
    public boolean contains(BigDecimal x) {
        return (low == null || x.compareTo(new BigDecimal(Double.toString(low))) >= 0)
                && (high == null || x.compareTo(new BigDecimal(Double.toString(high))) <= 0);
    }
}
