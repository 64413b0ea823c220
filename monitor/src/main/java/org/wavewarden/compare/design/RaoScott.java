package org.wavewarden.compare.design;

import java.util.Arrays;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Gamma;
import org.wavewarden.compare.TestResult;

/**
 * Rao-Scott corrected chi-square test that a categorical variable has the same distribution in two independently
 * sampled waves, each under its own survey design.
 *
 * <p>The waves are stacked into one design whose strata are wave x stratum. The 2k cell proportions
 * {@code p_jw} (category j, wave w, shares of the total weight) and their design-based covariance {@code V} come
 * from Taylor linearisation ({@link WeightedEstimates}). With a basis {@code C} of the interaction contrasts
 * (orthogonal to the row and column main effects), {@code D = diag(p)} and n the stacked sample size, the design
 * effect matrix is {@code Delta = (C' D^-1 C / n)^-1 (C' D^-1 V D^-1 C)}; its eigenvalues are the generalized design
 * effects. Pearson's X2 is computed on the weighted table scaled to total n. First-order correction:
 * {@code X2 / mean(eigenvalues)} on chi-square with k - 1 df. Second-order (Satterthwaite) F form:
 * {@code F = X2 / tr(Delta)} on {@code d0 = tr(Delta)^2 / tr(Delta^2)} and {@code d0 * nu} df, nu = #PSU - #strata
 * of the stacked design. Sources: Rao, J. N. K. and Scott, A. J. (1981), "The analysis of categorical data from
 * complex sample surveys", JASA 76, 221-230; Rao, J. N. K. and Scott, A. J. (1984), "On chi-squared tests for
 * multiway contingency tables with cell proportions estimated from survey data", Annals of Statistics 12, 46-60;
 * Thomas, D. R. and Rao, J. N. K. (1987), JASA 82, 630-636 (the F form); as implemented in R's
 * {@code svychisq(~cat + wave, design, statistic = "Chisq" | "F")} (Lumley, T. (2010), Complex Surveys, Wiley).
 *
 * <p>The cell proportions are shares of the combined weight, so the waves' weights should be on a comparable scale
 * (for instance both summing to the population size); this is also how R treats the stacked data.
 */
public final class RaoScott {

    public static final String FIRST_ORDER = "Rao-Scott chi-square (first order)";
    public static final String SECOND_ORDER = "Rao-Scott F (second order)";

    private RaoScott() {
    }

    /**
     * @param baselineCategories category code of each baseline respondent
     * @param baseline           the baseline wave's design
     * @param currentCategories  category code of each current respondent
     * @param current            the current wave's design
     * @throws IllegalArgumentException on mismatched lengths, fewer than 2 observed categories, or no design
     *                                  degrees of freedom
     */
    public static RaoScottResult test(int[] baselineCategories, SurveyDesign baseline, int[] currentCategories,
                                      SurveyDesign current) {
        if (baselineCategories == null || currentCategories == null) {
            throw new IllegalArgumentException("baselineCategories and currentCategories must not be null");
        }
        SurveyDesign.checkValues("baselineCategories", baselineCategories.length, baseline);
        SurveyDesign.checkValues("currentCategories", currentCategories.length, current);
        int n1 = baselineCategories.length;
        int n = n1 + currentCategories.length;
        int[] all = new int[n];
        System.arraycopy(baselineCategories, 0, all, 0, n1);
        System.arraycopy(currentCategories, 0, all, n1, currentCategories.length);
        int[] codes = Arrays.stream(all).distinct().sorted().toArray();
        int k = codes.length;
        if (k < 2) {
            throw new IllegalArgumentException("the waves hold " + k + " distinct category, need at least 2");
        }
        SurveyDesign stacked = SurveyDesign.stack(baseline, current);
        int nu = stacked.degreesOfFreedom();
        if (nu <= 0) {
            throw new IllegalArgumentException("the designs have no degrees of freedom (#PSU - #strata = 0)");
        }
        // Cell (j, w) is column j + k w: category varies fastest.
        double[][] cells = new double[2 * k][n];
        for (int i = 0; i < n; i++) {
            cells[Arrays.binarySearch(codes, all[i]) + (i < n1 ? 0 : k)][i] = 1;
        }
        WeightedEstimates.Means m = WeightedEstimates.means(cells, stacked);
        return corrected(codes, m.means(), m.covariance(), n, nu);
    }

    /**
     * The same test from the two waves' {@link WeightedTally} tallies under weights-only designs (each respondent its
     * own PSU; R: {@code svydesign(ids = ~1, strata = ~wave, weights = ~w)} on the stacked rows). Values are
     * category codes (integers); categories without weight in either wave are left out, as they would be absent
     * from the rows. The covariance of the 2k cell shares is exact from the per-category sums: with {@code T} the
     * weight of both waves, cell c = (j, h) and {@code z_i[c] = w_i (1[c = cell of i] - p_c) / T}, wave h contributes
     * {@code n_h/(n_h - 1) (sum_i z_i z_i' - S_h S_h' / n_h)}, and {@code sum_i z_i[c] z_i[d]} is a sum over the
     * categories of wave h of {@code Q_jh (1[c = (j, h)] - p_c)(1[d = (j, h)] - p_d) / T^2}.
     *
     * @throws IllegalArgumentException with fewer than 2 respondents in a wave, fewer than 2 categories with weight,
     *                                  or a wave without weight
     */
    public static RaoScottResult test(WeightedTally baseline, WeightedTally current) {
        TallyEstimates.check(baseline);
        TallyEstimates.check(current);
        java.util.TreeMap<Integer, double[]> cells = new java.util.TreeMap<>(); // code -> {W0, Q0, W1, Q1}
        WeightedTally[] waves = {baseline, current};
        for (int h = 0; h < 2; h++) {
            WeightedTally t = waves[h];
            for (int i = 0; i < t.size(); i++) {
                double[] c = cells.computeIfAbsent(TallyEstimates.code(t.value(i)), x -> new double[4]);
                c[2 * h] += t.weight(i);
                c[2 * h + 1] += t.squaredWeight(i);
            }
        }
        cells.values().removeIf(c -> !(c[0] + c[2] > 0));
        int k = cells.size();
        if (k < 2) {
            throw new IllegalArgumentException("the waves hold " + k + " category with weight, need at least 2");
        }
        int[] codes = cells.keySet().stream().mapToInt(Integer::intValue).toArray();
        double[] w = new double[2 * k];
        double[] q = new double[2 * k];
        int j = 0;
        for (double[] c : cells.values()) {
            w[j] = c[0];
            q[j] = c[1];
            w[j + k] = c[2];
            q[j + k] = c[3];
            j++;
        }
        double total = 0;
        for (double x : w) {
            total += x;
        }
        double[] p = new double[2 * k];
        for (int c = 0; c < 2 * k; c++) {
            p[c] = w[c] / total;
        }
        double[][] v = new double[2 * k][2 * k];
        for (int h = 0; h < 2; h++) {
            double[] wh = new double[2 * k];
            double[] qh = new double[2 * k];
            System.arraycopy(w, h * k, wh, h * k, k);
            System.arraycopy(q, h * k, qh, h * k, k);
            double[][] vh = DesignVariance.weightsOnlyShares(waves[h].n(), total, wh, qh, p);
            for (int c = 0; c < 2 * k; c++) {
                for (int d = 0; d < 2 * k; d++) {
                    v[c][d] += vh[c][d];
                }
            }
        }
        long n = baseline.n() + current.n();
        return corrected(codes, p, v, n, n - 2);
    }

    /**
     * The same test from the two waves' {@link PsuTally} tallies under stratified cluster designs: the stacked
     * design has strata wave x stratum and the PSUs of the two waves are distinct, as in
     * {@link #test(int[], SurveyDesign, int[], SurveyDesign)}. Values are category codes (integers); categories
     * without weight in either wave are left out. Cell (j, w) of PSU p holds {@code W_jp} in its own wave and
     * nothing in the other, so the PSU totals of the linearised cell shares are {@code (W_jp - p_jw W_p) / T} and
     * {@code -p_jw W_p / T}, with {@code T} the weight of both waves; the corrections are those of the row-level
     * form (Rao and Scott 1984, Annals of Statistics 12, 46-60; Lumley 2010).
     *
     * <p>Respondents without a valid answer are handled by the domain rule of {@link PsuTotals}: the variance keeps
     * every PSU of both designs, n counts the valid answers and {@code nu} is the sum of the waves'
     * {@link PsuTally#degreesOfFreedom()}. This is R's {@code svychisq(~cat + wave, subset(stacked, !is.na(cat)))}.
     * Called on the stacked design without the subset, svychisq scales X2 to every row, answered or not, and takes
     * {@code nu} from every PSU, with or without answers, unlike {@code degf} and {@code svyttest}: its F, ndf and
     * first-order p are the same, its X2 and ddf larger.
     *
     * @throws IllegalArgumentException with fewer than 2 categories with weight, a wave with fewer than 2 answers or
     *                                  without weight, or no design degrees of freedom
     */
    public static RaoScottResult test(PsuTally baseline, PsuTally current) {
        if (baseline == null || current == null) {
            throw new IllegalArgumentException("baseline and current tallies must not be null");
        }
        PsuTally[] waves = {baseline, current};
        double[][] psuWeights = {baseline.psuWeights(), current.psuWeights()};
        java.util.TreeMap<Integer, double[][]> byCode = new java.util.TreeMap<>(); // code -> weight per wave, PSU
        for (int h = 0; h < 2; h++) {
            PsuTally t = waves[h];
            double total = 0;
            for (double w : psuWeights[h]) {
                total += w;
            }
            PsuTotals.checkEstimable(t.n(), total);
            for (int v = 0; v < t.size(); v++) {
                double[][] cell = byCode.computeIfAbsent(TallyEstimates.code(t.value(v)),
                        x -> new double[][] {new double[baseline.psuCount()], new double[current.psuCount()]});
                for (int p = 0; p < t.psuCount(); p++) {
                    cell[h][p] += t.weight(v, p);
                }
            }
        }
        byCode.values().removeIf(c -> !(Arrays.stream(c[0]).sum() + Arrays.stream(c[1]).sum() > 0));
        int k = byCode.size();
        if (k < 2) {
            throw new IllegalArgumentException("the waves hold " + k + " category with weight, need at least 2");
        }
        int p1 = baseline.psuCount();
        int psus = p1 + current.psuCount();
        int strata1 = DesignVariance.psusInStratum(baseline.psuStratum()).length;
        int[] psuStratum = new int[psus];
        double[] psuWeight = new double[psus];
        for (int p = 0; p < psus; p++) {
            boolean first = p < p1;
            psuStratum[p] = first ? baseline.stratumOf(p) : current.stratumOf(p - p1) + strata1;
            psuWeight[p] = first ? psuWeights[0][p] : psuWeights[1][p - p1];
        }
        // Cell (j, w) is row j + k w: category varies fastest, as in the row-level form.
        double[][] cells = new double[2 * k][psus];
        int j = 0;
        for (double[][] c : byCode.values()) {
            System.arraycopy(c[0], 0, cells[j], 0, p1);
            System.arraycopy(c[1], 0, cells[j + k], p1, psus - p1);
            j++;
        }
        long n = baseline.n() + current.n();
        int nu = baseline.degreesOfFreedom() + current.degreesOfFreedom();
        if (nu <= 0) {
            throw new IllegalArgumentException("the designs have no degrees of freedom (#PSU - #strata = 0)");
        }
        int[] codes = byCode.keySet().stream().mapToInt(Integer::intValue).toArray();
        WeightedEstimates.Means m = WeightedEstimates.means(psuStratum, psuWeight, cells, cells, n);
        return corrected(codes, m.means(), m.covariance(), n, nu);
    }

    /** The corrections from the 2k cell shares (category fastest) and their covariance. */
    private static RaoScottResult corrected(int[] codes, double[] p, double[][] covariance, long n, long nu) {
        int k = codes.length;

        double x2 = pearson(p, k, n);
        RealMatrix c = contrasts(k);
        double[] inv = new double[2 * k];
        for (int cell = 0; cell < 2 * k; cell++) {
            inv[cell] = p[cell] == 0 ? 0 : 1 / p[cell];
        }
        RealMatrix dInv = new Array2DRowRealMatrix(2 * k, 2 * k);
        for (int cell = 0; cell < 2 * k; cell++) {
            dInv.setEntry(cell, cell, inv[cell]);
        }
        RealMatrix cd = c.transpose().multiply(dInv);
        RealMatrix denominator = cd.multiply(c).scalarMultiply(1.0 / n);
        RealMatrix numerator = cd.multiply(new Array2DRowRealMatrix(covariance, false)).multiply(dInv).multiply(c);
        RealMatrix delta = new LUDecomposition(denominator).getSolver().solve(numerator);
        double trace = delta.getTrace();
        double trace2 = delta.multiply(delta).getTrace();
        double[] eigen = new EigenDecomposition(delta).getRealEigenvalues().clone();
        Arrays.sort(eigen);
        double[] descending = new double[eigen.length];
        for (int i = 0; i < eigen.length; i++) {
            descending[i] = eigen[eigen.length - 1 - i];
        }

        int df = k - 1;
        double meanDeff = trace / df;
        double first = x2 / meanDeff;
        // Upper tails straight from the incomplete gamma and beta functions, so tiny p-values keep their digits.
        double pFirst = Gamma.regularizedGammaQ(df / 2.0, first / 2);
        double f = x2 / trace;
        double d0 = trace * trace / trace2;
        double ddf = d0 * nu;
        double pSecond = Beta.regularizedBeta(ddf / (ddf + d0 * f), ddf / 2, d0 / 2);
        return new RaoScottResult(codes, x2, descending, meanDeff,
                new TestResult(FIRST_ORDER, first, df, clamp(pFirst), "categories - 1"),
                new TestResult(SECOND_ORDER, f, d0, clamp(pSecond), "tr(Delta)^2 / tr(Delta^2)"), ddf);
    }

    private static double clamp(double p) {
        return Math.max(0, Math.min(1, p));
    }

    private static double pearson(double[] p, int k, long n) {
        double[] wave = new double[2];
        double[] row = new double[k];
        for (int w = 0; w < 2; w++) {
            for (int j = 0; j < k; j++) {
                wave[w] += p[j + k * w];
                row[j] += p[j + k * w];
            }
        }
        double x2 = 0;
        for (int w = 0; w < 2; w++) {
            for (int j = 0; j < k; j++) {
                double e = row[j] * wave[w];
                double d = p[j + k * w] - e;
                x2 += d * d / e;
            }
        }
        return n * x2;
    }

    /**
     * Columns {@code (e_a - e_k) x (e_1 - e_2)}, a = 1..k-1: they span the interaction space, orthogonal to the row
     * and column effects. Any basis of that space gives a similar Delta, hence the same eigenvalues.
     */
    private static RealMatrix contrasts(int k) {
        RealMatrix c = new Array2DRowRealMatrix(2 * k, k - 1);
        for (int a = 0; a < k - 1; a++) {
            c.setEntry(a, a, 1);
            c.setEntry(k - 1, a, -1);
            c.setEntry(a + k, a, -1);
            c.setEntry(k - 1 + k, a, 1);
        }
        return c;
    }
}
