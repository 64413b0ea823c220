package org.wavewarden.compare.shape;

import org.wavewarden.compare.EffectSize;
import org.wavewarden.compare.design.WeightedTally;
import org.wavewarden.profile.NumericDistribution;

import java.util.ArrayList;
import java.util.List;

/**
 * Both waves' cumulative distributions on the union of their values and the value where they lie furthest apart:
 * the numbers behind a change of shape, so that its picture draws what the KS distance was measured on.
 */
public final class CumulativeGap {

    /** Points of each wave's curve kept in a finding, besides the ends and the largest gap. */
    public static final int POINTS = 80;

    private CumulativeGap() {
    }

    /** A step of a cumulative distribution: the share of the wave (weighted where the finding is) at or below it. */
    public record Step(double value, double cumulative) {
    }

    /**
     * What a SHAPE_CHANGE finding carries beside its test.
     *
     * @param distance    the finding's KS distance (its effect), with the interval of {@code interval}
     * @param interval    the KS distance with its interval, as judged
     * @param at          the value at which the two curves lie furthest apart
     * @param cdfBaseline the baseline's cumulative share at {@code at}
     * @param cdfCurrent  the current wave's cumulative share at {@code at}
     * @param weighted    whether the shares are of the weights (true) or of the answers
     * @param unit        the values' unit, or null
     * @param baseline    the baseline's curve, thinned to about {@value #POINTS} steps, always with the gap's value
     * @param current     the current wave's curve, at the same values
     */
    public record ShapeDetail(double distance, EffectSize interval, double at, double cdfBaseline, double cdfCurrent,
                              boolean weighted, String unit, List<Step> baseline, List<Step> current) {
        public ShapeDetail {
            baseline = List.copyOf(baseline);
            current = List.copyOf(current);
        }
    }

    /** The curves of two waves' answers, each answer counting once. */
    public static ShapeDetail of(NumericDistribution b, NumericDistribution c, EffectSize distance, String unit) {
        return of(values(b), masses(b), values(c), masses(c), distance, false, unit);
    }

    /** The curves of two waves' weighted answers. */
    public static ShapeDetail of(WeightedTally b, WeightedTally c, EffectSize distance, String unit) {
        return of(b.values(), b.weights(), c.values(), c.weights(), distance, true, unit);
    }

    /**
     * The largest gap between the two cumulative distributions (values ascending, each with its mass), the sum
     * taken in the order the KS distance of weighted tallies takes it so that the two agree to the last digit.
     */
    public static double largestGap(double[] bv, double[] bm, double[] cv, double[] cm) {
        return merged(bv, bm, cv, cm).gap;
    }

    private static ShapeDetail of(double[] bv, double[] bm, double[] cv, double[] cm, EffectSize distance,
                                  boolean weighted, String unit) {
        Merged m = merged(bv, bm, cv, cm);
        int size = m.values.size();
        int every = Math.max(1, (int) Math.ceil(size / (double) POINTS));
        List<Step> sb = new ArrayList<>();
        List<Step> sc = new ArrayList<>();
        for (int k = 0; k < size; k++) {
            if (k % every == 0 || k == size - 1 || k == m.at) {
                sb.add(new Step(m.values.get(k), m.cdfB.get(k)));
                sc.add(new Step(m.values.get(k), m.cdfC.get(k)));
            }
        }
        return new ShapeDetail(distance.estimate(), distance, m.values.get(m.at), m.cdfB.get(m.at),
                m.cdfC.get(m.at), weighted, unit, sb, sc);
    }

    private record Merged(List<Double> values, List<Double> cdfB, List<Double> cdfC, int at, double gap) {
    }

    private static Merged merged(double[] bv, double[] bm, double[] cv, double[] cm) {
        double wb = 0;
        double wc = 0;
        for (double x : bm) {
            wb += x;
        }
        for (double x : cm) {
            wc += x;
        }
        if (!(wb > 0) || !(wc > 0)) {
            throw new IllegalArgumentException("a wave has no answers (or no weight) to draw");
        }
        List<Double> values = new ArrayList<>();
        List<Double> fb = new ArrayList<>();
        List<Double> fc = new ArrayList<>();
        int i = 0;
        int j = 0;
        double cb = 0;
        double cc = 0;
        double best = -1;
        int at = 0;
        while (i < bv.length || j < cv.length) {
            double x = Math.min(i < bv.length ? bv[i] : Double.POSITIVE_INFINITY,
                    j < cv.length ? cv[j] : Double.POSITIVE_INFINITY);
            if (i < bv.length && bv[i] == x) {
                cb += bm[i++];
            }
            if (j < cv.length && cv[j] == x) {
                cc += cm[j++];
            }
            double gap = Math.abs(cc / wc - cb / wb);
            if (gap > best) {
                best = gap;
                at = values.size();
            }
            values.add(x);
            fb.add(cb / wb);
            fc.add(cc / wc);
        }
        return new Merged(values, fb, fc, at, Math.min(1, best));
    }

    private static double[] values(NumericDistribution d) {
        double[] v = new double[d.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = d.value(i);
        }
        return v;
    }

    private static double[] masses(NumericDistribution d) {
        double[] m = new double[d.size()];
        for (int i = 0; i < m.length; i++) {
            m[i] = d.count(i);
        }
        return m;
    }
}
