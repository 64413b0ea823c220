package org.wavewarden.missing;

import org.wavewarden.profile.NumericDistribution;

/**
 * Whipple's index of heaping on ages ending in 0 or 5: the number of persons aged 25, 30, ..., 60 divided by one
 * fifth of the number aged 23 to 62, times 100. It runs from 0 (no such ages) through 100 (no preference) to 500
 * (every age ends in 0 or 5). Method and quality bands as recommended by the United Nations and given in Shryock
 * and Siegel, The Methods and Materials of Demography (age data chapter).
 *
 * @param index   the index (100 = no preference)
 * @param heaped  persons aged 25, 30, ..., 60
 * @param total   persons aged 23 to 62
 */
public record WhippleIndex(double index, long heaped, long total) {

    static final int LOW = 23;
    static final int HIGH = 62;

    /** The United Nations quality bands for Whipple's index. */
    public enum QualityBand {
        /** below 105 */
        HIGHLY_ACCURATE,
        /** 105 to below 110 */
        FAIRLY_ACCURATE,
        /** 110 to below 125 */
        APPROXIMATE,
        /** 125 to below 175 */
        ROUGH,
        /** 175 and over */
        VERY_ROUGH
    }

    public WhippleIndex {
        if (total <= 0 || heaped < 0 || heaped > total) {
            throw new IllegalArgumentException("heaped " + heaped + " must lie in [0, total] with total " + total + " > 0");
        }
    }

    /**
     * Computes the index from single-year ages; ages that are not whole numbers (an exact age in years and days)
     * are counted at their completed year, as the census tables are.
     */
    public static WhippleIndex compute(NumericDistribution ages) {
        if (ages == null) {
            throw new IllegalArgumentException("ages must not be null");
        }
        long heaped = 0;
        long total = 0;
        for (int i = 0; i < ages.size(); i++) {
            double a = Math.floor(ages.value(i));
            if (a >= LOW && a <= HIGH) {
                total += ages.count(i);
                if (((long) a) % 5 == 0) {
                    heaped += ages.count(i);
                }
            }
        }
        if (total == 0) {
            throw new IllegalArgumentException("ages has no one aged " + LOW + " to " + HIGH);
        }
        return new WhippleIndex(100.0 * heaped / (total / 5.0), heaped, total);
    }

    public QualityBand qualityBand() {
        if (index < 105) {
            return QualityBand.HIGHLY_ACCURATE;
        }
        if (index < 110) {
            return QualityBand.FAIRLY_ACCURATE;
        }
        if (index < 125) {
            return QualityBand.APPROXIMATE;
        }
        if (index < 175) {
            return QualityBand.ROUGH;
        }
        return QualityBand.VERY_ROUGH;
    }
}
