package org.wavewarden.missing;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Optional;
import java.util.function.DoublePredicate;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.wavewarden.profile.Quantiles;

/**
 * The spike-and-separation logic shared by numbers and dates: which sentinel-shaped values stand apart from the
 * bulk, which spike inside it, and which ordinary values spike far above their neighbours. See
 * {@link DisguisedMissingDetector} for the rule in words.
 */
final class SpikeScan {

    /** One distinct value on the number line (dates as day numbers), with its raw text and count. */
    record Point(double x, String raw, long count) {
    }

    /** How the evidence talks about distances on this line (numbers as they are; dates in days or years). */
    interface Units {
        String distance(double d);
    }

    static final double FENCE_IQR = DisguisedMissingDetector.FENCE_IQR;
    static final double GAP_SPACINGS = DisguisedMissingDetector.GAP_SPACINGS;
    static final double SENTINEL_SPIKE_RATIO = DisguisedMissingDetector.SENTINEL_SPIKE_RATIO;
    static final double INLIER_SPIKE_RATIO = DisguisedMissingDetector.INLIER_SPIKE_RATIO;
    static final int NEIGHBOURS_EACH_SIDE = 3;
    static final int MIN_DISTINCT_FOR_INLIER = 12;

    private final List<Point> points;
    private final long denominator;
    private final long floor;
    private final DoublePredicate sentinelShaped;
    private final DoubleUnaryOperator roundness;
    private final Optional<ValueRange> declared;
    private final CandidateKind sentinelKind;
    private final Units units;
    private final boolean roundSentinels;
    private final List<MissingCandidate> out = new ArrayList<>();

    SpikeScan(List<Point> points, long denominator, DoublePredicate sentinelShaped, DoubleUnaryOperator roundness,
              Optional<ValueRange> declared, CandidateKind sentinelKind, Units units, boolean roundSentinels) {
        this.points = new ArrayList<>(points);
        this.points.sort(Comparator.comparingDouble(Point::x));
        this.denominator = denominator;
        this.floor = DisguisedMissingDetector.minimumCount(denominator);
        this.sentinelShaped = sentinelShaped;
        this.roundness = roundness;
        this.declared = declared;
        this.sentinelKind = sentinelKind;
        this.units = units;
        // Numbers heap on round values, so a sentinel-shaped 7.0 among tenths is compared with other whole numbers;
        // placeholder dates are themselves the roundest dates (1 January), so they are compared with every neighbour.
        this.roundSentinels = roundSentinels;
    }

    List<MissingCandidate> run() {
        int m = points.size();
        if (m == 0) {
            return out;
        }
        boolean[] inBase = new boolean[m];
        boolean[] outOfDeclared = new boolean[m];
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < m; i++) {
            Point p = points.get(i);
            outOfDeclared[i] = declared.isPresent() && !declared.get().contains(p.x());
            if (!sentinelShaped.test(p.x()) && !outOfDeclared[i]) {
                lo = Math.min(lo, p.x());
                hi = Math.max(hi, p.x());
            }
        }
        if (lo > hi) {
            // Nothing ordinary to stand apart from: only the declared range can speak.
            for (int i = 0; i < m; i++) {
                if (outOfDeclared[i]) {
                    flagOutOfDeclared(points.get(i), new int[0], inBase);
                }
            }
            return out;
        }
        for (int i = 0; i < m; i++) {
            double x = points.get(i).x();
            inBase[i] = !outOfDeclared[i] && x >= lo && x <= hi;
        }
        // Sentinel-shaped values beyond the ordinary range, nearest first: one that does not stand apart joins the
        // bulk (a 1..9 scale keeps its 7, 8, 9), so the next one is judged against the widened bulk.
        List<Integer> outer = new ArrayList<>();
        for (int i = 0; i < m; i++) {
            if (!inBase[i] && !outOfDeclared[i]) {
                outer.add(i);
            }
        }
        final double lo0 = lo;
        final double hi0 = hi;
        outer.sort(Comparator.comparingDouble(i -> distanceOutside(points.get(i).x(), lo0, hi0)));
        List<Integer> flagged = new ArrayList<>();
        for (int i : outer) {
            Bulk bulk = new Bulk(inBase);
            Separation s = bulk.separation(points.get(i).x());
            if (s.apart()) {
                flagged.add(i);
            } else {
                inBase[i] = true;
            }
        }
        Bulk bulk = new Bulk(inBase);
        for (int i : flagged) {
            Point p = points.get(i);
            if (p.count() >= floor) {
                Separation s = bulk.separation(p.x());
                double ratio = spikeRatio(i, inBase, false);
                double conf = s.confidence() + (ratio >= SENTINEL_SPIKE_RATIO ? 0.1 : 0);
                out.add(candidate(p, sentinelKind, conf, s.words() + spikeWords(ratio)));
            }
        }
        for (int i = 0; i < m; i++) {
            Point p = points.get(i);
            if (outOfDeclared[i]) {
                flagOutOfDeclared(p, bulk.nearestIndices(p.x()), inBase);
            }
        }
        int baseDistinct = 0;
        for (boolean b : inBase) {
            baseDistinct += b ? 1 : 0;
        }
        int firstBase = -1;
        int lastBase = -1;
        for (int i = 0; i < m; i++) {
            if (inBase[i]) {
                lastBase = i;
                if (firstBase < 0) {
                    firstBase = i;
                }
            }
        }
        for (int i = 0; i < m; i++) {
            if (!inBase[i]) {
                continue;
            }
            Point p = points.get(i);
            if (p.count() < floor) {
                continue;
            }
            if (sentinelShaped.test(p.x())) {
                if (baseDistinct < MIN_DISTINCT_FOR_INLIER) {
                    continue; // the shares of a short scale's points are arbitrary: 9 may well be the favourite
                }
                double ratio = spikeRatio(i, inBase, roundSentinels);
                if (ratio >= SENTINEL_SPIKE_RATIO && beyondChance(p.count(), p.count() / ratio, SENTINEL_CHANCE)) {
                    double conf = ratio >= 4 * SENTINEL_SPIKE_RATIO ? 0.75 : 0.6;
                    out.add(candidate(p, sentinelKind, conf, "lies inside the bulk of the values but"
                            + spikeWords(ratio)));
                }
            } else if (baseDistinct >= MIN_DISTINCT_FOR_INLIER && i != firstBase && i != lastBase) {
                // The ends of a bounded scale pile up naturally (floor and ceiling effects), so only inner values.
                double ratio = spikeRatio(i, inBase, true);
                if (ratio >= INLIER_SPIKE_RATIO && beyondChance(p.count(), p.count() / ratio, CHANCE)) {
                    double conf = ratio >= 3 * INLIER_SPIKE_RATIO ? 0.55 : 0.4;
                    out.add(candidate(p, CandidateKind.INLIER_SPIKE, conf, "lies inside the bulk of the values but"
                            + spikeWords(ratio)));
                }
            }
        }
        return out;
    }

    private void flagOutOfDeclared(Point p, int[] nearest, boolean[] inBase) {
        if (p.count() < floor) {
            return; // a stray value outside the range is a range violation, not a code
        }
        ValueRange r = declared.orElseThrow();
        boolean shaped = sentinelShaped.test(p.x());
        double ratio = nearest.length == 0 ? Double.POSITIVE_INFINITY : p.count() / medianCount(nearest);
        double conf = (shaped ? 0.9 : 0.75) + (ratio >= SENTINEL_SPIKE_RATIO ? 0.05 : 0);
        String where = r.isBelow(p.x()) ? "below" : "above";
        String words = "lies " + where + " the declared range " + r + (Double.isInfinite(ratio) ? "" : spikeWords(ratio));
        out.add(candidate(p, shaped ? sentinelKind : CandidateKind.OUT_OF_RANGE_SENTINEL, conf, words));
    }

    private MissingCandidate candidate(Point p, CandidateKind kind, double confidence, String words) {
        double share = denominator == 0 ? 0 : Math.min(1, (double) p.count() / denominator);
        String evidence = p.raw() + " occurs " + p.count() + (p.count() == 1 ? " time" : " times") + " ("
                + DisguisedMissingDetector.percent(share) + " of the non-null answers) and " + words + ".";
        return new MissingCandidate(p.raw(), kind, p.count(), share, Math.min(0.98, confidence), evidence);
    }

    private static String spikeWords(double ratio) {
        if (Double.isInfinite(ratio) || Double.isNaN(ratio)) {
            return "";
        }
        if (ratio >= 2) {
            return ", occurring " + Math.round(ratio) + " times as often as the median of its nearest neighbouring values";
        }
        return "";
    }

    /**
     * Count of point i over the median count of its nearest distinct bulk values, up to three on each side; for inner
     * ordinary values only neighbours at least as round are compared, so heaping on 10s or 1000s is not a spike.
     */
    private double spikeRatio(int i, boolean[] inBase, boolean sameRoundness) {
        double r = roundness.applyAsDouble(points.get(i).x());
        List<Long> below = new ArrayList<>();
        List<Long> above = new ArrayList<>();
        // Neighbours as round as this value may lie far off in a narrow distribution (10 beside 20 in answers
        // centred on 10); only those within one interquartile range of it are comparable.
        double x = points.get(i).x();
        double window = sameRoundness ? bulkWindow(inBase) : Double.POSITIVE_INFINITY;
        for (int j = i - 1; j >= 0 && below.size() < NEIGHBOURS_EACH_SIDE && x - points.get(j).x() <= window; j--) {
            if (inBase[j] && (!sameRoundness || roundness.applyAsDouble(points.get(j).x()) >= r)) {
                below.add(points.get(j).count());
            }
        }
        for (int j = i + 1; j < points.size() && above.size() < NEIGHBOURS_EACH_SIDE
                && points.get(j).x() - x <= window; j++) {
            if (inBase[j] && (!sameRoundness || roundness.applyAsDouble(points.get(j).x()) >= r)) {
                above.add(points.get(j).count());
            }
        }
        if (sameRoundness && (below.isEmpty() || above.isEmpty())) {
            return 0;
        }
        List<Long> all = new ArrayList<>(below);
        all.addAll(above);
        if (all.isEmpty()) {
            return 0;
        }
        double med = Quantiles.median(all.stream().mapToDouble(Long::doubleValue).sorted().toArray());
        return points.get(i).count() / Math.max(1.0, med);
    }

    private Bulk windowBulk;

    private double bulkWindow(boolean[] inBase) {
        if (windowBulk == null) {
            windowBulk = new Bulk(inBase);
        }
        double iqr = windowBulk.q3 - windowBulk.q1;
        return Math.max(iqr, 3 * (Double.isNaN(windowBulk.spacing) ? 0 : windowBulk.spacing));
    }

    /**
     * True when a count this large is very unlikely (below {@value #CHANCE} for ordinary values, {@value #SENTINEL_CHANCE} for
     * sentinel-shaped ones) for a Poisson count with the neighbours'
     * median as its mean: with one or two answers per neighbouring value, five or six on one value is chance.
     */
    private static boolean beyondChance(long count, double neighbourMedian, double chance) {
        double upper = 1 - new PoissonDistribution(null, Math.max(1.0, neighbourMedian),
                PoissonDistribution.DEFAULT_EPSILON, PoissonDistribution.DEFAULT_MAX_ITERATIONS)
                .cumulativeProbability((int) Math.min(Integer.MAX_VALUE, count - 1));
        return upper < chance;
    }

    /** For ordinary values, whose shape gives no reason for suspicion. */
    static final double CHANCE = 1e-6;
    /** For sentinel-shaped values, whose shape is already part of the evidence. */
    static final double SENTINEL_CHANCE = 1e-5;

    private double medianCount(int[] idx) {
        double med = Quantiles.median(Arrays.stream(idx).mapToDouble(j -> points.get(j).count()).sorted().toArray());
        return Math.max(1.0, med);
    }

    private static double distanceOutside(double x, double lo, double hi) {
        return x < lo ? lo - x : x - hi;
    }

    /** How a value stands relative to the bulk: the reasons it stands apart, if any. */
    private record Separation(boolean apart, double confidence, String words) {
    }

    /** The weighted bulk of the ordinary values: quartiles, ends, typical spacing between distinct values. */
    private final class Bulk implements Quantiles.Table {
        final double q1;
        final double q3;
        final double min;
        final double max;
        final double spacing;
        final int[] indices;

        Bulk(boolean[] inBase) {
            List<Integer> idx = new ArrayList<>();
            for (int i = 0; i < inBase.length; i++) {
                if (inBase[i]) {
                    idx.add(i);
                }
            }
            indices = idx.stream().mapToInt(Integer::intValue).toArray();
            min = points.get(indices[0]).x();
            max = points.get(indices[indices.length - 1]).x();
            q1 = Quantiles.inverse(this, 0.25);
            q3 = Quantiles.inverse(this, 0.75);
            double[] gaps = new double[Math.max(0, indices.length - 1)];
            for (int k = 1; k < indices.length; k++) {
                gaps[k - 1] = points.get(indices[k]).x() - points.get(indices[k - 1]).x();
            }
            Arrays.sort(gaps);
            spacing = Quantiles.median(gaps);
        }

        @Override
        public int size() {
            return indices.length;
        }

        @Override
        public double value(int i) {
            return points.get(indices[i]).x();
        }

        @Override
        public long count(int i) {
            return points.get(indices[i]).count();
        }

        int[] nearestIndices(double x) {
            return Arrays.stream(indices).boxed()
                    .sorted(Comparator.comparingDouble(i -> Math.abs(points.get(i).x() - x)))
                    .limit(NEIGHBOURS_EACH_SIDE).mapToInt(Integer::intValue).toArray();
        }

        Separation separation(double x) {
            double iqr = q3 - q1;
            double scale = iqr > 0 ? iqr : (Double.isNaN(spacing) ? 0 : spacing);
            List<String> why = new ArrayList<>();
            double conf = 0;
            // Dates are told in time before or after the others; their day numbers' sign (1970) means nothing.
            boolean dates = sentinelKind == CandidateKind.SENTINEL_DATE;
            if (scale > 0 && (x > q3 + FENCE_IQR * scale || x < q1 - FENCE_IQR * scale)) {
                double k = x > q3 ? (x - q3) / scale : (q1 - x) / scale;
                why.add(dates ? "lies " + units.distance(x > q3 ? x - q3 : q1 - x) + (x > q3 ? " after the latest"
                        : " before the earliest") + " quarter of the other dates (" + DisguisedMissingDetector
                        .oneDecimal(k) + " times the " + (iqr > 0 ? "span of their middle half" : "usual step between"
                        + " them") + ")"
                        : "lies " + DisguisedMissingDetector.oneDecimal(k) + (iqr > 0 ? " IQR " : " value spacings ")
                        + (x > q3 ? "above the upper" : "below the lower") + " quartile of the other values");
                conf = Math.max(conf, 0.85);
            }
            if (x < 0 && min >= 0 && !dates) {
                why.add("is negative while every other value is zero or more");
                conf = Math.max(conf, 0.8);
            }
            double gap = x > max ? x - max : min - x;
            if (gap > 0 && !Double.isNaN(spacing) && spacing > 0 && gap >= GAP_SPACINGS * spacing) {
                why.add("is " + units.distance(gap) + (dates ? (x > max ? " after the latest other date, "
                        : " before the earliest other date, ") + Math.round(gap / spacing) + " times the usual step"
                        + " between dates" : (x > max ? " above the largest" : " below the smallest") + " other value, "
                        + Math.round(gap / spacing) + " times the usual step between values"));
                conf = Math.max(conf, 0.6);
            } else if (gap > 0 && Double.isNaN(spacing)) {
                why.add("is set apart from the single other value");
                conf = Math.max(conf, 0.6);
            }
            return new Separation(!why.isEmpty(), conf, String.join(", ", why));
        }
    }
}
