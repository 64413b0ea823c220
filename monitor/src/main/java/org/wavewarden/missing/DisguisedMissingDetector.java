package org.wavewarden.missing;

import java.math.BigDecimal;
import java.time.DateTimeException;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

/**
 * Finds values that mean "no answer" without being SQL NULL, from one column's tally alone (no codebook).
 *
 * <p>The idea follows the disguised-missing-data literature (Pearson 2006, "The problem of disguised missing data",
 * SIGKDD Explorations 8(1); Hua and Pei 2007, "Cleaning disguised missing data: a heuristic approach", KDD): a
 * default value or a code for "don't know" shows itself by its form (blank, invisible, a placeholder word, a
 * repdigit number, a round-trip epoch date) together with its frequency (a spike) and its place (apart from the
 * bulk). The rules, all on the tally:
 *
 * <ul>
 *   <li><b>Text.</b> The empty string and ASCII white space are {@link CandidateKind#BLANK}; values made only of
 *       no-break spaces, zero-width characters (U+200B..U+200D, U+FEFF, U+2060) or other Unicode space separators are
 *       {@link CandidateKind#INVISIBLE}; after normalising case, compatibility forms, apostrophes, dashes, white space
 *       and punctuation, tokens such as "N/A", "n.a.", "null", "none", "-", "?", "don't know", "not stated" are
 *       {@link CandidateKind#PLACEHOLDER}. A token that can also be an answer ("x", "none") is not a placeholder
 *       when it holds more than {@value #ANSWER_SHARE} of the column or the column has at most {@value #FEW_CODES}
 *       distinct values (it is then one of the column's codes, as 'x' beside 'y'); known no-answer forms ("n/a",
 *       "don't know", a lone "." or "*") are placeholders whatever their share.</li>
 *   <li><b>Numbers</b> (numeric columns, and text columns where at least {@value #NUMERIC_LOOKING_SHARE} of the
 *       remaining rows are numbers; the other rows there are {@link CandidateKind#TEXT_IN_NUMERIC}). A value is of
 *       <i>sentinel shape</i> when it is a repdigit of 7, 8 or 9 (7, 99, 888, 9999, ...), a 9-run ending in 8, 7 or
 *       6 (98, 997, 9996, ...), the negative of one of those, or -1 to -6. The <i>bulk</i> is every value that is
 *       in the declared range and lies between the smallest and largest value not of sentinel shape. A sentinel-shaped
 *       value outside the bulk is a {@link CandidateKind#NUMERIC_SENTINEL} when it <i>stands apart</i>: outside the
 *       fences [Q1 - {@value #FENCE_IQR} IQR, Q3 + {@value #FENCE_IQR} IQR] of the bulk (the far-out fences of Tukey
 *       1977, Exploratory Data Analysis), negative while the bulk is not, or separated from the bulk's end by at
 *       least {@value #GAP_SPACINGS} times the bulk's median step between distinct values (so 9 after a 1..5 scale,
 *       or 99 after ages ending at 95); otherwise it joins the bulk and the next one is judged against the widened
 *       bulk (a 1..9 scale keeps its 7, 8 and 9). Inside the bulk a sentinel-shaped value is a candidate only when
 *       its count is at least {@value #SENTINEL_SPIKE_RATIO} times the median count of its nearest distinct
 *       neighbours (up to three each side). Any value outside the declared range is a candidate, and a value that is
 *       not of sentinel shape there is an {@link CandidateKind#OUT_OF_RANGE_SENTINEL} (0 where 1..5 is declared).</li>
 *   <li><b>Dates and timestamps</b> work the same on day numbers, with sentinel shape meaning a well-known placeholder
 *       date (1900-01-01, 1899-12-31, 1970-01-01, 2000-01-01, 9999-12-31, 1111-11-11, 0001-01-01, ...), a year
 *       before 1000 or from 9000, or 'infinity'; candidates are {@link CandidateKind#SENTINEL_DATE}.</li>
 *   <li><b>Inlier spikes.</b> In a bulk of at least 12 distinct values, an inner value (not the smallest or largest:
 *       floor and ceiling effects pile up there naturally) is an {@link CandidateKind#INLIER_SPIKE} when its count is
 *       at least {@value #INLIER_SPIKE_RATIO} times the median count of its nearest neighbours (up to three each side,
 *       within one interquartile range) that are at least as round, and a Poisson count with that median as its mean
 *       would reach it with probability below 1e-6. Comparing like with like (50000 with 40000 and 60000, not with
 *       49900; age 40 with 30 and 50) discounts heaping on round numbers; the Poisson guard keeps five answers on one
 *       income among neighbours with one each from counting as a spike. The factor 5 is about the largest ratio a
 *       smooth unimodal answer distribution shows between one value and its near neighbours even with strong digit
 *       preference (the seeded accuracy test's heaped ages stay below it), while a form default holding 5% or more of
 *       a spread-out variable exceeds it. Sentinel-shaped values inside a long bulk use the same factor, compared with
 *       equally round neighbours, with the looser guard 1e-5 since their shape is evidence already.</li>
 *   <li><b>Shapes.</b> In other text columns each value's shape (letters to A, digits to 9, runs collapsed) is
 *       compared with the dominant shapes (the most common, covering 80% of rows); a value whose shape has under 2%
 *       of rows and shares no letter-or-digit class with the dominant shapes (digits among names, symbols only) is a
 *       {@link CandidateKind#PATTERN_OUTLIER}, as is, in a fixed-format column (one exact shape for 95% of rows), a
 *       rare different exact shape. These carry low confidence: genuine rare answers have rare shapes too.</li>
 * </ul>
 *
 * <p>Values that are not blank or placeholders are reported only when they occur at least
 * {@code max(3, 0.2% of the non-null rows)} times: a single odd value is a typo or a range violation, not a code.
 */
public final class DisguisedMissingDetector {

    static final double FENCE_IQR = 3.0;
    static final double GAP_SPACINGS = 2.0;
    static final double SENTINEL_SPIKE_RATIO = 5.0;
    static final double INLIER_SPIKE_RATIO = 5.0;
    static final double NUMERIC_LOOKING_SHARE = 0.9;
    static final double MIN_SHARE = 0.002;
    static final long MIN_COUNT = 3;
    static final double RARE_PATTERN_SHARE = 0.02;
    /**
     * A token that could be an answer ("x", "none") holding more than this share of a column is an answer, not a
     * placeholder: a form default is a minority of a column, an option ticked by a fifth of the people is an option.
     * Common practice, no source.
     */
    static final double ANSWER_SHARE = 0.2;
    /**
     * A column with at most this many distinct values is a code frame, and each of its values one of its codes
     * ("x" and "y" of a two-code item). Common practice, no source: about the size of a printed answer list.
     */
    static final int FEW_CODES = 10;

    private static final Set<LocalDate> SENTINEL_DATES = Set.of(
            LocalDate.of(1900, 1, 1), LocalDate.of(1899, 12, 31), LocalDate.of(1899, 12, 30), LocalDate.of(1970, 1, 1),
            LocalDate.of(1969, 12, 31), LocalDate.of(2000, 1, 1), LocalDate.of(9999, 12, 31), LocalDate.of(9999, 1, 1),
            LocalDate.of(1111, 11, 11), LocalDate.of(1, 1, 1), LocalDate.of(1800, 1, 1), LocalDate.of(1901, 1, 1),
            LocalDate.of(1753, 1, 1), LocalDate.of(1582, 10, 15), LocalDate.of(1601, 1, 1), LocalDate.of(2099, 12, 31),
            LocalDate.of(2999, 12, 31), LocalDate.of(1999, 12, 31), LocalDate.of(1000, 1, 1), LocalDate.of(2222, 2, 22));

    private DisguisedMissingDetector() {
    }

    /**
     * The candidates of one column, most confident first.
     *
     * @param tally         the column's distinct non-null values with counts
     * @param declaredRange the codebook's valid range for a numeric column, if any
     */
    public static List<MissingCandidate> detect(ColumnTally tally, Optional<ValueRange> declaredRange) {
        if (tally == null) {
            throw new IllegalArgumentException("tally must not be null");
        }
        if (declaredRange == null) {
            throw new IllegalArgumentException("declaredRange must not be null (use Optional.empty())");
        }
        long denominator = Math.max(tally.nonNullCount(),
                tally.valueCounts().values().stream().mapToLong(Long::longValue).sum());
        List<MissingCandidate> out = new ArrayList<>();
        Map<String, Long> remaining = new LinkedHashMap<>();
        boolean dateColumn = tally.type() == ColumnType.DATE || tally.type() == ColumnType.TIMESTAMP;
        for (Map.Entry<String, Long> e : tally.valueCounts().entrySet()) {
            String v = e.getKey();
            long c = e.getValue();
            if (c <= 0) {
                continue;
            }
            if (NumberText.isPlainDecimal(v)) {
                // A plain number is never blank, invisible or a placeholder; most values of numeric columns are
                // numbers, and this check is the cheap way past the text tests for each of them.
                remaining.put(v, c);
                continue;
            }
            double share = Math.min(1, (double) c / denominator);
            String shown = "'" + visible(v) + "'";
            if (TextForms.isBlank(v)) {
                String what = v.isEmpty() ? "the empty string" : "white space only";
                out.add(new MissingCandidate(v, CandidateKind.BLANK, c, share, 0.95,
                        shown + " is " + what + " and occurs " + times(c) + " (" + percent(share)
                                + " of the non-null answers)."));
            } else if (TextForms.isInvisibleOnly(v)) {
                out.add(new MissingCandidate(v, CandidateKind.INVISIBLE, c, share, 0.95,
                        shown + " holds only invisible or non-ASCII space characters and occurs " + times(c) + " ("
                                + percent(share) + " of the non-null answers)."));
            } else if (dateColumn && (v.equals("infinity") || v.equals("-infinity"))) {
                out.add(new MissingCandidate(v, CandidateKind.SENTINEL_DATE, c, share, 0.8,
                        shown + " is the unbounded date and occurs " + times(c) + " (" + percent(share)
                                + " of the non-null answers)."));
            } else {
                double strength = TextForms.placeholderStrength(v);
                if (strength > 0 && (TextForms.isKnownNoAnswerForm(v)
                        || !isOneOfTheColumnsCodes(share, tally.distinctCount()))) {
                    out.add(new MissingCandidate(v, CandidateKind.PLACEHOLDER, c, share, strength >= 1 ? 0.9 : 0.6,
                            shown + " reads as a placeholder for no answer ('" + TextForms.normalise(v) + "') and occurs "
                                    + times(c) + " (" + percent(share) + " of the non-null answers)."));
                } else {
                    remaining.put(v, c);
                }
            }
        }
        switch (tally.type()) {
            case INTEGER, DECIMAL -> out.addAll(numeric(remaining, denominator, declaredRange));
            case DATE, TIMESTAMP -> out.addAll(dates(remaining, denominator));
            case TEXT, OTHER -> out.addAll(text(remaining, denominator, declaredRange));
            case BOOLEAN -> { }
            default -> { }
        }
        out.sort(Comparator.comparingDouble(MissingCandidate::confidence).reversed()
                .thenComparing(Comparator.comparingLong(MissingCandidate::count).reversed())
                .thenComparing(MissingCandidate::value));
        return List.copyOf(out);
    }

    private static List<MissingCandidate> text(Map<String, Long> remaining, long denominator,
                                               Optional<ValueRange> declaredRange) {
        long rows = remaining.values().stream().mapToLong(Long::longValue).sum();
        if (rows == 0) {
            return List.of();
        }
        long numericRows = 0;
        long dateRows = 0;
        Set<String> numericDistinct = new HashSet<>();
        for (Map.Entry<String, Long> e : remaining.entrySet()) {
            if (NumberText.parse(e.getKey()) != null) {
                numericRows += e.getValue();
                numericDistinct.add(e.getKey());
            } else if (parseDate(e.getKey()) != null) {
                dateRows += e.getValue();
            }
        }
        List<MissingCandidate> out = new ArrayList<>();
        if (numericRows >= NUMERIC_LOOKING_SHARE * rows && numericDistinct.size() >= 2) {
            Map<String, Long> numbers = new LinkedHashMap<>();
            for (Map.Entry<String, Long> e : remaining.entrySet()) {
                if (NumberText.parse(e.getKey()) != null) {
                    numbers.put(e.getKey(), e.getValue());
                } else {
                    double share = Math.min(1, (double) e.getValue() / denominator);
                    out.add(new MissingCandidate(e.getKey(), CandidateKind.TEXT_IN_NUMERIC, e.getValue(), share, 0.75,
                            "'" + visible(e.getKey()) + "' is not a number while " + percent((double) numericRows / rows)
                                    + " of the other answers are; it occurs " + times(e.getValue()) + " ("
                                    + percent(share) + " of the non-null answers)."));
                }
            }
            out.addAll(numeric(numbers, denominator, declaredRange));
            return out;
        }
        if (dateRows >= NUMERIC_LOOKING_SHARE * rows) {
            return dates(remaining, denominator);
        }
        return shapes(remaining, denominator);
    }

    private static List<MissingCandidate> numeric(Map<String, Long> values, long denominator,
                                                  Optional<ValueRange> declaredRange) {
        // Equal numbers written differently ("9", "9.0") are one point, shown by the most frequent spelling.
        Map<BigDecimal, SpikeScan.Point> byNumber = new LinkedHashMap<>();
        for (Map.Entry<String, Long> e : values.entrySet()) {
            BigDecimal d = NumberText.parse(e.getKey());
            if (d == null) {
                continue;
            }
            BigDecimal key = d.signum() == 0 ? BigDecimal.ZERO : d.stripTrailingZeros();
            SpikeScan.Point before = byNumber.get(key);
            if (before == null) {
                byNumber.put(key, new SpikeScan.Point(d.doubleValue(), e.getKey(), e.getValue()));
            } else {
                String raw = before.count() >= e.getValue() ? before.raw() : e.getKey();
                byNumber.put(key, new SpikeScan.Point(before.x(), raw, before.count() + e.getValue()));
            }
        }
        return new SpikeScan(new ArrayList<>(byNumber.values()), denominator, DisguisedMissingDetector::isSentinelNumber,
                NumberText::roundness, declaredRange, CandidateKind.NUMERIC_SENTINEL, NumberText::plain, true).run();
    }

    private static List<MissingCandidate> dates(Map<String, Long> values, long denominator) {
        Map<Double, SpikeScan.Point> byInstant = new LinkedHashMap<>();
        for (Map.Entry<String, Long> e : values.entrySet()) {
            Double x = dayNumber(e.getKey());
            if (x == null) {
                continue;
            }
            SpikeScan.Point before = byInstant.get(x);
            byInstant.put(x, before == null ? new SpikeScan.Point(x, e.getKey(), e.getValue())
                    : new SpikeScan.Point(x, before.raw(), before.count() + e.getValue()));
        }
        return new SpikeScan(new ArrayList<>(byInstant.values()), denominator, DisguisedMissingDetector::isSentinelDay,
                DisguisedMissingDetector::dateRoundness, Optional.empty(), CandidateKind.SENTINEL_DATE,
                DisguisedMissingDetector::days, false).run();
    }

    private static List<MissingCandidate> shapes(Map<String, Long> values, long denominator) {
        long rows = values.values().stream().mapToLong(Long::longValue).sum();
        if (rows < 50 || values.size() < 3) {
            return List.of();
        }
        Map<String, Long> byPattern = new LinkedHashMap<>();
        Map<String, Long> byFullPattern = new LinkedHashMap<>();
        for (Map.Entry<String, Long> e : values.entrySet()) {
            byPattern.merge(TextForms.pattern(e.getKey()), e.getValue(), Long::sum);
            byFullPattern.merge(TextForms.fullPattern(e.getKey()), e.getValue(), Long::sum);
        }
        List<Map.Entry<String, Long>> ranked = new ArrayList<>(byPattern.entrySet());
        ranked.sort(Map.Entry.<String, Long>comparingByValue().reversed());
        Set<String> dominant = new HashSet<>();
        long covered = 0;
        for (Map.Entry<String, Long> e : ranked) {
            if (covered >= 0.8 * rows || dominant.size() == 3) {
                break;
            }
            dominant.add(e.getKey());
            covered += e.getValue();
        }
        if (covered < 0.5 * rows) {
            return List.of(); // no dominant shape: free text
        }
        boolean dominantLetters = dominant.stream().anyMatch(p -> p.indexOf('A') >= 0);
        boolean dominantDigits = dominant.stream().anyMatch(p -> p.indexOf('9') >= 0);
        Map.Entry<String, Long> topFull = byFullPattern.entrySet().stream().max(Map.Entry.comparingByValue()).orElseThrow();
        boolean fixedFormat = topFull.getValue() >= 0.95 * rows;
        long floor = minimumCount(denominator);
        List<MissingCandidate> out = new ArrayList<>();
        for (Map.Entry<String, Long> e : values.entrySet()) {
            String p = TextForms.pattern(e.getKey());
            long patternRows = byPattern.get(p);
            if (dominant.contains(p) || patternRows >= RARE_PATTERN_SHARE * rows || e.getValue() < Math.min(floor, 2)) {
                continue;
            }
            boolean letters = p.indexOf('A') >= 0;
            boolean digits = p.indexOf('9') >= 0;
            boolean disjoint = !(letters && dominantLetters) && !(digits && dominantDigits);
            String full = TextForms.fullPattern(e.getKey());
            double share = Math.min(1, (double) e.getValue() / denominator);
            String head = "'" + visible(e.getKey()) + "' has the shape '" + p + "', found in "
                    + percent((double) patternRows / rows) + " of the rows, ";
            if (disjoint) {
                out.add(new MissingCandidate(e.getKey(), CandidateKind.PATTERN_OUTLIER, e.getValue(), share,
                        letters || digits ? 0.45 : 0.5, head + "while the dominant shapes " + sorted(dominant)
                                + " cover " + percent((double) covered / rows) + " and share none of its letter or digit"
                                + " classes; it occurs " + times(e.getValue()) + "."));
            } else if (fixedFormat && !full.equals(topFull.getKey())
                    && byFullPattern.get(full) < RARE_PATTERN_SHARE * rows) {
                out.add(new MissingCandidate(e.getKey(), CandidateKind.PATTERN_OUTLIER, e.getValue(), share, 0.3,
                        head + "while " + percent((double) topFull.getValue() / rows) + " of the rows have the exact"
                                + " format '" + topFull.getKey() + "'; it occurs " + times(e.getValue()) + "."));
            }
        }
        return out;
    }

    /**
     * A token that can be an answer is one when it is a large share of the column or one of a few codes: the
     * disguised-missing literature asks for a value that stands apart from the answers, and such a token does not.
     */
    static boolean isOneOfTheColumnsCodes(double share, int distinctValues) {
        return share > ANSWER_SHARE || distinctValues <= FEW_CODES;
    }

    /** Sentinel shape: a repdigit of 7, 8 or 9, a 9-run ending in 8, 7 or 6, the negative of one, or -1 to -6. */
    public static boolean isSentinelNumber(double x) {
        if (x != Math.rint(x) || Math.abs(x) > 1e8) {
            return false;
        }
        long a = Math.abs((long) x);
        if (x < 0 && a >= 1 && a <= 6) {
            return true;
        }
        String s = Long.toString(a);
        char first = s.charAt(0);
        if ((first == '7' || first == '8' || first == '9') && s.chars().allMatch(ch -> ch == first)) {
            return true;
        }
        if (s.length() >= 2) {
            String head = s.substring(0, s.length() - 1);
            char last = s.charAt(s.length() - 1);
            return head.chars().allMatch(ch -> ch == '9') && (last == '8' || last == '7' || last == '6');
        }
        return false;
    }

    private static boolean isSentinelDay(double day) {
        LocalDate d = LocalDate.ofEpochDay((long) Math.floor(day));
        return SENTINEL_DATES.contains(d) || d.getYear() < 1000 || d.getYear() >= 9000;
    }

    private static double dateRoundness(double day) {
        LocalDate d = LocalDate.ofEpochDay((long) Math.floor(day));
        double r = d.getDayOfMonth() == 1 ? (d.getMonthValue() == 1 ? 2 : 1) : d.getDayOfMonth() == 15 ? 0.5 : 0;
        return day == Math.floor(day) ? r : r - 1; // a time of day other than midnight is less round
    }

    private static String days(double d) {
        if (d >= 730) {
            return oneDecimal(d / 365.25) + " years";
        }
        return Math.round(d) + " days";
    }

    /** Day number of a PostgreSQL date or timestamp text ('1970-01-01', '1970-01-01 12:00:00+01'), or null. */
    public static Double dayNumber(String raw) {
        LocalDate d = parseDate(raw);
        if (d == null) {
            return null;
        }
        double day = d.toEpochDay();
        String rest = raw.strip().substring(10).strip();
        if (rest.length() >= 8 && Character.isDigit(rest.charAt(0))) {
            try {
                int h = Integer.parseInt(rest.substring(0, 2));
                int m = Integer.parseInt(rest.substring(3, 5));
                double sec = Double.parseDouble(rest.substring(6).replaceAll("[+-].*$", "").replaceAll("[^0-9.].*$", ""));
                day += (h * 3600 + m * 60 + sec) / 86400.0;
            } catch (RuntimeException e) {
                return day;
            }
        }
        return day;
    }

    private static LocalDate parseDate(String raw) {
        String t = raw.strip();
        if (t.length() < 10 || t.charAt(4) != '-' || t.charAt(7) != '-' || t.endsWith("BC")) {
            return null;
        }
        try {
            return LocalDate.of(Integer.parseInt(t.substring(0, 4)), Integer.parseInt(t.substring(5, 7)),
                    Integer.parseInt(t.substring(8, 10)));
        } catch (NumberFormatException | DateTimeException e) {
            return null;
        }
    }

    static long minimumCount(long nonNullRows) {
        return Math.max(MIN_COUNT, (long) Math.ceil(MIN_SHARE * nonNullRows));
    }

    static String percent(double share) {
        double p = 100 * share;
        return String.format(Locale.ROOT, p < 0.1 && p > 0 ? "%.2f%%" : "%.1f%%", p);
    }

    static String oneDecimal(double x) {
        return String.format(Locale.ROOT, "%.1f", x);
    }

    private static String times(long c) {
        return c == 1 ? "once" : c + " times";
    }

    private static List<String> sorted(Set<String> s) {
        return s.stream().sorted().toList();
    }

    /** The value with invisible characters spelled out, so the evidence shows what is there. */
    static String visible(String v) {
        StringBuilder b = new StringBuilder();
        v.codePoints().forEach(cp -> {
            if (TextForms.isInvisible(cp) || (cp < 0x20 && cp != ' ')) {
                b.append(String.format(Locale.ROOT, "\\u%04X", cp));
            } else {
                b.appendCodePoint(cp);
            }
        });
        return b.toString();
    }
}
