package org.wavewarden.compare.domain;

import org.wavewarden.compare.StandardNormal;
import org.wavewarden.compare.design.DesignVariance;
import org.wavewarden.judge.multiplicity.BenjaminiHochberg;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DesignSummary;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.WaveProfile;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;

/**
 * Breaks one variable's change down by the domains of one column: pure functions of two waves' summaries.
 *
 * <p><b>Estimates.</b> Within each domain and wave the measure is a ratio {@code R_d = sum w y / sum w} over the
 * domain's base (its valid answers; every row for a RATE, with weight 1). Its variance is by Taylor linearisation
 * as R's {@code svyby(~y, ~domain, design, svymean, covmat = TRUE)} gives it, domain estimation over the whole
 * wave's design (Lumley, T. (2010), Complex Surveys, Wiley, section 2.4): the linearised score of respondent i for
 * domain d is {@code z_i = w_i 1[i in base of d] (y_i - R_d) / W_d}.
 * <ul>
 * <li>With a design, the PSU totals of every domain's scores, over every PSU of the wave, go through the with-
 * replacement stratified covariance of {@link DesignVariance}: domains sharing PSUs covary.</li>
 * <li>With weights only, each respondent is its own PSU in one stratum of the wave's n rows: {@code V_dd = n/(n-1)
 * sum_i z_i^2}, and two domains never covary, since no respondent is in two and each domain's scores sum to
 * zero.</li>
 * <li>Unweighted, the same with every weight 1 (R's {@code svydesign(ids = ~1)}); a RATE is always so, being a
 * question about records rather than the population.</li>
 * </ul>
 * The waves are independent samples, so a change's covariance is the sum of the waves'.
 *
 * <p><b>Heterogeneity.</b> Whether the domains changed alike is the Wald test of the domain-by-wave interaction,
 * {@code W = (C d)' (C V C')^+ (C d)} with d the domains' changes, V their full covariance and C the contrasts of
 * each domain against the last; it is {@code regTermTest(svyglm(y ~ domain * wave), ~domain:wave, method = "Wald",
 * df = Inf)} on the two waves stacked with wave-specific strata and PSUs. Rule for degenerate variances: a domain
 * whose change has no variance (every answer the same in both waves) carries no sampling evidence and is left out of
 * the test (it keeps its own row); the rest may still be dependent (a design with fewer PSUs than domains), so the
 * inverse is the Moore-Penrose pseudo-inverse and the degrees of freedom its rank. With fewer than two testable
 * domains the statistic is 0 with 0 degrees of freedom and p = 1: nothing speaks against equal changes. Without a
 * design V is diagonal, and W is computed in its closed form, Cochran's Q ({@link Wald#cochran}).
 *
 * <p><b>Decomposition.</b> A domain's share is its part of the measure's base over the whole wave (the weight of
 * its valid answers; its rows for a RATE). With {@code s} those shares and {@code m} the domains' measures the
 * overall measure is {@code sum s m} (plus the rows in no domain), and Kitagawa (1955, JASA 50, 1168-1194) splits
 * its change into {@code sum mean(s) change(m)}, each domain's contribution, and the rest, composition.
 */
public final class Breakdowns {

    private Breakdowns() {
    }

    /** How variances are made. */
    private enum Mode {
        UNWEIGHTED, WEIGHTED, DESIGN
    }

    /**
     * The breakdown of {@code measure} by {@code column} between two waves' summaries, weighted when
     * {@code weighted} and both summaries hold the variable's weights, design-based when both also hold a design.
     * Empty when either summary lacks the column's domain tallies or fewer than two domains have answers in both
     * waves. {@code qValue} of the result is null (the judge adjusts across the run).
     *
     * @param confidence the confidence of the intervals, 1 - alpha
     */
    public static Optional<Breakdown> of(String column, DomainMeasure measure, WaveProfile baseline,
                                         WaveProfile current, boolean weighted, double confidence) {
        String variable = measure.variable();
        Optional<DomainTally> ob = baseline.domains(column);
        Optional<DomainTally> oc = current.domains(column);
        if (ob.isEmpty() || oc.isEmpty() || !aligned(ob.get(), ob.get().tallies(), variable)
                || !aligned(oc.get(), oc.get().tallies(), variable) || baseline.rows() < 2 || current.rows() < 2) {
            return Optional.empty();
        }
        DomainTally bt = ob.get();
        DomainTally ct = oc.get();
        boolean rate = measure.kind() == DomainMeasure.Kind.RATE;
        Mode mode = rate || !weighted || !aligned(bt, bt.weights(), variable) || !aligned(ct, ct.weights(), variable)
                ? Mode.UNWEIGHTED
                : baseline.design() != null && current.design() != null && aligned(bt, bt.designs(), variable)
                  && aligned(ct, ct.designs(), variable) ? Mode.DESIGN : Mode.WEIGHTED;

        // Every kept domain of either wave, the current wave's order first.
        Set<String> labels = new LinkedHashSet<>(ct.domains());
        labels.addAll(bt.domains());
        List<String> compared = new ArrayList<>();
        List<String> leftOut = new ArrayList<>();
        List<DomainBase> before = new ArrayList<>();
        List<DomainBase> after = new ArrayList<>();
        for (String label : labels) {
            DomainBase b = base(measure, bt, label, mode);
            DomainBase a = base(measure, ct, label, mode);
            if (b.weight() > 0 && a.weight() > 0) {
                compared.add(label);
                before.add(b);
                after.add(a);
            } else {
                leftOut.add(label);
            }
        }
        if (compared.size() < 2) {
            return Optional.empty();
        }

        String designGap = null;
        double[][] vb = null;
        double[][] va = null;
        if (mode == Mode.DESIGN) {
            vb = designCovariance(measure, baseline.design(), bt, compared, before);
            va = designCovariance(measure, current.design(), ct, compared, after);
            if (vb == null || va == null) {
                designGap = "the design holds no PSU sums of every value of " + variable + " a domain needs";
                mode = Mode.WEIGHTED;
            }
        }
        if (mode != Mode.DESIGN) {
            vb = ownPsuCovariance(baseline.rows(), before);
            va = ownPsuCovariance(current.rows(), after);
        }

        int k = compared.size();
        double[] change = new double[k];
        double[][] v = new double[k][k];
        for (int i = 0; i < k; i++) {
            change[i] = after.get(i).estimate() - before.get(i).estimate();
            for (int j = 0; j < k; j++) {
                v[i][j] = vb[i][j] + va[i][j];
            }
        }

        DomainBase wholeBefore = whole(measure, baseline, bt, mode);
        DomainBase wholeAfter = whole(measure, current, ct, mode);
        double overall = wholeAfter.estimate() - wholeBefore.estimate();

        double zCrit = StandardNormal.twoSidedQuantile(confidence);
        double[] p = new double[k];
        double[] se = new double[k];
        for (int i = 0; i < k; i++) {
            se[i] = Math.sqrt(Math.max(0, v[i][i]));
            p[i] = se[i] > 0 ? StandardNormal.twoSidedP(change[i] / se[i]) : change[i] == 0 ? 1 : 0;
        }
        double[] q = BenjaminiHochberg.adjust(p);
        List<DomainChange> rows = new ArrayList<>();
        double contributions = 0;
        for (int i = 0; i < k; i++) {
            double shareBefore = before.get(i).weight() / wholeBefore.weight();
            double shareAfter = after.get(i).weight() / wholeAfter.weight();
            double contribution = (shareBefore + shareAfter) / 2 * change[i];
            contributions += contribution;
            rows.add(new DomainChange(compared.get(i), before.get(i).count(), after.get(i).count(),
                    before.get(i).estimate(), after.get(i).estimate(), change[i], se[i], change[i] - zCrit * se[i],
                    change[i] + zCrit * se[i], p[i], q[i], shareBefore, shareAfter, contribution));
        }
        rows.sort(Comparator.comparingDouble((DomainChange d) -> -Math.abs(d.contribution())));

        Wald wald = Wald.ofChanges(change, v);
        Double elsewhere = elsewhere(measure, bt, ct, mode, rows.get(0).domain(), labels);

        boolean binned = wholeBefore.binned() || wholeAfter.binned();
        for (int i = 0; i < k; i++) {
            binned |= before.get(i).binned() || after.get(i).binned();
        }
        String method = method(mode, rate, baseline.design(), current.design(), designGap, binned);
        return Optional.of(new Breakdown(column, variable, measure.label(), measure.kind(), measure.unit(), method,
                rows, overall, overall - contributions, wald.statistic(), wald.df(), wald.pValue(), null, elsewhere,
                leftOut, ct.nullRows(), ct.overflowDomains(), ct.overflowRows()));
    }

    /**
     * One wave's covariance of the measure across {@code domains} (each with answers in the wave), as the breakdown
     * makes it: design-based when {@code weighted} and the wave holds the design's PSU sums, from the weights alone
     * when it holds only weights, unweighted otherwise (and always for a RATE). Empty without the column's domain
     * tallies.
     */
    static Optional<double[][]> covariance(String column, DomainMeasure m, WaveProfile wave, List<String> domains,
                                           boolean weighted) {
        Optional<DomainTally> ot = wave.domains(column);
        if (ot.isEmpty() || !aligned(ot.get(), ot.get().tallies(), m.variable())) {
            return Optional.empty();
        }
        DomainTally t = ot.get();
        boolean w = weighted && m.kind() != DomainMeasure.Kind.RATE && aligned(t, t.weights(), m.variable());
        Mode mode = !w ? Mode.UNWEIGHTED
                : wave.design() != null && aligned(t, t.designs(), m.variable()) ? Mode.DESIGN : Mode.WEIGHTED;
        List<DomainBase> bases = new ArrayList<>();
        for (String d : domains) {
            bases.add(base(m, t, d, mode));
        }
        double[][] v = mode == Mode.DESIGN ? designCovariance(m, wave.design(), t, domains, bases) : null;
        return Optional.of(v != null ? v : ownPsuCovariance(wave.rows(), bases));
    }

    /**
     * Whether a per-domain list of the variable is there with one non-null entry per domain. A summary that does
     * not hold it (an older one, or one read without weights or design) is used without it, never trusted in part.
     */
    private static boolean aligned(DomainTally t, Map<String, ? extends List<?>> perVariable, String variable) {
        List<?> list = perVariable.get(variable);
        return list != null && list.size() == t.domains().size() && list.stream().allMatch(java.util.Objects::nonNull);
    }

    /** The domain's base in one wave; empty when the wave did not keep the domain. */
    private static DomainBase base(DomainMeasure m, DomainTally t, String label, Mode mode) {
        int at = t.indexOf(label);
        if (at < 0) {
            return DomainBase.EMPTY;
        }
        ColumnTally tally = t.tallies().get(m.variable()).get(at);
        Map<String, double[]> weights = mode == Mode.UNWEIGHTED ? null : t.weights().get(m.variable()).get(at);
        return DomainBase.of(m, tally, weights);
    }

    /**
     * The whole wave's base: from the wave's own tally (and weights) when it holds the variable, so that rows in no
     * domain count; otherwise the kept domains pooled.
     */
    private static DomainBase whole(DomainMeasure m, WaveProfile wave, DomainTally t, Mode mode) {
        ColumnTally tally = wave.columns().get(m.variable());
        Map<String, double[]> weights = wave.weights().get(m.variable());
        if (tally != null && (mode == Mode.UNWEIGHTED || weights != null)) {
            return DomainBase.of(m, tally, mode == Mode.UNWEIGHTED ? null : weights);
        }
        List<DomainBase> all = new ArrayList<>();
        for (String label : t.domains()) {
            all.add(base(m, t, label, mode));
        }
        return DomainBase.pooled(all);
    }

    /** The change over every kept domain but {@code first}, pooled; null when that has no base in a wave. */
    private static Double elsewhere(DomainMeasure m, DomainTally bt, DomainTally ct, Mode mode, String first,
                                    Set<String> labels) {
        List<DomainBase> b = new ArrayList<>();
        List<DomainBase> a = new ArrayList<>();
        for (String label : labels) {
            if (!label.equals(first)) {
                b.add(base(m, bt, label, mode));
                a.add(base(m, ct, label, mode));
            }
        }
        DomainBase pb = DomainBase.pooled(b);
        DomainBase pa = DomainBase.pooled(a);
        return pb.weight() > 0 && pa.weight() > 0 ? pa.estimate() - pb.estimate() : null;
    }

    /** Each respondent its own PSU among the wave's n rows: a diagonal matrix (see the class comment). */
    static double[][] ownPsuCovariance(long n, List<DomainBase> bases) {
        int k = bases.size();
        double[][] v = new double[k][k];
        for (int i = 0; i < k; i++) {
            v[i][i] = n / (n - 1.0) * bases.get(i).squaredScores();
        }
        return v;
    }

    /** The domains' covariance over every PSU of the wave, or null when a domain's PSU sums are not known. */
    private static double[][] designCovariance(DomainMeasure m, DesignSummary design, DomainTally t,
                                               List<String> compared, List<DomainBase> bases) {
        int psus = design.psuCount();
        double[][] totals = new double[psus][compared.size()];
        for (int d = 0; d < compared.size(); d++) {
            int at = t.indexOf(compared.get(d));
            DesignSummary.ColumnDesign cd = t.designs().get(m.variable()).get(at);
            double[] z = bases.get(d).psuScores(m, t.tallies().get(m.variable()).get(at), cd);
            if (z == null || z.length != psus) {
                return null;
            }
            for (int p = 0; p < psus; p++) {
                totals[p][d] = z[p];
            }
        }
        return DesignVariance.covariance(design.stratumIndex(), totals);
    }

    private static String method(Mode mode, boolean rate, DesignSummary b, DesignSummary c, String designGap,
                                 boolean binned) {
        String s = switch (mode) {
            case UNWEIGHTED -> rate ? "unweighted (a share of rows)" : "unweighted";
            case WEIGHTED -> "weighted (linearised, each respondent a PSU"
                    + (designGap == null ? "" : "; " + designGap) + ")";
            case DESIGN -> "design-based (linearised over all " + b.psuCount() + " and " + c.psuCount()
                    + " PSUs of the waves, in " + strata(b) + " and " + strata(c) + " strata, with replacement)";
        };
        return binned ? s + "; binned numbers at their bins' stand-ins" : s;
    }

    private static int strata(DesignSummary d) {
        int h = 0;
        for (int s : d.stratumIndex()) {
            h = Math.max(h, s + 1);
        }
        return h;
    }
}
