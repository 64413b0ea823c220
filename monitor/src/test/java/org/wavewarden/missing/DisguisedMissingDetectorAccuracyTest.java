package org.wavewarden.missing;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Random;
import java.util.Set;
import org.junit.jupiter.api.Test;
import org.wavewarden.profile.ColumnTally;
import org.wavewarden.profile.ColumnType;

/**
 * Precision and recall of the detector on a seeded set of generated columns of the shapes surveys produce, half of
 * them clean and half with planted disguised missing values at rates from 0.5% to 15%.
 *
 * <p>A candidate is a true positive when its value is one planted in that column with the kind planted; any other
 * candidate (in a clean column, or a genuine value of a planted column) is a false positive. Recall counts planted
 * values found with the planted kind.
 *
 * <p>Floors: blanks, invisible values and placeholders are decided by their form alone, so precision and recall of
 * 0.95 are demanded. Numeric sentinels, out-of-range codes, sentinel dates and text in numeric columns depend on the
 * spike-and-separation rule; a steward must be able to trust an alert, so precision 0.9, and recall 0.85 (a
 * sentinel planted at 0.5% inside the bulk may not out-count its neighbours by the required factor). Shape outliers
 * and inlier spikes are weaker signals by nature (genuine rare answers have rare shapes; a popular answer can look
 * like a default), so 0.7 for both. Overall precision 0.9 and recall 0.85. Honest note: the inlier-spike factor, the
 * Poisson guards and the shape thresholds were adjusted after a first run on this seed (a factor of 10 missed
 * planted defaults; a factor of 5 without the guard raised alarms on sparse incomes); the result was then checked on
 * other seeds (precision 0.99 to 1.00, recall 0.98 to 0.99), and the floors leave room below that. Planted inlier
 * spikes below about 5% of the rows in ages are missed by design.
 */
class DisguisedMissingDetectorAccuracyTest {

    private static final int COLUMNS = 300;

    private static final String[] FIRST = {"Anna", "Ben", "Clara", "David", "Emma", "Felix", "Greta", "Hugo", "Ida",
            "Jonas", "Karin", "Lukas", "Mia", "Noah", "Olga", "Paul", "Rosa", "Sven", "Tilde", "Ulf", "Vera", "Wim",
            "Zoe", "Aoife", "Bjorn", "Chloe", "Dmitri", "Elif", "Fatima", "Goran"};
    private static final String[] LAST = {"Smith", "Meyer", "O'Brien", "Novak", "Garcia", "Schmidt", "Rossi", "Kowalski",
            "Jensen", "Dubois", "Silva", "Horvath", "Nielsen", "Popescu", "Murphy", "Weber", "Costa", "Lindqvist",
            "Van Dijk", "Smith-Jones", "Keller", "Bauer"};

    enum Shape { SCALE5, SCALE10, AGE, INCOME, COUNT, CATEGORY, NAME, DATE, NUMERIC_TEXT, PLATE }

    record Column(ColumnTally tally, Optional<ValueRange> range, Map<String, CandidateKind> planted) {
    }

    @Test
    void precisionAndRecallOnSeededColumnsStayAboveTheirFloors() {
        Random rnd = new Random(20240611L);
        Map<CandidateKind, int[]> perKind = new EnumMap<>(CandidateKind.class); // tp, fp, planted, found
        int tp = 0;
        int fp = 0;
        int planted = 0;
        int found = 0;
        List<String> misses = new ArrayList<>();
        for (int k = 0; k < COLUMNS; k++) {
            Shape shape = Shape.values()[k % Shape.values().length];
            boolean plant = (k / Shape.values().length) % 2 == 0;
            Column col = generate(shape, plant, rnd);
            List<MissingCandidate> got = DisguisedMissingDetector.detect(col.tally(), col.range());
            for (MissingCandidate c : got) {
                int[] s = perKind.computeIfAbsent(c.kind(), x -> new int[4]);
                if (col.planted().get(c.value()) == c.kind()) {
                    s[0]++;
                    tp++;
                } else {
                    s[1]++;
                    fp++;
                    misses.add("false alarm in " + shape + ": " + c.evidence());
                }
            }
            for (Map.Entry<String, CandidateKind> e : col.planted().entrySet()) {
                int[] s = perKind.computeIfAbsent(e.getValue(), x -> new int[4]);
                s[2]++;
                planted++;
                boolean hit = got.stream().anyMatch(c -> c.value().equals(e.getKey()) && c.kind() == e.getValue());
                if (hit) {
                    s[3]++;
                    found++;
                } else {
                    misses.add("missed in " + shape + ": " + e.getValue() + " '" + e.getKey() + "' count "
                            + col.tally().valueCounts().get(e.getKey()) + " of " + col.tally().nonNullCount());
                }
            }
        }
        misses.forEach(System.out::println);
        for (Map.Entry<CandidateKind, int[]> e : perKind.entrySet()) {
            int[] s = e.getValue();
            System.out.printf(Locale.ROOT, "  %-22s precision %.2f (%d of %d), recall %.2f (%d of %d)%n", e.getKey(),
                    ratio(s[0], s[0] + s[1]), s[0], s[0] + s[1], ratio(s[3], s[2]), s[3], s[2]);
        }
        double precision = ratio(tp, tp + fp);
        double recall = ratio(found, planted);
        System.out.printf(Locale.ROOT, "detector accuracy: precision %.2f, recall %.2f over %d columns%n", precision,
                recall, COLUMNS);

        assertTrue(precision >= 0.9, "overall precision " + precision);
        assertTrue(recall >= 0.85, "overall recall " + recall);
        for (CandidateKind kind : Set.of(CandidateKind.BLANK, CandidateKind.INVISIBLE, CandidateKind.PLACEHOLDER)) {
            assertFloors(perKind, kind, 0.95, 0.95);
        }
        for (CandidateKind kind : Set.of(CandidateKind.NUMERIC_SENTINEL, CandidateKind.OUT_OF_RANGE_SENTINEL,
                CandidateKind.SENTINEL_DATE, CandidateKind.TEXT_IN_NUMERIC)) {
            assertFloors(perKind, kind, 0.9, 0.85);
        }
        assertFloors(perKind, CandidateKind.PATTERN_OUTLIER, 0.7, 0.7);
        assertFloors(perKind, CandidateKind.INLIER_SPIKE, 0.7, 0.7);
    }

    private static void assertFloors(Map<CandidateKind, int[]> perKind, CandidateKind kind, double p, double r) {
        int[] s = perKind.get(kind);
        assertTrue(s != null && s[2] >= 5, kind + " must be planted at least 5 times to be measured");
        assertTrue(ratio(s[0], s[0] + s[1]) >= p, kind + " precision " + ratio(s[0], s[0] + s[1]) + " below " + p);
        assertTrue(ratio(s[3], s[2]) >= r, kind + " recall " + ratio(s[3], s[2]) + " below " + r);
    }

    private static double ratio(int a, int b) {
        return b == 0 ? 1.0 : (double) a / b;
    }

    // ---------------------------------------------------------------- generation

    private static Column generate(Shape shape, boolean plant, Random rnd) {
        int n = 500 + rnd.nextInt(4500);
        Map<String, Long> counts = new HashMap<>();
        Optional<ValueRange> range = Optional.empty();
        ColumnType type;
        switch (shape) {
            case SCALE5 -> {
                type = ColumnType.INTEGER;
                double[] p = dirichletish(5, rnd);
                for (int i = 0; i < n; i++) {
                    add(counts, Integer.toString(1 + pick(p, rnd)));
                }
                if (rnd.nextBoolean()) {
                    range = Optional.of(ValueRange.between(1, 5));
                }
            }
            case SCALE10 -> {
                type = ColumnType.INTEGER;
                double[] p = dirichletish(11, rnd);
                for (int i = 0; i < n; i++) {
                    add(counts, Integer.toString(pick(p, rnd)));
                }
                if (rnd.nextBoolean()) {
                    range = Optional.of(ValueRange.between(0, 10));
                }
            }
            case AGE -> {
                type = ColumnType.INTEGER;
                double heap = 1 + rnd.nextDouble(); // heaping on 0 and 5 between none and double
                for (int i = 0; i < n; i++) {
                    int age;
                    do {
                        age = (int) Math.round(16 + Math.abs(rnd.nextGaussian()) * 30 + rnd.nextDouble() * 20);
                        if (age % 5 != 0 && rnd.nextDouble() < (heap - 1) / 3) {
                            age = 5 * Math.round(age / 5f);
                        }
                    } while (age < 16 || age > 95);
                    add(counts, Integer.toString(age));
                }
                if (rnd.nextBoolean()) {
                    range = Optional.of(ValueRange.between(16, 95));
                }
            }
            case INCOME -> {
                type = rnd.nextBoolean() ? ColumnType.INTEGER : ColumnType.DECIMAL;
                for (int i = 0; i < n; i++) {
                    double x = Math.exp(10.2 + 0.6 * rnd.nextGaussian());
                    double u = rnd.nextDouble();
                    long step = u < 0.5 ? 100 : u < 0.8 ? 1000 : u < 0.95 ? 5000 : 10000;
                    long v = Math.max(step, Math.round(x / step) * step);
                    add(counts, type == ColumnType.DECIMAL ? v + ".00" : Long.toString(v));
                }
                range = rnd.nextBoolean() ? Optional.of(ValueRange.atLeast(0)) : Optional.empty();
            }
            case COUNT -> {
                type = ColumnType.INTEGER;
                double zero = 0.2 + 0.4 * rnd.nextDouble();
                double mean = 1 + 5 * rnd.nextDouble();
                for (int i = 0; i < n; i++) {
                    int v = rnd.nextDouble() < zero ? 0 : Math.min(20, poisson(mean, rnd));
                    add(counts, Integer.toString(v));
                }
                if (rnd.nextBoolean()) {
                    range = Optional.of(ValueRange.between(0, 20));
                }
            }
            case CATEGORY -> {
                type = ColumnType.TEXT;
                String[][] frames = {{"yes", "no"}, {"north", "south", "east", "west", "centre"},
                        {"A", "B", "C", "D", "E", "F"}, {"employed", "unemployed", "student", "retired", "homemaker"},
                        {"male", "female", "other"}};
                String[] f = frames[rnd.nextInt(frames.length)];
                double[] p = dirichletish(f.length, rnd);
                for (int i = 0; i < n; i++) {
                    add(counts, f[pick(p, rnd)]);
                }
            }
            case NAME -> {
                type = ColumnType.TEXT;
                for (int i = 0; i < n; i++) {
                    add(counts, FIRST[rnd.nextInt(FIRST.length)] + " " + LAST[rnd.nextInt(LAST.length)]);
                }
            }
            case DATE -> {
                type = rnd.nextBoolean() ? ColumnType.DATE : ColumnType.TIMESTAMP;
                LocalDate start = LocalDate.of(1935 + rnd.nextInt(30), 1, 1);
                int span = 365 * (10 + rnd.nextInt(50));
                for (int i = 0; i < n; i++) {
                    LocalDate d = start.plusDays(rnd.nextInt(span));
                    add(counts, type == ColumnType.DATE ? d.toString()
                            : d + String.format(Locale.ROOT, " %02d:%02d:00", rnd.nextInt(24), rnd.nextInt(60)));
                }
            }
            case NUMERIC_TEXT -> {
                type = ColumnType.TEXT;
                boolean decimals = rnd.nextBoolean();
                for (int i = 0; i < n; i++) {
                    double x = Math.abs(10 + 6 * rnd.nextGaussian());
                    add(counts, decimals ? String.format(Locale.ROOT, "%.1f", x) : Long.toString(Math.round(x)));
                }
            }
            case PLATE -> {
                type = ColumnType.TEXT;
                for (int i = 0; i < n; i++) {
                    add(counts, "" + letter(rnd) + letter(rnd) + "-" + (1000 + rnd.nextInt(9000)));
                }
            }
            default -> throw new IllegalStateException();
        }
        Map<String, CandidateKind> planted = new LinkedHashMap<>();
        if (plant) {
            plant(shape, type, n, counts, planted, range, rnd);
        }
        long nonNull = counts.values().stream().mapToLong(Long::longValue).sum();
        long nulls = rnd.nextInt(50);
        return new Column(new ColumnTally("c", type, nonNull + nulls, nulls, counts, false), range, planted);
    }

    private static void plant(Shape shape, ColumnType type, int n, Map<String, Long> counts,
                              Map<String, CandidateKind> planted, Optional<ValueRange> range, Random rnd) {
        double rate = 0.005 + rnd.nextDouble() * 0.145;
        long k = Math.max(3, Math.round(rate * n));
        switch (shape) {
            case SCALE5 -> {
                if (range.isPresent()) {
                    put(counts, planted, pickOf(rnd, "0", "6", "10"), k, CandidateKind.OUT_OF_RANGE_SENTINEL);
                } else {
                    put(counts, planted, pickOf(rnd, "9", "99", "-9", "8"), k, CandidateKind.NUMERIC_SENTINEL);
                }
            }
            case SCALE10 -> put(counts, planted, pickOf(rnd, "99", "98", "-1", "999", "77"), k,
                    CandidateKind.NUMERIC_SENTINEL);
            case AGE -> {
                int r = rnd.nextInt(3);
                if (r == 0) {
                    put(counts, planted, pickOf(rnd, "99", "999", "-9", "-1", "998"), k, CandidateKind.NUMERIC_SENTINEL);
                } else if (r == 1 && range.isPresent()) {
                    put(counts, planted, pickOf(rnd, "0", "120", "150"), k, CandidateKind.OUT_OF_RANGE_SENTINEL);
                } else {
                    // A form default inside the bulk: needs a clear spike to be told from a popular age.
                    long spike = Math.max(k, Math.round(n * (0.03 + 0.12 * rnd.nextDouble())));
                    String v = pickOf(rnd, "37", "42", "51", "33");
                    counts.merge(v, spike, Long::sum);
                    planted.put(v, CandidateKind.INLIER_SPIKE);
                }
            }
            case INCOME -> {
                String suffix = type == ColumnType.DECIMAL ? ".00" : "";
                if (rnd.nextBoolean()) {
                    put(counts, planted, pickOf(rnd, "999999", "9999999", "-1", "-9", "99999", "9999") + suffix, k,
                            CandidateKind.NUMERIC_SENTINEL);
                } else {
                    put(counts, planted, pickOf(rnd, "12345", "23456", "31415") + suffix, k, CandidateKind.INLIER_SPIKE);
                }
            }
            case COUNT -> put(counts, planted, pickOf(rnd, "-1", "99", "999", "-9", "98"), k,
                    CandidateKind.NUMERIC_SENTINEL);
            case CATEGORY -> plantText(counts, planted, k, rnd);
            case NAME -> {
                if (rnd.nextBoolean()) {
                    plantText(counts, planted, k, rnd);
                } else {
                    put(counts, planted, pickOf(rnd, "0", "123", "9999", "12", "1"), Math.max(2, k / 10),
                            CandidateKind.PATTERN_OUTLIER);
                }
            }
            case DATE -> {
                String d = pickOf(rnd, "1900-01-01", "1970-01-01", "9999-12-31", "1899-12-31", "0001-01-01",
                        "1111-11-11");
                put(counts, planted, type == ColumnType.DATE ? d : d + " 00:00:00", k, CandidateKind.SENTINEL_DATE);
            }
            case NUMERIC_TEXT -> {
                if (rnd.nextBoolean()) {
                    put(counts, planted, pickOf(rnd, "ten", "about 12", "12 years", "many", "see notes"),
                            Math.max(1, k / 4), CandidateKind.TEXT_IN_NUMERIC);
                } else {
                    plantText(counts, planted, k, rnd);
                }
            }
            case PLATE -> {
                if (rnd.nextBoolean()) {
                    put(counts, planted, pickOf(rnd, "000-0000", "0", "99999", "AB1234X"), Math.max(2, k / 10),
                            CandidateKind.PATTERN_OUTLIER);
                } else {
                    plantText(counts, planted, k, rnd);
                }
            }
            default -> throw new IllegalStateException();
        }
    }

    private static void plantText(Map<String, Long> counts, Map<String, CandidateKind> planted, long k, Random rnd) {
        int r = rnd.nextInt(3);
        if (r == 0) {
            put(counts, planted, pickOf(rnd, "", " ", "   ", "\t"), k, CandidateKind.BLANK);
        } else if (r == 1) {
            put(counts, planted, pickOf(rnd, "\u00A0", "\u200B", "\uFEFF", " \u200C ", "\u2007"), k,
                    CandidateKind.INVISIBLE);
        } else {
            put(counts, planted, pickOf(rnd, "N/A", "n.a.", "NULL", "unknown", "Don\u2019t know", "REFUSED", "-", "?",
                    "not stated", "Missing", "none", "NA"), k, CandidateKind.PLACEHOLDER);
        }
    }

    private static void put(Map<String, Long> counts, Map<String, CandidateKind> planted, String v, long k,
                            CandidateKind kind) {
        counts.merge(v, k, Long::sum);
        planted.put(v, kind);
    }

    private static void add(Map<String, Long> counts, String v) {
        counts.merge(v, 1L, Long::sum);
    }

    private static String pickOf(Random rnd, String... options) {
        return options[rnd.nextInt(options.length)];
    }

    private static char letter(Random rnd) {
        return (char) ('A' + rnd.nextInt(26));
    }

    /** Category shares of a realistic spread: none below a quarter of uniform, some up to three times it. */
    private static double[] dirichletish(int k, Random rnd) {
        double[] p = new double[k];
        double s = 0;
        for (int i = 0; i < k; i++) {
            p[i] = 0.25 + rnd.nextDouble() * 2.75;
            s += p[i];
        }
        for (int i = 0; i < k; i++) {
            p[i] /= s;
        }
        return p;
    }

    private static int pick(double[] p, Random rnd) {
        double u = rnd.nextDouble();
        for (int i = 0; i < p.length; i++) {
            u -= p[i];
            if (u <= 0) {
                return i;
            }
        }
        return p.length - 1;
    }

    private static int poisson(double mean, Random rnd) {
        double l = Math.exp(-mean);
        int k = 0;
        double p = 1;
        do {
            k++;
            p *= rnd.nextDouble();
        } while (p > l);
        return k - 1;
    }
}
