package org.wavewarden.missing;

import org.wavewarden.codebook.CodeLabels;
import org.wavewarden.compare.Comparison;
import org.wavewarden.compare.VariableComparator;
import org.wavewarden.config.VariableConfig;
import org.wavewarden.config.VariableKind;
import org.wavewarden.judge.Finding;
import org.wavewarden.judge.FindingKind;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * Assembles the data-quality findings of one variable in one wave: disguised missing values, missing codes and
 * their rates, values of the wrong type or outside the range, changed code frames, heaping and digit preference.
 * Rates that can be tested between waves become comparisons, judged with the same verdict rule as shifts.
 */
public final class DataQualityFindings {

    /** Candidates reported as findings; below this confidence they stay in the detail only. */
    public static final double REPORT_CONFIDENCE = 0.5;
    /** A code must have this many answers on one side to count as appeared or vanished (one stray answer is noise). */
    static final long CODE_FRAME_MIN_COUNT = 5;
    /** Whipple's index at which heaping is reported: the UN "approximate" band starts at 110. */
    static final double WHIPPLE_REPORT = 110;
    /** Rise of Whipple's index against the baseline that counts as heaping appearing (common practice, no source). */
    static final double WHIPPLE_RISE = 10;
    /** Index of dissimilarity of last digits that counts as digit preference (common practice, no source). */
    static final double DIGIT_DISSIMILARITY = 0.1;
    /** Start of the age range of Myers' blended index (ages 10 to 99, the usual choice; Shryock & Siegel). */
    static final int MYERS_LOW_AGE = 10;
    /** Whipple's index without heaping (United Nations 1955 scale, 100 to 500). */
    static final double WHIPPLE_NO_HEAPING = 100;

    private DataQualityFindings() {
    }

    public record Result(List<Finding> findings, List<Comparison> rateComparisons) {
    }

    public static Result of(VariableConfig v, ColumnTally currentTally, ScreenedVariable current, ScreenedVariable baseline,
                     VariableComparator comparator) {
        List<Finding> out = new ArrayList<>();
        List<Comparison> rates = new ArrayList<>();
        String name = v.name();
        CodeLabels labels = CodeLabels.of(v);
        Long nB = baseline == null ? null : baseline.validN();
        long nC = current.validN();

        Map<CandidateKind, List<MissingCandidate>> byKind = new LinkedHashMap<>();
        for (MissingCandidate c : current.candidates()) {
            // Text in a numeric variable is reported once, below, with the values that failed to parse.
            boolean numericKind = v.kind() == VariableKind.CONTINUOUS || v.kind() == VariableKind.ORDINAL;
            if (c.kind() == CandidateKind.TEXT_IN_NUMERIC && numericKind) {
                continue;
            }
            if (c.confidence() >= REPORT_CONFIDENCE) {
                byKind.computeIfAbsent(c.kind(), k -> new ArrayList<>()).add(c);
            }
        }
        byKind.forEach((kind, list) -> {
            long total = list.stream().mapToLong(MissingCandidate::count).sum();
            // The candidates come most confident first; the most frequent one may be another value.
            MissingCandidate top = list.get(0);
            MissingCandidate frequent = list.stream().reduce((a, b) -> b.count() > a.count() ? b : a).orElseThrow();
            String evidence = top.evidence().strip().replaceAll("[.]+$", "");
            String sentence = String.format(Locale.ROOT, "%s look like disguised missing values (%s), most often %s"
                            + " (%,d rows)%s: %s%s.", ofRows(total, current.rows()),
                    kind.name().toLowerCase(Locale.ROOT).replace('_', ' '), quoted(frequent.value()), frequent.count(),
                    frequent == top ? "" : "; the most confident candidate is " + quoted(top.value()), evidence,
                    list.size() > 1 ? "; the detail lists the other values of this kind" : "");
            out.add(Finding.dataQuality(name, FindingKind.valueOf(kind.name()), nB, nC, sentence,
                    new CandidatesDetail(list, top.confidence() >= VariableScreen.EXCLUDE_CONFIDENCE, total,
                            current.rows())));
        });

        Map<String, Long> coded = new LinkedHashMap<>();
        current.missingByReason().forEach((r, n) -> {
            if (!r.startsWith("disguised: ") && !r.equals("outside the declared range")) {
                coded.put(r, n);
            }
        });
        if (!coded.isEmpty()) {
            long total = coded.values().stream().mapToLong(Long::longValue).sum();
            String byCode = coded.entrySet().stream().map(e -> String.format(Locale.ROOT, "%s %,d", e.getKey(),
                    e.getValue())).reduce((a, b) -> a + ", " + b).orElse("");
            out.add(Finding.dataQuality(name, FindingKind.MISSING_CODE, nB, nC, String.format(Locale.ROOT,
                    "%s carry codebook missing codes and were left out of the comparison (%s).",
                    ofRows(total, current.rows()), byCode), new CountsDetail(coded, total, current.rows())));
        }
        Long outside = current.missingByReason().get("outside the declared range");
        if (outside != null) {
            out.add(Finding.dataQuality(name, FindingKind.OUT_OF_RANGE, nB, nC, String.format(Locale.ROOT,
                    "%s lie outside the declared range %s to %s and were left out of the comparison.",
                    ofRows(outside, current.rows()), v.range().min() == null ? "-inf" : fmt(v.range().min()),
                    v.range().max() == null ? "+inf" : fmt(v.range().max())),
                    new RangeDetail(outside, current.rows(), v.range().min(), v.range().max())));
        }
        Long excludedText = current.missingByReason().get("disguised: text in numeric");
        if (!current.invalid().isEmpty() || excludedText != null) {
            long total = current.invalid().values().stream().mapToLong(Long::longValue).sum()
                    + (excludedText == null ? 0 : excludedText);
            String examples = java.util.stream.Stream.concat(current.invalid().keySet().stream(), current.candidates()
                            .stream().filter(c -> c.kind() == CandidateKind.TEXT_IN_NUMERIC).map(MissingCandidate::value))
                    .distinct().limit(3).map(DataQualityFindings::quoted).reduce((a, b) -> a + ", " + b).orElse("");
            out.add(Finding.dataQuality(name, FindingKind.TEXT_IN_NUMERIC, nB, nC, String.format(Locale.ROOT,
                    "%s of this numeric variable are not finite numbers (for example %s) and were left out.",
                    ofRows(total, current.rows()), examples),
                    new CountsDetail(limit(current.invalid(), 20), total, current.rows())));
        }
        if (currentTally.truncated()) {
            out.add(Finding.dataQuality(name, FindingKind.TOO_MANY_DISTINCT, nB, nC, String.format(Locale.ROOT, "More"
                    + " distinct values than the monitor keeps (%,d); the distribution was not compared.",
                    currentTally.distinctCount()), new DistinctDetail(currentTally.distinctCount())));
        }
        if (currentTally.rowCount() > 0 && currentTally.nonNullCount() == 0) {
            out.add(Finding.dataQuality(name, FindingKind.ALL_NULL, nB, nC, "Every answer in this wave is NULL.", null));
        } else if (current.validN() >= 2 && distinctValid(current) == 1 && (baseline == null || distinctValid(baseline) > 1)) {
            out.add(Finding.dataQuality(name, FindingKind.CONSTANT, nB, nC, "Every valid answer in this wave is the"
                    + " same value.", null));
        }
        Finding unlabelled = unlabelledCodes(v, current, labels, nB);
        if (unlabelled != null) {
            out.add(unlabelled);
        }
        if (baseline == null) {
            return new Result(out, rates);
        }

        // Missing rates by reason (SQL NULL included), tested between the waves.
        Set<String> reasons = new LinkedHashSet<>(baseline.missingByReason().keySet());
        reasons.addAll(current.missingByReason().keySet());
        for (String reason : reasons) {
            long b = baseline.missingByReason().getOrDefault(reason, 0L);
            long c = current.missingByReason().getOrDefault(reason, 0L);
            if (b + c > 0 && baseline.rows() > 0 && current.rows() > 0) {
                rates.add(comparator.proportion(name, FindingKind.MISSING_RATE_CHANGE, "missing (" + reason + ")", b,
                        baseline.rows(), c, current.rows(), null));
            }
        }
        if (baseline.rows() > 0 && current.rows() > 0 && (baseline.sqlNulls() + current.sqlNulls()) > 0
                && baseline.sqlNulls() < baseline.rows() && current.sqlNulls() < current.rows()) {
            rates.add(comparator.proportion(name, FindingKind.MISSING_RATE_CHANGE, "missing (NULL)",
                    baseline.sqlNulls(), baseline.rows(), current.sqlNulls(), current.rows(), null));
        }

        if (current.categories() != null && baseline.categories() != null && (v.kind() == VariableKind.CATEGORICAL
                || binaryFrameSkipReason(v, baseline, current) != null)) {
            CodeFrameChange frame = CodeFrameChange.between(baseline.categories(), current.categories(), 1);
            List<String> appeared = frame.appeared().stream()
                    .filter(code -> current.categories().count(code) >= CODE_FRAME_MIN_COUNT).toList();
            List<String> vanished = frame.vanished().stream()
                    .filter(code -> baseline.categories().count(code) >= CODE_FRAME_MIN_COUNT).toList();
            if (!appeared.isEmpty()) {
                out.add(Finding.dataQuality(name, FindingKind.CODE_APPEARED, nB, nC, "New code(s) "
                        + codes(appeared, current, labels) + " appear in this wave and not in the baseline: a changed"
                        + " code frame?", CodesDetail.of(appeared, counts(appeared, current), labels)));
            }
            if (!vanished.isEmpty()) {
                out.add(Finding.dataQuality(name, FindingKind.CODE_VANISHED, nB, nC, "Code(s) "
                        + codes(vanished, baseline, labels) + " of the baseline have no answers in this wave: a"
                        + " changed code frame?", CodesDetail.of(vanished, counts(vanished, baseline), labels)));
            }
        }

        if (current.numeric() != null && baseline.numeric() != null && v.kind() == VariableKind.CONTINUOUS) {
            if (isAgeLike(v)) {
                WhippleIndex wc = WhippleIndex.compute(current.numeric());
                WhippleIndex wb = WhippleIndex.compute(baseline.numeric());
                if (wc.total() > 0 && wb.total() > 0 && wc.index() >= WHIPPLE_REPORT
                        && wc.index() - wb.index() >= WHIPPLE_RISE) {
                    out.add(Finding.dataQuality(name, FindingKind.HEAPING, nB, nC, String.format(Locale.ROOT,
                            "Ages ending in 0 or 5 are over-reported: Whipple's index rose from %.1f to %.1f (UN band:"
                                    + " %s; an index of %.0f means no heaping).", wb.index(), wc.index(),
                            wc.qualityBand().name().toLowerCase(Locale.ROOT).replace('_', ' '), WHIPPLE_NO_HEAPING),
                            new HeapingDetail(wb.index(), wc.index(), wc.qualityBand().name(),
                                    MyersIndex.compute(baseline.numeric(), MYERS_LOW_AGE).index(),
                                    MyersIndex.compute(current.numeric(), MYERS_LOW_AGE).index(), WHIPPLE_NO_HEAPING)));
                }
            } else if (isWholeNumbers(currentTally.type(), current)) {
                TerminalDigitPreference tc = TerminalDigitPreference.test(current.numeric());
                TerminalDigitPreference tb = TerminalDigitPreference.test(baseline.numeric());
                if (tc.applicable() && tb.applicable() && tc.pValue() < 0.001 && tc.dissimilarity() >= DIGIT_DISSIMILARITY
                        && tc.dissimilarity() - tb.dissimilarity() >= DIGIT_DISSIMILARITY / 2) {
                    out.add(Finding.dataQuality(name, FindingKind.DIGIT_PREFERENCE, nB, nC, String.format(Locale.ROOT,
                            "Some last digits are preferred: the index of dissimilarity of last digits rose from %.2f"
                                    + " to %.2f (an index of %.0f means every digit equally common).", tb.dissimilarity(),
                            tc.dissimilarity(), 0.0), new HeapingDetail(tb.dissimilarity(), tc.dissimilarity(), "",
                            Double.NaN, Double.NaN, 0)));
                }
            }
        }
        return new Result(out, rates);
    }

    /**
     * Why a binary variable's share is not compared, when its two waves do not share one frame of two codes, or
     * null. The share is not compared on the codes the waves have in common either: after a renaming there is at
     * most one, and its share among the answers that kept their code is 100% by construction. Only the user knows
     * which new code stands for which old one.
     */
    public static String binaryFrameSkipReason(VariableConfig v, ScreenedVariable baseline, ScreenedVariable current) {
        if (v.kind() != VariableKind.BINARY || baseline == null || baseline.categories() == null
                || current.categories() == null
                || !CodeFrameChange.outgrowsTwoCodes(baseline.categories(), current.categories(),
                CODE_FRAME_MIN_COUNT)) {
            return null;
        }
        return "the code frame changed, so the share of one code is not compared across the two frames (codes "
                + codes(codesWithAnswers(baseline), baseline) + " in the baseline, " + codes(codesWithAnswers(current),
                current) + " in this wave)";
    }

    private static List<String> codesWithAnswers(ScreenedVariable s) {
        return s.categories().categories().stream().filter(c -> s.categories().count(c) > 0).toList();
    }

    static boolean isAgeLike(VariableConfig v) {
        return "years".equalsIgnoreCase(v.unit()) && v.name().toLowerCase(Locale.ROOT).contains("age");
    }

    static boolean isWholeNumbers(ColumnType type, ScreenedVariable s) {
        var d = s.numeric();
        for (int i = 0; i < d.size(); i++) {
            if (d.value(i) != Math.rint(d.value(i))) {
                return false;
            }
        }
        return d.size() > 0;
    }

    public static int distinctValid(ScreenedVariable s) {
        return s.numeric() != null ? s.numeric().size() : s.categories() != null
                ? (int) java.util.Arrays.stream(s.categories().counts()).filter(c -> c > 0).count() : 2;
    }

    static String codes(List<String> codes, ScreenedVariable s) {
        return codes(codes, s, CodeLabels.NONE);
    }

    /** "'North' (12), 'Council tenant' (COUN: 41)": each code with its answers, named by its label where it has one. */
    static String codes(List<String> codes, ScreenedVariable s, CodeLabels labels) {
        return codes.stream().map(c -> {
            String label = labels.label(c);
            long n = s.categories().count(c);
            return label == null ? quoted(c) + " (" + n + ")"
                    : "'" + CodeLabels.shown(label) + "' (" + c + ": " + n + ")";
        }).reduce((a, b) -> a + ", " + b).orElse("");
    }

    /**
     * A code answered in this wave that has no value label while the variable's other codes have one: a code
     * outside the frame the codebook (or the YAML) declares. Only variables whose answers are codes (categorical,
     * binary, ordinal) are checked; a code needs {@link #CODE_FRAME_MIN_COUNT} answers, as for a code that appeared.
     */
    static Finding unlabelledCodes(VariableConfig v, ScreenedVariable current, CodeLabels labels, Long nB) {
        if (!labels.hasValueLabels() || (v.kind() != VariableKind.CATEGORICAL && v.kind() != VariableKind.BINARY
                && v.kind() != VariableKind.ORDINAL)) {
            return null;
        }
        Map<String, Long> answers = answeredCodes(current);
        List<String> codes = CodeFrameChange.unlabelled(answers, labels, CODE_FRAME_MIN_COUNT);
        if (codes.isEmpty()) {
            return null;
        }
        List<Long> counts = codes.stream().map(answers::get).toList();
        String listed = codes.size() == 1
                ? "Code " + quoted(codes.get(0)) + String.format(Locale.ROOT, " has %,d answers", counts.get(0))
                + " and no value label"
                : "Codes " + java.util.stream.IntStream.range(0, codes.size()).mapToObj(i -> quoted(codes.get(i))
                + String.format(Locale.ROOT, " (%,d answers)", counts.get(i))).reduce((a, b) -> a + ", " + b)
                .orElse("") + " have no value label";
        return Finding.dataQuality(v.name(), FindingKind.CODE_UNLABELLED, nB, current.validN(), listed
                        + " in this wave, though the variable's other codes have labels: a code outside the codebook?",
                CodesDetail.of(codes, counts, labels));
    }

    /**
     * A label that changed for the same code between the baseline wave's codebook and the current wave's: the code
     * is the same, what it stands for may not be. Only the codebooks each wave was imported with can show this; the
     * YAML and the dataset's codebook give one label per code for every wave.
     *
     * @param baselineWave   the baseline wave's own value labels (empty: it has no codebook of its own)
     * @param currentWave    the current wave's own value labels
     * @param baselineName   the baseline wave, as the sentence names it
     * @param currentName    the current wave
     */
    public static Finding relabelledCodes(VariableConfig v, ScreenedVariable baseline, ScreenedVariable current,
                                          Map<String, String> baselineWave, Map<String, String> currentWave,
                                          String baselineName, String currentName) {
        List<CodeFrameChange.Relabel> changed = CodeFrameChange.relabelled(new CodeLabels(null, baselineWave),
                currentWave);
        if (changed.isEmpty()) {
            return null;
        }
        Map<String, Long> before = baseline == null ? Map.of() : answeredCodes(baseline);
        Map<String, Long> after = answeredCodes(current);
        List<RelabelledCode> codes = changed.stream().map(r -> new RelabelledCode(r.code(), r.before(), r.after(),
                count(before, r.code()), count(after, r.code()))).toList();
        String sentence = codes.stream().map(c -> String.format(Locale.ROOT, "code %s was '%s' in wave %s and is '%s'"
                        + " in wave %s (%,d answers now)", quoted(c.code()), CodeLabels.shown(c.baselineLabel()),
                baselineName, CodeLabels.shown(c.label()), currentName, c.countCurrent()))
                .reduce((a, b) -> a + "; " + b).orElse("");
        return Finding.dataQuality(v.name(), FindingKind.LABEL_CHANGED, baseline == null ? null : baseline.validN(),
                current.validN(), Character.toUpperCase(sentence.charAt(0)) + sentence.substring(1)
                        + ": the same code may not mean the same answer in the two waves.",
                new RelabelledDetail(codes, baselineName, currentName));
    }

    /** The answers a code has, matched as {@link CodeLabels} matches labels: as written, then as a number. */
    private static long count(Map<String, Long> answers, String code) {
        Long exact = answers.get(code);
        if (exact != null) {
            return exact;
        }
        String n = CodeLabels.numericKey(code);
        return n == null ? 0 : answers.entrySet().stream().filter(e -> n.equals(CodeLabels.numericKey(e.getKey())))
                .mapToLong(Map.Entry::getValue).sum();
    }

    /** Each valid answer's code with its count: the categories as tallied, or a numeric code in the form of Codes. */
    static Map<String, Long> answeredCodes(ScreenedVariable s) {
        Map<String, Long> out = new LinkedHashMap<>();
        if (s.categories() != null) {
            s.categories().categories().forEach(c -> out.put(c, s.categories().count(c)));
        } else if (s.numeric() != null) {
            for (int i = 0; i < s.numeric().size(); i++) {
                out.merge(org.wavewarden.codebook.Codes.of(s.numeric().value(i)), s.numeric().count(i), Long::sum);
            }
        }
        return out;
    }

    /** "12 of 480 rows (2.5%)": every share a data-quality sentence prints names its count and denominator. */
    static String ofRows(long count, long rows) {
        return String.format(Locale.ROOT, "%,d of %,d rows (%.1f%%)", count, rows, 100.0 * count / Math.max(1, rows));
    }

    static List<Long> counts(List<String> codes, ScreenedVariable s) {
        return codes.stream().map(c -> s.categories().count(c)).toList();
    }

    static String quoted(String v) {
        String shown = v.codePoints().mapToObj(cp -> Character.isWhitespace(cp) || Character.isSpaceChar(cp)
                || Character.getType(cp) == Character.FORMAT ? String.format("\\u%04X", cp)
                : new String(Character.toChars(cp))).reduce("", String::concat);
        return "'" + (shown.length() > 40 ? shown.substring(0, 40) + "..." : shown) + "'";
    }

    static String fmt(double d) {
        return d == Math.rint(d) ? String.valueOf((long) d) : String.valueOf(d);
    }

    static Map<String, Long> limit(Map<String, Long> m, int n) {
        Map<String, Long> out = new LinkedHashMap<>();
        m.entrySet().stream().limit(n).forEach(e -> out.put(e.getKey(), e.getValue()));
        return out;
    }

    /** The candidates, most confident first; {@code count} of them among the wave's {@code rows}. */
    record CandidatesDetail(List<MissingCandidate> candidates, boolean excludedFromComparison, long count, long rows) {
    }

    /** Counts by code or value; {@code total} of them among the wave's {@code rows}. */
    record CountsDetail(Map<String, Long> counts, long total, long rows) {
    }

    record RangeDetail(long outside, long rows, Double min, Double max) {
    }

    record DistinctDetail(long distinctValues) {
    }

    /**
     * The codes, with their answers in the wave that has them and their value labels (null where a code has none).
     */
    record CodesDetail(List<String> codes, List<Long> counts, List<String> labels) {

        static CodesDetail of(List<String> codes, List<Long> counts, CodeLabels labels) {
            return new CodesDetail(codes, counts, codes.stream().map(labels::label).toList());
        }
    }

    /**
     * A code whose label changed between the two waves' codebooks.
     *
     * @param label          its label in the current wave's codebook
     * @param baselineLabel  its label in the baseline wave's codebook
     * @param countBaseline  its answers in the baseline wave
     * @param countCurrent   its answers in this wave
     */
    public record RelabelledCode(String code, String baselineLabel, String label, long countBaseline,
                                 long countCurrent) {
    }

    /** The codes whose labels changed, and the two waves whose codebooks say so. */
    public record RelabelledDetail(List<RelabelledCode> codes, String baselineWave, String currentWave) {
    }

    /**
     * Whipple's (or the digit dissimilarity) index of both waves, Myers' blended index for ages, and the index's
     * value without any preference, which the sentence names.
     */
    record HeapingDetail(double baselineIndex, double currentIndex, String band, double myersBaseline,
                         double myersCurrent, double noPreference) {
    }
}
