package org.wavewarden.missing;

/**
 * The declared range of valid answers of a numeric variable, as a codebook gives it, e.g. ages 16 to 95 or a
 * scale 1 to 5. Either bound may be absent (null), meaning unbounded on that side; both bounds are inclusive.
 */
public record ValueRange(Double min, Double max) {

    public ValueRange {
        if (min != null && !Double.isFinite(min)) {
            throw new IllegalArgumentException("min must be finite when given, was " + min);
        }
        if (max != null && !Double.isFinite(max)) {
            throw new IllegalArgumentException("max must be finite when given, was " + max);
        }
        if (min != null && max != null && min > max) {
            throw new IllegalArgumentException("min " + min + " exceeds max " + max);
        }
    }

    public static ValueRange between(double min, double max) {
        return new ValueRange(min, max);
    }

    public static ValueRange atLeast(double min) {
        return new ValueRange(min, null);
    }

    public static ValueRange atMost(double max) {
        return new ValueRange(null, max);
    }

    public boolean isBelow(double x) {
        return min != null && x < min;
    }

    public boolean isAbove(double x) {
        return max != null && x > max;
    }

    public boolean contains(double x) {
        return !isBelow(x) && !isAbove(x);
    }

    @Override
    public String toString() {
        return "[" + (min == null ? "-inf" : NumberText.plain(min)) + ", " + (max == null ? "+inf" : NumberText.plain(max))
                + "]";
    }
}
