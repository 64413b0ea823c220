package org.wavewarden.missing;

import java.util.ArrayList;
import java.util.List;
import org.wavewarden.profile.NumericDistribution;

/**
 * Myers' blended index of preference for each terminal digit of age (Myers 1940, "The validity and significance of
 * male net reproduction rates", JASA 35, and Myers 1954; as set out in Shryock and Siegel, The Methods and Materials
 * of Demography). Starting at {@code lowAge} (usually 10), for each terminal digit the persons at ages ending in it
 * are summed over the eight decades {@code lowAge .. lowAge+79} and again over {@code lowAge+10 .. lowAge+89}; the
 * digit in place j of the decade (j = 0 for the digit of {@code lowAge}) weights the first sum by j + 1 and the
 * second by 9 - j, which offsets the fall in numbers with age that would otherwise favour the low digits. Each
 * digit's share of the blended total should be 10%; the index is half the sum of the absolute deviations from 10,
 * from 0 (no preference) to 90 (every age on one digit). With {@code lowAge = 10} the ages used are 10 to 99.
 *
 * @param index          the blended index, in percentage points
 * @param blendedPercent the blended share of each terminal digit 0..9, in percent
 * @param lowAge         the first age of the blend
 */
public record MyersIndex(double index, List<Double> blendedPercent, int lowAge) {

    public MyersIndex {
        blendedPercent = List.copyOf(blendedPercent);
        if (blendedPercent.size() != 10) {
            throw new IllegalArgumentException("blendedPercent must have one entry per digit, had " + blendedPercent.size());
        }
    }

    /** Computes the index from single-year ages (whole years; fractional ages count at their completed year). */
    public static MyersIndex compute(NumericDistribution ages, int lowAge) {
        if (ages == null) {
            throw new IllegalArgumentException("ages must not be null");
        }
        if (lowAge < 0) {
            throw new IllegalArgumentException("lowAge must not be negative, was " + lowAge);
        }
        double[] first = new double[10];
        double[] second = new double[10];
        for (int i = 0; i < ages.size(); i++) {
            long a = (long) Math.floor(ages.value(i));
            int digit = (int) (a % 10);
            if (a >= lowAge && a <= lowAge + 79) {
                first[digit] += ages.count(i);
            }
            if (a >= lowAge + 10 && a <= lowAge + 89) {
                second[digit] += ages.count(i);
            }
        }
        double[] blended = new double[10];
        double sum = 0;
        for (int d = 0; d < 10; d++) {
            int j = Math.floorMod(d - lowAge, 10);
            blended[d] = (j + 1) * first[d] + (9 - j) * second[d];
            sum += blended[d];
        }
        if (sum == 0) {
            throw new IllegalArgumentException("ages has no one aged " + lowAge + " to " + (lowAge + 89));
        }
        List<Double> pct = new ArrayList<>();
        double dev = 0;
        for (int d = 0; d < 10; d++) {
            double p = 100 * blended[d] / sum;
            pct.add(p);
            dev += Math.abs(p - 10);
        }
        return new MyersIndex(dev / 2, pct, lowAge);
    }
}
