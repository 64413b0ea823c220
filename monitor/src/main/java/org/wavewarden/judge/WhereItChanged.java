package org.wavewarden.judge;

import org.wavewarden.compare.domain.Breakdown;
import org.wavewarden.compare.domain.Breakdowns;
import org.wavewarden.compare.domain.DomainChange;
import org.wavewarden.compare.domain.DomainMeasure;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.multiplicity.BenjaminiHochberg;
import org.wavewarden.missing.CandidateKind;
import org.wavewarden.missing.DataQualityFindings;
import org.wavewarden.missing.MissingCandidate;
import org.wavewarden.missing.ScreenedVariable;
import org.wavewarden.missing.ScreenedWave;
import org.wavewarden.missing.ValidNumber;
import org.wavewarden.missing.VariableScreen;
import org.wavewarden.profile.CategoryCounts;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.WaveProfile;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeSet;

/**
 * Where a run's changes happened: each finding worth a look is broken down by the dataset's domain columns, the
 * breakdowns' heterogeneity tests are adjusted together for the false discovery rate, and the finding's sentence says
 * where the change is concentrated when the change differs across domains.
 *
 * <p>Which findings are broken down:
 * <ul>
 *   <li>a SHIFT whose verdict is MATERIAL or UNCERTAIN: a change that matters or one that cannot be ruled out. A
 *       MINOR or STABLE shift is not looked into: asking where an unimportant change happened only adds tests to the
 *       family;</li>
 *   <li>not a PANEL_SHIFT: its verdict comes from the pairs of respondents present in both waves, while the domain
 *       tallies hold every respondent of each wave. A breakdown of the two independent samples would answer another
 *       question than the finding's, with other variances; the variable's SHIFT, judged from the same tallies as the
 *       breakdown, is broken down where it qualifies;</li>
 *   <li>every data-quality finding that has offending values to count (disguised missing values of each kind,
 *       codebook missing codes, values outside the range, text in a number, codes that appeared), and a
 *       MISSING_RATE_CHANGE whose verdict is MATERIAL or UNCERTAIN (the rate of every missing answer, SQL NULL
 *       included). Findings about the whole column (all NULL, constant, heaping, the schema) have no rows of their own
 *       to place in a domain.</li>
 * </ul>
 *
 * <p>Only findings made against the run's first baseline are broken down here (a finding naming another baseline
 * in {@link Finding#against()} is left as it is), since the breakdowns are made from that baseline's tallies.
 *
 * <p>A variable is never broken down by its own column, and a breakdown that cannot be made (a column not tallied,
 * fewer than two domains with answers in both waves) is simply absent. A breakdown that fails on data no method
 * foresaw costs that breakdown only, and the run's notes say so.
 */
public final class WhereItChanged {

    private static final Logger LOG = LoggerFactory.getLogger(WhereItChanged.class);

    /** The data-quality kinds whose offending values are disguised missing candidates of the same name. */
    private static final Set<FindingKind> CANDIDATE_KINDS = Set.of(FindingKind.BLANK, FindingKind.INVISIBLE,
            FindingKind.PLACEHOLDER, FindingKind.PATTERN_OUTLIER, FindingKind.NUMERIC_SENTINEL,
            FindingKind.OUT_OF_RANGE_SENTINEL, FindingKind.SENTINEL_DATE, FindingKind.INLIER_SPIKE);

    private WhereItChanged() {
    }

    /**
     * The run's findings with their breakdowns, and what could not be broken down.
     *
     * @param findings every finding of the run, in the order given
     * @param notes    breakdowns that failed, one line each, for the run's notes
     */
    public record Result(List<Finding> findings, List<String> notes) {

        public Result {
            findings = List.copyOf(findings);
            notes = List.copyOf(notes);
        }
    }

    /** Makes one breakdown; {@link Breakdowns#of} in a run. */
    @FunctionalInterface
    public interface BreakdownMaker {
        Optional<Breakdown> make(String column, DomainMeasure measure, WaveProfile baseline, WaveProfile current,
                                 boolean weighted, double confidence);
    }

    /**
     * Breaks the run's findings down by {@code config}'s columns.
     *
     * @param screened the run's two screened waves (baseline null for a first wave, which has nothing to break down)
     * @param weighted whether the dataset has a weight column
     * @param alpha    the run's alpha: the intervals' confidence is 1 - alpha, and a breakdown whose q-value lies
     *                 below it is named in the sentence
     */
    public static Result attach(List<Finding> findings, WaveProfile baseline, WaveProfile current,
                                ScreenedWave screenedBaseline, ScreenedWave screenedCurrent,
                                org.wavewarden.config.Breakdowns config, boolean weighted, double alpha) {
        return attach(findings, baseline, current, screenedBaseline, screenedCurrent, config, weighted, alpha,
                Breakdowns::of);
    }

    /** The same with the breakdowns made by {@code maker}. */
    public static Result attach(List<Finding> findings, WaveProfile baseline, WaveProfile current,
                                ScreenedWave screenedBaseline, ScreenedWave screenedCurrent,
                                org.wavewarden.config.Breakdowns config, boolean weighted, double alpha,
                                BreakdownMaker maker) {
        return attach(findings, baseline, current, screenedBaseline, screenedCurrent, Map.of(), config, weighted,
                alpha, maker);
    }

    /**
     * A baseline judged alongside the run's first one (the same quarter a year back): its summary and its screened
     * side, for the findings that name it in {@link Finding#against()}.
     */
    public record Side(WaveProfile profile, ScreenedWave screened) {
    }

    /**
     * The same for a run judged against further baselines too, keyed by their labels: a finding made against one of
     * them is broken down against that baseline's tallies, and every breakdown of the run is in one
     * false-discovery-rate family.
     */
    public static Result attach(List<Finding> findings, WaveProfile baseline, WaveProfile current,
                                ScreenedWave screenedBaseline, ScreenedWave screenedCurrent, Map<String, Side> further,
                                org.wavewarden.config.Breakdowns config, boolean weighted, double alpha,
                                BreakdownMaker maker) {
        if (config == null || config.isEmpty() || baseline == null || screenedBaseline == null) {
            return new Result(findings, List.of());
        }
        List<String> notes = new ArrayList<>();
        Map<Integer, List<Breakdown>> made = new LinkedHashMap<>();
        for (int i = 0; i < findings.size(); i++) {
            Finding f = findings.get(i);
            WaveProfile before = baseline;
            ScreenedWave screenedBefore = screenedBaseline;
            if (f.against() != null) {
                // Made against another baseline than the run's first (a seasonal one alongside): it is broken down
                // against that baseline's tallies, never the first one's, which would answer another comparison.
                Side side = further.get(f.against());
                if (side == null || side.profile() == null || side.screened() == null) {
                    continue;
                }
                before = side.profile();
                screenedBefore = side.screened();
            }
            Optional<DomainMeasure> measure;
            try {
                measure = measure(f, screenedBefore, screenedCurrent);
            } catch (RuntimeException e) {
                // A variable whose screening failed was skipped by the run already; its finding is not broken down.
                LOG.debug("no breakdown measure for {}: {}", f.variable(), e.toString());
                continue;
            }
            if (measure.isEmpty()) {
                continue;
            }
            List<Breakdown> mine = new ArrayList<>();
            for (String column : config.columns()) {
                if (column.equals(f.variable())) {
                    continue;
                }
                try {
                    maker.make(column, measure.get(), before, current, weighted, 1 - alpha).ifPresent(mine::add);
                } catch (RuntimeException e) {
                    LOG.warn("{} of {} could not be broken down by {}: {}", f.kind(), f.variable(), column,
                            e.toString(), e);
                    notes.add(String.format(Locale.ROOT, "%s of %s could not be broken down by %s (%s).", f.kind(),
                            f.variable(), column, e.getClass().getSimpleName()));
                }
            }
            if (!mine.isEmpty()) {
                made.put(i, mine);
            }
        }
        Map<Integer, List<Breakdown>> adjusted = adjusted(made);
        List<Finding> out = new ArrayList<>(findings.size());
        for (int i = 0; i < findings.size(); i++) {
            List<Breakdown> b = adjusted.get(i);
            Finding f = findings.get(i);
            out.add(b == null ? f : f.withBreakdowns(b).withSentence(sentence(f.sentence(), b, alpha)));
        }
        return new Result(out, notes);
    }

    /**
     * Every breakdown of the run with its q-value: Benjamini-Hochberg over the heterogeneity p-values of all the
     * run's breakdowns together (one family, as the run's variables are one family), in the order given.
     */
    static Map<Integer, List<Breakdown>> adjusted(Map<Integer, List<Breakdown>> made) {
        List<Breakdown> all = made.values().stream().flatMap(List::stream).toList();
        double[] q = BenjaminiHochberg.adjust(all.stream().mapToDouble(Breakdown::pValue).toArray());
        Map<Integer, List<Breakdown>> out = new LinkedHashMap<>();
        int k = 0;
        for (Map.Entry<Integer, List<Breakdown>> e : made.entrySet()) {
            List<Breakdown> list = new ArrayList<>();
            for (Breakdown b : e.getValue()) {
                list.add(b.withQValue(q[k++]));
            }
            out.put(e.getKey(), list);
        }
        return out;
    }

    /** The same for a plain list of breakdowns, in its order. */
    public static List<Breakdown> adjusted(List<Breakdown> breakdowns) {
        Map<Integer, List<Breakdown>> one = new LinkedHashMap<>();
        one.put(0, breakdowns);
        return breakdowns.isEmpty() ? List.of() : adjusted(one).get(0);
    }

    /**
     * The number a finding is broken down by, or empty when the finding is not broken down (see the class comment).
     * SHARE and MEAN leave out what the whole wave's comparison left out: the screen's excluded values (codebook
     * codes, confident disguised missing values, values outside the range) and text in a number, of either wave.
     */
    public static Optional<DomainMeasure> measure(Finding f, ScreenedWave baseline, ScreenedWave current) {
        if (f.variable() == null) {
            return Optional.empty();
        }
        Optional<VariableConfig> declared = current.variable(f.variable());
        if (declared.isEmpty()) {
            return Optional.empty();
        }
        VariableConfig v = declared.get();
        ScreenedVariable sc = current.get(v.name()).orElse(null);
        ScreenedVariable sb = baseline == null ? null : baseline.get(v.name()).orElse(null);
        if (sc == null || sb == null) {
            return Optional.empty();
        }
        boolean worthALook = f.verdict() == Verdict.MATERIAL || f.verdict() == Verdict.UNCERTAIN;
        if (f.kind() == FindingKind.SHIFT) {
            return worthALook ? shiftMeasure(v, sb, sc) : Optional.empty();
        }
        if (f.kind() == FindingKind.MISSING_RATE_CHANGE) {
            if (!worthALook) {
                return Optional.empty();
            }
            Set<String> missing = new LinkedHashSet<>();
            missing.add(DomainMeasure.NULL);
            missing.addAll(leftOut(sb, sc));
            return Optional.of(new DomainMeasure(DomainMeasure.Kind.RATE, v.name(), missing, Set.of(),
                    "share of rows missing", "points"));
        }
        Set<String> offending = offending(f.kind(), v, current.tally(v.name()), baseline.tally(v.name()), sb, sc);
        if (offending.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new DomainMeasure(DomainMeasure.Kind.RATE, v.name(), offending, Set.of(),
                "share of rows holding " + listed(offending), "points"));
    }

    private static Optional<DomainMeasure> shiftMeasure(VariableConfig v, ScreenedVariable sb, ScreenedVariable sc) {
        Set<String> excluded = leftOut(sb, sc);
        if (v.kind() == VariableKind.BINARY && sb.categories() != null && sc.categories() != null) {
            String success = VariableScreen.successValue(v, sb.categories(), sc.categories());
            return Optional.of(new DomainMeasure(DomainMeasure.Kind.SHARE, v.name(), Set.of(success), excluded,
                    "share answering " + quoted(success), "points"));
        }
        if (v.kind() == VariableKind.CATEGORICAL && sb.categories() != null && sc.categories() != null) {
            String moved = mostMoved(sb, sc);
            return moved == null ? Optional.empty() : Optional.of(new DomainMeasure(DomainMeasure.Kind.SHARE,
                    v.name(), Set.of(moved), excluded, "share of " + quoted(moved), "points"));
        }
        // An ordinal variable with named levels has no mean of its raw text; its change is judged by ranks only.
        if ((v.kind() == VariableKind.CONTINUOUS || (v.kind() == VariableKind.ORDINAL && v.levels().isEmpty()))
                && sb.numeric() != null && sc.numeric() != null) {
            return Optional.of(new DomainMeasure(DomainMeasure.Kind.MEAN, v.name(), Set.of(), excluded, "mean",
                    v.unit()));
        }
        return Optional.empty();
    }

    /**
     * The category whose share of the valid answers moved most between the waves (weighted where the screen weighed
     * the answers), ties to the first in the union order; null without categories.
     */
    static String mostMoved(ScreenedVariable sb, ScreenedVariable sc) {
        List<String> order = sb.categories().unionOrder(sc.categories());
        String best = null;
        double most = -1;
        for (String category : order) {
            double moved = Math.abs(share(sc, category) - share(sb, category));
            if (moved > most) {
                most = moved;
                best = category;
            }
        }
        return best;
    }

    /** A category's share of the valid answers: of the weight where the answers carry weights, else of the count. */
    private static double share(ScreenedVariable s, String category) {
        CategoryCounts c = s.categories();
        int at = c.indexOf(category);
        if (at < 0) {
            return 0;
        }
        if (s.weighted() != null && s.weighted().totalWeight() > 0) {
            double[] positions = s.weighted().values();
            double w = 0;
            for (int i = 0; i < positions.length; i++) {
                if (positions[i] == at) {
                    w += s.weighted().weights()[i];
                }
            }
            return w / s.weighted().totalWeight();
        }
        return c.n() == 0 ? 0 : (double) c.count(category) / c.n();
    }

    /** What the screen of either wave left out of the valid answers, as raw values. */
    private static Set<String> leftOut(ScreenedVariable sb, ScreenedVariable sc) {
        Set<String> out = new LinkedHashSet<>(sb.excludedValues());
        out.addAll(sc.excludedValues());
        out.addAll(sb.invalid().keySet());
        out.addAll(sc.invalid().keySet());
        return out;
    }

    /**
     * The raw values a data-quality finding is about, found by the rule that made the finding: the screen's
     * candidates of the finding's kind, the codebook, the declared range, the values that are not numbers. Values of
     * both waves, so that the baseline's rate counts the same values.
     */
    static Set<String> offending(FindingKind kind, VariableConfig v, ColumnTally current, ColumnTally baseline,
                                 ScreenedVariable sb, ScreenedVariable sc) {
        Set<String> out = new TreeSet<>();
        if (CANDIDATE_KINDS.contains(kind)) {
            CandidateKind ck = CandidateKind.valueOf(kind.name());
            for (ScreenedVariable s : List.of(sb, sc)) {
                s.candidates().stream().filter(c -> c.kind() == ck
                                && c.confidence() >= DataQualityFindings.REPORT_CONFIDENCE)
                        .map(MissingCandidate::value).forEach(out::add);
            }
            return out;
        }
        List<ColumnTally> tallies = baseline == null ? List.of(current) : List.of(baseline, current);
        switch (kind) {
            case MISSING_CODE -> {
                var codebook = VariableScreen.codebook(v);
                for (ColumnTally t : tallies) {
                    t.valueCounts().keySet().stream().filter(x -> codebook.reasonOf(x, t.type()).isPresent())
                            .forEach(out::add);
                }
            }
            case OUT_OF_RANGE -> {
                ValidNumber rule = ValidNumber.of(v);
                for (ColumnTally t : tallies) {
                    t.valueCounts().keySet().stream().filter(x -> rule.status(x) == ValidNumber.Status.OUTSIDE_RANGE)
                            .forEach(out::add);
                }
            }
            case TEXT_IN_NUMERIC -> {
                out.addAll(sb.invalid().keySet());
                out.addAll(sc.invalid().keySet());
                for (ScreenedVariable s : List.of(sb, sc)) {
                    s.candidates().stream().filter(c -> c.kind() == CandidateKind.TEXT_IN_NUMERIC)
                            .map(MissingCandidate::value).forEach(out::add);
                }
            }
            case CODE_APPEARED -> {
                if (sc.categories() != null && sb.categories() != null) {
                    sc.categories().categories().stream()
                            .filter(x -> sb.categories().count(x) == 0 && sc.categories().count(x) > 0)
                            .forEach(out::add);
                }
            }
            default -> {
                // The other kinds are about the whole column or the codebook, not about rows.
            }
        }
        return out;
    }

    /**
     * The finding's sentence with where the change happened, for each breakdown whose heterogeneity q-value lies
     * below alpha, most significant first; unchanged when none does (the table shows every breakdown).
     */
    public static String sentence(String sentence, List<Breakdown> breakdowns, double alpha) {
        List<Breakdown> significant = breakdowns.stream()
                .filter(b -> b.qValue() != null && b.qValue() < alpha && !b.domains().isEmpty())
                .sorted(java.util.Comparator.comparingDouble(Breakdown::qValue)).toList();
        List<String> added = new ArrayList<>(significant.stream().map(WhereItChanged::where).toList());
        for (Breakdown b : breakdowns) {
            onlyIn(b).ifPresent(added::add);
        }
        if (added.isEmpty()) {
            return sentence;
        }
        StringBuilder s = new StringBuilder(sentence == null ? "" : sentence.strip());
        for (String a : added) {
            if (!s.isEmpty()) {
                s.append(' ');
            }
            s.append(a);
        }
        return s.toString();
    }

    /**
     * Offending rows that all lie in one domain, none in any other domain in either wave: "All 80 rows holding
     * '999' in this wave are in district KES (20.0% of its rows; none elsewhere in either wave)." The other domains'
     * rates then have no variance, so the heterogeneity test has nothing to compare (no degrees of freedom) and can
     * never name the domain, yet the counts alone say where the rows are. Stated as counts, with no test claimed;
     * only when every row of the wave is in a compared domain, since rows beyond the cap or with no domain could
     * hold more.
     */
    static Optional<String> onlyIn(Breakdown b) {
        if (b.kind() != DomainMeasure.Kind.RATE || b.df() != 0 || b.domains().size() < 2 || b.nullRows() > 0
                || b.overflowDomains() > 0 || !b.leftOut().isEmpty()) {
            return Optional.empty();
        }
        List<DomainChange> holding = b.domains().stream().filter(d -> d.after() > 0).toList();
        if (holding.size() != 1 || b.domains().stream().anyMatch(d -> d != holding.get(0) && d.before() > 0)) {
            return Optional.empty();
        }
        DomainChange d = holding.get(0);
        long rows = Math.round(d.after() * d.nCurrent());
        if (rows < 2) {
            return Optional.empty();
        }
        String what = b.measure().startsWith("share of ") ? b.measure().substring("share of ".length()) : "rows";
        return Optional.of(String.format(Locale.ROOT, "All %,d %s in this wave are in %s %s (%.1f%% of its rows;"
                + " none elsewhere in either wave).", rows, what, columnWords(b.column()), d.domain(), d.after() * 100));
    }

    /**
     * One breakdown in a sentence. When the first-ranked domain moved the way the whole wave did and further than
     * the other domains pooled: "The rise is concentrated in district KES (+18.0 points; elsewhere +1.0); the change
     * differs across districts (q < 0.001)." Otherwise the change still differs, and the sentence names the domain
     * that carries most of it without calling it concentrated.
     */
    static String where(Breakdown b) {
        DomainChange top = b.domains().get(0);
        String domain = columnWords(b.column()) + " " + top.domain();
        String across = "the change differs across " + plural(columnWords(b.column())) + " (" + q(b.qValue()) + ")";
        // The pooled rest is printed with the first domain's digits, so the two numbers read side by side.
        int digits = Sentences.decimals(top.change());
        String values = change(b, top.change(), digits) + (b.elsewhere() == null ? ""
                : "; elsewhere " + change(b, b.elsewhere(), digits).replace(unitSuffix(b), ""));
        boolean sameWay = Math.signum(top.change()) == Math.signum(b.overall()) && b.overall() != 0;
        boolean concentrated = sameWay && (b.elsewhere() == null || Math.abs(top.change()) > Math.abs(b.elsewhere()));
        if (concentrated) {
            String direction = b.overall() > 0 ? "rise" : "fall";
            String of = b.kind() == DomainMeasure.Kind.MEAN ? " in the mean" : "";
            return "The " + direction + of + " is concentrated in " + domain + " (" + values + "); " + across + ".";
        }
        return Character.toUpperCase(across.charAt(0)) + across.substring(1) + ": " + domain + " carries most of it ("
                + values + ").";
    }

    /** A change in the breakdown's unit: percentage points for shares and rates, the variable's unit for means. */
    static String change(Breakdown b, double d, int digits) {
        if (b.kind() == DomainMeasure.Kind.MEAN) {
            return (d >= 0 ? "+" : "") + Sentences.num(d, digits) + unitSuffix(b);
        }
        return String.format(Locale.ROOT, "%+.1f", d * 100) + " points";
    }

    private static String unitSuffix(Breakdown b) {
        if (b.kind() != DomainMeasure.Kind.MEAN) {
            return " points";
        }
        return b.unit() == null || b.unit().isBlank() ? "" : " " + b.unit();
    }

    /** "q < 0.001", else two significant digits without trailing zeros: "q = 0.012", "q = 0.03". */
    static String q(double q) {
        return q < 0.001 ? "q < 0.001" : "q = " + new java.math.BigDecimal(q)
                .round(new java.math.MathContext(2)).stripTrailingZeros().toPlainString();
    }

    /** A column name in words: "interview_mode" reads "interview mode". */
    static String columnWords(String column) {
        return column.replace('_', ' ').strip();
    }

    /** A plain English plural of a column's words: districts, interview modes, cities, boxes. */
    public static String plural(String words) {
        String w = words.toLowerCase(Locale.ROOT);
        if (w.endsWith("s") || w.endsWith("x") || w.endsWith("ch") || w.endsWith("sh")) {
            return words + "es";
        }
        if (w.endsWith("y") && w.length() > 1 && "aeiou".indexOf(w.charAt(w.length() - 2)) < 0) {
            return words.substring(0, words.length() - 1) + "ies";
        }
        return words + "s";
    }

    private static String quoted(String value) {
        return "'" + value + "'";
    }

    /** Up to three values quoted, then how many more. */
    private static String listed(Set<String> values) {
        List<String> shown = values.stream().limit(3).map(x -> x.equals(DomainMeasure.NULL) ? "NULL" : quoted(x))
                .toList();
        String s = String.join(", ", shown);
        return values.size() > 3 ? s + " and " + (values.size() - 3) + " other values" : s;
    }
}
