package org.wavewarden.compare.categorical;

import org.wavewarden.compare.EffectSize;

/**
 * Cramér's V, the chi-square statistic rescaled to [0, 1]: V = sqrt(X2 / (n (min(r, c) - 1))) (Cramér 1946,
 * Mathematical Methods of Statistics, section 21.9).
 *
 * <p>The confidence interval inverts the noncentral chi-square distribution for the noncentrality (Smithson 2003; as
 * MBESS's {@code conf.limits.nc.chisq}) and maps each limit lambda to sqrt(lambda / (n (min(r, c) - 1))), the same
 * map that takes X2 to V. When X2 falls far below its degrees of freedom both limits can be 0 while the plug-in
 * estimate is positive; the interval then says "no association" and is the part to read.
 *
 * <p>{@link #biasCorrected} is Bergsma's (2013, Journal of the Korean Statistical Society 42, 323-328) correction,
 * which removes most of the upward bias of V in small samples.
 *
 * <p>V has no sign; rows and columns with zero totals are dropped as in {@link ChiSquareHomogeneity}.
 */
public final class CramersV {

    static final String NAME = "Cramér's V";

    private CramersV() {
    }

    public static EffectSize estimate(long[][] table, double confidence) {
        ChiSquareResult chi = ChiSquareHomogeneity.test(table);
        double n = n(table);
        int k = Math.min(chi.keptRows().length, chi.keptColumns().length);
        if (k < 2) {
            return new EffectSize(NAME, 0, 0, 0, confidence);
        }
        double scale = n * (k - 1);
        double x2 = chi.test().statistic();
        double[] ncp = NoncentralityInterval.of(x2, chi.test().df(), confidence);
        return new EffectSize(NAME, Math.sqrt(x2 / scale), Math.sqrt(ncp[0] / scale), Math.sqrt(ncp[1] / scale),
                confidence);
    }

    /**
     * V of a two-wave table from its chi-square statistic and total: {@code sqrt(X2 / n)} (a 2 x k table has
     * min(r, c) - 1 = 1), with the same noncentral chi-square interval as {@link #estimate}. For weighted waves the
     * monitor passes X2 of the weighted shares scaled to Kish's effective sample sizes and n their sum.
     *
     * @param name the effect's name in the finding
     */
    public static EffectSize ofTwoWaveChiSquare(String name, double x2, double df, double n, double confidence) {
        if (!(n > 0) || Double.isInfinite(n)) {
            throw new IllegalArgumentException("n must be finite and positive, was " + n);
        }
        if (!(x2 >= 0)) {
            throw new IllegalArgumentException("x2 must be >= 0, was " + x2);
        }
        EffectSize w = CohensW.fromStatistic(x2, df, n, confidence);
        return new EffectSize(name, w.estimate(), w.ciLow(), w.ciHigh(), confidence);
    }

    /**
     * The interval of a two-wave V at a given effective sample size: the noncentral chi-square interval of the
     * statistic {@code n_eff V^2} on {@code df}, mapped back as in {@link #ofTwoWaveChiSquare}; the estimate stays
     * V. Under a complex survey design {@code n_eff = n / dbar}, dbar the mean generalised design effect of the
     * Rao-Scott test, so that the statistic is Rao and Scott's (1981, JASA 76, 221-230) first-order corrected
     * chi-square ({@code X2 / dbar}, R's {@code svychisq(..., statistic = "Chisq")} p-value); a design that makes the
     * shares less precise than simple random sampling widens the interval by about sqrt(dbar).
     */
    public static EffectSize atEffectiveSize(String name, double v, double df, double effectiveN,
                                             double confidence) {
        if (!(v >= 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException("v must be finite and >= 0, was " + v);
        }
        return ofTwoWaveChiSquare(name, v * v * effectiveN, df, effectiveN, confidence);
    }

    /** Bergsma's (2013) bias-corrected V; 0 when the corrected phi-square is not positive. */
    public static double biasCorrected(long[][] table) {
        ChiSquareResult chi = ChiSquareHomogeneity.test(table);
        double n = n(table);
        int r = chi.keptRows().length;
        int c = chi.keptColumns().length;
        if (r < 2 || c < 2 || n < 2) {
            return 0;
        }
        double phi2 = chi.test().statistic() / n;
        double phi2Corrected = Math.max(0, phi2 - (r - 1.0) * (c - 1.0) / (n - 1));
        double rCorrected = r - (r - 1.0) * (r - 1.0) / (n - 1);
        double cCorrected = c - (c - 1.0) * (c - 1.0) / (n - 1);
        double denominator = Math.min(rCorrected - 1, cCorrected - 1);
        return denominator > 0 ? Math.sqrt(phi2Corrected / denominator) : 0;
    }

    static double n(long[][] table) {
        return ContingencyTables.total(ContingencyTables.rowTotals(table));
    }
}
