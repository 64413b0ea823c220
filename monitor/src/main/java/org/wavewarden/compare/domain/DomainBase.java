package org.wavewarden.compare.domain;

import org.wavewarden.missing.ValidNumber;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * One measure's sufficient statistic over some rows of one wave (a domain, several domains pooled, or the whole
 * wave): the distinct values that enter it, each with its 0/1 or numeric value {@code y}, its number of rows and its
 * sums of {@code w} and {@code w^2}. The measure is the ratio {@code R = sum w y / sum w} over these cells; without
 * weights every row weighs 1, so that {@code sum w = sum w^2 = rows}.
 *
 * <p>A numeric column summarised in relative bins enters at its bins' stand-ins, as the tally holds them: a mean
 * is then that of the stand-ins, within the binning's stated relative error of the true mean.
 *
 * @param cells  the cells; rows with a value outside the measure (missing codes, excluded values, NULLs of a SHARE
 *               or MEAN) are in none
 * @param binned whether a tally held bin stand-ins instead of values
 */
record DomainBase(List<Cell> cells, boolean binned) {

    /**
     * One distinct value.
     *
     * @param y       the value the ratio averages: 1 or 0 for a SHARE or RATE, the number for a MEAN
     * @param count   rows
     * @param weight  sum of w
     * @param squares sum of w^2
     */
    record Cell(double y, long count, double weight, double squares) {
    }

    static final DomainBase EMPTY = new DomainBase(List.of(), false);

    DomainBase {
        cells = List.copyOf(cells);
    }

    /**
     * The measure's cells of one tally.
     *
     * @param weights {sum w, sum w^2} per value, or null to count every row as weight 1 (and always for a RATE,
     *                which is a share of rows)
     */
    static DomainBase of(DomainMeasure m, ColumnTally tally, Map<String, double[]> weights) {
        List<Cell> cells = new ArrayList<>();
        if (m.kind() == DomainMeasure.Kind.RATE) {
            // A share of rows: every row is in the base, a NULL row counts as a target when NULL is a target.
            long target = 0;
            for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
                if (m.target().contains(e.getKey())) {
                    target += e.getValue();
                }
            }
            if (m.target().contains(DomainMeasure.NULL)) {
                target += tally.nullCount();
            }
            long other = tally.rowCount() - target;
            cells.add(new Cell(1, target, target, target));
            cells.add(new Cell(0, other, other, other));
            return new DomainBase(cells, false);
        }
        for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
            String v = e.getKey();
            Double y = y(m, v);
            if (y == null) {
                continue;
            }
            long n = e.getValue();
            double[] ws = weights == null ? new double[] {n, n} : weights.getOrDefault(v, new double[2]);
            cells.add(new Cell(y, n, ws[0], ws[1]));
        }
        return new DomainBase(cells, !tally.binning().equals(org.wavewarden.profile.Binning.EXACT));
    }

    /** The value a valid answer enters with, or null when the text is not a valid answer of the measure. */
    static Double y(DomainMeasure m, String text) {
        if (m.excluded().contains(text)) {
            return null;
        }
        return switch (m.kind()) {
            case SHARE -> m.target().contains(text) ? 1.0 : 0.0;
            case MEAN -> ValidNumber.parse(text);
            case RATE -> m.target().contains(text) ? 1.0 : 0.0;
        };
    }

    /** The cells of several bases together (pooled domains). */
    static DomainBase pooled(List<DomainBase> bases) {
        List<Cell> all = new ArrayList<>();
        boolean binned = false;
        for (DomainBase b : bases) {
            all.addAll(b.cells);
            binned |= b.binned;
        }
        return new DomainBase(all, binned);
    }

    /** Rows in the base (valid answers; every row for a RATE). */
    long count() {
        long n = 0;
        for (Cell c : cells) {
            n += c.count;
        }
        return n;
    }

    /** {@code sum w} over the base. */
    double weight() {
        double w = 0;
        for (Cell c : cells) {
            w += c.weight;
        }
        return w;
    }

    /** The ratio {@code sum w y / sum w}; NaN without weight. */
    double estimate() {
        double wy = 0;
        double w = 0;
        for (Cell c : cells) {
            wy += c.weight * c.y;
            w += c.weight;
        }
        return w > 0 ? wy / w : Double.NaN;
    }

    /**
     * {@code sum_i z_i^2} of the ratio's linearised scores {@code z_i = w_i (y_i - R) / sum w} (Woodruff 1971):
     * respondents of one cell share their residual, so the sum collapses onto the cells' {@code sum w^2}. Times
     * {@code n/(n-1)} it is the variance with each respondent its own PSU, drawn with replacement, since the scores
     * of a ratio sum to zero (Wolter 2007, Chapter 6).
     */
    double squaredScores() {
        double r = estimate();
        double w = weight();
        double s = 0;
        for (Cell c : cells) {
            double d = c.y - r;
            s += c.squares * d * d;
        }
        return s / (w * w);
    }

    /**
     * The PSU totals of the ratio's linearised scores, {@code z_p = (Y_p - R X_p) / X} with {@code Y_p} and
     * {@code X_p} the PSU sums of {@code w y} and {@code w} over the base, or null when the design's PSU sums do not
     * show the base (a value of the base whose PSU sums were not kept).
     *
     * @param m      the measure (SHARE or MEAN)
     * @param tally  the tally the base was made of
     * @param design the PSU sums of the same rows
     */
    double[] psuScores(DomainMeasure m, ColumnTally tally, DesignSummary.ColumnDesign design) {
        double[] x;
        double[] yw;
        if (design.complete()) {
            x = null;
            yw = null;
            for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
                Double y = y(m, e.getKey());
                if (y == null) {
                    continue;
                }
                double[] sums = design.cells().get(e.getKey());
                if (sums == null) {
                    return null;
                }
                if (x == null) {
                    x = new double[sums.length];
                    yw = new double[sums.length];
                } else if (sums.length != x.length) {
                    return null; // PSU sums of another design: not to be trusted
                }
                for (int p = 0; p < sums.length; p++) {
                    x[p] += sums[p];
                    yw[p] += sums[p] * y;
                }
            }
            if (x == null) {
                return null;
            }
        } else {
            // All non-null answers' PSU sums less the values outside the base: the left-out values must be kept
            // by value (code-like), and a SHARE's targets too.
            if (design.weight() == null || (m.kind() == DomainMeasure.Kind.MEAN && (design.weightedSum() == null
                    || design.weightedSum().length != design.weight().length))) {
                return null;
            }
            x = design.weight().clone();
            yw = m.kind() == DomainMeasure.Kind.MEAN ? design.weightedSum().clone() : new double[x.length];
            for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
                String v = e.getKey();
                Double y = y(m, v);
                boolean out = y == null || (m.kind() == DomainMeasure.Kind.MEAN && !Double.isFinite(y));
                boolean target = m.kind() == DomainMeasure.Kind.SHARE && y != null && y == 1.0;
                if (!out && !target) {
                    continue;
                }
                double[] sums = design.cells().get(v);
                if (sums == null || sums.length != x.length) {
                    return null;
                }
                Double number = ValidNumber.parse(v);
                for (int p = 0; p < x.length; p++) {
                    if (out) {
                        x[p] -= sums[p];
                        if (m.kind() == DomainMeasure.Kind.MEAN && number != null) {
                            yw[p] -= sums[p] * number;
                        }
                    } else {
                        yw[p] += sums[p];
                    }
                }
            }
        }
        // The ratio is linearised at its own PSU sums, so that the scores sum to zero: with binned numbers the
        // PSU sums hold the exact values while the cells hold stand-ins, and the variance is then the exact mean's.
        double total = 0;
        double sum = 0;
        for (int p = 0; p < x.length; p++) {
            total += x[p];
            sum += yw[p];
        }
        if (!(total > 0)) {
            return null;
        }
        double r = sum / total;
        double[] z = new double[x.length];
        for (int p = 0; p < z.length; p++) {
            z[p] = (yw[p] - r * x[p]) / total;
        }
        return z;
    }
}
