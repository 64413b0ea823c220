package org.wavewarden.compare.interviewer;

import org.wavewarden.compare.TestResult;
import org.wavewarden.compare.categorical.ChiSquareHomogeneity;
import org.wavewarden.compare.categorical.FisherExact;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.compare.location.WelchTTest;
import org.wavewarden.config.Breakdowns;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.config.WardenConfig;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.judge.multiplicity.BenjaminiHochberg;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.DomainTally;
import org.wavewarden.profile.NumericDistribution;
import org.wavewarden.profile.WaveProfile;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Judges the interviewers of one wave from its summary's interviewer-column domain tallies.
 *
 * <p>Measures, per variable: the missing share (SQL NULL, declared missing codes and the disguised missing values
 * the wave's screen excluded, over the interviewer's rows) and, when a variable has more than one kind of missing
 * answer, the share of each; for key variables the distribution of valid answers, by kind: the mean (continuous and
 * ordinal), the share of the tracked answer (binary), the answer shares (categorical). Without configured key
 * variables every variable of those kinds is one, except the breakdown columns (interviewers are assigned by area
 * or mode, so those differ by design).
 *
 * <p>Each interviewer with at least the minimum workload is tested against every other interviewer pooled (those
 * under the minimum included: their interviews are other interviewers' work all the same): rates by Fisher's exact
 * test, means by Welch's t, answer shares by Pearson's chi-square on the 2 x K table. The p-values of every
 * interviewer test of the wave are adjusted together (Benjamini-Hochberg) and an interviewer is flagged when
 * q &lt; alpha; of an interviewer's missing measures of one variable (the missing share and each value's share)
 * only the one with the smallest q is reported, since they count the same interviews. A flag is a screening aid:
 * many tests over few interviews, and interviewers are seldom assigned at random, so a flagged workload is one to
 * look at, not proof of a fault.
 *
 * <p>The interviewer effect, the intra-interviewer correlation ({@link IntraInterviewerCorrelation}), is estimated
 * for the missing indicator of every variable with missing answers, the value of numeric key variables and the
 * tracked answer of binary key variables, over the judged interviewers; a measure whose interval lies above
 * {@link Breakdowns#iccThreshold()} becomes a finding.
 */
public final class InterviewerMonitor {

    private static final String FDR = WardenConfig.FdrMethod.BENJAMINI_HOCHBERG.name();
    private static final int NAMED = 10;

    private InterviewerMonitor() {
    }

    /**
     * What interviewer monitoring found in one wave.
     *
     * @param findings INTERVIEWER_OUTLIER findings (one per flag, detail the {@link InterviewerFlag}) and
     *                 INTERVIEWER_EFFECT findings (one per measure whose correlation's interval lies above the
     *                 threshold, detail the {@link InterviewerEffect})
     * @param flags    every flagged interviewer and variable
     * @param effects  every measure's interviewer effect, reported or not
     * @param notes    what was not judged and why (interviewers under the minimum workload, overflow)
     */
    public record Result(List<Finding> findings, List<InterviewerFlag> flags, List<InterviewerEffect> effects,
                         List<String> notes) {

        public Result {
            findings = List.copyOf(findings);
            flags = List.copyOf(flags);
            effects = List.copyOf(effects);
            notes = List.copyOf(notes);
        }

        static Result nothing(List<String> notes) {
            return new Result(List.of(), List.of(), List.of(), notes);
        }
    }

    /**
     * Monitors the interviewers of {@code current}: the column {@code config.interviewer()} must be among the
     * summary's domain tallies; empty result otherwise.
     *
     * @param screened the wave as screened (its missing codes and disguised missing values per variable)
     */
    public static Result judge(WaveProfile current, ScreenedWave screened, Breakdowns config, double alpha) {
        if (config == null || config.interviewer() == null) {
            return Result.nothing(List.of());
        }
        Optional<DomainTally> held = current.domains(config.interviewer());
        if (held.isEmpty()) {
            return Result.nothing(List.of("The wave's summary holds no tallies by " + config.interviewer()
                    + ", so no interviewer was judged."));
        }
        return judge(held.get(), screened, config, alpha);
    }

    /** The same from the interviewer column's domain tallies themselves. */
    public static Result judge(DomainTally interviewers, ScreenedWave screened, Breakdowns config, double alpha) {
        Assessment a = assess(interviewers, screened, config, alpha);
        if (a.tests() == null) {
            return Result.nothing(a.notes());
        }
        List<String> ids = interviewers.domains();
        long[] workload = interviewers.rows();
        List<Test> tests = a.tests();
        double[] p = tests.stream().mapToDouble(t -> t.result().pValue()).toArray();
        double[] q = a.q();
        Workloads w = a.workloads();
        double confidence = 1 - alpha;
        List<InterviewerFlag> flags = new ArrayList<>();
        List<Finding> findings = new ArrayList<>();
        List<Integer> order = new ArrayList<>();
        for (int i = 0; i < tests.size(); i++) {
            if (q[i] < alpha) {
                order.add(i);
            }
        }
        // Among equal q-values the narrower measure first: the share of 999 says more than the missing share.
        order.sort(Comparator.comparingDouble((Integer i) -> q[i]).thenComparingDouble(i -> p[i])
                .thenComparingInt(i -> tests.get(i).offending().size()));
        java.util.Set<String> missingFlagged = new java.util.HashSet<>();
        for (int i : order) {
            Test t = tests.get(i);
            // The missing share holds every missing value's share: one flag per interviewer and variable for
            // them, the one with the strongest evidence, so that one keyed sentinel is one finding, not two.
            if (t.ofRows() && !missingFlagged.add(t.interviewer() + "\u0000" + t.variable().name())) {
                continue;
            }
            InterviewerFlag flag = new InterviewerFlag(interviewers.column(), ids.get(t.interviewer()),
                    t.variable().name(), t.measure(), t.result().test(), workload[t.interviewer()], t.value(),
                    t.rest(), t.result().pValue(), q[i], t.offending(), config.minInterviews());
            flags.add(flag);
            Double df = Double.isNaN(t.result().df()) ? null : t.result().df();
            findings.add(new Finding(t.variable().name(), t.variable().label(), FindingKind.INTERVIEWER_OUTLIER,
                    t.result().test(), t.result().statistic(), t.result().pValue(), q[i], null, null, t.restN(),
                    t.ownN(), InterviewerSentences.outlier(flag, t, w), flag, df, df == null ? null
                    : t.result().dfConvention(), a.family(), FDR));
        }
        for (InterviewerEffect e : a.effects()) {
            if (e.ciLow() > config.iccThreshold()) {
                VariableConfig v = screened.variable(e.variable()).orElseThrow();
                findings.add(new Finding(e.variable(), v.label(), FindingKind.INTERVIEWER_EFFECT,
                        "F test of the interviewer effect", e.fStatistic(), e.pValue(), null,
                        new Finding.Effect(IntraInterviewerCorrelation.NAME, e.icc(), e.ciLow(), e.ciHigh(),
                                config.iccThreshold()), null, null, e.interviews(),
                        InterviewerSentences.effect(e, config.iccThreshold(), confidence, w), e, e.dfBetween(),
                        "interviewers - 1; within: interviews - interviewers = "
                                + String.format(java.util.Locale.ROOT, "%.0f", e.dfWithin()), null, null));
            }
        }
        return new Result(findings, flags, a.effects(), a.notes());
    }

    /**
     * Every interviewer test of a wave with its q-value, and every measure's interviewer effect.
     *
     * @param tests  every test, in order of variable, measure and interviewer; null when fewer than two
     *               interviewers could be judged
     * @param q      the tests' q-values (Benjamini-Hochberg over all of them), same order
     * @param family how many p-values were adjusted together
     */
    record Assessment(List<Test> tests, double[] q, int family, List<InterviewerEffect> effects, List<String> notes,
                      Workloads workloads) {
    }

    static Assessment assess(DomainTally interviewers, ScreenedWave screened, Breakdowns config, double alpha) {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("alpha must lie in (0, 1), was " + alpha);
        }
        List<String> ids = interviewers.domains();
        int k = ids.size();
        long[] workload = interviewers.rows();
        boolean[] judged = new boolean[k];
        List<String> under = new ArrayList<>();
        long underRows = 0;
        for (int i = 0; i < k; i++) {
            judged[i] = workload[i] >= config.minInterviews();
            if (!judged[i]) {
                under.add(ids.get(i));
                underRows += workload[i];
            }
        }
        Workloads w = new Workloads(interviewers.column(), k - under.size(), under.size(), config.minInterviews());
        List<String> notes = new ArrayList<>(workloadNotes(interviewers, under, underRows, config));
        if (w.judged() < 2) {
            notes.add(String.format(java.util.Locale.ROOT, "%d interviewer%s reached the minimum workload of %d "
                    + "interviews: at least two are needed to compare, so none was judged.", w.judged(),
                    w.judged() == 1 ? "" : "s", config.minInterviews()));
            return new Assessment(null, null, 0, List.of(), notes, w);
        }

        List<Test> tests = new ArrayList<>();
        List<InterviewerEffect> effects = new ArrayList<>();
        double confidence = 1 - alpha;
        for (String key : config.keyVariables()) {
            if (screened.variable(key).isEmpty() || !interviewers.tallies().containsKey(key)) {
                notes.add("Key variable " + key + " has no tallies by " + interviewers.column()
                        + " in this wave; its distributions were not compared.");
            }
        }
        for (VariableConfig v : screened.variables()) {
            List<ColumnTally> tallies = interviewers.tallies().get(v.name());
            if (tallies == null || v.name().equals(interviewers.column())) {
                continue;
            }
            ScreenedVariable sv;
            try {
                sv = screened.get(v.name()).orElse(null);
            } catch (RuntimeException e) {
                notes.add(v.name() + " could not be screened, so its interviewers were not compared: "
                        + e.getMessage());
                continue;
            }
            if (sv == null) {
                continue;
            }
            if (tallies.stream().anyMatch(ColumnTally::truncated)) {
                notes.add(v.name() + " has more distinct values by interviewer than are kept, so its interviewers "
                        + "were not compared.");
                continue;
            }
            try {
                InterviewerCounts c = InterviewerCounts.of(v, sv, tallies);
                // By default the breakdown columns are no key variables: interviewers are assigned by district or
                // mode, so their districts differ by design and would flag every interviewer.
                boolean key = config.keyVariables().isEmpty()
                        ? comparedByKind(v.kind()) && !config.columns().contains(v.name())
                        : config.keyVariables().contains(v.name());
                rateTests(c, judged, tests);
                rateEffect(c, judged, confidence, w.under()).ifPresent(effects::add);
                if (key) {
                    distributionTests(c, judged, confidence, tests, notes);
                    distributionEffect(c, judged, confidence, w.under()).ifPresent(effects::add);
                    if (c.binned() && c.numbers() != null) {
                        notes.add("The interviewers' means of " + v.name() + " come from binned tallies and are "
                                + "approximate.");
                    }
                }
            } catch (RuntimeException e) {
                // One variable that cannot be measured is said so; the others are still judged.
                notes.add(v.name() + " could not be compared by interviewer: " + e.getMessage());
            }
        }

        double[] p = tests.stream().mapToDouble(t -> t.result().pValue()).toArray();
        int family = (int) java.util.Arrays.stream(p).filter(x -> !Double.isNaN(x)).count();
        return new Assessment(tests, BenjaminiHochberg.adjust(p), family, effects, notes, w);
    }

    /** How many interviewers were judged and left out, for every sentence. */
    record Workloads(String column, int judged, int under, int minimum) {
    }

    /**
     * One interviewer test.
     *
     * @param interviewer index of the interviewer among the domains
     * @param value       the interviewer's measure (a proportion or a mean)
     * @param rest        the same over every other interviewer
     * @param hits        for a rate, the interviewer's rows counted; -1 otherwise
     * @param ownN        the interviewer's denominator: rows for a missing share, valid answers otherwise
     * @param restN       the others' denominator
     * @param ofRows      whether the denominators are rows (a missing share) rather than valid answers
     * @param shown       for answer shares, the answer whose share departs most; null otherwise
     */
    record Test(VariableConfig variable, String measure, int interviewer, TestResult result, double value,
                double rest, long hits, long ownN, long restN, boolean ofRows, List<String> offending, String shown,
                double shownShare, double shownRest) {
    }

    /** The missing share, and when the variable has several kinds of missing answer the share of each. */
    private static void rateTests(InterviewerCounts c, boolean[] judged, List<Test> tests) {
        Map<String, long[]> by = c.byValue();
        if (by.isEmpty()) {
            return;
        }
        List<String> kinds = List.copyOf(by.keySet());
        if (kinds.size() == 1) {
            rate(c, judged, kinds.get(0).equals(DomainMeasure.NULL) ? "missing share" : "share of " + kinds.get(0),
                    c.missing(), c.rows(), kinds, tests);
            return;
        }
        rate(c, judged, "missing share", c.missing(), c.rows(), kinds, tests);
        for (String value : kinds) {
            rate(c, judged, value.equals(DomainMeasure.NULL) ? "share of SQL NULL" : "share of " + value,
                    by.get(value), c.rows(), List.of(value), tests);
        }
    }

    private static void rate(InterviewerCounts c, boolean[] judged, String measure, long[] hits, long[] base,
                             List<String> offending, List<Test> tests) {
        long allHits = sum(hits);
        long allBase = sum(base);
        for (int i = 0; i < judged.length; i++) {
            if (!judged[i] || base[i] == 0) {
                continue;
            }
            long restHits = allHits - hits[i];
            long restBase = allBase - base[i];
            if (restBase == 0 || allHits == 0 || allHits == allBase) {
                continue; // nothing to tell apart: no other interviews, or every interview alike
            }
            TestResult r = FisherExact.twoByTwo(hits[i], base[i] - hits[i], restHits, restBase - restHits);
            tests.add(new Test(c.variable(), measure, i, r, hits[i] / (double) base[i],
                    restHits / (double) restBase, hits[i], base[i], restBase, true, offending, null, 0, 0));
        }
    }

    private static void distributionTests(InterviewerCounts c, boolean[] judged, double confidence,
                                          List<Test> tests, List<String> notes) {
        if (c.numbers() != null) {
            NumericDistribution all = NumericDistribution.empty();
            for (NumericDistribution d : c.numbers()) {
                all = all.merge(d);
            }
            for (int i = 0; i < judged.length; i++) {
                NumericDistribution own = c.numbers()[i];
                if (!judged[i] || own.n() < 2) {
                    continue;
                }
                NumericDistribution rest = without(all, own);
                if (rest.n() < 2 || (own.variance() == 0 && rest.variance() == 0)) {
                    continue;
                }
                // Welch's t with the others as the baseline: the statistic's sign is the interviewer's departure.
                TestResult r = WelchTTest.test(rest, own, confidence).test();
                tests.add(new Test(c.variable(), "mean", i, r, own.mean(), rest.mean(), -1, own.n(), rest.n(),
                        false, List.of(), null, 0, 0));
            }
            return;
        }
        if (c.categories() == null || c.categories().size() < 2) {
            return;
        }
        int kCat = c.categories().size();
        long[] all = new long[kCat];
        for (long[] row : c.counts()) {
            for (int j = 0; j < kCat; j++) {
                all[j] += row[j];
            }
        }
        boolean binary = c.variable().kind() == VariableKind.BINARY;
        String success = binary ? successValue(c) : null;
        for (int i = 0; i < judged.length; i++) {
            long[] own = c.counts()[i];
            long ownN = java.util.Arrays.stream(own).sum();
            if (!judged[i] || ownN == 0) {
                continue;
            }
            long[] rest = new long[kCat];
            for (int j = 0; j < kCat; j++) {
                rest[j] = all[j] - own[j];
            }
            long restN = java.util.Arrays.stream(rest).sum();
            if (restN == 0) {
                continue;
            }
            if (binary) {
                int s = c.categories().indexOf(success);
                long hit = own[s];
                long restHit = rest[s];
                if (hit + restHit == 0 || hit + restHit == ownN + restN) {
                    continue;
                }
                TestResult r = FisherExact.twoByTwo(hit, ownN - hit, restHit, restN - restHit);
                tests.add(new Test(c.variable(), "share of " + success, i, r, hit / (double) ownN,
                        restHit / (double) restN, hit, ownN, restN, false, List.of(success), null, 0, 0));
                continue;
            }
            var chi = ChiSquareHomogeneity.test(rest, own);
            if (chi.keptColumns().length < 2) {
                continue;
            }
            // The answer the interviewer departs on most, by Agresti's adjusted residual of the interviewer's row.
            double[] res = chi.adjustedResiduals()[chi.adjustedResiduals().length - 1];
            int most = 0;
            for (int j = 1; j < res.length; j++) {
                if (Math.abs(res[j]) > Math.abs(res[most])) {
                    most = j;
                }
            }
            int col = chi.keptColumns()[most];
            String shown = c.categories().get(col);
            tests.add(new Test(c.variable(), "answer shares", i, chi.test(), own[col] / (double) ownN,
                    rest[col] / (double) restN, -1, ownN, restN, false, List.of(), shown, own[col] / (double) ownN,
                    rest[col] / (double) restN));
        }
    }

    private static Optional<InterviewerEffect> rateEffect(InterviewerCounts c, boolean[] judged, double confidence,
                                                          int under) {
        if (c.byValue().isEmpty()) {
            return Optional.empty();
        }
        long[] n = pick(c.rows(), judged);
        double[] s = toDouble(pick(c.missing(), judged));
        // A 0/1 indicator is its own square.
        return IntraInterviewerCorrelation.estimate(c.name(), "missing", n, s, s.clone(), confidence, under);
    }

    private static Optional<InterviewerEffect> distributionEffect(InterviewerCounts c, boolean[] judged,
                                                                  double confidence, int under) {
        if (c.numbers() != null) {
            List<Long> n = new ArrayList<>();
            List<double[]> sums = new ArrayList<>();
            for (int i = 0; i < judged.length; i++) {
                if (!judged[i]) {
                    continue;
                }
                NumericDistribution d = c.numbers()[i];
                double s = 0;
                double q = 0;
                for (int j = 0; j < d.size(); j++) {
                    s += d.count(j) * d.value(j);
                    q += d.count(j) * d.value(j) * d.value(j);
                }
                n.add(d.n());
                sums.add(new double[] {s, q});
            }
            return IntraInterviewerCorrelation.estimate(c.name(), "value", n.stream().mapToLong(Long::longValue)
                            .toArray(), sums.stream().mapToDouble(x -> x[0]).toArray(),
                    sums.stream().mapToDouble(x -> x[1]).toArray(), confidence, under);
        }
        if (c.variable().kind() != VariableKind.BINARY || c.categories() == null || c.categories().size() < 2) {
            return Optional.empty();
        }
        String success = successValue(c);
        int sIdx = c.categories().indexOf(success);
        List<Long> n = new ArrayList<>();
        List<Double> s = new ArrayList<>();
        for (int i = 0; i < judged.length; i++) {
            if (judged[i]) {
                n.add(java.util.Arrays.stream(c.counts()[i]).sum());
                s.add((double) c.counts()[i][sIdx]);
            }
        }
        double[] sums = s.stream().mapToDouble(Double::doubleValue).toArray();
        return IntraInterviewerCorrelation.estimate(c.name(), "share of " + success,
                n.stream().mapToLong(Long::longValue).toArray(), sums, sums.clone(), confidence, under);
    }

    private static String successValue(InterviewerCounts c) {
        var cats = new org.wavewarden.profile.CategoryCounts(c.categories(), new long[c.categories().size()]);
        String s = VariableScreen.successValue(c.variable(), cats, cats);
        return c.categories().contains(s) ? s : c.categories().get(c.categories().size() - 1);
    }

    private static boolean comparedByKind(VariableKind kind) {
        return kind == VariableKind.CONTINUOUS || kind == VariableKind.ORDINAL || kind == VariableKind.CATEGORICAL
                || kind == VariableKind.BINARY;
    }

    private static List<String> workloadNotes(DomainTally t, List<String> under, long underRows, Breakdowns config) {
        List<String> notes = new ArrayList<>();
        if (!under.isEmpty()) {
            String named = String.join(", ", under.subList(0, Math.min(NAMED, under.size())))
                    + (under.size() > NAMED ? " and " + (under.size() - NAMED) + " more" : "");
            notes.add(String.format(java.util.Locale.ROOT, "%d interviewer%s under the minimum workload of %d "
                            + "interviews (%,d interviews in all) %s not judged: %s.", under.size(),
                    under.size() == 1 ? "" : "s", config.minInterviews(), underRows,
                    under.size() == 1 ? "was" : "were", named));
        }
        if (t.overflowDomains() > 0) {
            notes.add(String.format(java.util.Locale.ROOT, "%d interviewer%s beyond the cap of %d per column "
                            + "(%,d interviews) %s not tallied by %s and not judged.", t.overflowDomains(),
                    t.overflowDomains() == 1 ? "" : "s", config.maxDomains(), t.overflowRows(),
                    t.overflowDomains() == 1 ? "was" : "were", t.column()));
        }
        if (t.nullRows() > 0) {
            notes.add(String.format(java.util.Locale.ROOT, "%,d interview%s no %s and %s not judged.",
                    t.nullRows(), t.nullRows() == 1 ? " has" : "s have", t.column(),
                    t.nullRows() == 1 ? "was" : "were"));
        }
        return notes;
    }

    /** Every answer of {@code all} but those of {@code part} (a sub-multiset of it). */
    private static NumericDistribution without(NumericDistribution all, NumericDistribution part) {
        java.util.TreeMap<Double, Long> left = new java.util.TreeMap<>();
        for (int j = 0; j < all.size(); j++) {
            left.put(all.value(j), all.count(j));
        }
        for (int j = 0; j < part.size(); j++) {
            left.merge(part.value(j), -part.count(j), Long::sum);
        }
        left.values().removeIf(x -> x <= 0);
        return NumericDistribution.ofTally(left);
    }

    private static long[] pick(long[] x, boolean[] keep) {
        List<Long> out = new ArrayList<>();
        for (int i = 0; i < x.length; i++) {
            if (keep[i]) {
                out.add(x[i]);
            }
        }
        return out.stream().mapToLong(Long::longValue).toArray();
    }

    private static double[] toDouble(long[] x) {
        return java.util.Arrays.stream(x).asDoubleStream().toArray();
    }

    private static long sum(long[] x) {
        return java.util.Arrays.stream(x).sum();
    }
}
